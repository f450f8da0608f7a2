"""Shared fixtures and Hypothesis profiles (``--hypothesis-profile ci`` for more examples)."""

from __future__ import annotations

import os

import pytest
from click.testing import CliRunner
from hypothesis import HealthCheck, settings

settings.register_profile("ci", max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])
settings.register_profile("dev", deadline=None)
# a slow local search for hostile input (tests/test_fuzz.py runs a quarter of max_examples per property)
settings.register_profile("fuzz", max_examples=2000, deadline=None, suppress_health_check=[HealthCheck.too_slow])
settings.load_profile(os.environ.get("HYPOTHESIS_PROFILE", "dev"))

# The search keeps tables in a disk cache; the suite never writes to the user's cache folder
# (tests/test_cache.py points it at temporary folders itself).
os.environ["NETSYNTH_CACHE"] = "off"


@pytest.fixture
def runner() -> CliRunner:
    return CliRunner()
