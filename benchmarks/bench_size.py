"""Speed figures for `sizer size` on a catalogue of 1000 generated I-sections (a plain script; not part
of the test suite).

    .venv/bin/python benchmarks/bench_size.py [--workdir DIR] [--runs N] [--no-profile] [--by mass|cost|depth]

Writes the catalogue (the generated sections and a copy of the shipped materials file, for the
member's mild-steel) and its own section cache into a temporary folder (or DIR, kept and reused:
a second run skips the cold build), then prints:
  cold build   `sizer sections build --catalogue DIR`, seconds per section
  (a)          `sizer --help` wall time (median of N runs, subprocess)
  (b)          `sizer size MEMBER --catalogue DIR [--by B]` wall time (median, subprocess, warm cache), ratio to (a);
               (a) and (b) run in turn, and the median of the N pairs' ratios is shown too
  (b0)         what `size` pays before it sizes anything: the interpreter importing the modules the
               command imports (numpy, sizer's analysis, sections, checks, sizing and renderers), ratio to (a)
  (c)          screening throughput: sections x combinations x stations / time of sizing.screen (in-process)
  (d)          the naive way: full stress-field check of a sample of sections, extrapolated to the whole
               catalogue, against the measured size_member time; and the naive answer on the sample
               around the chosen section
  (e)          `sizer size --by cost` against `sizer size` (by mass), run in turn: median wall times and ratio
               (the catalogue carries invented prices that vary by size, and stock lengths of 6, 8 and 12 m)
  profile      the top 25 lines of `python -m cProfile -s cumtime` over `sizer size`
Targets (issues 5, 11 and 28, the member unbraced): (b)/(a) <= 2.5, (c) >= 50 million station-checks per second, (d) >= 100,
(e) <= 1.2.
"""

from __future__ import annotations

import argparse
import itertools
import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

from sizer.cli import single_threaded_blas

single_threaded_blas()  # before numpy loads, as the sizer command does, so the in-process figures match it

from sizer.sections import shipped_library  # noqa: E402

VENV_BIN = Path(sys.executable).parent
SIZER = str(VENV_BIN / "sizer")
# what `sizer size` imports before it sizes anything (the command line, the api, the renderer of its output), as the
# command does it: the command line first, then (sizer.cli.main) the kept compiled methods of dataclasses, then the rest
SIZE_IMPORTS = ("import sizer.cli; from sizer import method_cache; method_cache.install(); "
                "import sizer.api, sizer.commands, sizer.inputfile, sizer.render.size, sizer.render.sections, sizer.sizing, "
                "rich.console, rich.panel")

# An invented member: a mezzanine edge beam continuous over three supports with a short overhang,
# carrying floor loads, a wind load across it and a bracing force along it. 3 cases, 6 combinations.
# Unbraced between its supports: every candidate is judged for lateral-torsional, flexural-torsional
# and local buckling as well (the eigen-solves and their Rayleigh-Ritz bounds are in every figure).
MEMBER = """title = "Generated-catalogue benchmark: mezzanine edge beam (invented)"

[member]
length = "7.5 m"
material = "mild-steel"
self_weight = "dead"

[[supports]]
at = "0 m"
type = "pin"
[[supports]]
at = "3.6 m"
type = "roller"
[[supports]]
at = "6.6 m"
type = "roller"

[[loads]]
type = "line"
case = "dead"
wy = "-3.2 kN/m"
[[loads]]
type = "line"
case = "imposed"
from = "0 m"
to = "6.6 m"
wy = "-7.5 kN/m"
wy_end = "-5 kN/m"
[[loads]]
type = "point"
case = "imposed"
at = "1.8 m"
fy = "-18 kN"
[[loads]]
type = "point"
case = "imposed"
at = "7.5 m"
fy = "-6 kN"
[[loads]]
type = "line"
case = "wind"
wz = "1.2 kN/m"
[[loads]]
type = "point"
case = "wind"
at = "7.5 m"
fx = "-30 kN"

[combinations]
"dead" = { dead = 1.0 }
"dead + imposed" = { dead = 1.0, imposed = 1.0 }
"dead + wind" = { dead = 1.0, wind = 1.0 }
"dead + imposed + wind" = { dead = 1.0, imposed = 0.75, wind = 0.75 }
"uplift" = { dead = 0.6, wind = 1.0 }
"dead + imposed, factored" = { dead = 1.2, imposed = 1.6 }

[checks]
deflection_limit = 300
deflection_combinations = ["dead + imposed", "dead + imposed + wind"]
"""


