"""Section properties and unit stress fields from sectionproperties (geometric, warping and plastic
analyses, and its stress analysis), in member axes and SI units, cached on disk.

Axes. A section is drawn with its depth along sectionproperties' Y axis, "across" along its X
axis, and sectionproperties' Z out of the drawing. The member's axes (SPEC section 2) are
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

Stresses per unit action are sectionproperties' nodal-averaged values at the mesh nodes (corner and
mid-side nodes), from its Saint-Venant elasticity solution with Poisson's ratio 0, loads through the
shear centre. At sharp re-entrant corners (zero radii) the true elastic peak is unbounded and the
nodal value grows as the mesh is refined; give radii where they exist.
"""

from __future__ import annotations

import math
import os
import time
from collections import OrderedDict
from dataclasses import dataclass, field
from functools import cached_property
from typing import Any, Callable, Iterator, Sequence

import numpy as np

from sizer.errors import InputError
from sizer.sections import cache
from sizer.sections.geometry import MM, max_element_area, meshed_section
from sizer.sections.spec import SectionSpec

SCALAR_NAMES: tuple[str, ...] = (
    "area", "centroid_y", "centroid_z", "Iz", "Iy", "Iyz", "I11", "I22", "principal_angle",
    "Sz_top", "Sz_bottom", "Sy_plus", "Sy_minus", "y_top", "y_bottom", "z_plus", "z_minus",
    "Zz", "Zy", "rz", "ry", "J", "Iw", "ys", "zs", "Py", "Pz", "Avy", "Avz", "depth", "width", "perimeter",
    "sigma_peak_N", "sigma_peak_My", "sigma_peak_Mz", "tau_peak_Vy", "tau_peak_Vz", "tau_peak_T",
    "mesh_elements", "mesh_nodes", "max_element_area",
)
SIGMA_PEAK_NAMES = ("sigma_peak_N", "sigma_peak_My", "sigma_peak_Mz")  # per unit N, My, Mz
TAU_PEAK_NAMES = ("tau_peak_Vy", "tau_peak_Vz", "tau_peak_T")  # per unit Vy, Vz, T
FIELD_MEMORY = 64  # unit stress fields kept in memory (least recently used dropped)
# fewer missing sections than this are computed in this process: a worker's start-up and its
# sectionproperties import (about 1 s) outweigh the gain
PARALLEL_FROM = 4

# unit actions in sectionproperties' units (N, N*mm) and sign mapping, see the module docstring
_UNIT_ACTIONS = {"n": 1.0, "vx": -1.0, "vy": 1.0, "mxx": -1.0, "myy": 1.0, "mzz": 1.0}
_FORCE_TO_PA = 1e6  # stress in N/mm^2 per 1 N -> Pa per 1 N
_MOMENT_TO_PA = 1e9  # stress in N/mm^2 per 1 N*mm -> Pa per 1 N*m


@dataclass(frozen=True, eq=False)
class UnitStressField:
    """Stresses at the mesh nodes per unit action, member axes, Pa.

    points (p, 2): node positions (y, z) from the centroid, m.
    sigma (3, p): sigma_xx (tension +) per unit N (1 N), My (1 N*m), Mz (1 N*m).
    tau (3, p, 2): (tau_xy, tau_xz) per unit Vy (1 N), Vz (1 N), T (1 N*m), through the shear centre.
    """

    points: np.ndarray
    sigma: np.ndarray
    tau: np.ndarray

    @cached_property
    def sigma_peak(self) -> np.ndarray:
        """(3,) largest |sigma| per unit N, My, Mz."""
        return np.abs(self.sigma).max(axis=1)

    @cached_property
    def tau_peak(self) -> np.ndarray:
        """(3,) largest shear stress magnitude per unit Vy, Vz, T."""
        return np.hypot(self.tau[..., 0], self.tau[..., 1]).max(axis=1)

    def stresses(self, N: float = 0.0, Vy: float = 0.0, Vz: float = 0.0, T: float = 0.0,
                 My: float = 0.0, Mz: float = 0.0) -> tuple[np.ndarray, np.ndarray]:
        """sigma_xx (p,) and (tau_xy, tau_xz) (p, 2) in Pa for one set of actions (N, N*m)."""
        sigma = N * self.sigma[0] + My * self.sigma[1] + Mz * self.sigma[2]
        tau = Vy * self.tau[0] + Vz * self.tau[1] + T * self.tau[2]
        return sigma, tau


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

