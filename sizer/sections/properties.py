"""Section properties and unit stress fields in member axes and SI units, in three tiers, each
computed when something first needs it and then kept (in memory, and on disk with a digest):

- geometric (sizer.sections.geometric): what the outline alone settles, exact for the outline
  polygon, in well under a millisecond and without sectionproperties; a list of sections is kept
  as one table file (cache.py);
- torsion and warping (sizer.sections.warping): J, Iw, shear centre, shear areas, plastic moduli
  and the peak shear stresses per unit action, from a finite-element solution on the outline's
  mesh (sizer.sections.tri6: sectionproperties' formulation, every element at once, a few
  hundredths of a second a section); kept per geometry as a JSON entry;
- unit stress fields: the same analysis' stresses at every mesh node, kept beside that entry as a
  raw array file and read only when a full check needs them.

The sizing reads the geometric tier of every candidate and asks for the others section by section
(sizer.sizing); `section_properties`, `section_table` and `build_catalogue` give every tier.

Axes. A section is drawn with its depth along sectionproperties' Y axis, "across" along its X
axis, and sectionproperties' Z out of the drawing. The member's axes (docs/design.md section 2) are
    member x = Z (the member axis, towards the viewer: we look at the +x cut face),
    member y = Y (depth, up),
    member z = -X (so x, y, z is right-handed: z points left in the drawing).
Hence Iz = ixx_c (about the horizontal axis: the major axis of an I-beam), Iy = iyy_c and
Iyz = integral of y z dA = -ixy_c. Actions map member -> sectionproperties as
    n = N, vy = Vy, vx = -Vz, mzz = T, mxx = -Mz, myy = My,
and stresses back as sigma_xx = sig_zz, tau_xy = sig_zy, tau_xz = -sig_zx. So a positive (sagging)
Mz gives sigma = -Mz y / Iz (compression at the top, y > 0) and a positive My gives
sigma = +My z / Iy for a symmetric section.

SectionProperties fields (SI: m, m^2, m^3, m^4, m^6, kg/m, rad):
    area; centroid (y, z) from the centre of the bounding box; Iz, Iy, Iyz about the centroid;
    I11 >= I22 principal values, principal_angle in [-pi/2, pi/2) from the z axis to the 11
    axis, positive about +x (so I11 = Iz cos^2 a + Iy sin^2 a + Iyz sin 2a); elastic moduli
    Sz_top = Iz / y_top, Sz_bottom = Iz / y_bottom (fibres at the top, y > 0, and bottom),
    Sy_plus = Iy / z_plus, Sy_minus = Iy / z_minus (fibres at +z and -z);
    y_top, y_bottom, z_plus, z_minus: distances from the centroid to those extreme fibres;
    plastic moduli Zz, Zy; radii of gyration rz, ry; torsion constant J; warping constant Iw;
    shear_centre (ys, zs) from the centroid; Py = integral y (y^2 + z^2) dA and Pz = integral
    z (y^2 + z^2) dA (m^5) about the centroid, the integrals of the monosymmetry constants
    (beta_y = Py / Iz - 2 ys; sectionproperties' beta_x_minus); shear areas Avy, Avz (for shear along y and z);
    depth and width of the bounding box; perimeter; sigma_peak (3,) max |sigma| (Pa) per unit
    N (N), My (N*m), Mz (N*m); tau_peak (3,) max |tau| (Pa) per unit Vy (N), Vz (N), T (N*m);
    mass_per_length = area * density (None without a density).

The geometric tier's scalars agree with sectionproperties' geometric analysis of the same outline
to round-off (tests/test_tiers.py), since both integrate polynomials exactly over the polygon.
Stresses per unit action are nodal-averaged values at the mesh nodes (corner and mid-side nodes)
of the Saint-Venant elasticity solution with Poisson's ratio 0, loads through the shear centre, as
sectionproperties computes them on the same mesh (tests/test_tiers.py holds them to it). At sharp
re-entrant corners (zero radii) the true elastic peak is unbounded and the nodal value grows as the
mesh is refined; give radii where they exist.
"""

