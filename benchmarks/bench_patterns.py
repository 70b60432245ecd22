"""Speed figures for pattern loading (a plain script; not part of the test suite).

    .venv/bin/python benchmarks/bench_patterns.py [--runs N] [--no-profile]

An invented member: a five-span roof purlin (5 x 4 m) with dead load, imposed load as an area load
on its tributary width and snow, the imposed and snow loads patterned; one combination uses both
patterned cases, so it is checked in (2^5 - 1)^2 = 961 arrangements. The same member unpatterned
is the baseline (one combination). Prints, each the median of N runs in a subprocess, warm caches,
the shipped catalogue:
  (a)  `sizer check` (section IPE 200), unpatterned and patterned, and their ratio
  (b)  `sizer size --top 1`, unpatterned and patterned, and their ratio
  (c)  `sizer forces --envelope --json`, patterned (no section: forces only)
  (d)  in-process: the solve (n spans cost n solves, not 2^n) and the envelope over all arrangements
  profile  the top lines of cProfile over the patterned `sizer check` (in-process): where the time goes
"""

from __future__ import annotations

import argparse
import cProfile
import io
import pstats
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

from sizer.cli import single_threaded_blas

single_threaded_blas()  # before numpy loads, as the sizer command does, so the in-process figures match it

VENV_BIN = Path(sys.executable).parent
SIZER = str(VENV_BIN / "sizer")
SPANS, BAY = 5, 4.0

SUPPORTS = "\n".join(f'[[supports]]\nat = "{i * BAY:g} m"\ntype = "{"pin" if i == 0 else "roller"}"' for i in range(SPANS + 1))
MEMBER = f"""title = "Pattern-loading benchmark: five-span roof purlin (invented)"

[member]
length = "{SPANS * BAY:g} m"
material = "mild-steel"
section = "IPE 200"

{SUPPORTS}

[[loads]]
type = "line"
case = "dead"
wy = "-0.6 kN/m"
[[loads]]
type = "area"
case = "imposed"
py = "-0.75 kPa"
width = "1.8 m"
pattern = true
[[loads]]
type = "area"
case = "snow"
py = "-0.9 kPa"
width = "1.8 m"
pattern = true

[combinations]
"dead + imposed + snow" = {{ dead = 1.2, imposed = 1.5, snow = 0.75 }}

[checks]
deflection_limit = 200
"""


def wall_time(args: list[str], runs: int) -> float:
    """Median wall time (s) of running `args`, exit codes 0 and 1 both fine."""
    times = []
    for _ in range(runs):
        start = time.perf_counter()
        done = subprocess.run(args, capture_output=True, text=True)
        times.append(time.perf_counter() - start)
        if done.returncode not in (0, 1):
            raise SystemExit(f"{' '.join(args)} failed:\n{done.stderr}")
    return statistics.median(times)


def in_process(patterned: Path) -> None:
    """(d): the solve and the envelope, in this process."""
    from sizer import api
    from sizer.analysis import action_envelope, solve_member

    member = api.as_member(api.read_member(patterned))
    start = time.perf_counter()
    solution = solve_member(member, None, None)
    solved = time.perf_counter() - start
    start = time.perf_counter()
    action_envelope(solution, solution.combination_names)
    enveloped = time.perf_counter() - start
    print(f"(d) solve: {len(solution.cases)} load cases for {len(solution.combination_names)} combinations in {solved * 1e3:.0f} ms; "
          f"envelope over all of them {enveloped:.2f} s")


def profile(patterned: Path, lines: int = 20) -> None:
    from sizer import api

    profiler = cProfile.Profile()
    profiler.enable()
    api.check(patterned)
    profiler.disable()
    out = io.StringIO()
    pstats.Stats(profiler, stream=out).sort_stats("cumulative").print_stats(lines)
    print(out.getvalue())


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=3)
    parser.add_argument("--no-profile", action="store_true")
    options = parser.parse_args()
    with tempfile.TemporaryDirectory() as folder:
        patterned, plain = Path(folder) / "patterned.toml", Path(folder) / "plain.toml"
        patterned.write_text(MEMBER, encoding="utf-8")
        plain.write_text(MEMBER.replace("pattern = true\n", ""), encoding="utf-8")
        subprocess.run([SIZER, "check", str(plain)], capture_output=True)  # warm the section and unit caches
        print(f"five spans, two patterned cases in one combination: {(2 ** SPANS - 1) ** 2} arrangements; median of {options.runs} runs")
        for label, command in (("(a) sizer check", ["check"]), ("(b) sizer size --top 1", ["size", "--top", "1"])):
            base = wall_time([SIZER, *command, str(plain)], options.runs)
            slow = wall_time([SIZER, *command, str(patterned)], options.runs)
            print(f"{label}: unpatterned {base:.2f} s, patterned {slow:.2f} s, ratio {slow / base:.1f}")
        envelope = wall_time([SIZER, "forces", str(patterned), "--envelope", "--json"], options.runs)
        print(f"(c) sizer forces --envelope --json, patterned: {envelope:.2f} s")
        in_process(patterned)
        if not options.no_profile:
            profile(patterned)


if __name__ == "__main__":
    main()