def generated_sections() -> list[str]:
    """1000 [[sections]] entries of shape i_beam: 10 depths x 5 widths x 5 flange x 4 web thicknesses,
    each a fixed fraction of the depth (so every name is unique), root radius 1.2 x web."""
    depths = [200 + 50 * i for i in range(10)]  # mm
    width_ratios = (0.35, 0.42, 0.5, 0.6, 0.75)
    flange_ratios = (0.03, 0.038, 0.046, 0.055, 0.065)
    web_ratios = (0.022, 0.027, 0.032, 0.038)
    entries = []
    for depth, wr, fr, ww in itertools.product(depths, width_ratios, flange_ratios, web_ratios):
        width, flange, web = round(depth * wr), round(depth * fr, 1), round(depth * ww, 1)
        radius = round(1.2 * web, 1)
        entries.append(f'[[sections]]\nname = "GEN {depth}x{width}x{flange:g}x{web:g}"\nshape = "i_beam"\nfamily = "gen"\n'
                       f'depth = "{depth} mm"\nwidth = "{width} mm"\nflange_thickness = "{flange:g} mm"\n'
                       f'web_thickness = "{web:g} mm"\nroot_radius = "{radius:g} mm"\n')
    return entries


def generated_prices() -> str:
    """Invented purchase terms: a currency, the family's stock lengths, and a price per kg on every
    section that grows with the width ratio and varies with the depth (so the cheapest is not the lightest)."""
    return 'currency = "EUR"\n\n[families.gen]\nstock_lengths = ["6 m", "8 m", "12 m"]\ncost_per_kg = 1.2\n\n'


def priced(entry: str, index: int) -> str:
    """A generated entry with its own invented price (every fifth keeps the family's)."""
    if index % 5 == 0:
        return entry
    return entry + f"cost_per_kg = {1.0 + 0.07 * (index % 7) + 0.04 * (index % 3):.2f}\n"


def write_inputs(workdir: Path) -> tuple[Path, Path, int]:
    catalogue = workdir / "catalogue"
    catalogue.mkdir(parents=True, exist_ok=True)
    entries = generated_sections()
    (catalogue / "generated.toml").write_text(generated_prices() + "\n".join(priced(entry, k) for k, entry in enumerate(entries)), encoding="utf-8")
    (catalogue / "materials.toml").write_text((shipped_library() / "materials.toml").read_text(encoding="utf-8"), encoding="utf-8")
    member = workdir / "mezzanine_beam.toml"
    member.write_text(MEMBER, encoding="utf-8")
    return catalogue, member, len(entries)