from __future__ import annotations

import time
from collections import OrderedDict
from dataclasses import dataclass, field
from functools import cached_property
from typing import Any, Callable, Iterator, Sequence

import numpy as np

from sizer.errors import InputError
from sizer.sections import cache
from sizer.sections.fields import UnitStressField
from sizer.sections.geometric import GEOMETRIC_NAMES, geometric_scalars
from sizer.sections.spec import SectionSpec
from sizer.sections.warping import WARPING_NAMES
from sizer.sections.warping import compute as compute_warping
from sizer.workers import Workers, error_result, result_error

SCALAR_NAMES: tuple[str, ...] = (
    "area", "centroid_y", "centroid_z", "Iz", "Iy", "Iyz", "I11", "I22", "principal_angle",
    "Sz_top", "Sz_bottom", "Sy_plus", "Sy_minus", "y_top", "y_bottom", "z_plus", "z_minus",
    "Zz", "Zy", "rz", "ry", "J", "Iw", "ys", "zs", "Py", "Pz", "Avy", "Avz", "depth", "width", "perimeter",
    "sigma_peak_N", "sigma_peak_My", "sigma_peak_Mz", "tau_peak_Vy", "tau_peak_Vz", "tau_peak_T",
    "mesh_elements", "mesh_nodes", "max_element_area",
)
assert set(SCALAR_NAMES) == set(GEOMETRIC_NAMES) | set(WARPING_NAMES) and not set(GEOMETRIC_NAMES) & set(WARPING_NAMES)
SIGMA_PEAK_NAMES = ("sigma_peak_N", "sigma_peak_My", "sigma_peak_Mz")  # per unit N, My, Mz
TAU_PEAK_NAMES = ("tau_peak_Vy", "tau_peak_Vz", "tau_peak_T")  # per unit Vy, Vz, T
FIELD_MEMORY = 64  # unit stress fields kept in memory (least recently used dropped)
# fewer missing sections than this are computed in this process unless workers are already running:
# a worker's start-up and imports (about 0.5 s) outweigh the gain at a few hundredths of a second a section
PARALLEL_FROM = 32


@dataclass(frozen=True, eq=False)
class SectionProperties:
    """Properties of one catalogue section in member axes, SI (see the module docstring)."""

    name: str
    shape: str
    area: float
    centroid: tuple[float, float]
    Iz: float
    Iy: float
    Iyz: float
    I11: float
    I22: float
    principal_angle: float
    Sz_top: float
    Sz_bottom: float
    Sy_plus: float
    Sy_minus: float
    y_top: float
    y_bottom: float
    z_plus: float
    z_minus: float
    Zz: float
    Zy: float
    rz: float
    ry: float
    J: float
    Iw: float
    shear_centre: tuple[float, float]
    Py: float
    Pz: float
    Avy: float
    Avz: float
    depth: float
    width: float
    perimeter: float
    sigma_peak: tuple[float, float, float]
    tau_peak: tuple[float, float, float]
    mesh_elements: int
    mesh_nodes: int
    max_element_area: float
    density: float | None
    mass_per_length: float | None
    spec: SectionSpec = field(repr=False)

    @cached_property
    def stress(self) -> UnitStressField:
        """The unit stress fields (loaded from the cache on first use)."""
        return unit_stress_field(self.spec)


# ----------------------------------------------------------------------------------------------
# public look-ups

# In memory, by geometry key (an entry key adds only what is fixed within a process): each tier's
# scalars as a row in its names' order (plain floats; a table's row until first used), and the
# unit stress fields last used.
_GEOMETRIC: dict[str, list[float] | np.ndarray] = {}
_WARPING: dict[str, list[float] | np.ndarray] = {}
_FIELDS: OrderedDict[str, UnitStressField] = OrderedDict()
_FROM_TIERS = tuple((name in GEOMETRIC_NAMES, (GEOMETRIC_NAMES if name in GEOMETRIC_NAMES else WARPING_NAMES).index(name))
                    for name in SCALAR_NAMES)


