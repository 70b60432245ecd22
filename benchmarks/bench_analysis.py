"""Timing of the member analysis on a busy member: 50 loads in 5 cases, 10 combinations, 2000 stations.

Run: .venv/bin/python benchmarks/bench_analysis.py
Prints the best of several repeats (time.perf_counter) of: solving every case, the actions of every
combination at the stations, the same including the solve, the displacements, and the extremes.
Target (issue requirement): actions at 2000 stations for all combinations in under 50 ms.
"""

from __future__ import annotations

import time
from typing import Callable

import numpy as np

from sizer.analysis import extremes, solve_member
from sizer.model import SUPPORT_TYPES, Hinge, LineLoad, Load, Member, PointLoad, Stiffness, Support

LENGTH = 12.0
N_LOADS, N_CASES, N_COMBINATIONS, N_STATIONS = 50, 5, 10, 2000
REPEATS = 20
STEEL_IPE300 = Stiffness(EA=200e9 * 53.8e-4, GJ=77e9 * 20.1e-8, EIz=200e9 * 8356e-8, EIy=200e9 * 604e-8)


def busy_member(seed: int = 1) -> Member:
    """A four-support member with a hinge, 50 random 3-D point and line loads in 5 cases."""
    rng = np.random.default_rng(seed)
    cases = [f"case{i}" for i in range(N_CASES)]
    loads: list[Load] = []
    for index in range(N_LOADS):
        case = cases[index % N_CASES]
        if index % 2:
            at = float(rng.uniform(0.0, LENGTH))
            loads.append(PointLoad(case, at, tuple(rng.uniform(-20e3, 20e3, 3)), tuple(rng.uniform(-5e3, 5e3, 3))))
        else:
            start, end = sorted(rng.uniform(0.0, LENGTH, 2))
            loads.append(LineLoad(case, float(start), float(end), tuple(rng.uniform(-5e3, 5e3, 4)), tuple(rng.uniform(-5e3, 5e3, 4))))
    combinations = {f"combination {j}": {case: float(rng.uniform(0.0, 1.6)) for case in cases} for j in range(N_COMBINATIONS)}
    supports = (Support(0.0, SUPPORT_TYPES["pin"], label="pin"), Support(4.0, SUPPORT_TYPES["roller"], label="roller"),
                Support(8.0, SUPPORT_TYPES["roller"], label="roller"), Support(LENGTH, SUPPORT_TYPES["fixed"], label="fixed"))
    return Member(length=LENGTH, material="steel", supports=supports, loads=tuple(loads), combinations=combinations,
                  self_weight_case="case0", hinges=(Hinge(9.5),))


def best_of(fn: Callable[[], object], repeats: int = REPEATS) -> float:
    """Shortest wall time of `repeats` calls (s)."""
    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        fn()
        times.append(time.perf_counter() - start)
    return min(times)


def main() -> None:
    member = busy_member()
    x = np.linspace(0.0, LENGTH, N_STATIONS)
    mass = 42.2  # kg/m
    solution = solve_member(member, STEEL_IPE300, mass)
    figures = {
        "solve every case (solve_member)": best_of(lambda: solve_member(member, STEEL_IPE300, mass)),
        "actions, all combinations (all_actions)": best_of(lambda: solution.all_actions(x)),
        "solve + actions, all combinations": best_of(lambda: solve_member(member, STEEL_IPE300, mass).all_actions(x)),
        "displacements, all combinations": best_of(lambda: solution.all_displacements(x)),
        "extremes, one combination": best_of(lambda: extremes(solution, "combination 0")),
    }
    print(f"member: {N_LOADS} loads, {N_CASES} cases (+ self weight), {N_COMBINATIONS} combinations, "
          f"{N_STATIONS} stations; best of {REPEATS}")
    for name, seconds in figures.items():
        print(f"  {name:<42} {seconds * 1e3:8.2f} ms")
    target = figures["solve + actions, all combinations"] * 1e3
    print(f"target: actions for all combinations under 50 ms -> {'met' if target < 50 else 'NOT met'} ({target:.2f} ms with the solve)")


if __name__ == "__main__":
    main()
