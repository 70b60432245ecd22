"""Speed figures for `sizer schedule` and `sizer span-table` (a plain script; not part of the test suite).

    .venv/bin/python benchmarks/bench_many.py [--workdir DIR] [--members 200] [--spans 20] [--jobs 2] [--repeats 5]

Writes a schedule of generated members (invented floor beams: each its own span, loads and support
layout; two in three sized against the shipped catalogue, the rest checked) into a temporary folder
(or DIR), then prints, for the command line as a user runs it (subprocess, wall time, the kept rows
of earlier runs removed first so every row is worked out):
  (a)  `sizer schedule` with --jobs 1
  (b)  the same with --jobs N (default: every core), and the speed-up (a) / (b)
       (a) and (b) are run in turn `--repeats` times (default 5); the medians are compared, so that a
       burst of other work on a shared machine does not decide the figure
  (c)  `sizer span-table` for the whole shipped catalogue, mode "load" at `--spans` spans, with --jobs N,
       and the full checks it made
  (d)  the machine's own ceiling: two copies of a fixed CPU-bound kernel (small numpy eigen-solves and
       Python arithmetic, no sizer code, nothing shared) run in turn and then at once; on a shared
       virtual machine two busy cores are slower than one, and no parallel program beats this ratio
  (d') the same ceiling for this schedule's own work: N copies of `schedule --jobs 1` at once, each with
       a cache folder of its own (a copy of the user's, without kept rows), against one alone
  (e)  the best speed-up this schedule can reach here (Amdahl's law): the serial start, measured as a
       one-member schedule with --jobs N (interpreter, imports, workers forked, one row, output) less
       one row's share of (a), runs once whatever the jobs; the rest of (a) at best divides by (d')
Target (issue 16): (a) / (b) >= 1.8 on 2 cores.
The section cache is the user's (or SIZER_CACHE_DIR); run once to warm it if the catalogue is new there.
"""

from __future__ import annotations

import argparse
import json
import os
import resource
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

VENV_BIN = Path(sys.executable).parent
SIZER = str(VENV_BIN / "sizer")


def member_text(index: int) -> str:
    """An invented floor beam: span 2.5 to 7.4 m, a propped end or an overhang on some, two cases."""
    length = 2.5 + (index * 37 % 50) / 10
    dead = 0.6 + (index % 7) * 0.15
    imposed = 1.5 + (index % 11) * 0.4
    end = length if index % 3 else length * 0.85
    section = '\nsection = "IPE 240"' if index % 3 == 0 else ""
    return f"""title = "Generated floor beam {index} (invented)"
[member]
length = "{length:.2f} m"
material = "mild-steel"{section}

[[supports]]
at = "0 m"
type = "pin"
[[supports]]
at = "{end:.3f} m"
type = "roller"

[[restraints]]
from = "0 m"
to = "{length:.2f} m"
hold = ["lateral", "twist"]
height = "top"

[[loads]]
type = "line"
case = "dead"
wy = "-{dead:.2f} kN/m"
[[loads]]
type = "line"
case = "imposed"
wy = "-{imposed:.2f} kN/m"
[[loads]]
type = "point"
case = "imposed"
at = "{length / 2:.3f} m"
fy = "-{1 + index % 5} kN"

[combinations]
"dead + imposed" = {{ dead = 1.0, imposed = 1.0 }}

[checks]
deflection_limit = 300
"""


SPAN_TABLE = """title = "Benchmark: the shipped catalogue as simply supported floor beams"
[span_table]
layout = "simple"
material = "mild-steel"
restraint = "continuous"
mode = "load"
lengths = [{lengths}]
[span_table.checks]
deflection_limit = 360
"""


def write_schedule(folder: Path, members: int, name: str = "schedule.toml") -> Path:
    (folder / "members").mkdir(parents=True, exist_ok=True)
    rows = []
    for index in range(members):
        (folder / "members" / f"m{index:03d}.toml").write_text(member_text(index))
        rows.append(f'[[members]]\nmark = "M{index:03d}"\nfile = "members/m{index:03d}.toml"\nquantity = {1 + index % 4}\n')
    path = folder / name
    path.write_text('title = "Benchmark schedule (invented)"\n' + "".join(rows))
    return path


