"""Speed figures for pattern loading (a plain script; not part of the test suite).

    .venv/bin/python benchmarks/bench_patterns.py [--runs N] [--no-profile]

An invented member: a five-span roof purlin (5 x 4 m) with dead load, imposed load as an area load
on its tributary width and snow, the imposed and snow loads patterned; one combination uses both
patterned cases, so it is checked in 2^5 x 2^5 = 1024 arrangements (each case on any set of spans,
none included). The same member unpatterned is the baseline (one combination). Prints, each the
median of N runs in a subprocess, warm caches, the shipped catalogue:
  (a)  `sizer check` (section IPE 200), unpatterned and patterned: times, their ratio, peak memory
  (b)  `sizer size --top 1`, unpatterned and patterned: times, their ratio, peak memory
  (c)  `sizer forces --envelope --json`, patterned (no section: forces only)
  (d)  in-process: the solve (n spans cost n solves, not 2^n) and the envelope over all arrangements
  (e)  the same purlin over 10 spans, two patterned cases: what `sizer check` answers, time, memory
  profile  the top lines of cProfile over the patterned `sizer check` (in-process): where the time goes
"""

from __future__ import annotations

import argparse
import cProfile
import io
import os
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



def supports(spans: int) -> str:
    return "\n".join(f'[[supports]]\nat = "{i * BAY:g} m"\ntype = "{"pin" if i == 0 else "roller"}"' for i in range(spans + 1))


SUPPORTS = supports(SPANS)
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


def measured(args: list[str]) -> tuple[float, float, int, str]:
    """(wall time s, peak resident memory MB, exit code, first line of stderr) of one run of `args`."""
    with tempfile.TemporaryFile() as errors:
        start = time.perf_counter()
        process = subprocess.Popen(args, stdout=subprocess.DEVNULL, stderr=errors)
        _, status, usage = os.wait4(process.pid, 0)
        elapsed = time.perf_counter() - start
        process.returncode = os.waitstatus_to_exitcode(status)
        errors.seek(0)
        first = (errors.read().decode(errors="replace").strip().splitlines() or [""])[0]
    return elapsed, usage.ru_maxrss / 1024, process.returncode, first


def wall_time(args: list[str], runs: int) -> tuple[float, float]:
    """Median wall time (s) and the largest peak memory (MB) of running `args`, exit codes 0 and 1 both fine."""
    times, peaks = [], []
    for _ in range(runs):
        elapsed, peak, code, first = measured(args)
        times.append(elapsed)
        peaks.append(peak)
        if code not in (0, 1):
            raise SystemExit(f"{' '.join(args)} failed ({code}): {first}")
    return statistics.median(times), max(peaks)


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
        print(f"five spans, two patterned cases in one combination: {4 ** SPANS} arrangements; median of {options.runs} runs")
        for label, command in (("(a) sizer check", ["check"]), ("(b) sizer size --top 1", ["size", "--top", "1"])):
            base, base_peak = wall_time([SIZER, *command, str(plain)], options.runs)
            slow, slow_peak = wall_time([SIZER, *command, str(patterned)], options.runs)
            print(f"{label}: unpatterned {base:.2f} s, patterned {slow:.2f} s, ratio {slow / base:.1f}; "
                  f"peak memory {base_peak:.0f} MB and {slow_peak:.0f} MB, ratio {slow_peak / base_peak:.1f}")
        envelope, _ = wall_time([SIZER, "forces", str(patterned), "--envelope", "--json"], options.runs)
        print(f"(c) sizer forces --envelope --json, patterned: {envelope:.2f} s")
        in_process(patterned)
        ten = Path(folder) / "ten.toml"
        ten.write_text(MEMBER.replace(SUPPORTS, supports(10)).replace(f'length = "{SPANS * BAY:g} m"', f'length = "{10 * BAY:g} m"'), encoding="utf-8")
        elapsed, peak, code, first = measured([SIZER, "check", str(ten)])
        print(f"(e) ten spans, two patterned cases ({4 ** 10} arrangements): sizer check exit {code} in {elapsed:.2f} s, "
              f"peak memory {peak:.0f} MB" + (f": {first}" if code == 2 else ""))
        if not options.no_profile:
            profile(patterned)


if __name__ == "__main__":
    main()
