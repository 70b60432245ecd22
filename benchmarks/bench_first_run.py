"""The first answer on a new machine (issue 15): `sizer size` with an empty section cache (a plain
script; not part of the test suite).

    .venv/bin/python benchmarks/bench_first_run.py [--workdir DIR] [--runs N] [--skip-large]

Each cold run gets a fresh SIZER_CACHE_DIR (nothing cached: no catalogue parse, no unit factors, no
section property), the way a new user meets sizer; compiled modules are kept, as after pip
install. Prints:
  (a) the README's demo, `sizer size examples/platform_joist.toml`: cold wall time (median of N),
      sections whose warping tier was computed out of the catalogue's, then the warm run, and the
      cold median's ratio to `sizer --help` (run in turn with the cold runs)
  (b) `sizer size` on the 1000-section catalogue of benchmarks/bench_size.py (written to DIR), cold:
      wall and CPU time, sections computed, then the warm run
Targets (issue 15, 2 cores): (a) cold <= 3 s; (b) cold <= 30 s; warm runs as fast as before
(benchmarks/bench_size.py (b)); issue 24: (a) cold within 6x `sizer --help`.
"""

from __future__ import annotations

import argparse
import os
import resource
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parent
SIZER = str(Path(sys.executable).parent / "sizer")
DEMO = ROOT / "examples" / "platform_joist.toml"


def timed_run(command: list[str], cache: Path) -> tuple[float, float]:
    """(wall, CPU of the process and its children) seconds of one run with `cache` as SIZER_CACHE_DIR."""
    env = dict(os.environ, SIZER_CACHE_DIR=str(cache), COLUMNS="120")
    env.pop("PYTHONDONTWRITEBYTECODE", None)  # as on a user's machine: compiled modules are kept between runs
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    start = time.perf_counter()
    done = subprocess.run(command, env=env, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
    wall = time.perf_counter() - start
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    if done.returncode not in (0, 1):
        raise SystemExit(f"{' '.join(command)} exited {done.returncode}: {done.stderr}")
    return wall, (after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)


def computed_sections(cache: Path) -> int:
    """Sections whose warping tier and stress fields a run computed (entries in the cache)."""
    folder = cache / "sections"
    return len(list(folder.glob("*.entry"))) if folder.is_dir() else 0


def cold_and_warm(label: str, command: list[str], runs: int, total: int, target: float, to_help: float | None = None) -> None:
    """Cold runs on fresh caches (median), the sections computed, then a warm run on the last cache.
    With `to_help` (a target ratio), `sizer --help` runs in turn with each cold run and the medians'
    ratio is shown against it."""
    walls, cpus, counts, helps = [], [], [], []
    for _ in range(runs):
        cache = Path(tempfile.mkdtemp(prefix="sizer-first-run-"))
        wall, cpu = timed_run(command, cache)
        walls.append(wall)
        cpus.append(cpu)
        counts.append(computed_sections(cache))
        if to_help is not None:
            helps.append(timed_run([SIZER, "--help"], cache)[0])
    warm = statistics.median(timed_run(command, cache)[0] for _ in range(max(3, runs)))
    print(f"{label}: cold median {statistics.median(walls):.2f} s wall of {runs} ({', '.join(f'{t:.2f}' for t in walls)}), "
          f"{statistics.median(cpus):.2f} s CPU; warping tier computed for {statistics.median(counts):g} of {total} sections; "
          f"target <= {target:g} s; warm median {warm:.2f} s")
    if helps:
        ratio = statistics.median(walls) / statistics.median(helps)
        print(f"    `sizer --help` median {statistics.median(helps):.3f} s (run in turn); cold / --help = {ratio:.2f}x "
              f"(target <= {to_help:g}x, issue 24)")


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--workdir", type=Path, default=None, help="where the 1000-section catalogue is written (kept)")
    parser.add_argument("--runs", type=int, default=3, help="cold runs per median")
    parser.add_argument("--skip-large", action="store_true", help="the demo only")
    args = parser.parse_args()
    sys.path.insert(0, str(HERE))
    from bench_size import write_inputs

    from sizer.sections import load_catalogue, shipped_library

    print(f"cores: {len(os.sched_getaffinity(0))}, load average {os.getloadavg()[0]:.1f}")
    shipped = len(load_catalogue([shipped_library()]).sections)
    cold_and_warm("(a) README demo, sizer size examples/platform_joist.toml", [SIZER, "size", str(DEMO)], args.runs, shipped, 3.0, to_help=6.0)
    if not args.skip_large:
        workdir = args.workdir or Path(tempfile.mkdtemp(prefix="sizer-bench-first-"))
        catalogue, member, count = write_inputs(workdir)
        cold_and_warm(f"(b) sizer size, {count}-section catalogue", [SIZER, "size", str(member), "--catalogue", str(catalogue)],
                      max(1, args.runs // 2), count, 30.0)


if __name__ == "__main__":
    main()
