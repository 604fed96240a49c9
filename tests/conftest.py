"""Shared fixtures: a CLI runner and a small invented site written into tmp_path."""

from __future__ import annotations

import os
from pathlib import Path

import pytest
from click.testing import CliRunner
from hypothesis import settings
from sitekit import make_site

# CI runs the same examples every time (a failure there is reproducible); a developer's run
# explores new ones and keeps the failures it finds in .hypothesis/.
settings.register_profile("ci", derandomize=True, print_blob=True)
if os.environ.get("CI"):
    settings.load_profile("ci")


@pytest.fixture
def runner() -> CliRunner:
    return CliRunner()


@pytest.fixture
def site_dir(tmp_path: Path) -> Path:
    make_site(tmp_path)
    return tmp_path
