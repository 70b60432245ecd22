"""A fuzz campaign across every command (a plain script; not part of the test suite: it takes minutes).

    .venv/bin/python benchmarks/fuzz_campaign.py [--scale 1.0] [--seed 25] [--log campaign.log]

Feeds hostile inputs made by the strategies of tests/test_fuzz.py (member files with restraints,
heights, patterns and springs; catalogue files with polygons and holes, with and without a material;
schedules as TOML and CSV) and its own (span tables, command-line options: --jobs, --cluster,
output paths, unit systems, sections to show and add) to `sizer forces`, `check`, `size`,
`report`, `schedule`, `span-table`, `sections list|show|add|import` and `init`, each in process
(sizer.cli.run_app, as the `sizer` command runs) with a time limit. Every run must end with exit 0, 1 or 2, no traceback, no
escaped exception, bad input as one line on stderr, no NaN or infinity on screen, no escape byte
from the input on the terminal, and nothing written on bad input. A crash of the interpreter
(segfault) ends the script itself: the log's last line names the input.

Prints the count of inputs per command, the exit codes, the slowest run, and every failure found
(the input is saved beside the log). Default scale 1.0: 2480 inputs (about 2 minutes on 2 cores).
"""

from __future__ import annotations

import argparse
import collections
import contextlib
import io
import os
import signal
import sys
import tempfile
import time
import traceback
from pathlib import Path
from typing import Any, Callable

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))
for _name in ("OPENBLAS_NUM_THREADS", "MKL_NUM_THREADS", "OMP_NUM_THREADS"):  # as the sizer command does (sizer.cli.main)
    os.environ.setdefault(_name, "1")

import tomlkit  # noqa: E402
from hypothesis import HealthCheck, Phase, given, seed, settings  # noqa: E402
from hypothesis import strategies as st  # noqa: E402
from sizer.cli import run_app  # noqa: E402
from tests.steel import STEEL_TOML  # noqa: E402
from tests.test_fuzz import FLAT, NOT_FINITE, VALUES, base_member, catalogue_texts, member_texts, schedule_texts  # noqa: E402

HANG_SECONDS = {"size": 40.0, "span-table": 60.0, "schedule": 40.0, "report": 30.0}
DEFAULT_HANG = 20.0
STATS: dict[str, collections.Counter] = collections.defaultdict(collections.Counter)
FAILURES: list[str] = []
SLOWEST: list[tuple[float, str]] = []


class Hang(Exception):
    pass


def invoke(args: list[str], label: str, saved: dict[str, str], folder: Path) -> None:
    """Run one command in process and judge it (STATS, FAILURES)."""
    limit = HANG_SECONDS.get(args[0], DEFAULT_HANG)

    def stop(signum: int, frame: Any) -> None:
        raise Hang(f"past {limit:g} s")

    LOG.write(f"{label}: sizer {' '.join(args)[:300]!r}\n")
    LOG.flush()
    before = sorted(path.name for path in folder.iterdir())
    previous = signal.signal(signal.SIGALRM, stop)
    signal.setitimer(signal.ITIMER_REAL, limit)
    started = time.monotonic()
    try:
        result = run_captured(args)
        problem = judge(result, before, folder)
    except Hang as hang:
        problem = f"hang: {hang}"
        result = None
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, previous)
    took = time.monotonic() - started
    if result is not None:
        LOG.write(f"  -> exit {result.exit_code} in {took:.2f} s {result.stderr.strip()[:200]!r}\n")
    SLOWEST.append((took, f"{label}: {' '.join(args)[:120]}"))
    STATS[label]["inputs"] += 1
    STATS[label][f"exit {result.exit_code}" if result is not None else "hang"] += 1
    if problem:
        index = len(FAILURES)
        for name, text in saved.items():
            (OUT / f"failure-{index}-{name}").write_text(text, encoding="utf-8")
        FAILURES.append(f"{label} #{STATS[label]['inputs']}: {problem} (inputs saved as failure-{index}-*)")
        STATS[label]["failures"] += 1