# In memory, by geometry key (an entry key adds only what is fixed within a process): the scalars
# as a row in SCALAR_NAMES order (plain floats; a section table's row until first used), and the
# unit stress fields last used.
_ENTRIES: dict[str, list[float] | np.ndarray] = {}
_FIELDS: OrderedDict[str, UnitStressField] = OrderedDict()
_SIGMA_PEAK_COLUMNS = tuple(SCALAR_NAMES.index(name) for name in SIGMA_PEAK_NAMES)
_TAU_PEAK_COLUMNS = tuple(SCALAR_NAMES.index(name) for name in TAU_PEAK_NAMES)


def section_properties(spec: SectionSpec, density: float | None = None) -> SectionProperties:
    """Properties of `spec` (kg/m^3 `density` gives the mass per length). Cached: memory, then disk,
    then computed with sectionproperties and stored."""
    return _assemble(spec, _scalars(spec), density)


def section_properties_many(specs: Sequence[SectionSpec], density: float | None = None, workers: int | None = None,
                            progress: Callable[[int, int, str], None] | None = None) -> list[SectionProperties]:
    """Properties of many sections, read through section_table (those not cached are computed in
    parallel first)."""
    section_table(specs, workers, progress)
    return [section_properties(spec, density) for spec in specs]


def section_table(specs: Sequence[SectionSpec], workers: int | None = None,
                  progress: Callable[[int, int, str], None] | None = None) -> np.ndarray:
    """The scalars of `specs` as a float64 array (len(specs), len(SCALAR_NAMES)): row i is specs[i],
    columns in SCALAR_NAMES order, SI units and member axes as in SectionProperties.

    Read from one file when this list of sections was tabled before; else gathered from memory and
    the entries (missing ones computed in parallel, as build_catalogue does; `progress` as there)
    and stored as one file. Afterwards section_properties and peak_unit_stresses of these sections
    read no file."""
    geometry_keys = [spec.geometry_key() for spec in specs]
    key = cache.table_key(geometry_keys, SCALAR_NAMES)
    table = cache.read_table(key, (len(specs), len(SCALAR_NAMES)))
    if table is None:
        build_catalogue(specs, workers, progress, check_arrays=False)
        table = np.array([_scalars(spec) for spec in specs], dtype=np.float64).reshape(len(specs), len(SCALAR_NAMES))
        cache.write_table(key, table)
    else:
        _ENTRIES.update(zip(geometry_keys, table.copy()))  # rows of a private copy: the caller may change `table`
        if progress:
            geometries = len(set(geometry_keys))
            progress(geometries, geometries, "")  # as build_catalogue reports a catalogue with nothing to compute
    return table


def peak_unit_stresses(spec: SectionSpec) -> tuple[np.ndarray, np.ndarray]:
    """(sigma_peak (3,), tau_peak (3,)): largest |stress| (Pa) per unit N, My, Mz and Vy, Vz, T."""
    row = _scalars(spec)
    return np.array([row[i] for i in _SIGMA_PEAK_COLUMNS]), np.array([row[i] for i in _TAU_PEAK_COLUMNS])


def unit_stress_field(spec: SectionSpec) -> UnitStressField:
    """The unit stress fields of `spec` (memory, then disk, else recomputed and stored)."""
    geometry = spec.geometry_key()
    if geometry in _FIELDS:
        _FIELDS.move_to_end(geometry)
        return _FIELDS[geometry]
    key = cache.entry_key(spec)
    entry = cache.read_entry(key, SCALAR_NAMES)
    arrays = cache.read_arrays(key, entry) if entry is not None else None
    if arrays is None:
        _compute_and_store(spec)
        return _FIELDS[geometry]
    _ENTRIES[geometry] = _row(entry["scalars"])
    return _remember_field(geometry, arrays)


