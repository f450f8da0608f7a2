"""A bin that keeps count: netsynth.stock.edit and ``netsynth bin show|check|take|add``.

References: the bin files' own text (quantities typed in the demo bins and in the files below) and
hand arithmetic (a take of n parts lowers a quantity by n). The kill test is its own reference:
after a writer is killed, the file must be byte for byte one of the two versions.
"""

from __future__ import annotations

import json
import os
import random
import shutil
import signal
import sys
import time
from pathlib import Path

import pytest

from netsynth.api import make, take_list
from netsynth.cli import cli
from netsynth.errors import StockError
from netsynth.stock import StockItem, load_bin
from netsynth.stock.edit import apply_edit, backup_path, plan_add, plan_take

BINS = Path(__file__).resolve().parent.parent / "bins"

# A hand-made file with everything a user might add: comments before and between rows, an unknown
# column, CRLF line ends, spaces around a qty, a quoted cell with a comma, a short row, a blank line,
# and two rows of one part (same value and ratings, so one stock line of 3 + 4 parts).
DRAWER = (
    "# my drawer, typed by hand\r\n"
    "value,qty,tolerance,watts,location,supplier\r\n"
    "4k7, 3 ,5%,1/4W,\"box 1, left\",acme\r\n"
    "# the second bag of 4k7 arrived later\r\n"
    "4K7,4,5%,0.25,box 1 back,other\r\n"
    "\r\n"
    "1k,10,1%,1/4W,box 2\r\n"
    "10k,,1%,1/4W,box 3,unlimited?\r\n"
    "22k,2\r\n"
)


@pytest.fixture
def drawer(tmp_path) -> Path:
    path = tmp_path / "drawer.csv"
    path.write_bytes(DRAWER.encode())
    return path


def line_of(stock, ohms, tolerance=None):
    return next(i for i in stock.items if i.ohms == ohms and (tolerance is None or i.tolerance == tolerance))


def test_take_changes_only_the_qty_cells_of_the_rows_it_takes_from(drawer):
    stock = load_bin(drawer)
    edit = plan_take(drawer, {line_of(stock, 4700.0): 5, line_of(stock, 1000.0): 2})
    apply_edit(edit)
    new = drawer.read_bytes().decode().split("\r\n")
    old = DRAWER.split("\r\n")
    # 4k7: 3 + 4 parts over two rows, taken in file order: the first row 3 -> 0, the second 4 -> 2
    assert new[2] == "4k7, 0 ,5%,1/4W,\"box 1, left\",acme"
    assert new[4] == "4K7,2,5%,0.25,box 1 back,other"
    assert new[6] == "1k,8,1%,1/4W,box 2"
    assert [n for i, n in enumerate(new) if i not in (2, 4, 6)] == [o for i, o in enumerate(old) if i not in (2, 4, 6)]
    assert [(c.line, c.before, c.after) for c in edit.changes] == [(3, 3, 0), (5, 4, 2), (7, 10, 8)]
    assert Path(backup_path(drawer)).read_bytes() == DRAWER.encode()
    after = load_bin(drawer)
    assert line_of(after, 4700.0).count == 2 and line_of(after, 1000.0).count == 8


def test_take_never_goes_negative_and_names_the_line(drawer):
    stock = load_bin(drawer)
    with pytest.raises(StockError, match=r"line 3: 4k7 .*holds 7, the network takes 8"):
        plan_take(drawer, {line_of(stock, 4700.0): 8})
    assert drawer.read_bytes() == DRAWER.encode()


def test_a_line_with_as_many_as_needed_is_not_counted(drawer):
    edit = plan_take(drawer, {line_of(load_bin(drawer), 10000.0): 50})
    assert not edit.changed and apply_edit(edit) is None
    assert not Path(backup_path(drawer)).exists()


def test_a_short_row_gets_its_qty_cell(drawer, tmp_path):
    path = tmp_path / "short.csv"
    path.write_text("value,location,qty\n1k,box\n2k2,box,5\n")  # 1k: no qty cell at all (as many as needed)
    apply_edit(plan_add(path, StockItem(2200.0, 3)))
    assert path.read_text() == "value,location,qty\n1k,box\n2k2,box,8\n"


