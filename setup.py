"""Build of the one compiled module; everything else about the package is in pyproject.toml.

``netsynth.search._kernel`` is the exact search's inner loop in C (no library beyond
Python's own headers). It is optional: where no C compiler is found the install goes on
and the search runs in numpy, the same answers, slower (netsynth.search.kernel says which).
"""

import sys

from setuptools import Extension, setup

# no fused multiply-add: the same rounding as numpy's separate multiply and add
FLAGS = [] if sys.platform == "win32" else ["-O2", "-ffp-contract=off"]

setup(
    ext_modules=[
        Extension(
            "netsynth.search._kernel",
            ["netsynth/search/_kernel.c"],
            extra_compile_args=FLAGS,
            optional=True,
        )
    ]
)
