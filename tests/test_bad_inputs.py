"""Every case of the bad-input corpus through the real command line.

Each broken site is run as a subprocess (the installed ``wallsched`` script, with an earlier
output folder in place) and in-process through click's CliRunner (``stations`` and
``design``, with no output folder yet). Every run must exit 2 with exactly one line on stderr
naming the file and the line or key, no traceback, no output folder created, no temporary
folder left, and the earlier output folder byte-for-byte as it was.
"""

from __future__ import annotations

import shutil
import subprocess
import sys
from concurrent.futures import ThreadPoolExecutor
from pathlib import Path

import pytest
from bad_inputs.corpus import CASES, DESIGN_ONLY, HOSTILE, Case
from sitekit import make_site

from wallsched.cli import main

EXE = Path(sys.executable).with_name("wallsched")
ALL = CASES + HOSTILE + DESIGN_ONLY
# (case, command): every case through both commands, the design-only ones through design
RUNS = [(c, cmd) for c in CASES + HOSTILE for cmd in ("stations", "design")] + [
    (c, "design") for c in DESIGN_ONLY]
PREVIOUS = {"stations.csv": b"wall,station_ft\nA,0.0\n",
            "run.json": b'{"format": "wallsched-run", "files": ["run.json", "stations.csv"]}\n'}


def _snapshot(folder: Path) -> dict[str, bytes]:
    return {str(p.relative_to(folder)): p.read_bytes() for p in sorted(folder.rglob("*"))
            if p.is_file()}


def _check_line(stderr: str, case: Case) -> str:
    assert "Traceback" not in stderr
    lines = stderr.strip().splitlines()
    assert len(lines) == 1, stderr
    line = lines[0]
    assert line.startswith("error: "), line
    assert case.expect in line, line
    assert case.file in line, line
    if case.where is not None:
        assert case.where in line, line
    return line


@pytest.fixture(scope="session")
def corpus(tmp_path_factory) -> dict[str, tuple[Path, subprocess.CompletedProcess]]:
    """Build every case and run it once as a subprocess (in parallel), with a previous
    output folder beside the site."""
    root = tmp_path_factory.mktemp("bad")
    built = {}
    for i, case in enumerate(ALL):
        folder = root / case.name
        folder.mkdir()
        site = case.build(folder)
        out = folder / "out"
        out.mkdir()
        for name, data in PREVIOUS.items():
            (out / name).write_bytes(data)
        built[case.name] = (i, folder, site)

    def run(item):
        name, (i, folder, site) = item
        command = "design" if i % 2 or i >= len(CASES) + len(HOSTILE) else "stations"
        done = subprocess.run([str(EXE), command, str(site), "--out", str(folder / "out")],
                              capture_output=True, text=True, timeout=300)
        return name, (folder, done)

    with ThreadPoolExecutor(max_workers=6) as pool:
        return dict(pool.map(run, built.items()))


def test_corpus_is_large_and_distinct():
    names = [c.name for c in ALL]
    assert len(names) >= 30 and len(set(names)) == len(names)
    assert len(HOSTILE) + len(DESIGN_ONLY) >= 40


@pytest.mark.parametrize("case", ALL, ids=[c.name for c in ALL])
def test_subprocess_exit_2_one_line_previous_output_untouched(case: Case, corpus):
    folder, done = corpus[case.name]
    assert done.returncode == 2, (done.stdout, done.stderr)
    _check_line(done.stderr, case)
    assert done.stdout == ""
    assert _snapshot(folder / "out") == PREVIOUS
    assert not (folder / "out.prev").exists()
    assert not list(folder.glob(".out.*"))


@pytest.mark.parametrize("case, command", RUNS, ids=[f"{c.name}-{cmd}" for c, cmd in RUNS])
def test_cli_runner_exit_2_one_line_nothing_written(case: Case, command: str, corpus, runner):
    folder, _ = corpus[case.name]
    site = folder / "site.toml"
    out = folder / f"fresh-{command}"
    before = sorted(p.name for p in folder.iterdir())
    res = runner.invoke(main, [command, str(site), "--out", str(out)])
    assert res.exit_code == 2, (res.output, res.exception)
    assert isinstance(res.exception, SystemExit)
    _check_line(res.stderr, case)
    assert res.stdout == ""
    assert not out.exists()
    assert sorted(p.name for p in folder.iterdir()) == before


@pytest.mark.parametrize("case", DESIGN_ONLY, ids=[c.name for c in DESIGN_ONLY])
def test_design_only_cases_sample_fine(case: Case, corpus, runner, tmp_path: Path):
    # the refusal comes from the design's resource estimate, not from reading or sampling
    folder, _ = corpus[case.name]
    res = runner.invoke(main, ["stations", str(folder / "site.toml"), "--out",
                               str(tmp_path / "sampled"), "--no-plots"])
    assert res.exit_code == 0, res.output
    assert (tmp_path / "sampled" / "stations.csv").is_file()


def test_bom_alone_is_accepted(runner, tmp_path: Path):
    # a UTF-8 byte-order mark is what spreadsheets write for "CSV UTF-8": legitimate input
    site = make_site(tmp_path)
    top = tmp_path / "top.csv"
    top.write_bytes(b"\xef\xbb\xbf" + top.read_bytes())
    res = runner.invoke(main, ["stations", str(site), "--out", str(tmp_path / "o"),
                               "--no-plots"])
    assert res.exit_code == 0, res.output
    assert (tmp_path / "o" / "stations.csv").is_file()


@pytest.mark.parametrize("out, message", [
    (".", "names no folder of its own"),
    ("site.toml", "is a file"),
    ("notes", "not an earlier output"),
    ("", "holds the input site.toml"),
    ("missing/deeper/out", "does not exist"),
])
def test_bad_out_folder_exit_2_one_line(runner, tmp_path: Path, monkeypatch, out, message):
    site = make_site(tmp_path)
    (tmp_path / "notes").mkdir()
    (tmp_path / "notes" / "keep.txt").write_text("someone's notes\n")
    monkeypatch.chdir(tmp_path / "notes" if out == "." else tmp_path.parent)
    target = {"": str(tmp_path), ".": "."}.get(out, str(tmp_path / out))
    before = _snapshot(tmp_path)
    res = runner.invoke(main, ["stations", str(site), "--out", target, "--no-plots"])
    assert res.exit_code == 2, res.output
    lines = res.stderr.strip().splitlines()
    assert len(lines) == 1 and message in lines[0] and "--out" in lines[0], res.stderr
    assert "Traceback" not in res.output
    assert _snapshot(tmp_path) == before


def test_subprocess_has_the_script():
    # the corpus runs the installed console script; its absence is a failure, not a skip
    assert EXE.is_file() and shutil.which(str(EXE))
