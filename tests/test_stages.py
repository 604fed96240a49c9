"""Progress and stage times of ``wallsched design`` (the times feed the pipeline benchmark)."""

from __future__ import annotations

import json

from sitekit import SMALL_GRID, make_site

from wallsched.cli import main
from wallsched.stages import TIMES_ENV, Stages


def test_stage_times_are_written_where_the_environment_says(runner, tmp_path):
    site = make_site(tmp_path / "site", extra=SMALL_GRID)
    times = tmp_path / "times.json"
    res = runner.invoke(main, ["design", str(site), "--out", str(tmp_path / "out"),
                               "--no-drawings"], env={TIMES_ENV: str(times)})
    assert res.exit_code == 0, res.output
    got = json.loads(times.read_text())
    assert {"reading", "sampling", "designing", "writing tables", "calc package"} <= set(got)
    assert all(v >= 0.0 for v in got.values())
    # not a terminal: no progress lines among the output a script reads
    assert "designing" not in res.output


def test_no_times_file_without_the_environment_variable(runner, tmp_path, monkeypatch):
    monkeypatch.delenv(TIMES_ENV, raising=False)
    site = make_site(tmp_path / "site", extra=SMALL_GRID)
    res = runner.invoke(main, ["design", str(site), "--out", str(tmp_path / "out"),
                               "--no-drawings", "-q"])
    assert res.exit_code == 0, res.output
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out", "site"]


def test_a_shown_stage_prints_its_name_and_time(capsys):
    stages = Stages(show=True)
    with stages.stage("designing", "2 walls"):
        pass
    err = capsys.readouterr().err
    assert err.startswith("designing 2 walls ...") and err.rstrip().endswith(" s")
    assert set(stages.times_s) == {"designing"}


def test_an_item_stage_counts_every_tick():
    stages = Stages(show=False)
    seen = []
    with stages.items("drawing", 3, "walls") as tick:
        for _ in range(3):
            tick(1)
            seen.append(1)
    assert len(seen) == 3 and stages.times_s["drawing"] >= 0.0