def section_properties(spec: SectionSpec, density: float | None = None) -> SectionProperties:
    """Properties of `spec`, every tier (kg/m^3 `density` gives the mass per length). Each tier from
    memory, then disk, else computed now and stored."""
    return _assemble(spec, _full_row(spec), density)


def section_properties_many(specs: Sequence[SectionSpec], density: float | None = None, workers: int | None = None,
                            progress: Callable[[int, int, str], None] | None = None) -> list[SectionProperties]:
    """Properties of many sections, read through section_table (those not cached are computed in
    parallel first)."""
    section_table(specs, workers, progress)
    return [section_properties(spec, density) for spec in specs]


def section_table(specs: Sequence[SectionSpec], workers: int | None = None,
                  progress: Callable[[int, int, str], None] | None = None) -> np.ndarray:
    """Every tier's scalars of `specs` as a float64 array (len(specs), len(SCALAR_NAMES)): row i is
    specs[i], columns in SCALAR_NAMES order, SI units and member axes as in SectionProperties.

    Read from one file when this list of sections was tabled before; else gathered from memory and
    the entries (missing ones computed in parallel, as build_catalogue does; `progress` as there)
    and stored as one file. Afterwards section_properties and peak_unit_stresses of these sections
    read no file."""
    geometry_keys = [spec.geometry_key() for spec in specs]
    key = cache.table_key(geometry_keys, SCALAR_NAMES)
    table = cache.read_table(key, (len(specs), len(SCALAR_NAMES)))
    if table is None:
        build_catalogue(specs, workers, progress, check_arrays=False)
        table = np.array([_full_row(spec) for spec in specs], dtype=np.float64).reshape(len(specs), len(SCALAR_NAMES))
        cache.write_table(key, table)
        return table
    geometric = [SCALAR_NAMES.index(name) for name in GEOMETRIC_NAMES]
    warping = [SCALAR_NAMES.index(name) for name in WARPING_NAMES]
    _GEOMETRIC.update(zip(geometry_keys, table[:, geometric]))  # fancy indexing: copies, the caller may change `table`
    _WARPING.update(zip(geometry_keys, table[:, warping]))
    if progress:
        geometries = len(set(geometry_keys))
        progress(geometries, geometries, "")  # as build_catalogue reports a catalogue with nothing to compute
    return table


def geometric_table(specs: Sequence[SectionSpec]) -> np.ndarray:
    """The geometric tier of `specs` (len(specs), len(GEOMETRIC_NAMES)), columns in GEOMETRIC_NAMES
    order: one table file when this list was tabled before, else computed from the outlines and
    stored as one file."""
    geometry_keys = [spec.geometry_key() for spec in specs]
    key = cache.table_key(geometry_keys, GEOMETRIC_NAMES)
    table = cache.read_table(key, (len(specs), len(GEOMETRIC_NAMES)))
    if table is None:
        table = np.array([geometric_row(spec) for spec in specs], dtype=np.float64).reshape(len(specs), len(GEOMETRIC_NAMES))
        cache.write_table(key, table)
        return table
    _GEOMETRIC.update(zip(geometry_keys, table.copy()))  # rows of a private copy: the caller may change `table`
    return table


def geometric_row(spec: SectionSpec) -> list[float]:
    """The geometric tier of `spec` in GEOMETRIC_NAMES order (memory, else computed: no file)."""
    return _plain(_GEOMETRIC, spec.geometry_key()) or _remember(_GEOMETRIC, spec.geometry_key(), geometric_scalars(spec), GEOMETRIC_NAMES)


def warping_row(spec: SectionSpec) -> list[float]:
    """The torsion-and-warping tier of `spec` in WARPING_NAMES order (memory, then disk, else
    computed now, in this process, and stored with the stress fields)."""
    if not has_warping(spec):
        _compute_and_store(spec)
    row = _plain(_WARPING, spec.geometry_key())
    assert row is not None  # in memory now
    return row