class Result:
    """What one run gave: exit code, stdout, stderr, and an exception that escaped (a failure)."""

    def __init__(self, exit_code: int, stdout: str, stderr: str, exception: BaseException | None) -> None:
        self.exit_code, self.stdout, self.stderr, self.exception = exit_code, stdout, stderr, exception


def run_captured(args: list[str]) -> Result:
    """`sizer ARGS` as the console entry point runs it (sizer.cli.run_app), output captured."""
    out, err = io.StringIO(), io.StringIO()
    exception = None
    code = 0
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        try:
            code = run_app(args)
        except SystemExit as stop:
            code = stop.code if isinstance(stop.code, int) else 1
        except Hang:
            raise
        except BaseException as escaped:  # noqa: BLE001 - a failure to report
            exception, code = escaped, 1
    return Result(code, out.getvalue(), err.getvalue(), exception)


def judge(result: Any, before: list[str], folder: Path) -> str:
    """'' when the run is well behaved, else what is wrong."""
    if result.exception is not None:
        return "exception: " + "".join(traceback.format_exception(result.exception))[-1500:]
    if result.exit_code not in (0, 1, 2):
        return f"exit code {result.exit_code}"
    output = result.stdout + result.stderr
    if "Traceback" in output:
        return "traceback on screen: " + output[-1500:]
    if "\x1b" in output:
        return "an escape byte reached the terminal"
    if result.exit_code == 2:
        lines = result.stderr.strip().splitlines()
        if len(lines) != 1 or not lines[0].startswith("sizer: "):
            if not (result.stdout and "bad" in result.stdout.lower()):  # --keep-going lists bad rows after the table
                return "bad input not one line: " + result.stderr[-800:]
        if not result.stdout and sorted(path.name for path in folder.iterdir()) != before:
            return "bad input, yet something was written"
    found = NOT_FINITE.search(result.stdout)
    if found is not None:
        return "non-finite number on screen: " + result.stdout[max(0, found.start() - 200): found.end() + 50]
    return ""


# ----------------------------------------------------------------------------------------------
# inputs of the campaign's own

SPAN_KEYS = {
    "layout": st.sampled_from(["simple", "cantilever", "continuous", "portal", ""]),
    "spans": st.one_of(st.integers(-2, 8), st.sampled_from([10**9, 2, 3])),
    "restraint": st.sampled_from(["continuous", "supports", "1.5 m", "0.001 mm", "1e300 m", "-1 m", "nan m"]),
    "mode": st.sampled_from(["span", "load", "both"]),
    "loads": st.one_of(st.lists(st.sampled_from(["-2 kN/m", "-4 kN", "-1e12 kN/m", "0 kN/m", "2 kN/m", "-1e-300 kN/m", "-3 MPa"]),
                                max_size=3), VALUES),
    "lengths": st.one_of(st.lists(st.sampled_from(["2 m", "0.5 m", "1e-6 m", "1000 m", "0 m", "-2 m"]), max_size=3), VALUES),
    "load": st.sampled_from(["-1 kN/m", "-2 kN", "1 kN/m", "0 kN", "-1e13 N/m"]),
    "resolution": st.sampled_from(["10 mm", "1 mm", "1 µm", "1 km", "0 mm", "-5 mm", "1e-300 m"]),
    "max_span": st.sampled_from(["30 m", "3 m", "1 µm", "1e300 m", "0 m"]),
    "dead_load": st.sampled_from(["-0.5 kN/m", "-1 kN", "1e300 kN/m"]),
    "self_weight": st.sampled_from([False, True, "dead", "imposed", "", 3]),
    "orientation": st.sampled_from(["major", "minor", "sideways"]),
    "checks": st.sampled_from([{"deflection_limit": 360}, {"deflection_limit": 1e-310}, {"buckling_safety_factor": 0.5},
                               {"deflection_limit": 250, "buckling_safety_factor": 1.5}, {"colour": 1}, "x"]),
    "combinations": st.sampled_from([{"a": {"imposed": 1.0}}, {"a\u001b[2K": {"imposed": 1.0}}, {"b": {"wind": 1.0}}, {}, 3]),
    "material": st.sampled_from(["catalogue-steel", "steel", "unobtainium", ""]),
}


