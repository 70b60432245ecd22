"""Speed and mesh figures for sizer.sections (a plain script; not part of the test suite).

    .venv/bin/python benchmarks/bench_sections.py [--skip-convergence]

Prints: sectionproperties import time; cold analysis of one IPE 300 in one process (geometric,
warping, plastic and the unit stress fields); a cold parallel build of the shipped catalogue; warm
look-ups from disk and from memory; loading unit stress fields; J at the mesh rule against a mesh
with elements 9 times smaller in area.
"""

from __future__ import annotations

import os
import statistics
import sys
import tempfile
import time


def timed(work) -> float:
    start = time.perf_counter()
    work()
    return time.perf_counter() - start


def main() -> None:
    os.environ["SIZER_CACHE_DIR"] = tempfile.mkdtemp(prefix="sizer-bench-")
    from sizer.sections import build_catalogue, load_catalogue, section_properties, shipped_library, unit_stress_field
    from sizer.sections.properties import clear_memory, compute

    catalogue = load_catalogue([shipped_library()])
    specs = list(catalogue.sections.values())
    print(f"cores: {os.cpu_count()}, load average {os.getloadavg()[0]:.1f}, shipped catalogue: {len(specs)} sections, cache: {os.environ['SIZER_CACHE_DIR']}")

    print(f"import sectionproperties: {timed(lambda: __import__('sectionproperties.analysis')):.2f} s (once per process)")
    ipe = catalogue.get("IPE 300")
    cpu_start = time.process_time()
    runs = [timed(lambda: compute(ipe)) for _ in range(3)]
    cpu = (time.process_time() - cpu_start) / len(runs)
    print(f"cold IPE 300 in one process (mesh, geometric, warping, plastic, unit stress fields): median {statistics.median(runs):.3f} s "
          f"wall of {len(runs)}, {cpu:.3f} s CPU each")

    summary = build_catalogue(specs)
    print(f"cold build of the shipped catalogue: {summary.seconds:.1f} s for {summary.computed} sections with {summary.workers} processes "
          f"= {summary.seconds / summary.computed:.3f} s per section (process start-up and imports included)")

    laps = -(-1000 // len(specs))

    def from_disk() -> None:
        for _ in range(laps):
            clear_memory()
            for spec in specs:
                section_properties(spec, 7850.0)

    seconds = timed(from_disk)
    print(f"warm look-ups from the disk cache (memory cleared each lap): {laps * len(specs)} in {seconds:.3f} s")
    seconds = timed(lambda: [section_properties(spec, 7850.0) for _ in range(laps) for spec in specs])
    print(f"warm look-ups held in memory: {laps * len(specs)} in {seconds:.4f} s")
    clear_memory()
    seconds = timed(lambda: [unit_stress_field(spec) for spec in specs])
    nodes = statistics.median(unit_stress_field(spec).sigma.shape[1] for spec in specs)
    print(f"unit stress fields from disk: {len(specs)} in {seconds:.3f} s ({1e3 * seconds / len(specs):.2f} ms each, median {nodes:.0f} nodes)")
    print(f"sectionproperties imported by the warm path: {'yes' if 'sectionproperties' in sys.modules else 'no'} (it was imported above for the cold runs)")

    if "--skip-convergence" not in sys.argv:
        convergence(catalogue)


def convergence(catalogue) -> None:
    """J at the mesh rule against a mesh 9 times finer (by element area)."""
    from sectionproperties.analysis import Section

    from sizer.sections import section_properties
    from sizer.sections.geometry import max_element_area, outline

    print("mesh rule convergence: J(rule) / J(9x finer) - 1")
    for name in ("FL 80x10", "RD 32", "RHS 100x50x4", "CHS 90x5", "L 75x50x6", "C 150x75x6", "IPE 80", "IPE 300", "IPE 600", "HE 200 A", "HE 500 A"):
        spec = catalogue.get(name)
        rule = section_properties(spec)
        geometry = outline(spec)
        geometry.create_mesh(mesh_sizes=max_element_area(spec, geometry) / 9)
        fine = Section(geometry)
        fine.calculate_geometric_properties()
        fine.calculate_warping_properties()
        print(f"  {name:14s} {rule.mesh_elements:5d} vs {len(fine.elements):5d} elements: {100 * (rule.J / (fine.get_j() * 1e-12) - 1):+.3f} %")


if __name__ == "__main__":
    main()
