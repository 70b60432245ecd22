"""Schedules: each row equals `sizer size` / `sizer check` on its member, whatever runs it (one
process, local processes, a Dask cluster); resume; totals; bad rows.

Outside values: a simply supported flat bar under a uniform load w has M max = w L^2 / 8 (AISC
Manual Table 3-23, from memory; docs/references.md) and S = b h^2 / 6, so its bending utilization is
w L^2 / 8 / (S Fb); mass per length = density x b h (elementary geometry).
"""

from __future__ import annotations

import json
import re
import shutil

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from typer.testing import CliRunner

from sizer.cli import app
from sizer.cache_store import cache_root
from sizer.parallel import RUNS_FOLDER
from sizer.schedule import read_schedule, run_schedule, scaled_member, schedule_totals
from tests.steel import STEEL_TOML

FB, DENSITY = 165e6, 7850.0  # tests/steel.py

CATALOGUE = STEEL_TOML + """
[[sections]]
name = "FL 60x8"
shape = "rectangle"
depth = "60 mm"
width = "8 mm"

[[sections]]
name = "FL 100x10"
shape = "rectangle"
depth = "100 mm"
width = "10 mm"

[[sections]]
name = "SHS 60x60x4"
shape = "rectangular_tube"
depth = "60 mm"
width = "60 mm"
thickness = "4 mm"
"""


def beam_text(length: float, w: str, section: str | None = None, deck: bool = True) -> str:
    """A simply supported beam, no self-weight, with a uniform load; a deck holds it all along."""
    lines = ['[member]', f'length = "{length} m"', 'material = "steel"', 'self_weight = false']
    if section:
        lines.append(f'section = "{section}"')
    lines += ['[[supports]]', 'at = "0 m"', 'type = "pin"', '[[supports]]', f'at = "{length} m"', 'type = "roller"',
              '[[loads]]', 'type = "line"', f'wy = "{w}"']
    if deck:
        lines += ['[[restraints]]', 'from = "0 m"', f'to = "{length} m"', 'hold = ["lateral", "twist"]', 'height = "top"']
    return "\n".join(lines) + "\n"


@pytest.fixture
def project(tmp_path):
    """A catalogue, three member files and a schedule using them (sizing, checking, overrides)."""
    (tmp_path / "catalogue.toml").write_text(CATALOGUE)
    (tmp_path / "beams").mkdir()
    (tmp_path / "beams" / "b1.toml").write_text(beam_text(2.0, "-2 kN/m"))
    (tmp_path / "beams" / "b2.toml").write_text(beam_text(1.5, "-2 kN/m", "FL 100x10"))
    (tmp_path / "beams" / "b3.toml").write_text(beam_text(1.5, "-1 kN/m"))  # row B3: length 1.2 m
    (tmp_path / "beams" / "b3_short.toml").write_text(beam_text(1.2, "-1 kN/m"))  # the same member written at 1.2 m
    (tmp_path / "schedule.toml").write_text(
        'title = "Test floor"\n'
        '[[members]]\nmark = "B1"\nfile = "beams/b1.toml"\nquantity = 3\n'
        '[[members]]\nmark = "B2"\nfile = "beams/b2.toml"\n'
        '[[members]]\nmark = "B3"\nfile = "beams/b3.toml"\nlength = "1.2 m"\nquantity = 2\n'
        '[[members]]\nmark = "B4"\nfile = "beams/b1.toml"\nsection = "FL 60x8"\n')
    return tmp_path


def invoke(*args: str):
    return CliRunner().invoke(app, [*map(str, args)])


def forget_kept_rows() -> None:
    shutil.rmtree(cache_root() / RUNS_FOLDER, ignore_errors=True)


def rows_of(project, **options) -> list[dict]:
    result = run_schedule(read_schedule(project / "schedule.toml"), [project / "catalogue.toml"], show_progress=False, **options)
    return [{key: value for key, value in row.items() if key != "assumptions"} for row in result.rows]