@st.composite
def span_table_texts(draw: Any) -> str:
    table: dict[str, Any] = {"material": "catalogue-steel", "self_weight": False, "restraint": "continuous",
                             "loads": ["-2 kN/m"], "resolution": "50 mm", "max_span": "8 m"}
    for key in draw(st.lists(st.sampled_from(sorted(SPAN_KEYS)), min_size=1, max_size=3, unique=True)):
        table[key] = draw(SPAN_KEYS[key])
    if table.get("mode") == "load":
        table.pop("loads", None)
        table.pop("resolution", None)
        table.setdefault("lengths", ["2 m", "3 m"])
    try:
        return tomlkit.dumps({"span_table": table})
    except Exception:  # a value tomlkit cannot write
        return '[span_table]\nmaterial = "catalogue-steel"\n'


@st.composite
def sound_member_texts(draw: Any) -> str:
    """Member files that are good input, mostly: restraints at points and along zones, load heights
    within (and just outside) the 30 mm flat, patterned loads over 2 to 6 spans, combinations and
    limits within their ranges: the paths past the reader (exit 0 or 1) get their share."""
    spans = draw(st.integers(1, 6))
    length = 4.0
    supports = [{"at": f"{length * k / spans!r} m", "type": "pin" if k == 0 else "roller"} for k in range(spans + 1)]
    height = st.sampled_from(["top", "centre", "bottom", "+15 mm", "-15 mm", "+7.5 mm", "-15.01 mm", "+20 mm"])
    loads = [{"type": "line", "case": "dead", "wy": draw(st.sampled_from(["-0.2 kN/m", "-1 kN/m", "-5 kN/m"]))},
             {"type": "line", "case": "imposed", "wy": draw(st.sampled_from(["-0.5 kN/m", "-2 kN/m", "1 kN/m"])),
              "pattern": draw(st.booleans())}]
    if draw(st.booleans()):
        loads.append({"type": "point", "case": "imposed", "at": f"{draw(st.integers(0, 40)) / 10!r} m",
                      "fy": draw(st.sampled_from(["-1 kN", "-0.1 kN", "2 kN"])), "height": draw(height)})
    if draw(st.booleans()):
        loads[0]["height"] = draw(height)
    if draw(st.integers(0, 3)) == 0:  # the third round's keys: where across, bearing lengths, stiffeners
        loads[-1]["across"] = draw(st.sampled_from(["shear-centre", "centroid", "+4 mm", "-4 mm", "+40 mm", "-5 m", "1e-300 mm"]))
        supports[-1]["bearing"] = draw(st.sampled_from(["0 mm", "50 mm", "150 mm", "4 m", "-1 mm"]))
        supports[0]["stiffened"] = draw(st.sampled_from([True, False, "yes"]))
    restraints = []
    for _ in range(draw(st.integers(0, 3))):
        start = draw(st.integers(0, 38)) / 10  # m, on a 100 mm grid
        if draw(st.booleans()):
            restraint = {"at": f"{start!r} m"}
        else:
            restraint = {"from": f"{start!r} m", "to": f"{min(length, start + draw(st.sampled_from([0.05, 0.1, 0.5, 2.0])))!r} m"}
        restraint["hold"] = draw(st.sampled_from([["lateral"], ["twist"], ["lateral", "twist"]]))
        if "lateral" in restraint["hold"] and draw(st.booleans()):
            restraint["height"] = draw(height)
        restraints.append(restraint)
    data: dict[str, Any] = {"member": {"length": f"{length} m", "material": "catalogue-steel", "self_weight": draw(st.sampled_from([False, "dead"]))},
                            "supports": supports, "loads": loads,
                            "combinations": {"dead + imposed": {"dead": 1.0, "imposed": 1.0}, "dead only": {"dead": 1.0}}}
    if restraints:
        data["restraints"] = restraints
    if draw(st.integers(0, 4)):
        data["member"]["section"] = draw(st.sampled_from(["F 30x8", "F 60x8"]))
    data["checks"] = {"deflection_limit": draw(st.sampled_from([1, 250, 360, 10000, 360, 250, 0.5, 1e-310, 20000])),
                      "buckling_safety_factor": draw(st.sampled_from([1, 1.7, 2.0, 100, 2.0, 1.5, 0.99, 1e-310]))}
    return tomlkit.dumps(data)