def test_add_to_an_existing_line_and_as_a_new_row(drawer):
    stock = load_bin(drawer)
    apply_edit(plan_add(drawer, StockItem(22000.0, 3)))  # 22k,2 with default ratings (blank cells)
    assert drawer.read_bytes().decode().endswith("22k,5\r\n")
    apply_edit(plan_add(drawer, StockItem(470.0, 6, tolerance=0.05, location="box 4")))
    text = drawer.read_bytes().decode()
    assert text.startswith(DRAWER.replace("22k,2", "22k,5"))
    assert text.endswith("22k,5\r\n470,6,5%,0.25,box 4,\r\n")  # the header's column order; CRLF as the file
    new = line_of(load_bin(drawer), 470.0)
    assert (new.count, new.tolerance, new.power_rating_w, new.location) == (6, 0.05, 0.25, "box 4")
    assert len(load_bin(drawer)) == len(stock) + 1


def test_add_refuses_a_rating_the_file_cannot_hold(drawer):
    with pytest.raises(StockError, match="no 'max_volts' column"):
        plan_add(drawer, StockItem(470.0, 6, max_volts=500.0))
    with pytest.raises(StockError, match="no 'qty' column"):
        path = drawer.parent / "noqty.csv"
        path.write_text("value\n1k\n")
        plan_add(path, StockItem(1000.0, 1))


def test_an_emptied_bin_can_be_filled_again(tmp_path):
    path = tmp_path / "one.csv"
    path.write_text("value,qty\n1k,2\n")
    apply_edit(plan_take(path, {StockItem(1000.0, 2): 2}))
    assert path.read_text() == "value,qty\n1k,0\n"
    with pytest.raises(StockError, match="qty 0"):
        load_bin(path)  # a bin with no parts is no bin to search ...
    apply_edit(plan_add(path, StockItem(1000.0, 4)))  # ... but still a file to add to
    assert path.read_text() == "value,qty\n1k,4\n"


def test_a_file_changed_after_planning_is_not_overwritten(drawer):
    edit = plan_take(drawer, {line_of(load_bin(drawer), 1000.0): 1})
    drawer.write_bytes(DRAWER.encode() + b"33k,1\r\n")
    with pytest.raises(StockError, match="changed since netsynth read it"):
        apply_edit(edit)
    assert drawer.read_bytes().endswith(b"33k,1\r\n")


# ------------------------------------------------------------------ killed writers


def _kill_trials(path: Path, old: bytes, new: bytes, work, trials: int, seed: int) -> dict[str, int]:
    """Fork a child that runs `work()`, SIGKILL it after a random delay; check the file after each."""
    rng = random.Random(seed)
    devnull = os.open(os.devnull, os.O_WRONLY)
    # how long one uninterrupted run takes, so the delays span it (and a little after)
    durations = []
    for _ in range(5):
        path.write_bytes(old)
        start = time.perf_counter()
        pid = os.fork()
        if pid == 0:
            os.dup2(devnull, 1), os.dup2(devnull, 2)
            try:
                work()
            finally:
                os._exit(0)
        os.waitpid(pid, 0)
        durations.append(time.perf_counter() - start)
        assert path.read_bytes() == new
    span = 1.3 * sorted(durations)[2]
    seen = {"old": 0, "new": 0, "stray": 0}
    for _ in range(trials):
        for p in path.parent.iterdir():
            p.unlink()
        path.write_bytes(old)
        pid = os.fork()
        if pid == 0:
            os.dup2(devnull, 1), os.dup2(devnull, 2)
            try:
                work()
            finally:
                os._exit(0)
        time.sleep(rng.uniform(0, span))
        os.kill(pid, signal.SIGKILL)
        os.waitpid(pid, 0)
        now = path.read_bytes()
        assert now in (old, new), "a killed writer left a file that is neither version"
        seen["old" if now == old else "new"] += 1
        backup = Path(backup_path(path))
        assert not backup.exists() or backup.read_bytes() == old
        load_bin(path)  # and it parses
        seen["stray"] += any(p.name.endswith(".tmp") for p in path.parent.iterdir())
    os.close(devnull)
    return seen