def forget_kept_rows() -> None:
    from sizer.cache_store import cache_root
    from sizer.parallel import RUNS_FOLDER

    shutil.rmtree(cache_root() / RUNS_FOLDER, ignore_errors=True)


# as on a user's machine: one BLAS thread (as the command asks), compiled modules kept between runs
ENV = {**{k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}, "OPENBLAS_NUM_THREADS": "1"}


def timed(arguments: list[str]) -> tuple[float, float, dict]:
    """Wall time and CPU time (the run and its worker processes) of one `sizer` run (kept rows removed
    first), and its JSON document. On a machine shared with other work the wall time depends on the
    load; the CPU time shows the parallel overhead apart from it."""
    forget_kept_rows()
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    start = time.perf_counter()
    done = subprocess.run([SIZER, *arguments, "--json"], capture_output=True, text=True, env=ENV)
    elapsed = time.perf_counter() - start
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    if done.returncode not in (0, 1):
        sys.exit(f"sizer failed ({done.returncode}): {done.stderr.strip()}")
    cpu = after.ru_utime + after.ru_stime - before.ru_utime - before.ru_stime
    return elapsed, cpu, json.loads(done.stdout)


KERNEL = """
import numpy as np
a = np.random.default_rng(0).random((60, 60))
for _ in range(3000):
    np.linalg.eigh(a + a.T)
total = 0
for i in range(1_500_000):
    total += i * i
"""


def machine_ceiling(copies: int) -> tuple[float, float]:
    """Wall time of `copies` runs of KERNEL one after another, and of `copies` at once."""
    command = [sys.executable, "-c", KERNEL]
    env = {**os.environ, "OPENBLAS_NUM_THREADS": "1"}
    start = time.perf_counter()
    for _ in range(copies):
        subprocess.run(command, env=env, check=True)
    in_turn = time.perf_counter() - start
    start = time.perf_counter()
    for process in [subprocess.Popen(command, env=env) for _ in range(copies)]:
        process.wait()
    return in_turn, time.perf_counter() - start


def workload_ceiling(folder: Path, schedule: Path, copies: int) -> float:
    """`copies` x the wall time of one `schedule --jobs 1` alone / that of `copies` run at once, each
    with its own copy of the cache folder (so that none takes another's kept rows)."""
    from sizer.cache_store import cache_root
    from sizer.parallel import RUNS_FOLDER

    caches = [folder / f"cache-{k}" for k in range(copies)]
    for cache in caches:
        shutil.rmtree(cache, ignore_errors=True)
        shutil.copytree(cache_root(), cache, ignore=shutil.ignore_patterns(RUNS_FOLDER))
    command = [SIZER, "schedule", str(schedule), "--jobs", "1", "--json"]
    start = time.perf_counter()
    subprocess.run(command, capture_output=True, env={**ENV, "SIZER_CACHE_DIR": str(caches[0])})
    alone = time.perf_counter() - start
    shutil.rmtree(caches[0] / RUNS_FOLDER, ignore_errors=True)
    start = time.perf_counter()
    runs = [subprocess.Popen(command, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, env={**ENV, "SIZER_CACHE_DIR": str(cache)})
            for cache in caches]
    for process in runs:
        process.wait()
    return copies * alone / (time.perf_counter() - start)