@st.composite
def sound_schedule_texts(draw: Any) -> tuple[str, str]:
    """Schedules that are good input, mostly: unique marks, the member file, what to do, quantities
    and overrides within range; as TOML or CSV (sometimes with a byte-order mark)."""
    rows = []
    for k in range(1, draw(st.integers(1, 4)) + 1):
        row: dict[str, Any] = {"mark": f"B{k}", "file": "member.toml"}
        if draw(st.booleans()):
            row["quantity"] = draw(st.sampled_from([1, 2, 40, 10**6, 10**6 + 1]))
        if draw(st.booleans()):
            row["length"] = draw(st.sampled_from(["2 m", "3.5 m", "6 m", "0.5 m"]))
        if draw(st.booleans()):
            row["section"] = draw(st.sampled_from(["F 30x8", "F 60x8"]))
            row["do"] = draw(st.sampled_from(["check", "size"]))
        rows.append(row)
    if draw(st.booleans()):
        return "schedule.toml", tomlkit.dumps({"title": "Fuzz floor", "members": rows})
    header = ["mark", "file", "do", "quantity", "length", "section"]
    text = "\n".join([",".join(header)] + [",".join(str(row.get(key, "")) for key in header) for row in rows]) + "\n"
    return "schedule.csv", ("\ufeff" if draw(st.booleans()) else "") + text


OPTION_VALUES = st.sampled_from(["1", "2", "0", "-1", "1e20", "1000", "x", "9" * 40, "tcp://127.0.0.1:1", "ucx://a:1", "tls://b:2",
                                 "inproc://x", "tcp://[::1]", "http://example:80", "", " ", "\x1b[2J", "out.csv", "out.html",
                                 "missing/out.csv", "member.toml", ".", "out.png", "out.svg", "out.txt"])


# ----------------------------------------------------------------------------------------------
# the campaign

def workspace(member: str | None = None) -> tuple[tempfile.TemporaryDirectory, Path]:
    holder = tempfile.TemporaryDirectory()
    folder = Path(holder.name)
    (folder / "member.toml").write_text(member if member is not None else tomlkit.dumps(
        {**base_member(), "member": {"length": "4 m", "material": "catalogue-steel", "section": "F 30x8", "self_weight": False}}),
        encoding="utf-8")
    return holder, folder


def campaign(count: int, strategy: Any, body: Callable[[Any], None]) -> None:
    """Draw `count` inputs from `strategy` and run `body` on each (failures are recorded, not raised)."""
    @seed(ARGS.seed)
    @settings(max_examples=count, deadline=None, database=None, phases=[Phase.generate],
              suppress_health_check=list(HealthCheck))
    @given(strategy)
    def run_all(example: Any) -> None:
        body(example)

    run_all()


def member_runs(example: tuple[str, list[str]]) -> None:
    text, command = example
    holder, folder = workspace(text)
    with holder:
        extra = [str(folder / option) if option.startswith("out.") else option for option in command[1:]]
        invoke([command[0], str(folder / "member.toml"), "--catalogue", str(CATALOGUE), *extra], command[0], {"member.toml": text}, folder)


def catalogue_runs(example: tuple[str, list[str]]) -> None:
    text, command = example
    holder, folder = workspace()
    with holder:
        (folder / "lib").mkdir()
        (folder / "lib" / "stock.toml").write_text((CATALOGUE / "stock.toml").read_text(encoding="utf-8"), encoding="utf-8")
        (folder / "lib" / "fuzzed.toml").write_text(text, encoding="utf-8")
        args = {"check": ["check", str(folder / "member.toml")], "list": ["sections", "list"], "show": ["sections", "show", "S0"],
                "size": ["size", str(folder / "member.toml")]}[command[0]]
        invoke(args + ["--catalogue", str(folder / "lib"), *command[1:]], f"catalogue/{command[0]}", {"fuzzed.toml": text}, folder)