def has_warping(spec: SectionSpec) -> bool:
    """Whether the warping tier of `spec` is in memory or whole on disk (then it is kept in memory)."""
    geometry = spec.geometry_key()
    if geometry in _WARPING:
        return True
    entry = cache.read_entry(cache.entry_key(spec), WARPING_NAMES)
    if entry is None:
        return False
    _remember(_WARPING, geometry, entry["scalars"], WARPING_NAMES)
    return True


def peak_unit_stresses(spec: SectionSpec) -> tuple[np.ndarray, np.ndarray]:
    """(sigma_peak (3,), tau_peak (3,)): largest |stress| (Pa) per unit N, My, Mz and Vy, Vz, T."""
    geometric, warping = geometric_row(spec), warping_row(spec)
    return (np.array([geometric[GEOMETRIC_NAMES.index(name)] for name in SIGMA_PEAK_NAMES]),
            np.array([warping[WARPING_NAMES.index(name)] for name in TAU_PEAK_NAMES]))


def unit_stress_field(spec: SectionSpec) -> UnitStressField:
    """The unit stress fields of `spec` (memory, then disk, else recomputed and stored)."""
    geometry = spec.geometry_key()
    if geometry in _FIELDS:
        _FIELDS.move_to_end(geometry)
        return _FIELDS[geometry]
    key = cache.entry_key(spec)
    entry = cache.read_entry(key, WARPING_NAMES)
    arrays = cache.read_arrays(key, entry) if entry is not None else None
    if entry is None or arrays is None:
        _compute_and_store(spec)
        return _FIELDS[geometry]
    _remember(_WARPING, geometry, entry["scalars"], WARPING_NAMES)
    return _remember_field(geometry, arrays)


def clear_memory() -> None:
    """Forget every tier held in memory (the disk cache is untouched)."""
    _GEOMETRIC.clear()
    _WARPING.clear()
    _FIELDS.clear()


def _remember_field(geometry: str, arrays: dict[str, np.ndarray]) -> UnitStressField:
    unit_field = UnitStressField(arrays["points"], arrays["sigma"], arrays["tau"], omega=arrays["omega"], tau_w=arrays["tau_w"])
    _FIELDS[geometry] = unit_field
    _FIELDS.move_to_end(geometry)
    while len(_FIELDS) > FIELD_MEMORY:
        _FIELDS.popitem(last=False)
    return unit_field


def _remember(memory: dict, geometry: str, scalars: dict[str, float], names: tuple[str, ...]) -> list[float]:
    """Keep a tier's scalars as floats in `names` order; returns the row."""
    memory[geometry] = row = [float(scalars[name]) for name in names]
    return row


def _plain(memory: dict, geometry: str) -> list[float] | None:
    """A remembered row as plain floats (a table's row becomes one on first use); None if absent."""
    row = memory.get(geometry)
    if row is None or type(row) is list:
        return row
    memory[geometry] = row = row.tolist()
    return row


def _full_row(spec: SectionSpec) -> list[float]:
    """Every tier's scalars of `spec` in SCALAR_NAMES order."""
    geometric, warping = geometric_row(spec), warping_row(spec)
    return [geometric[k] if is_geometric else warping[k] for is_geometric, k in _FROM_TIERS]