def clear_memory() -> None:
    """Forget every entry held in memory (the disk cache is untouched)."""
    _ENTRIES.clear()
    _FIELDS.clear()


def _remember_field(geometry: str, arrays: dict[str, np.ndarray]) -> UnitStressField:
    unit_field = UnitStressField(arrays["points"], arrays["sigma"], arrays["tau"])
    _FIELDS[geometry] = unit_field
    _FIELDS.move_to_end(geometry)
    while len(_FIELDS) > FIELD_MEMORY:
        _FIELDS.popitem(last=False)
    return unit_field


def _row(scalars: dict[str, float]) -> list[float]:
    """An entry's scalars as floats in SCALAR_NAMES order."""
    return [float(scalars[name]) for name in SCALAR_NAMES]


def _scalars(spec: SectionSpec) -> list[float]:
    """The section's row of scalars (SCALAR_NAMES order): memory, then disk, else computed."""
    geometry = spec.geometry_key()
    row = _ENTRIES.get(geometry)
    if type(row) is list:
        return row
    if row is not None:
        _ENTRIES[geometry] = row = row.tolist()  # a section table's row: plain floats from now on
        return row
    entry = cache.read_entry(cache.entry_key(spec), SCALAR_NAMES)
    if entry is None:
        _compute_and_store(spec)
    else:
        _ENTRIES[geometry] = _row(entry["scalars"])
    return _ENTRIES[geometry]


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
# computing with sectionproperties

def analyse(spec: SectionSpec) -> Any:
    """A sectionproperties Section of `spec` (mm) after the geometric, warping and plastic analyses."""
    section = meshed_section(spec)
    try:
        section.calculate_geometric_properties()
        section.calculate_warping_properties()
        section.calculate_plastic_properties()
    except Exception as exc:  # sectionproperties' failures on a mesh that was made
        raise InputError(spec.source, "sections", f"section {spec.name!r}: sectionproperties could not analyse it ({type(exc).__name__}: {exc})",
                         "check the dimensions or the polygon's points", spec.line) from None
    return section


def unit_fields(section: Any) -> dict[str, np.ndarray]:
    """Unit stress fields (member axes, SI) of an analysed Section: one stress analysis with every
    unit action at once (sectionproperties keeps each action's stresses apart)."""
    cx, cy = section.get_c()
    stress = section.calculate_stress(**_UNIT_ACTIONS).get_stress()[0]
    nodes = np.asarray(section.mesh_nodes, dtype=float)
    points = np.column_stack([(nodes[:, 1] - cy) / MM, -(nodes[:, 0] - cx) / MM])
    sigma = np.stack([stress["sig_zz_n"] * _FORCE_TO_PA, stress["sig_zz_myy"] * _MOMENT_TO_PA, stress["sig_zz_mxx"] * _MOMENT_TO_PA])

    def shear(action: str, scale: float) -> np.ndarray:
        return np.column_stack([stress[f"sig_zy_{action}"], -stress[f"sig_zx_{action}"]]) * scale

    tau = np.stack([shear("vy", _FORCE_TO_PA), shear("vx", _FORCE_TO_PA), shear("mzz", _MOMENT_TO_PA)])
    return {"points": points, "sigma": sigma, "tau": tau}


