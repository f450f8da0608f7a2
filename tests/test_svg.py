"""The SVG schematic: it parses, holds one resistor symbol per drawn part, names its terminals; the CLI writes it."""

from __future__ import annotations

import datetime
import os
import stat
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest
from hypothesis import given, settings

from netsynth.cli import cli
from netsynth.errors import ArgumentError
from netsynth.network import from_text, part_count
from netsynth.render.diagram import draw
from netsynth.render.svg import save_svg, to_svg
from tests.test_diagram import drawn_blocks, repeating

NS = {"s": "http://www.w3.org/2000/svg"}
BINS = Path(__file__).resolve().parent.parent / "bins"


def parsed(svg: str) -> ET.Element:
    return ET.fromstring(svg.encode("utf-8"))


def texts(root: ET.Element, cls: str) -> list[str]:
    return [t.text for t in root.iterfind(".//s:text", NS) if t.get("class") == cls]


def resistors(root: ET.Element) -> list[ET.Element]:
    return [r for r in root.iterfind(".//s:rect", NS) if r.get("class") == "resistor"]


@pytest.mark.parametrize("text, symbols, counts", [
    ("4k7", 1, []),
    ("1k + (2k2 || 4k7)", 3, []),
    ("20p(8s(10))", 1, ["×8 in series", "×20 in parallel"]),  # 160 parts, one drawn copy
    ("10p(4s(10) + 5s(12))", 5, ["×5 in series", "×10 in parallel"]),
])
def test_svg_parses_with_one_symbol_per_drawn_part(text, symbols, counts):
    root = parsed(to_svg(from_text(text)))
    assert root.tag == "{http://www.w3.org/2000/svg}svg"
    assert len(resistors(root)) == symbols
    assert texts(root, "count") == counts
    assert texts(root, "terminal-name") == ["A", "B"]


@settings(max_examples=40)
@given(repeating)
def test_svg_and_text_drawing_show_the_same_blocks(net):
    root = parsed(to_svg(net))
    assert len(resistors(root)) == drawn_blocks(net) == draw(net).count("[")


@settings(max_examples=40)
@given(repeating)
def test_resistor_symbols_never_overlap_and_stay_on_the_canvas(net):
    root = parsed(to_svg(net))
    _, _, width, height = (float(v) for v in root.get("viewBox").split())
    boxes = [tuple(float(r.get(k)) for k in ("x", "y", "width", "height")) for r in resistors(root)]
    for x, y, w, h in boxes:
        assert 0 <= x and x + w <= width and 0 <= y and y + h <= height
    for i, (x1, y1, w1, h1) in enumerate(boxes):
        for x2, y2, w2, h2 in boxes[i + 1:]:
            assert x1 + w1 <= x2 or x2 + w2 <= x1 or y1 + h1 <= y2 or y2 + h2 <= y1


def test_title_block_and_power_labels():
    net = from_text("1k + (2k2 || 4k7)")
    title = {"target": "3.37 kΩ", "achieved": "3.37 kΩ", "error": "exact", "bin": "drawer", "date": "2026-01-02"}
    root = parsed(to_svg(net, title, watts=[0.5, 0.25, 0.125]))
    assert texts(root, "title-key") == list(title)
    assert texts(root, "title-value") == list(title.values())
    assert texts(root, "value") == ["1k", "2k2", "4k7"]
    assert texts(root, "power") == ["0.5W", "0.25W", "0.12W"]


def test_save_svg_is_atomic_and_keeps_the_mode(tmp_path):
    path = tmp_path / "net.svg"
    path.write_text("old", encoding="utf-8")
    os.chmod(path, 0o640)
    svg = to_svg(from_text("1k + 1k"))
    save_svg(svg, path)
    assert path.read_text(encoding="utf-8") == svg
    assert stat.S_IMODE(path.stat().st_mode) == 0o640
    assert sorted(p.name for p in tmp_path.iterdir()) == ["net.svg"]  # no temporary file left


def test_save_svg_into_a_missing_folder_is_a_short_error(tmp_path):
    with pytest.raises(ArgumentError, match="cannot write the SVG"):
        save_svg("<svg/>", tmp_path / "no" / "such" / "net.svg")


# ---------------------------------------------------------------- the command line


def test_make_writes_the_recommended_network_as_svg(runner, tmp_path):
    out = tmp_path / "load.svg"
    result = runner.invoke(cli, ["make", "10", "--watts", "5", "--bin", str(BINS / "quarter-watt-kit.csv"),
                                 "--alternatives", "0", "--svg", str(out)])
    assert result.exception is None and result.exit_code == 0, result.output
    root = parsed(out.read_text(encoding="utf-8"))
    # the recommended 40-part array 20p(2s(100)): one string of two drawn, twenty in parallel
    assert "Recommended (error first): 20p(2s(100))" in result.output
    assert len(resistors(root)) == 2 and texts(root, "count") == ["×20 in parallel"]
    assert texts(root, "power") == ["0.12W", "0.12W"]  # 5 W over 40 parts: 0.125 W each
    keys = texts(root, "title-key")
    assert keys[:5] == ["target", "network", "achieved", "error", "parts"] and keys[-2:] == ["bin", "date"]
    assert texts(root, "title-value")[keys.index("date")] == datetime.date.today().isoformat()


def test_check_writes_svg_with_its_target_and_draws_ascii(runner, tmp_path):
    out = tmp_path / "check.svg"
    result = runner.invoke(cli, ["check", "1k + (2k2 || 4k7)", "--target", "2k5", "--ascii", "--svg", str(out)])
    assert result.exception is None and result.exit_code == 0, result.output
    assert "A --[1k]--+-[2k2]-+-- B" in result.output.splitlines()
    root = parsed(out.read_text(encoding="utf-8"))
    values = dict(zip(texts(root, "title-key"), texts(root, "title-value")))
    assert values["target"] == "2.5 kΩ" and values["network"] == "1k + (2k2 || 4k7)"
    assert len(resistors(root)) == 3


def test_svg_to_an_unwritable_place_is_an_error_not_a_traceback(runner, tmp_path):
    result = runner.invoke(cli, ["check", "1k", "--svg", str(tmp_path / "missing" / "x.svg")])
    assert isinstance(result.exception, SystemExit) and result.exit_code == 1
    assert result.output.startswith("Error: cannot write the SVG") and "x.svg" in result.output


# ---------------------------------------------------------------- notebook display


def test_design_and_candidate_show_themselves_in_a_notebook():
    import netsynth.render.notebook  # noqa: F401  (registers the displays)
    from netsynth import check, default_bin, make

    design = make("3k37", default_bin(), max_parts=3, alternatives=0)
    page = design._repr_html_()
    assert page.startswith("<div><svg") and page.count("<tr") == 1 + len(design.frontier)
    assert len(resistors(parsed(design._repr_svg_()))) == design.best.parts
    candidate, _ = check("6s(10)", default_bin())
    root = parsed(candidate._repr_svg_())
    assert len(resistors(root)) == 1 and texts(root, "count") == ["×6 in series"]
    assert part_count(candidate.network) == 6