def test_rows_equal_size_and_check_on_each_member(project):
    forget_kept_rows()
    result = invoke("schedule", project / "schedule.toml", "--catalogue", project / "catalogue.toml", "--jobs", "1", "--json")
    assert result.exit_code == 1  # B4 (FL 60x8 on 2 m) fails
    rows = {row["mark"]: row for row in json.loads(result.stdout)["members"]}
    catalogue = ["--catalogue", project / "catalogue.toml", "--json"]
    expected = {
        "B1": json.loads(invoke("size", project / "beams/b1.toml", *catalogue).stdout),
        "B2": json.loads(invoke("check", project / "beams/b2.toml", *catalogue).stdout),
        "B3": json.loads(invoke("size", project / "beams/b3_short.toml", *catalogue).stdout),
        "B4": json.loads(invoke("check", project / "beams/b1.toml", "--section", "FL 60x8", *catalogue).stdout),
    }
    for mark, document in expected.items():
        row = rows[mark]
        assert (row["section"], row["passes"], row["governing"]) == (document["section"], document["passes"], document["governing"])
        assert row["utilization"] == pytest.approx(document["utilization"], rel=1e-12)
        assert row["mass_per_length"] == pytest.approx(document["mass_per_length"], rel=1e-12)
    assert [rows[m]["do"] for m in "B1 B2 B3 B4".split()] == ["size", "check", "size", "check"]
    # B2 against the closed form: w L^2 / 8 / (b h^2 / 6) / Fb; the total mass from density x b h x L x quantity
    assert rows["B2"]["utilization"] == pytest.approx(2e3 * 1.5**2 / 8 / (0.010 * 0.100**2 / 6) / FB, rel=2e-3)
    assert rows["B2"]["governing"] in ("bending", "interaction")
    assert rows["B3"]["length"] == pytest.approx(1.2) and rows["B3"]["quantity"] == 2
    assert rows["B3"]["total_mass"] == pytest.approx(DENSITY * rows["B3"]["mass_per_length"] / DENSITY * 1.2 * 2)
    assert rows["B2"]["total_mass"] == pytest.approx(DENSITY * 0.010 * 0.100 * 1.5, rel=1e-6)


def test_local_processes_and_a_dask_cluster_give_the_same_rows(project):
    distributed = pytest.importorskip("distributed")
    forget_kept_rows()
    here = rows_of(project, jobs=1)
    forget_kept_rows()
    processes = rows_of(project, jobs=2)
    forget_kept_rows()
    with distributed.LocalCluster(n_workers=1, processes=False, threads_per_worker=1, dashboard_address=None, protocol="tcp://") as cluster:
        on_cluster = rows_of(project, cluster=cluster.scheduler_address)
    assert here == processes == on_cluster
    assert [row["mark"] for row in here] == ["B1", "B2", "B3", "B4"]  # the input's order


def test_finished_rows_are_kept_and_not_redone(project):
    forget_kept_rows()
    first = run_schedule(read_schedule(project / "schedule.toml"), [project / "catalogue.toml"], jobs=1, show_progress=False)
    assert (first.summary.ran, first.summary.resumed) == (4, 0)
    (project / "schedule.toml").write_text((project / "schedule.toml").read_text()
                                           + '[[members]]\nmark = "B5"\nfile = "beams/b3_short.toml"\nsection = "FL 60x8"\n')
    second = run_schedule(read_schedule(project / "schedule.toml"), [project / "catalogue.toml"], jobs=1, show_progress=False)
    assert (second.summary.ran, second.summary.resumed) == (1, 4)
    assert second.rows[:4] == first.rows
    from sizer.render.phrases import in_display_units

    def shown_in_us(rows: list[dict]) -> list[list[str]]:
        return [[in_display_units(note, "us") for note in row["assumptions"]] for row in rows]

    # the rows taken from the cache keep the numbers of their notes: a US run shows them in US units
    assert shown_in_us(second.rows[:4]) == shown_in_us(first.rows)
    assert any(" ft" in note for notes in shown_in_us(second.rows[:4]) for note in notes)


def test_csv_schedule_gives_the_same_rows(project):
    forget_kept_rows()
    (project / "schedule.csv").write_text("mark,file,do,quantity,length,section\nB1,beams/b1.toml,,3,,\nB2,beams/b2.toml,check,,,\n"
                                          "B3,beams/b3.toml,,2,1.2 m,\nB4,beams/b1.toml,,,,FL 60x8\n")
    from_csv = run_schedule(read_schedule(project / "schedule.csv"), [project / "catalogue.toml"], jobs=1, show_progress=False)
    assert [{k: v for k, v in row.items() if k != "file"} for row in from_csv.rows] == \
        [{k: v for k, v in row.items() if k != "file"} for row in
         run_schedule(read_schedule(project / "schedule.toml"), [project / "catalogue.toml"], jobs=1, show_progress=False).rows]


