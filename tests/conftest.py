"""Shared fixtures: a CLI runner and a small invented site written into tmp_path."""

from __future__ import annotations

from pathlib import Path

import pytest
from click.testing import CliRunner
from sitekit import make_site


@pytest.fixture
def runner() -> CliRunner:
    return CliRunner()


@pytest.fixture
def site_dir(tmp_path: Path) -> Path:
    make_site(tmp_path)
    return tmp_path