def _assemble(spec: SectionSpec, row: list[float], density: float | None) -> SectionProperties:
    plain = dict(zip(SCALAR_NAMES, row))
    return SectionProperties(
        name=spec.name, shape=spec.shape, area=plain["area"], centroid=(plain["centroid_y"], plain["centroid_z"]),
        Iz=plain["Iz"], Iy=plain["Iy"], Iyz=plain["Iyz"], I11=plain["I11"], I22=plain["I22"],
        principal_angle=plain["principal_angle"], Sz_top=plain["Sz_top"], Sz_bottom=plain["Sz_bottom"],
        Sy_plus=plain["Sy_plus"], Sy_minus=plain["Sy_minus"], y_top=plain["y_top"], y_bottom=plain["y_bottom"],
        z_plus=plain["z_plus"], z_minus=plain["z_minus"], Zz=plain["Zz"], Zy=plain["Zy"], rz=plain["rz"], ry=plain["ry"],
        J=plain["J"], Iw=plain["Iw"], shear_centre=(plain["ys"], plain["zs"]), Py=plain["Py"], Pz=plain["Pz"], Avy=plain["Avy"], Avz=plain["Avz"],
        depth=plain["depth"], width=plain["width"], perimeter=plain["perimeter"],
        sigma_peak=(plain["sigma_peak_N"], plain["sigma_peak_My"], plain["sigma_peak_Mz"]),
        tau_peak=(plain["tau_peak_Vy"], plain["tau_peak_Vz"], plain["tau_peak_T"]),
        mesh_elements=int(plain["mesh_elements"]), mesh_nodes=int(plain["mesh_nodes"]),
        max_element_area=plain["max_element_area"], density=density,
        mass_per_length=None if density is None else plain["area"] * density, spec=spec,
    )


# ----------------------------------------------------------------------------------------------
# computing the warping tier and the stress fields

def compute(spec: SectionSpec) -> tuple[dict[str, float], dict[str, np.ndarray]]:
    """The warping tier's scalars (WARPING_NAMES) and the unit stress arrays of `spec`, computed now."""
    return compute_warping(spec, dict(zip(GEOMETRIC_NAMES, geometric_row(spec))))


def _compute_and_store(spec: SectionSpec) -> None:
    scalars, arrays = compute(spec)
    cache.write_entry(cache.entry_key(spec), scalars, arrays)
    _keep(spec, scalars, arrays)


def _keep(spec: SectionSpec, scalars: dict[str, float], arrays: dict[str, np.ndarray]) -> None:
    _remember(_WARPING, spec.geometry_key(), scalars, WARPING_NAMES)
    _remember_field(spec.geometry_key(), arrays)


@dataclass(frozen=True)
class BuildSummary:
    """What build_catalogue did."""

    sections: int
    geometries: int
    computed: int
    from_cache: int
    workers: int
    seconds: float


SECTION_MODULES = ("cytriangle", "scipy.sparse.linalg", "shapely.geometry")  # what a worker needs to compute sections


class AnalysisWorkers:
    """The warping tiers and stress fields of sections computed on the worker pool (sizer.workers),
    kept for a whole run. `wait` makes sure that some sections are done: in this process while fewer
    than PARALLEL_FROM are missing (two, when the number of workers is given) and the pool is not
    running, else on the pool, which starts then and stays for the rest of the run. A process that is
    itself a worker never starts more. `workers` local processes, or the Dask cluster at `cluster`
    (sizer.workers). `progress(done, total, name)` hears of every section computed, counted over the
    whole run."""

    def __init__(self, workers: int | None = None, progress: Callable[[int, int, str], None] | None = None,
                 cluster: str | None = None) -> None:
        self.pool = Workers(workers, cluster, warm=SECTION_MODULES)
        self.from_count = 2 if workers or cluster else PARALLEL_FROM  # workers asked for are used for any two sections
        self.progress = progress
        self.asked = self.done = 0

    def __enter__(self) -> "AnalysisWorkers":
        return self

    def __exit__(self, *exc: Any) -> None:
        self.pool.close()

    @property
    def count(self) -> int:
        return self.pool.count

    @property
    def started(self) -> bool:
        return self.pool.started

    def wait(self, specs: Sequence[SectionSpec], finished: Callable[[SectionSpec], None] | None = None, recompute: bool = False) -> None:
        """Make sure the warping tier and stress fields of every spec are kept (with `recompute`, the
        specs are known to be missing: computed whatever the cache says); `finished(spec)` as each
        missing one is done."""
        unique = {spec.geometry_key(): spec for spec in specs}
        missing = [spec for spec in unique.values() if recompute or not has_warping(spec)]
        if not missing:
            return
        self.asked += len(missing)
        self._report("")
        if not self.pool.started and (not self.pool.parallel or len(missing) < self.from_count):
            for spec in missing:
                _compute_and_store(spec)
                self._finish(spec, finished)
        else:
            for spec in self._on_workers(missing):
                self._finish(spec, finished)

    def _on_workers(self, specs: list[SectionSpec]) -> Iterator[SectionSpec]:
        """Compute `specs` on the pool (started now if not yet); each spec as it is kept. Local workers
        keep the entries themselves; a cluster's are kept here."""
        self.pool.start()
        keeps = self.pool.keeps_here
        futures = {self.pool.submit(_worker, spec, dict(zip(GEOMETRIC_NAMES, geometric_row(spec))), keeps,
                                    key=f"sizer-section-{spec.geometry_key()}"): spec for spec in specs}
        for future in self.pool.completed(futures):
            result = future.result()
            if (error := result_error(result)) is not None:
                self.pool.cancel(list(futures))
                raise error
            spec = futures[future]
            if not keeps:
                cache.write_entry(cache.entry_key(spec), result["scalars"], result["arrays"])
            _keep(spec, result["scalars"], result["arrays"])
            yield spec

    def _finish(self, spec: SectionSpec, finished: Callable[[SectionSpec], None] | None) -> None:
        self.done += 1
        self._report(spec.name)
        if finished is not None:
            finished(spec)

    def _report(self, name: str) -> None:
        if self.progress is not None:
            self.progress(self.done, self.asked, name)