def test_outputs_csv_and_html_record_linking_each_member(project):
    out = project / "out" / "floor.html"
    out.parent.mkdir()  # outputs go into existing folders only (docs/limits.md)
    result = invoke("schedule", project / "schedule.toml", "--catalogue", project / "catalogue.toml", "--jobs", "1",
                    "--csv", project / "out" / "floor.csv", "-o", out)
    assert result.exit_code == 1
    assert "Cautions" in result.stdout and "fails" in result.stdout and "FAILS" not in result.stdout
    index = out.read_text()
    for mark in ("B1", "B2", "B3", "B4"):
        assert f'href="floor_records/{mark}.html"' in index
        assert "Calculation record" in (project / "out" / "floor_records" / f"{mark}.html").read_text()
    lines = (project / "out" / "floor.csv").read_text().splitlines()
    assert lines[0].startswith("mark,file,do,section") and len([line for line in lines if not line.lstrip('"').startswith('#')]) == 5


@pytest.mark.parametrize("edit, words", [
    (lambda s: s.replace('quantity = 3', 'quantity = 0'), ["schedule.toml", "members[1].quantity"]),
    (lambda s: s.replace('length = "1.2 m"', 'lenght = "1.2 m"'), ["schedule.toml", "members[3].lenght", "unknown key"]),
    (lambda s: s.replace('section = "FL 60x8"', 'section = "FL 60x9"'), ["schedule.toml", "members[4].section", "FL 60x8"]),
    (lambda s: s.replace('mark = "B2"', 'mark = "B1"'), ["schedule.toml", "members[2].mark", "members[1]"]),
    (lambda s: s.replace('beams/b2.toml', 'beams/missing.toml'), ["schedule.toml", "members[2] (mark B2)", "missing.toml"]),
])
def test_bad_rows_are_one_line_naming_file_row_and_key(project, edit, words):
    schedule = project / "schedule.toml"
    schedule.write_text(edit(schedule.read_text()))
    result = invoke("schedule", schedule, "--catalogue", project / "catalogue.toml", "--jobs", "1", "-o", project / "r.html")
    lines = result.output.strip().splitlines()
    assert result.exit_code == 2 and len(lines) == 1 and "Traceback" not in result.output
    assert all(word in lines[0] for word in words), lines[0]
    assert not (project / "r.html").exists()


def test_a_bad_member_file_is_named_with_its_row(project):
    (project / "beams" / "b2.toml").write_text(beam_text(1.5, "-2 kN/m", "FL 100x10").replace('wy = "-2 kN/m"', 'wy = "-2"'))
    result = invoke("schedule", project / "schedule.toml", "--catalogue", project / "catalogue.toml", "--jobs", "1")
    assert result.exit_code == 2
    line = result.output.strip()
    assert "schedule.toml" in line and "members[2] (mark B2)" in line and "b2.toml" in line and "loads[1].wy" in line


def test_keep_going_runs_the_good_rows_and_lists_the_bad(project):
    schedule = project / "schedule.toml"
    schedule.write_text(schedule.read_text().replace('beams/b2.toml', 'beams/missing.toml'))
    result = invoke("schedule", schedule, "--catalogue", project / "catalogue.toml", "--jobs", "1", "--keep-going", "--json")
    assert result.exit_code == 2
    document = json.loads(result.stdout)
    assert [row["mark"] for row in document["members"]] == ["B1", "B3", "B4"]
    (bad,) = document["bad_rows"]
    assert bad["mark"] == "B2" and "missing.toml" in bad["message"]


def test_nothing_passing_is_a_failing_row_without_a_section(project):
    (project / "beams" / "b1.toml").write_text(beam_text(2.0, "-200 kN/m"))
    result = invoke("schedule", project / "schedule.toml", "--catalogue", project / "catalogue.toml", "--jobs", "1", "--json")
    document = json.loads(result.stdout)
    b1 = document["members"][0]
    assert result.exit_code == 1 and b1["section"] is None and not b1["passes"] and "B1" in document["totals"]["failing"]
    assert all(entry["section"] != None for entry in document["totals"]["by_section"])  # noqa: E711


@settings(max_examples=60, deadline=None)
@given(st.lists(st.tuples(st.sampled_from(["FL 60x8", "FL 100x10", None]), st.integers(1, 20), st.floats(0.5, 12.0),
                          st.floats(1.0, 90.0), st.booleans()), min_size=1, max_size=12))