def section_results(spec: SectionSpec, section: Any) -> tuple[dict[str, float], dict[str, np.ndarray]]:
    """Scalars (SI, member axes; SCALAR_NAMES) and unit stress arrays of an analysed Section."""
    xmin, xmax, ymin, ymax = section.geometry.calculate_extents()
    cx, cy = section.get_c()
    ixx, iyy, ixy = section.get_ic()
    i11, i22 = section.get_ip()
    zxx_plus, zxx_minus, zyy_plus, zyy_minus = section.get_z()
    sxx, syy = section.get_s()
    rx, ry = section.get_rc()
    a_sx, a_sy = section.get_as()
    props = section.section_props  # x_se, y_se: shear centre from the centroid
    arrays = unit_fields(section)
    unit = UnitStressField(arrays["points"], arrays["sigma"], arrays["tau"])
    length, area, inertia, modulus = 1 / MM, 1 / MM**2, 1 / MM**4, 1 / MM**3
    scalars = {
        "area": section.get_area() * area,
        "centroid_y": (cy - (ymin + ymax) / 2) * length, "centroid_z": -(cx - (xmin + xmax) / 2) * length,
        "Iz": ixx * inertia, "Iy": iyy * inertia, "Iyz": -ixy * inertia, "I11": i11 * inertia, "I22": i22 * inertia,
        "principal_angle": _axis_angle(math.radians(section.get_phi())),
        "Sz_top": zxx_plus * modulus, "Sz_bottom": zxx_minus * modulus, "Sy_plus": zyy_minus * modulus, "Sy_minus": zyy_plus * modulus,
        "y_top": (ymax - cy) * length, "y_bottom": (cy - ymin) * length, "z_plus": (cx - xmin) * length, "z_minus": (xmax - cx) * length,
        "Zz": sxx * modulus, "Zy": syy * modulus, "rz": rx * length, "ry": ry * length,
        "J": section.get_j() * inertia, "Iw": section.get_gamma() / MM**6,
        "ys": props.y_se * length, "zs": -props.x_se * length,
        "Py": (props.beta_x_minus + 2 * props.y_se) * ixx / MM**5, "Pz": -(props.beta_y_minus + 2 * props.x_se) * iyy / MM**5,
        "Avy": a_sy * area, "Avz": a_sx * area,
        "depth": (ymax - ymin) * length, "width": (xmax - xmin) * length, "perimeter": section.get_perimeter() * length,
        "sigma_peak_N": unit.sigma_peak[0], "sigma_peak_My": unit.sigma_peak[1], "sigma_peak_Mz": unit.sigma_peak[2],
        "tau_peak_Vy": unit.tau_peak[0], "tau_peak_Vz": unit.tau_peak[1], "tau_peak_T": unit.tau_peak[2],
        "mesh_elements": len(section.elements), "mesh_nodes": section.num_nodes,
        "max_element_area": max_element_area(spec, section.geometry) * area,
    }
    return _without_noise({name: float(value) for name, value in scalars.items()}), arrays


def _axis_angle(angle: float) -> float:
    """An axis direction (a line) as an angle in [-pi/2, pi/2)."""
    return (angle + math.pi / 2) % math.pi - math.pi / 2


def _without_noise(s: dict[str, float]) -> dict[str, float]:
    """Round-off and solver noise set to exactly zero: centroid and shear-centre offsets below
    1e-5 of the section's size, a product of inertia below 1e-9 of sqrt(Iz Iy), a warping
    constant below 1e-9 of (Iz + Iy) size^2 (a circle's), monosymmetry integrals below 1e-7 of
    (Iz + Iy) size (a symmetric section's)."""
    size = max(s["depth"], s["width"])
    for name in ("centroid_y", "centroid_z", "ys", "zs"):
        if abs(s[name]) < 1e-5 * size:
            s[name] = 0.0
    if abs(s["Iyz"]) < 1e-9 * math.sqrt(s["Iz"] * s["Iy"]):
        s["Iyz"] = 0.0
    if abs(s["Iw"]) < 1e-9 * (s["Iz"] + s["Iy"]) * size**2:
        s["Iw"] = 0.0
    for name in ("Py", "Pz"):
        if abs(s[name]) < 1e-7 * (s["Iz"] + s["Iy"]) * size:
            s[name] = 0.0
    return s