def schedule_runs(example: tuple[tuple[str, str], list[str]]) -> None:
    (name, text), options = example
    holder, folder = workspace(tomlkit.dumps({**base_member(), "member": {"length": "4 m", "material": "catalogue-steel", "self_weight": False}}))
    with holder:
        (folder / name).write_text(text, encoding="utf-8")
        extra = [str(folder / option) if option.startswith(("out.", "missing/")) else option for option in options]
        invoke(["schedule", str(folder / name), "--catalogue", str(CATALOGUE), *extra], "schedule", {name: text}, folder)


def span_table_runs(example: tuple[str, list[str]]) -> None:
    text, options = example
    holder, folder = workspace()
    with holder:
        (folder / "table.toml").write_text(text, encoding="utf-8")
        extra = [str(folder / option) if option.startswith(("out.", "missing/")) else option for option in options]
        invoke(["span-table", str(folder / "table.toml"), "--catalogue", str(CATALOGUE), *extra], "span-table", {"table.toml": text}, folder)


def option_runs(example: tuple[str, str, str]) -> None:
    command, option, value = example
    holder, folder = workspace()
    with holder:
        value = str(folder / value) if value.startswith(("out.", "missing/", "member.toml")) else value
        base = {"schedule": ["schedule", str(SCHEDULE)], "span-table": ["span-table", str(SPAN_TABLE)],
                "check": ["check", str(folder / "member.toml"), "--catalogue", str(CATALOGUE)],
                "forces": ["forces", str(folder / "member.toml"), "--catalogue", str(CATALOGUE)],
                "size": ["size", str(folder / "member.toml"), "--catalogue", str(CATALOGUE)],
                "report": ["report", str(folder / "member.toml"), "--catalogue", str(CATALOGUE)],
                "init": ["init"], "sections add": ["sections", "add", str(folder / "new.toml")]}[command]
        invoke(base + [option, value], f"options/{command}", {"option.txt": f"{command} {option} {value!r}"}, folder)


OPTIONS = {"schedule": ["--jobs", "--cluster", "--csv", "-o", "--catalogue"], "span-table": ["--jobs", "--cluster", "--csv", "--plot", "--family"],
           "check": ["--section", "--plot", "--units"], "forces": ["--at", "--combination", "--plot"], "size": ["--max-depth", "--top", "--family", "--report"],
           "report": ["-o", "--section"], "init": ["-o", "--layout"], "sections add": ["--shape", "--name"]}