@pytest.mark.skipif(not hasattr(os, "fork") or sys.platform == "darwin", reason="needs fork (POSIX)")
def test_a_writer_killed_at_any_moment_leaves_the_old_or_the_new_file(tmp_path):
    folder = tmp_path / "kill"
    folder.mkdir()
    path = folder / "drawer.csv"
    path.write_bytes(DRAWER.encode())
    edit = plan_take(path, {line_of(load_bin(path), 4700.0): 5, line_of(load_bin(path), 1000.0): 2})
    old, new = DRAWER.encode(), edit.new_text.encode()
    # 1. the write alone (the planned take's apply_edit), so the kills land inside it
    seen = _kill_trials(path, old, new, lambda: apply_edit(edit), trials=200, seed=1)
    # some kills came before the rename, some after, and some between the temp file's creation and
    # the rename (a stray temp file is left): the write itself was interrupted
    assert seen["old"] > 0 and seen["new"] > 0 and seen["stray"] > 0, seen
    # 2. the whole command, as a user runs it
    args = ["bin", "take", str(path), "--network", "4k7 + 4k7 + 4k7 + 4k7 + 4k7 + 1k + 1k", "--yes"]
    seen = _kill_trials(path, old, new, lambda: cli.main(args, standalone_mode=False), trials=60, seed=2)
    assert seen["old"] > 0 and seen["new"] > 0, seen


# ------------------------------------------------------------------ a demo bin through a build


def test_a_demo_bin_keeps_count_through_a_build(tmp_path, runner):
    path = tmp_path / "makerspace-drawer.csv"
    shutil.copy(BINS / "makerspace-drawer.csv", path)
    before = {i.line: i.count for i in load_bin(path).items}
    design = make("3k37", str(path), max_parts=3)
    result = runner.invoke(cli, ["bin", "take", str(path), "--network", design.best.expression, "--yes"])
    assert result.exception is None and result.exit_code == 0, result.output
    after = {i.line: i.count for i in load_bin(path).items}
    taken = {p.line.line: p.count for p in design.pick_list}
    assert taken and sum(taken.values()) == design.best.parts
    assert after == {line: n - taken.get(line, 0) for line, n in before.items()}


def test_take_ties_the_lines_make_chose_at_an_operating_point(tmp_path):
    # power shelf (bins/power-shelf.csv): 10 Ω as ¼ W (line 3, 8 parts), 1 W (line 7, 4) and 5 W (line 16, 2);
    # 5 Ω at 3 W from two 10 Ω in parallel is 1.5 W each: only the 5 W line carries it
    path = tmp_path / "shelf.csv"
    shutil.copy(BINS / "power-shelf.csv", path)
    from netsynth.analysis.conditions import OperatingPoint

    picks = take_list("10 || 10", str(path), OperatingPoint(watts=3.0))
    assert [(p.line.line, p.count) for p in picks] == [(16, 2)]
    assert [(p.line.line, p.count) for p in take_list("10 || 10", str(path))] == [(3, 2)]


def test_take_in_a_hand_checked_case(tmp_path, runner):
    # bins/makerspace-drawer.csv line 3 holds 3 of 10R, line 4 holds 12 of 22R (the file's text)
    path = tmp_path / "m.csv"
    shutil.copy(BINS / "makerspace-drawer.csv", path)
    original = path.read_bytes()
    dry = runner.invoke(cli, ["bin", "take", str(path), "--network", "10 + 22 + 22", "--dry-run"])
    assert dry.exception is None and dry.exit_code == 0
    assert "line 3: qty 3 -> 2" in dry.output and "line 4: qty 12 -> 10" in dry.output
    assert "Dry run: nothing written." in dry.output
    assert path.read_bytes() == original
    no = runner.invoke(cli, ["bin", "take", str(path), "--network", "10 + 22 + 22"], input="n\n")
    assert isinstance(no.exception, SystemExit) and no.exit_code == 1 and path.read_bytes() == original
    yes = runner.invoke(cli, ["bin", "take", str(path), "--network", "10 + 22 + 22"], input="y\n")
    assert yes.exception is None and yes.exit_code == 0, yes.output
    lines = path.read_text().splitlines()
    assert lines[2].startswith("10R,2,") and lines[3].startswith("22R,10,")
    assert path.with_name("m.csv.bak").read_bytes() == original
    too_many = runner.invoke(cli, ["bin", "take", str(path), "--network", "10 + 10 + 10"])
    assert isinstance(too_many.exception, SystemExit) and too_many.exit_code == 1
    assert "holds 2 of 10 (line 3 at drawer A1: 2); the network takes 3" in too_many.output


