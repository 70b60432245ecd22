"""Speed figures for dense point restraints (a plain script; not part of the test suite).

    .venv/bin/python benchmarks/bench_restraints.py [--counts 10,100,240,1000] [--runs N]

An invented member: a 6 m IPE 300 on forks under hogging end moments, its top flange held sideways
by N point restraints evenly spaced (cleats of a deck), and the same member with a continuous
restraint. Prints for each N:
  (a)  `sizer check` wall time (median of N runs, subprocess, the shipped catalogue)
  (b)  in-process: the stability model and one converged lateral-torsional solve of the section
       (build and solve separately), the mesh's freedoms, and the load factor against the
       continuous restraint's (the point holds leave the slopes free: at most the continuous one)
Targets (issue 25): 240 restraints not minutes, 1000 in seconds.
"""

from __future__ import annotations

import argparse
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

from sizer.cli import single_threaded_blas

single_threaded_blas()  # before numpy loads, as the sizer command does

from sizer.analysis import solve_member  # noqa: E402
from sizer.api import member_from_text  # noqa: E402
from sizer.model import Stiffness  # noqa: E402
from sizer.stability import MemberStability, StabilitySection  # noqa: E402

LENGTH = 6.0  # m
E, G = 200e9, 77e9  # Pa
IPE300 = StabilitySection(EIz=E * 8356e-8, EIy=E * 604e-8, EIyz=0.0, GJ=G * 20.1e-8, EIw=E * 125.9e-9, area=53.8e-4, Iz=8356e-8,
                          Iy=604e-8, Iyz=0.0, y0=0.0, z0=0.0, Py=0.0, Pz=0.0, y_top=0.15, y_bottom=0.15)  # handbook values


def member_text(count: int) -> str:
    """The member file with `count` point restraints (0: one continuous restraint)."""
    if count:
        restraints = "".join(f'[[restraints]]\nat = "{LENGTH * (i + 0.5) / count:.6f} m"\nhold = ["lateral"]\nheight = "top"\n'
                             for i in range(count))
    else:
        restraints = f'[[restraints]]\nfrom = "0 m"\nto = "{LENGTH} m"\nhold = ["lateral"]\nheight = "top"\n'
    return (f'title = "dense restraints ({count})"\n[member]\nlength = "{LENGTH} m"\nmaterial = "mild-steel"\nsection = "IPE 300"\n'
            f'self_weight = false\n[[supports]]\nat = "0 m"\ntype = "pin"\n[[supports]]\nat = "{LENGTH} m"\ntype = "roller"\n'
            f'[[loads]]\ntype = "moment"\nat = "0 m"\nmz = "40 kN*m"\n[[loads]]\ntype = "moment"\nat = "{LENGTH} m"\nmz = "-40 kN*m"\n'
            + restraints)


def in_process(count: int) -> tuple[float, float, int, float]:
    """(build s, solve s, freedoms, load factor) of one converged lateral solve."""
    member = member_from_text(member_text(count))
    start = time.perf_counter()
    solution = solve_member(member, Stiffness.unit(), None)
    model = MemberStability(member, solution)
    built = time.perf_counter()
    found = model.lateral_buckling(IPE300, solution.weights(None)[0])
    return built - start, time.perf_counter() - built, model.mesh.size, found.load_factor


def check_time(count: int, runs: int, folder: Path) -> float:
    path = folder / f"restraints_{count}.toml"
    path.write_text(member_text(count))
    times = []
    for _ in range(runs):
        start = time.perf_counter()
        subprocess.run([str(Path(sys.executable).with_name("sizer")), "check", str(path)], capture_output=True, check=False)
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--counts", default="10,100,240,1000")
    parser.add_argument("--runs", type=int, default=3)
    args = parser.parse_args()
    counts = [int(text) for text in args.counts.split(",")]
    _, _, _, continuous = in_process(0)
    print(f"continuous restraint: load factor {continuous:.6g}")
    with tempfile.TemporaryDirectory() as folder:
        for count in counts:
            build, solve, size, factor = in_process(count)
            wall = check_time(count, args.runs, Path(folder))
            print(f"{count:5d} restraints: (a) sizer check {wall:6.2f} s   (b) build {build:5.2f} s, solve {solve:5.2f} s, "
                  f"{size} freedoms, load factor {factor:.6g} = {factor / continuous:.5f} x continuous")


if __name__ == "__main__":
    main()