def test_totals_add_up(entries):
    """Invariant (arithmetic): per-section totals add up to the whole, and the failing marks are the failing rows."""
    rows = [{"mark": f"M{i}", "section": section, "quantity": quantity, "length": length, "passes": passes and section is not None,
             "mass_per_length": mass if section else None, "total_mass": mass * length * quantity if section else None}
            for i, (section, quantity, length, mass, passes) in enumerate(entries)]
    totals = schedule_totals(rows)
    sized = [row for row in rows if row["section"] is not None]
    assert totals["mass"] == pytest.approx(sum(row["total_mass"] for row in sized))
    assert sum(entry["quantity"] for entry in totals["by_section"]) == sum(row["quantity"] for row in sized)
    assert sum(entry["length"] for entry in totals["by_section"]) == pytest.approx(sum(row["length"] * row["quantity"] for row in sized))
    assert totals["failing"] == [row["mark"] for row in rows if not row["passes"]]
    assert totals["passes"] == (not totals["failing"])


@settings(max_examples=50, deadline=None)
@given(st.floats(0.3, 20.0))
def test_a_length_override_moves_every_position_in_proportion(length):
    """Invariant: supports, loads and restraints keep their place as a fraction of the length."""
    from sizer.api import member_from_text

    member = member_from_text(beam_text(4.0, "-1 kN/m") + '[[loads]]\ntype = "point"\nat = "1 m"\nfy = "-1 kN"\n')
    scaled = scaled_member(member, length)
    k = length / 4.0
    assert scaled.length == length
    assert [s.at for s in scaled.supports] == pytest.approx([s.at * k for s in member.supports])
    assert scaled.loads[1].at == pytest.approx(1.0 * k) and scaled.loads[0].end == pytest.approx(length)
    assert (scaled.restraints[0].start, scaled.restraints[0].end) == pytest.approx((0.0, length))


def test_row_keys_are_the_same_in_every_process(project):
    """Resume across runs needs the same key for the same content in any interpreter (string hashing,
    and so set order, changes from one process to the next unless seeded)."""
    import os
    import subprocess
    import sys

    code = ("from sizer.schedule import read_schedule, row_task, row_key; import sys; s = read_schedule(sys.argv[1]); c = {}; "
            "print([row_key(row_task(s, r, [sys.argv[2]], False, c)[0]) for r in s.rows])")
    keys = [subprocess.run([sys.executable, "-c", code, str(project / "schedule.toml"), str(project / "catalogue.toml")],
                           capture_output=True, text=True, check=True, env={**os.environ, "PYTHONHASHSEED": seed}).stdout
            for seed in ("1", "2")]
    assert keys[0] == keys[1] and len(eval(keys[0])) == 4


def test_rows_worked_out_by_local_processes_are_kept_by_them(project):
    """The workers keep each finished row themselves: a later run on one process redoes none."""
    forget_kept_rows()
    first = run_schedule(read_schedule(project / "schedule.toml"), [project / "catalogue.toml"], jobs=2, show_progress=False)
    assert (first.summary.ran, first.summary.resumed) == (4, 0) and "2 local processes" in first.summary.where
    second = run_schedule(read_schedule(project / "schedule.toml"), [project / "catalogue.toml"], jobs=1, show_progress=False)
    assert (second.summary.ran, second.summary.resumed) == (0, 4)
    assert second.rows == first.rows


def test_progress_bar_starts_once_every_worker_has_a_job(monkeypatch):
    """The bar (rich, about 20 ms to import) starts once as many jobs have started as there are
    workers, so that its imports hold up no worker; with fewer jobs than workers, before the wait
    for them; a run of kept results only shows none (common practice: nothing is running)."""
    from sizer.parallel import Job, run_jobs
    from sizer.progress import ProgressBar
    from sizer.workers import Workers

    forget_kept_rows()
    events: list[str] = []
    monkeypatch.setattr(ProgressBar, "begin", lambda self: events.append("bar") if "bar" not in events else None)

    def work(payload: int) -> dict:
        events.append(f"job {payload}")
        return {"value": payload}

    def run(count: int, keys: list[str]) -> list[dict]:
        events.clear()
        results, _ = run_jobs(Workers(count), work, [Job(key, k) for k, key in enumerate(keys)], show_progress=True)
        return results

    assert run(2, ["bar-a", "bar-b", "bar-c"]) == [{"value": 0}, {"value": 1}, {"value": 2}]
    assert events == ["job 0", "job 1", "bar", "job 2"]
    run(3, ["bar-d"])
    assert events == ["job 0", "bar"]
    run(2, ["bar-a", "bar-b"])
    assert events == []