def test_take_json_needs_dry_run_or_yes(drawer, runner):
    result = runner.invoke(cli, ["bin", "take", str(drawer), "--network", "1k", "--json"])
    assert isinstance(result.exception, SystemExit) and result.exit_code == 2
    assert json.loads(result.stdout)["error"]["kind"] == "usage"
    result = runner.invoke(cli, ["bin", "take", str(drawer), "--network", "1k + 1k", "--json", "--dry-run"])
    assert result.exception is None and result.exit_code == 0
    data = json.loads(result.stdout)
    assert data["changes"] == [{"line": 7, "value_ohms": 1000.0, "location": "box 2", "before": 10, "after": 8,
                                "appended": False}]
    assert data["written"] is False and drawer.read_bytes() == DRAWER.encode()


def test_add_from_the_command_line_takes_the_ratings_of_the_file_s_line(drawer, runner):
    result = runner.invoke(cli, ["bin", "add", str(drawer), "1k", "--qty", "5", "--yes"])
    assert result.exception is None and result.exit_code == 0, result.output
    assert "1k,15,1%,1/4W,box 2\r\n" in drawer.read_bytes().decode()
    result = runner.invoke(cli, ["bin", "add", str(drawer), "4k7", "--qty", "1", "--tolerance", "1%", "--yes"])
    assert result.exception is None and result.exit_code == 0, result.output
    assert drawer.read_bytes().decode().endswith("4k7,1,1%,0.25,,\r\n")
    result = runner.invoke(cli, ["bin", "add", str(drawer), "4k7", "--qty", "1", "--yes"])
    assert isinstance(result.exception, SystemExit) and result.exit_code == 1
    assert "has 2 lines of 4k7" in result.output
    result = runner.invoke(cli, ["bin", "add", str(drawer), "4k7", "--qty", "0"])
    assert isinstance(result.exception, SystemExit) and result.exit_code == 2


def test_bin_file_still_lists_and_the_subcommands_answer(drawer, runner):
    for args in (["bin", str(drawer)], ["bin", "show", str(drawer)]):
        result = runner.invoke(cli, args)
        assert result.exception is None and result.exit_code == 0
        # 4k7 (two rows, one part), 1k, 10k, 22k
        assert result.output.splitlines()[0] == f"{drawer}: 4 stock lines"
    result = runner.invoke(cli, ["bin", "check", str(drawer)])
    assert result.exception is None and result.exit_code == 0
    # 4k7: 3 + 4, 1k: 10, 22k: 2 (the file's text); 10k has a blank qty
    assert result.output == f"{drawer}: ok, 4 stock lines holding 19 parts, and 1 line with as many as needed\n"
    bad = drawer.parent / "bad.csv"
    bad.write_text("value,qty\n1k,ten\n")
    result = runner.invoke(cli, ["bin", "check", str(bad)])
    assert isinstance(result.exception, SystemExit) and result.exit_code == 1
    assert "line 2, field 'qty'" in result.output
    result = runner.invoke(cli, ["bin", "--json"])
    assert result.exception is None and result.exit_code == 0
    assert len(json.loads(result.stdout)["items"]) == 121  # the default bin: E24 from 10 Ω to 1 MΩ


def test_an_emptied_line_is_refilled_not_duplicated(tmp_path, runner):
    # bins/power-shelf.csv line 16: 10R, 2 parts, 5 %, 5 W, 350 V, shelf 2 box 2 (the file's text)
    path = tmp_path / "shelf.csv"
    shutil.copy(BINS / "power-shelf.csv", path)
    took = runner.invoke(cli, ["bin", "take", str(path), "--network", "10 || 10", "--watts", "3", "--yes"])
    assert took.exception is None and took.exit_code == 0, took.output
    assert path.read_text().splitlines()[15].startswith("10R,0,5%,5W,")
    back = runner.invoke(cli, ["bin", "add", str(path), "10", "--qty", "2", "--watts", "5W", "--yes"])
    assert back.exception is None and back.exit_code == 0, back.output
    assert path.read_bytes() == (BINS / "power-shelf.csv").read_bytes()