def build_catalogue(specs: Sequence[SectionSpec], workers: int | None = None,
                    progress: Callable[[int, int, str], None] | None = None, check_arrays: bool = True,
                    cluster: str | None = None) -> BuildSummary:
    """Make sure every section's tiers are cached, computing the missing ones in parallel on the
    worker pool (one process per core by default, in this process when fewer than PARALLEL_FROM are
    missing; or `workers` processes, at most one per core, or the Dask cluster at `cluster`, for any
    two or more).
    `progress(done, total, name)` is called as geometries finish. `check_arrays`: also verify each
    cached entry's stress arrays (else only its scalars)."""
    start = time.perf_counter()
    unique = {spec.geometry_key(): spec for spec in specs}
    missing = [spec for spec in unique.values() if not _entry_ready(spec, check_arrays)]
    total, done = len(unique), len(unique) - len(missing)
    if progress:
        progress(done, total, "")

    def finished(spec: SectionSpec) -> None:
        nonlocal done
        done += 1
        if progress:
            progress(done, total, spec.name)

    with AnalysisWorkers(workers and min(workers, max(1, len(missing))), cluster=cluster) as runner:
        runner.wait(missing, finished, recompute=True)
        used = runner.count if runner.started else 1
    return BuildSummary(len(specs), total, len(missing), total - len(missing), used, time.perf_counter() - start)


def _entry_ready(spec: SectionSpec, check_arrays: bool) -> bool:
    geometry = spec.geometry_key()
    if geometry in _WARPING and (not check_arrays or geometry in _FIELDS):
        return True
    key = cache.entry_key(spec)
    entry = cache.read_entry(key, WARPING_NAMES)
    if entry is None:
        return False
    if check_arrays:
        arrays = cache.read_arrays(key, entry)
        if arrays is None:
            return False
        _remember_field(geometry, arrays)
    _remember(_WARPING, geometry, entry["scalars"], WARPING_NAMES)
    return True


def _worker(spec: SectionSpec, geometric: dict[str, float], keep: bool) -> dict[str, Any]:
    """Pool task: one section's warping tier and fields ({"scalars", "arrays"}), stored in the cache
    when `keep` (a local worker); bad input as data (sizer.workers.error_result)."""
    try:
        scalars, arrays = compute_warping(spec, geometric)
    except InputError as error:
        return error_result(error)
    if keep:
        cache.write_entry(cache.entry_key(spec), scalars, arrays)
    return {"scalars": scalars, "arrays": arrays}