class _InlinePool:
    """A stand-in for the process pool: runs each task at once, here, and notes the jobs it carried."""

    def __init__(self, events: list[str]) -> None:
        self.events = events

    def submit(self, function, *args):
        from concurrent.futures import Future

        self.events.append(f"task of {len(args[1])}")
        future = Future()
        future.set_result(function(*args))
        return future


def test_local_workers_get_jobs_in_pairs_but_the_last_singly(monkeypatch):
    """Jobs go to the pool in pairs (half the round trips), the last two per worker singly so that the
    workers finish together; every result comes back to its own job, in the jobs' order, and is kept
    (common practice: batching short tasks, as `Executor.map(chunksize=)` does)."""
    from sizer.parallel import Job, read_kept, run_jobs
    from sizer.progress import ProgressBar
    from sizer.workers import Workers

    forget_kept_rows()
    events: list[str] = []
    monkeypatch.setattr(ProgressBar, "begin", lambda self: events.append("bar") if "bar" not in events else None)

    def work(payload: int) -> dict:
        events.append(f"job {payload}")
        return {"value": payload * payload}

    workers = Workers(2)
    workers.pool = _InlinePool(events)
    keys = [f"pair-{k}" for k in range(9)]
    results, summary = run_jobs(workers, work, [Job(key, k) for k, key in enumerate(keys)], show_progress=True)
    assert results == [{"value": k * k} for k in range(9)] and (summary.ran, summary.resumed) == (9, 0)
    assert [event for event in events if event.startswith("task")] == ["task of 2"] * 2 + ["task of 1"] * 5
    assert events.index("bar") == events.index("job 3") + 1  # once both workers have work
    assert [read_kept(key) for key in keys] == results


def test_local_workers_are_forked_only_where_that_is_safe():
    """fork on Linux while one thread runs (a fork copies only the calling thread, and a lock held by
    another could never be released in the copy); spawn beside other threads (common practice, and
    the reason CPython warns of fork in threaded processes from 3.12)."""
    import sys
    import threading

    from sizer.workers import local_context

    expected = "fork" if sys.platform.startswith("linux") and threading.active_count() == 1 else "spawn"
    assert local_context().get_start_method() == expected
    stop = threading.Event()
    other = threading.Thread(target=stop.wait)
    other.start()
    try:
        assert local_context().get_start_method() == "spawn"
    finally:
        stop.set()
        other.join()


def test_schedule_speaks_as_every_other_screen_in_the_units_asked(project):
    """passes / fails as `sizer check` says them, no thousands separator, --units us in feet and
    pounds, and the HTML's assumptions once each (each member's own are in its linked record)."""
    from sizer.render.schedule import _mass

    out = project / "out" / "floor.html"
    out.parent.mkdir()  # outputs go into existing folders only (docs/limits.md)
    result = invoke("schedule", project / "schedule.toml", "--catalogue", project / "catalogue.toml", "--jobs", "1",
                    "--units", "us", "-o", out)
    words = set(re.findall(r"\b(ok|FAILS|ALL PASS|FAILING|passes|fails)\b", result.stdout))
    assert words <= {"passes", "fails"} and "fails" in words
    assert " ft " in result.stdout and " lb" in result.stdout and "lb/ft" in result.stdout
    assert "…" not in result.stdout  # no number or word cut short: narrow columns move under their row
    assert _mass(12345.4, "si") == "12345 kg" and _mass(0.45359237 * 2000, "us") == "2000 lb"  # 1 lb = 0.45359237 kg (exact)
    index = out.read_text()
    assumptions = index.split("<h2>Assumptions</h2>")[1].split("</ul>")[0]
    items = re.findall(r"<li>(.*?)</li>", assumptions)
    assert len(items) == len(set(items))
    assert not any(re.match(r"B\d: (Verdict|Buckling|Section|Supports)", item) for item in items)  # no member's own lines repeated
    assert any("listed with it in --json and in its calculation record" in item for item in items)
    assert "ALL PASS" not in index and "FAILING" not in index and ">fails<" in index