def main() -> int:
    global ARGS, LOG, OUT, CATALOGUE, SCHEDULE, SPAN_TABLE
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--scale", type=float, default=1.0, help="multiply every input count by this")
    parser.add_argument("--seed", type=int, default=25)
    parser.add_argument("--log", type=Path, default=Path(tempfile.gettempdir()) / "sizer-fuzz-campaign" / "campaign.log")
    ARGS = parser.parse_args()
    OUT = ARGS.log.parent
    OUT.mkdir(parents=True, exist_ok=True)
    LOG = open(ARGS.log, "w", encoding="utf-8")
    base = Path(tempfile.mkdtemp(prefix="sizer-fuzz-"))
    CATALOGUE = base / "catalogue"
    CATALOGUE.mkdir()
    (CATALOGUE / "stock.toml").write_text(STEEL_TOML.replace("materials.steel", "materials.catalogue-steel") + FLAT
                                          + FLAT.replace("F 30x8", "F 60x8").replace('"30 mm"', '"60 mm"'), encoding="utf-8")
    (base / "member.toml").write_text(tomlkit.dumps({**base_member(), "member": {"length": "4 m", "material": "catalogue-steel",
                                                                               "self_weight": False}}), encoding="utf-8")
    SCHEDULE = base / "schedule.toml"
    SCHEDULE.write_text('[[members]]\nmark = "B1"\nfile = "member.toml"\n', encoding="utf-8")
    SPAN_TABLE = base / "table.toml"
    SPAN_TABLE.write_text('[span_table]\nmaterial = "catalogue-steel"\nself_weight = false\nloads = ["-2 kN/m"]\nresolution = "100 mm"\n'
                          'max_span = "6 m"\n', encoding="utf-8")
    (base / "section_library").mkdir()
    (base / "section_library" / "stock.toml").write_text((CATALOGUE / "stock.toml").read_text(encoding="utf-8"), encoding="utf-8")
    n = lambda count: max(1, round(count * ARGS.scale))  # noqa: E731
    member_commands = st.sampled_from([["forces"], ["forces", "--json"], ["forces", "--envelope"], ["check"], ["check", "--json"],
                                       ["check", "--units", "us"], ["forces", "--at", "1 m"], ["check", "--plot", "out.png"]])
    started = time.monotonic()
    plan = [
        ("member files: forces and check", n(600), st.tuples(member_texts(), member_commands), member_runs),
        ("sound member files", n(300), st.tuples(sound_member_texts(), st.sampled_from([["check"], ["check", "--json"], ["size"], ["size", "--json"],
                                                                                   ["forces", "--envelope"]])), member_runs),
        ("member files: size", n(200), st.tuples(member_texts(), st.sampled_from([["size"], ["size", "--json"]])), member_runs),
        ("member files: report", n(80), st.tuples(member_texts(), st.just(["report", "-o", "out.html"])), member_runs),
        ("catalogue files", n(400), st.tuples(catalogue_texts(), st.sampled_from([["check"], ["list"], ["show"], ["list", "--json"], ["size"]])),
         catalogue_runs),
        ("schedules", n(300), st.tuples(schedule_texts(), st.sampled_from([["--jobs", "1"], ["--jobs", "1", "--json"], ["--jobs", "1", "--keep-going"],
                                                                         ["--jobs", "1", "--csv", "out.csv"], ["--jobs", "2"],
                                                                         ["--jobs", "1", "--csv", "missing/out.csv"], ["--jobs", "1", "-o", "out.html"]])),
         schedule_runs),
        ("sound schedules", n(150), st.tuples(sound_schedule_texts(), st.sampled_from([["--jobs", "1"], ["--jobs", "1", "--json"],
                                                                                       ["--jobs", "2", "--csv", "out.csv", "-o", "out.html"]])),
         schedule_runs),
        ("span tables", n(200), st.tuples(span_table_texts(), st.sampled_from([["--jobs", "1"], ["--jobs", "1", "--json"],
                                                                               ["--jobs", "1", "--csv", "out.csv"], ["--jobs", "2"]])), span_table_runs),
        ("command-line options", n(250), st.sampled_from(sorted(OPTIONS)).flatmap(
            lambda command: st.tuples(st.just(command), st.sampled_from(OPTIONS[command]), OPTION_VALUES)), option_runs),
    ]
    os.chdir(base)
    for title, count, strategy, body in plan:
        part = time.monotonic()
        campaign(count, strategy, body)
        print(f"{title}: {count} inputs in {time.monotonic() - part:.0f} s", flush=True)
    total = sum(counter["inputs"] for counter in STATS.values())
    print(f"\n{total} inputs in {time.monotonic() - started:.0f} s; failures: {len(FAILURES)}")
    for label, counter in sorted(STATS.items()):
        codes = ", ".join(f"{key} {value}" for key, value in sorted(counter.items()) if key != "inputs")
        print(f"  {label:22s} {counter['inputs']:5d} inputs: {codes}")
    took, what = max(SLOWEST)
    print(f"slowest run: {took:.1f} s ({what})")
    for failure in FAILURES:
        print("FAILURE", failure)
    return 1 if FAILURES else 0


if __name__ == "__main__":
    sys.exit(main())