def wall_time(command: list[str], env: dict[str, str], expect: tuple[int, ...] = (0,)) -> float:
    start = time.perf_counter()
    done = subprocess.run(command, env=env, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
    seconds = time.perf_counter() - start
    if done.returncode not in expect:
        raise SystemExit(f"{' '.join(command)} exited {done.returncode}: {done.stderr}")
    return seconds


def paired_times(first: list[str], second: list[str], env: dict[str, str], runs: int) -> tuple[list[float], list[float]]:
    """Wall times of two commands run in turn `runs` times (the first must exit 0, the second 0 or 1),
    so that a machine whose speed drifts (shared with other work) slows both alike."""
    pairs = [(wall_time(first, env, (0,)), wall_time(second, env)) for _ in range(runs)]
    return [a for a, _ in pairs], [b for _, b in pairs]


def in_process_median(work, runs: int) -> float:
    times = []
    for _ in range(runs):
        start = time.perf_counter()
        work()
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--workdir", type=Path, default=None, help="keep the catalogue and cache here (reused when present)")
    parser.add_argument("--runs", type=int, default=5, help="runs per median")
    parser.add_argument("--no-profile", action="store_true")
    parser.add_argument("--by", choices=("mass", "cost", "depth"), default="mass", help="the ranking (b) and the profile use")
    args = parser.parse_args()
    workdir = args.workdir or Path(tempfile.mkdtemp(prefix="sizer-bench-size-"))
    workdir.mkdir(parents=True, exist_ok=True)
    catalogue, member, count = write_inputs(workdir)
    env = dict(os.environ, SIZER_CACHE_DIR=str(workdir / "cache"), COLUMNS="120")
    env.pop("PYTHONDONTWRITEBYTECODE", None)  # as on a user's machine: compiled modules are kept between runs
    os.environ["SIZER_CACHE_DIR"] = env["SIZER_CACHE_DIR"]
    print(f"cores: {os.cpu_count()}, catalogue: {count} i_beam sections in {catalogue}, cache: {env['SIZER_CACHE_DIR']}")

    seconds = wall_time([SIZER, "sections", "build", "--catalogue", str(catalogue)], env)
    print(f"build: {seconds:.1f} s = {seconds / count * 1e3:.1f} ms per section "
          "(cold unless --workdir already held the cache; process start-up and imports included)")

    size_command = [SIZER, "size", str(member), "--catalogue", str(catalogue), "--by", args.by]
    wall_time(size_command, env)  # the first run after a change compiles sizer's modules, as an install does once
    help_runs, size_runs = paired_times([SIZER, "--help"], size_command, env, args.runs)
    help_time, size_time = statistics.median(help_runs), statistics.median(size_runs)
    ratios = [b / a for a, b in zip(help_runs, size_runs)]
    print(f"(a) sizer --help: median {help_time:.3f} s of {args.runs} ({', '.join(f'{t:.2f}' for t in help_runs)})")
    print(f"(b) sizer size, 1000 sections, warm cache: median {size_time:.3f} s of {args.runs} ({', '.join(f'{t:.2f}' for t in size_runs)}); "
          f"ratio to --help {size_time / help_time:.2f}x of the medians, {statistics.median(ratios):.2f}x the median of the pairs "
          f"run in turn (target <= 2.5x)")

    imports_alone = statistics.median(wall_time([sys.executable, "-c", SIZE_IMPORTS], env) for _ in range(args.runs))
    print(f"(b0) the imports of `size` alone, nothing sized: median {imports_alone:.3f} s, {imports_alone / help_time:.2f}x (a); "
          f"sizing, checking and printing take the remaining {size_time - imports_alone:.3f} s")

    in_process_figures(member, catalogue, args.runs)
    by_mass, by_cost = paired_times([SIZER, "size", str(member), "--catalogue", str(catalogue)],
                                    [SIZER, "size", str(member), "--catalogue", str(catalogue), "--by", "cost"], env, args.runs)
    cost_ratios = [b / a for a, b in zip(by_mass, by_cost)]
    print(f"(e) sizer size --by cost: median {statistics.median(by_cost):.3f} s against {statistics.median(by_mass):.3f} s by mass, "
          f"run in turn {args.runs} times; ratio {statistics.median(by_cost) / statistics.median(by_mass):.2f}x of the medians, "
          f"{statistics.median(cost_ratios):.2f}x the median of the pairs (target <= 1.2x)")
    if not args.no_profile:
        profile(size_command, env)


def in_process_figures(member_path: Path, catalogue_path: Path, runs: int) -> None:
    """(c) screening throughput and (d) the naive full-field way against size_member."""
    from sizer.analysis import solve_member, stations
    from sizer.checks import check_design, check_stations, deflection_check, full_field_stresses, member_actions, to_section_axes
    from sizer.design import catalogue_for, resolve_material
    from sizer.inputfile import read_member_file
    from sizer.model import Stiffness
    from sizer.sections import unit_stress_field
    from sizer.sections.properties import clear_memory
    from sizer.sizing import candidate_sections, design_for, screen, size_member

    clear_memory()
    phases = {}
    start = time.perf_counter()
    member = read_member_file(member_path)
    phases["read member file"] = time.perf_counter() - start
    start = time.perf_counter()
    catalogue = catalogue_for(member, [catalogue_path])
    material = resolve_material(member, catalogue)
    phases["read catalogue (TOML, units)"] = time.perf_counter() - start
    start = time.perf_counter()
    candidates, table = candidate_sections(catalogue, member, material, (), None, None)
    phases["section table from the disk cache"] = time.perf_counter() - start
    start = time.perf_counter()
    base = solve_member(member, Stiffness.unit(), None)
    phases["unit-rigidity solve"] = time.perf_counter() - start
    print("    in-process phases before the screen (warm disk cache, memory cleared): "
          + "; ".join(f"{name} {seconds * 1e3:.0f} ms" for name, seconds in phases.items()))
    n_stations = len(stations(member)[0])
    combinations = len(member.combinations)
    screen(table, member, material, base)  # warm-up (arrays, first numpy calls)
    screen_time = in_process_median(lambda: screen(table, member, material, base), runs)
    work = len(candidates) * combinations * n_stations
    print(f"(c) screen: {len(candidates)} sections x {combinations} combinations x {n_stations} stations = {work:,} station-checks "
          f"in {screen_time * 1e3:.1f} ms (median of {runs}) = {work / screen_time / 1e6:.1f} million/s (target >= 50)")

    result = size_member(member, catalogue, material)
    size_time = in_process_median(lambda: size_member(member, catalogue, material), runs)
    chosen = result.chosen
    position = result.candidates.index(chosen) if chosen else len(result.candidates) // 2
    print(f"    size_member in-process (warm, fields in memory after the first run): median {size_time:.3f} s; "
          f"chosen {chosen.name if chosen else None} at position {position} of {len(result.candidates)} by mass, "
          f"{result.full_checks} full stress-field checks")

    fresh = candidate_sections(catalogue, member, material, (), None, None)[0]
    sample = fresh[max(0, position - 10):position + 10]

    def naive_one(candidate, from_disk: bool) -> bool:
        """The naive way: solve this section, then the full stress field at every node of every
        station of every combination (no bounds, no pruning), deflections, and the verdict."""
        if from_disk:
            clear_memory()
        design = design_for(member, material, candidate)
        xs, sides = check_stations(design)
        actions = to_section_axes(member_actions(design, xs, sides), member.orientation)
        stress = full_field_stresses(actions, unit_stress_field(candidate.spec), candidate.props.area)
        allow = material.allowable
        worst = max(stress.bending.max() / allow.bending, stress.shear.max() / allow.shear,
                    stress.equivalent.max() / allow.equivalent, abs(stress.axial).max() / allow.compression,
                    deflection_check(design).utilization or 0.0)
        return check_design(design, unit_stress_field(candidate.spec)).passes if worst <= 1.0 else False

    for label, from_disk in (("unit fields read from the disk cache", True), ("unit fields already in memory", False)):
        start = time.perf_counter()
        verdicts = [naive_one(candidate, from_disk) for candidate in sample]
        per_section = (time.perf_counter() - start) / len(sample)
        naive_total = per_section * len(fresh)
        print(f"(d) naive way, every node at every station ({label}): {per_section * 1e3:.1f} ms per section x {len(fresh)} = "
              f"{naive_total:.1f} s; size_member {size_time:.3f} s; ratio {naive_total / size_time:.0f}x (target >= 100x)")
    start = time.perf_counter()
    for candidate in sample:
        check_design(design_for(member, material, candidate), unit_stress_field(candidate.spec))
    ordered = (time.perf_counter() - start) / len(sample)
    print(f"    for comparison, sizer's own full check (stations in order of their stress bound): {ordered * 1e3:.1f} ms per section")
    naive_choice = next((c.name for c, passes in zip(sample, verdicts) if passes), None)  # the lightest passing in the sample
    agrees = naive_choice == (chosen.name if chosen else None)
    print(f"    naive answer on the {len(sample)} sections around the choice (by mass): {naive_choice} "
          f"({'same as' if agrees else 'DIFFERENT FROM'} size_member); verdicts {''.join('P' if v else 'f' for v in verdicts)}")


def profile(size_command: list[str], env: dict[str, str]) -> None:
    """The top 25 lines of cProfile's cumulative-time listing over one `sizer size` run."""
    done = subprocess.run([sys.executable, "-m", "cProfile", "-s", "cumtime", *size_command], env=env,
                          capture_output=True, text=True)
    lines = done.stdout.splitlines()
    start = next((i for i, line in enumerate(lines) if "ncalls" in line and "cumtime" in line), None)
    if start is None:
        print("profile: no cProfile listing found:", done.stderr[-500:])
        return
    header = next((line for line in lines[:start] if "function calls" in line), "")
    print("profile of `sizer size` (python -m cProfile -s cumtime):", header.strip())
    print("\n".join(lines[start:start + 26]))


if __name__ == "__main__":
    main()