def compute(spec: SectionSpec) -> tuple[dict[str, float], dict[str, np.ndarray]]:
    """Scalars and unit stress arrays of `spec`, computed now with sectionproperties."""
    return section_results(spec, analyse(spec))


def _compute_and_store(spec: SectionSpec) -> None:
    scalars, arrays = compute(spec)
    cache.write_entry(cache.entry_key(spec), scalars, arrays)
    _ENTRIES[spec.geometry_key()] = _row(scalars)
    _remember_field(spec.geometry_key(), arrays)


# ----------------------------------------------------------------------------------------------
# building a whole catalogue

@dataclass(frozen=True)
class BuildSummary:
    """What build_catalogue did."""

    sections: int
    geometries: int
    computed: int
    from_cache: int
    workers: int
    seconds: float


def build_catalogue(specs: Sequence[SectionSpec], workers: int | None = None,
                    progress: Callable[[int, int, str], None] | None = None, check_arrays: bool = True) -> BuildSummary:
    """Make sure every section's entry is cached, computing the missing ones in parallel (one
    process per core by default; in this process when fewer than PARALLEL_FROM are missing). `progress(done, total, name)` is called as geometries finish.
    `check_arrays`: also verify each cached entry's stress arrays (else only its scalars)."""
    start = time.perf_counter()
    unique = {spec.geometry_key(): spec for spec in specs}
    missing = [spec for spec in unique.values() if not _entry_ready(spec, check_arrays)]
    total, done = len(unique), len(unique) - len(missing)
    if progress:
        progress(done, total, "")
    workers = max(1, min(workers or os.cpu_count() or 1, len(missing)))
    if len(missing) < PARALLEL_FROM:
        workers = 1
    if workers == 1:
        for spec in missing:
            _compute_and_store(spec)
            done += 1
            if progress:
                progress(done, total, spec.name)
    else:
        for spec in _build_in_parallel(missing, workers):
            done += 1
            if progress:
                progress(done, total, spec.name)
    return BuildSummary(len(specs), total, len(missing), total - len(missing), workers, time.perf_counter() - start)


def _entry_ready(spec: SectionSpec, check_arrays: bool) -> bool:
    geometry = spec.geometry_key()
    if geometry in _ENTRIES and (not check_arrays or geometry in _FIELDS):
        return True
    key = cache.entry_key(spec)
    entry = cache.read_entry(key, SCALAR_NAMES)
    if entry is None:
        return False
    if check_arrays:
        arrays = cache.read_arrays(key, entry)
        if arrays is None:
            return False
        _remember_field(geometry, arrays)
    _ENTRIES[geometry] = _row(entry["scalars"])
    return True


def _build_in_parallel(specs: list[SectionSpec], workers: int) -> Iterator[SectionSpec]:
    """Compute `specs` in `workers` processes; yields each spec as it finishes."""
    import multiprocessing
    from concurrent.futures import ProcessPoolExecutor, as_completed

    # spawn: safe beside threads (a rich progress bar) and the same on every platform
    with ProcessPoolExecutor(max_workers=workers, mp_context=multiprocessing.get_context("spawn")) as pool:
        futures = {pool.submit(_worker, spec): spec for spec in specs}
        for future in as_completed(futures):
            scalars, arrays, error = future.result()
            if error is not None:
                pool.shutdown(cancel_futures=True)
                raise InputError(*error)
            spec = futures[future]
            _ENTRIES[spec.geometry_key()] = _row(scalars)
            _remember_field(spec.geometry_key(), arrays)
            yield spec


def _worker(spec: SectionSpec) -> tuple[dict | None, dict | None, tuple | None]:
    """Process-pool task: compute and store one entry. Bad input comes back as InputError fields
    (the dataclass exception does not survive pickling)."""
    try:
        scalars, arrays = compute(spec)
    except InputError as error:
        return None, None, (error.file, error.key, error.problem, error.fix, error.line)
    cache.write_entry(cache.entry_key(spec), scalars, arrays)
    return scalars, arrays, None