def rows_of(document: dict) -> list[tuple]:
    """What must not depend on who ran the rows: each row's section and utilization, in order."""
    return [(row["section"], row["utilization"]) for row in document["members"]]


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("--workdir", type=Path)
    parser.add_argument("--members", type=int, default=200)
    parser.add_argument("--spans", type=int, default=20, help="spans of the span table (0: no span table)")
    parser.add_argument("--jobs", type=int, default=os.cpu_count() or 2)
    parser.add_argument("--repeats", type=int, default=5, help="runs of (a) and (b) each, in turn")
    options = parser.parse_args()
    folder = options.workdir or Path(tempfile.mkdtemp(prefix="sizer-bench-many-"))
    schedule = write_schedule(folder, options.members)
    print(f"workdir {folder}; {options.members} members; {options.jobs} jobs; cores {os.cpu_count()}")

    print(f"load average before: {os.getloadavg()[0]:.1f} (other work on the machine slows the wall times)")
    timed(["schedule", str(schedule), "--jobs", "1"])  # the first run compiles changed modules and fills the section cache
    ones, manys, same = [], [], True
    for _ in range(options.repeats):
        ones.append(timed(["schedule", str(schedule), "--jobs", "1"]))
        manys.append(timed(["schedule", str(schedule), "--jobs", str(options.jobs)]))
        same &= rows_of(ones[-1][2]) == rows_of(manys[-1][2]) == rows_of(ones[0][2])
    one, one_cpu = (statistics.median(run[k] for run in ones) for k in (0, 1))
    many, many_cpu = (statistics.median(run[k] for run in manys) for k in (0, 1))
    document = ones[0][2]
    sized = sum(row["do"] == "size" for row in document["members"])
    print(f"(a) schedule --jobs 1:  {one:7.2f} s wall (median of {', '.join(f'{run[0]:.2f}' for run in ones)}), {one_cpu:6.1f} s CPU  "
          f"({sized} sized, {len(document['members']) - sized} checked)")
    print(f"(b) schedule --jobs {options.jobs}:  {many:7.2f} s wall (median of {', '.join(f'{run[0]:.2f}' for run in manys)}), {many_cpu:6.1f} s CPU")
    pairs = [a[0] / b[0] for a, b in zip(ones, manys)]
    print(f"    speed-up {one / many:.2f} of the medians, {statistics.median(pairs):.2f} the median of the pairs run in turn "
          f"({', '.join(f'{pair:.2f}' for pair in pairs)}) (target >= 1.8); CPU overhead of the processes {many_cpu / one_cpu - 1:+.0%}; "
          f"rows identical in every run: {same}")
    print(f"    load average after: {os.getloadavg()[0]:.1f}")
    ceilings = [machine_ceiling(options.jobs) for _ in range(3)]
    ceiling = statistics.median(a / b for a, b in ceilings)
    print(f"(d) the machine's ceiling for {options.jobs} processes: {ceiling:.2f} "
          f"(median of {', '.join(f'{a / b:.2f}' for a, b in ceilings)}; {options.jobs} copies of a CPU-bound kernel in turn / at once)")
    own = [workload_ceiling(folder, schedule, options.jobs) for _ in range(3)]
    print(f"(d') the ceiling for this schedule's own work: {statistics.median(own):.2f} (median of {', '.join(f'{x:.2f}' for x in own)}; "
          f"{options.jobs} runs of `schedule --jobs 1` at once, each with its own cache folder, against one alone)")
    ceiling = statistics.median(own)
    single = write_schedule(folder, 1, "schedule_one.toml")
    starts = [timed(["schedule", str(single), "--jobs", str(options.jobs)])[0] for _ in range(options.repeats)]
    serial = statistics.median(starts) - (one - statistics.median(starts)) / (options.members - 1)
    print(f"(e) best speed-up here: {one / (serial + (one - serial) / ceiling):.2f} (Amdahl's law: serial start {serial:.2f} s, from a "
          f"one-member schedule with --jobs {options.jobs}, {', '.join(f'{run:.2f}' for run in starts)} s, less one row's share of (a); "
          f"the rest of (a) divided by (d'))")

    if options.spans < 1:
        return
    table = folder / "span_table.toml"
    table.write_text(SPAN_TABLE.format(lengths=", ".join(f'"{1 + 0.5 * k:g} m"' for k in range(options.spans))))
    seconds, _, spans = timed(["span-table", str(table), "--jobs", str(options.jobs)])
    cells = sum(len(entry["rows"]) for entry in spans["sections"])
    checks = sum(row["checks_made"] for entry in spans["sections"] for row in entry["rows"])
    print(f"(c) span-table, {len(spans['sections'])} sections x {options.spans} spans = {cells} cells: {seconds:7.1f} s "
          f"({checks} full checks, {checks / cells:.1f} per cell, {seconds / checks * 1e3 * options.jobs:.1f} ms per check per core)")


if __name__ == "__main__":
    main()
