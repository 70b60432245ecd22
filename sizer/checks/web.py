"""Webs under concentrated forces (check "web") and the shear buckling of webs (in check "shear").

Concentrated forces: at every support (its reaction) and every point load (the loads at one position
summed per combination) of an i_beam, channel or rectangular_tube, the force along the web (the
section's depth direction; for a tube also across, on the other pair of walls) against the allowable
force of the American steel specification, AISC 360-16 section J10 (from memory), in its allowable
strength form Rn / Omega:
- bearing at the web's toe of fillet, web local yielding (J10.2, Omega = 1.50):
      Rn = Fy tw (5 k + lb)       (eq. J10-2) where the force is more than d from the member's end,
      Rn = Fy tw (2.5 k + lb)     (eq. J10-3) where it is within d of it;
- web crippling (J10.3, Omega = 2.00), Qf = 1:
      Rn = 0.80 tw^2 [1 + 3 (lb/d) (tw/tf)^1.5] sqrt(E Fy tf / tw)            (eq. J10-4), at least d/2 from the end,
      Rn = 0.40 tw^2 [1 + 3 (lb/d) (tw/tf)^1.5] sqrt(E Fy tf / tw)            (eq. J10-5a), within d/2, lb/d <= 0.2,
      Rn = 0.40 tw^2 [1 + (4 lb/d - 0.2) (tw/tf)^1.5] sqrt(E Fy tf / tw)      (eq. J10-5b), within d/2, lb/d > 0.2;
- web compression buckling where a point load sits directly over a support (J10.5, Omega = 1.67),
  under the smaller of the two opposed forces (the web strip between them carries it):
      Rn = 24 tw^3 sqrt(E Fy) / h      (eq. J10-8), h = d - 2k; half of it within d/2 of the end;
with d the section's depth, tw and tf the web and flange thicknesses, k the distance from the flange's
outer face to the web's toe of fillet (tf + root_radius; a tube wall: max(outer_radius, t)), lb the
stiff bearing length (`bearing`, default 0: a knife edge). A tube has two webs (its side walls, each
with tf = tw = t): twice the force of one. Every force is taken as pushing on the web (crippling
applies), the safe side. A support or load with `stiffened = true` is not checked (the stiffener
carries the force; it is stated). Fy: the material's yield strength; without one, the largest of the
allowable stresses given (a yield strength is never below an allowable stress: the safe side).

Shear buckling of webs: each web panel (the web of an i_beam or channel, the walls of a tube) between
stiffeners a apart (`web_stiffener_spacing`; default: the span between supports that the station is
in, the longer one at a support) has the elastic shear buckling stress
    tau_cr = k_tau pi^2 E / (12 (1 - nu^2)) (t / h)^2,
    k_tau = 5.34 + 4 (h/a)^2 for a/h >= 1,  4 + 5.34 (h/a)^2 for a/h < 1
(Timoshenko & Gere ch. 9; EN 1993-1-5 Annex A.3, from memory), h the clear depth between the
flanges (depth - 2 tf; a tube wall: outer size - 2 t). The shear allowable where the panel carries
shear is reduced as local buckling is (sizer.checks.reduction) with the shear yield Fy / sqrt(3)
and the plateau lambda_w = 0.83 of EN 1993-1-5 5.3 Table 5.1 (eta = 1).
Units: N, m, Pa.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import TYPE_CHECKING, Any, Callable, Iterable, Sequence, Union

import numpy as np

from sizer.checks.reduction import PLATEAU_SHEAR, reduced_allowable, slenderness
from sizer.checks.results import ZERO_ACTION, CheckResult
from sizer.design import Design
from sizer.errors import InputError
from sizer.model import Material, Member, PointLoad
from sizer.phrase import joined, phrase, q

if TYPE_CHECKING:
    from sizer.analysis import MemberSolution
    from sizer.sections.spec import SectionSpec

METHOD = ("AISC 360-16 J10.2 (web local yielding: bearing at the toe of the fillet), J10.3 (web crippling) and J10.5 "
          "(web compression buckling under a load directly over a support)")
OMEGA_YIELDING = 1.50  # AISC 360-16 J10.2, allowable strength design (from memory)
OMEGA_CRIPPLING = 2.00  # AISC 360-16 J10.3, allowable strength design (from memory)
OMEGA_COMPRESSION = 1.67  # AISC 360-16 J10.5, allowable strength design (from memory)
WEB_SHAPES = ("i_beam", "channel", "rectangular_tube")
ASSUMPTIONS = (f"Webs under concentrated forces: {METHOD}, allowable force Rn / Omega with Omega = {OMEGA_YIELDING:.2f} "
               f"(yielding), {OMEGA_CRIPPLING:.2f} (crippling) and {OMEGA_COMPRESSION:.2f} (compression buckling under a load over a support), "
               "Qf = 1, at every support and point load; end formulas within "
               "d (yielding) or d/2 (crippling) of a member end; every force taken as pushing on the web; a tube's two "
               "side walls each as a web (tf = tw = t); forces across an I's or channel's web (along its flanges) not checked.")


@dataclass(frozen=True)
class Web:
    """One web direction of a section: the walls that carry a force along `axis` (1: section y, the
    depth; 2: section z). d, tw, tf, k in m; `webs` walls side by side; h the clear depth (m)."""

    axis: int
    depth: float
    tw: float
    tf: float
    k: float
    webs: int
    h: float

    @property
    def thin(self) -> float:
        """(tw / tf)^1.5, as the crippling formulas take it."""
        return (self.tw / self.tf) ** 1.5

    @property
    def tw2(self) -> float:
        return self.tw**2

    @property
    def tw3(self) -> float:
        return self.tw**3


def section_webs(shape: str, dims: dict[str, float]) -> list[Web]:
    """The webs of a section (empty for shapes without one)."""
    if shape in ("i_beam", "channel"):
        d, tf, tw, r = dims["depth"], dims["flange_thickness"], dims["web_thickness"], dims.get("root_radius", 0.0)
        return [Web(1, d, tw, tf, tf + r, 1, d - 2 * tf)]
    if shape == "rectangular_tube":
        d, b, t = dims["depth"], dims["width"], dims["thickness"]
        k = max(dims.get("outer_radius", 0.0), t)
        return [Web(1, d, t, t, k, 2, d - 2 * t), Web(2, b, t, t, k, 2, b - 2 * t)]
    return []


def no_web_reason(shape: str) -> str | None:
    if shape in WEB_SHAPES:
        return None
    return f"a {shape.replace('_', ' ')} has no web of an I, channel or tube: not made; check concentrated forces by hand"


# ----------------------------------------------------------------------------------------------
# the published formulas: one web (floats) or the webs of many sections at once (WebColumns, arrays)

Webs = Union["Web", "WebColumns"]


def web_yielding(web: Webs, fy: float, bearing: float, near_end: bool | np.ndarray) -> Any:
    """Rn of web local yielding, N (AISC 360-16 eqs. J10-2 and J10-3), all the section's webs."""
    return _plain(web.webs * fy * web.tw * (np.where(near_end, 2.5, 5.0) * web.k + bearing))


def web_crippling(web: Webs, E: float, fy: float, bearing: float, near_end: bool | np.ndarray) -> Any:
    """Rn of web crippling, N (AISC 360-16 eqs. J10-4, J10-5a, J10-5b, Qf = 1), all the section's webs."""
    ratio, thin = bearing / web.depth, web.thin
    factor = np.where(near_end, np.where(ratio <= 0.2, 0.40 * (1 + 3 * ratio * thin), 0.40 * (1 + (4 * ratio - 0.2) * thin)),
                      0.80 * (1 + 3 * ratio * thin))
    return _plain(web.webs * factor * web.tw2 * np.sqrt(E * fy * web.tf / web.tw))


def web_compression_buckling(web: Webs, E: float, fy: float, near_end: bool | np.ndarray) -> Any:
    """Rn of web compression buckling under a pair of opposed forces, N (AISC 360-16 eq. J10-8, Qf = 1):
    24 tw^3 sqrt(E Fy) / h with h = d - 2k, half within d/2 of the member's end; all the section's webs."""
    return _plain(web.webs * 24.0 * web.tw3 * math.sqrt(E * fy) / (web.depth - 2 * web.k) * np.where(near_end, 0.5, 1.0))


def _plain(value: Any) -> Any:
    """A float for one web, the array for many."""
    return float(value) if np.ndim(value) == 0 else value


# ----------------------------------------------------------------------------------------------
# the concentrated forces

@dataclass(frozen=True)
class Concentrated:
    """A support's reaction or the point loads at one position: forces (C, 3) along the section's
    x, y, z per combination (N), the stiff bearing length (m) and whether a stiffener is there."""

    what: str
    at: float
    forces: np.ndarray
    bearing: float
    stiffened: bool


def concentrated_forces(design: Design) -> list[Concentrated]:
    """Every support's reaction and every point load position, forces in section axes."""
    solution = design.solution
    names = solution.combination_names
    reactions = solution.combination_reactions(names)[..., :3] if solution.member.supports else np.zeros((len(names), 0, 3))
    return concentrated_on(solution.member, names, reactions)


def concentrated_on(member: Member, names: Sequence[str], reactions: np.ndarray) -> list[Concentrated]:
    """Every support's reaction and every point load position of `member` in the combinations `names`,
    forces in section axes; `reactions` (..., C, n_supports, 3) along member x, y, z (a leading axis
    for many sections gives each support's forces that axis too; a point load's are (C, 3))."""
    turn = (lambda f: np.stack([f[..., 0], f[..., 2], -f[..., 1]], axis=-1)) if member.orientation == "minor" else (lambda f: f)
    found = []
    for index, support in enumerate(member.supports):
        found.append(Concentrated(f"support S{index + 1} ({support.label})", support.at, turn(reactions[..., index, :]), support.bearing,
                                  support.stiffened))
    tol = 1e-9 * member.length
    loads = [load for load in member.loads if isinstance(load, PointLoad) and any(load.force)]
    positions: list[float] = []
    for at in sorted({load.at for load in loads}):
        if not positions or at - positions[-1] > tol:
            positions.append(at)
    for at in positions:
        group = [load for load in loads if abs(load.at - at) <= tol]
        forces = np.array([[sum(member.combinations[name].get(load.case, 0.0) * load.force[i] for load in group) for i in range(3)]
                           for name in names])
        found.append(Concentrated(phrase("point load at ", q("at", at, "m", ".4g")), at, turn(forces), min(load.bearing for load in group),
                                  all(load.stiffened for load in group)))
    return found


def web_yield_strength(design: Design) -> tuple[float, str]:
    """Fy for the web formulas (Pa) and how it was found; bad input when neither a yield strength nor
    an allowable stress is given."""
    return yield_strength_for_webs(design.known_material, design.member.source)


def yield_strength_for_webs(material: Material, source: str) -> tuple[float, str]:
    """Fy of `material` for the web formulas (Pa) and how it was found (see web_yield_strength)."""
    if material.yield_strength:
        return material.yield_strength, "yield strength"
    allow = material.allowable
    given = [v for v in (allow.tension, allow.compression, allow.bending, allow.shear, allow.equivalent) if v is not None]
    if not given:
        raise InputError(material.source or source, f"materials.{material.name}.yield_strength",
                         "the web check under concentrated forces needs the yield strength, which is not given",
                         f'add yield_strength = "... MPa" under [materials.{material.name}]')
    return max(given), "no yield strength given: Fy taken as the largest allowable stress (the safe side)"


def web_check(design: Design) -> CheckResult:
    """The web check: the largest utilization (force / allowable force) of any web under any
    concentrated force and combination."""
    reason = no_web_reason(design.spec.shape)
    if reason:
        return CheckResult("web", None, detail=reason)
    webs = section_webs(design.spec.shape, design.spec.dims)
    items = concentrated_forces(design)
    if not items:
        return CheckResult("web", None, detail="no support or point load")
    checked = [item for item in items if not item.stiffened]
    if not checked:
        return CheckResult("web", None, detail="every support and point load is stiffened (stated): not made")
    fy, fy_text = None, ""
    best: CheckResult | None = None
    for item in checked:
        for web in webs:
            force = np.abs(item.forces[:, web.axis])
            if force.max() <= ZERO_ACTION:
                continue
            if fy is None:
                fy, fy_text = web_yield_strength(design)
            found = _web_result(design, item, web, force, fy)
            if best is None or found.made_utilization > best.made_utilization:
                best = found
    for load, support in opposed_pairs(checked, design.member.length):
        for web in webs:
            pushed, held = load.forces[:, web.axis], support.forces[:, web.axis]
            force = np.where(pushed * held < 0, np.minimum(np.abs(pushed), np.abs(held)), 0.0)
            if force.max() <= ZERO_ACTION:
                continue
            if fy is None:
                fy, fy_text = web_yield_strength(design)
            found = _pair_result(design, load, support, web, force, fy)
            if best is None or found.made_utilization > best.made_utilization:
                best = found
    if best is None:
        return CheckResult("web", None, detail="no concentrated force along a web")
    if fy_text != "yield strength":
        best = replace(best, detail=best.detail + "; " + fy_text)
    return best


def _web_result(design: Design, item: Concentrated, web: Web, force: np.ndarray, fy: float) -> CheckResult:
    """The web check of one concentrated force (its largest combination) on one web direction."""
    end = min(item.at, design.member.length - item.at)
    yield_end, crippling_end = end <= web.depth, end < web.depth / 2
    yielding = web_yielding(web, fy, item.bearing, yield_end) / OMEGA_YIELDING
    crippling = web_crippling(web, design.known_material.elastic_modulus, fy, item.bearing, crippling_end) / OMEGA_CRIPPLING
    allowable = min(yielding, crippling)
    c = int(np.argmax(force))
    governs = "web local yielding" if yielding <= crippling else "web crippling"
    where = "end formulas" if crippling_end else "end formula for yielding (within d of the end)" if yield_end else "interior formulas"
    bearing = phrase("lb = ", q("lb", item.bearing, "mm", ".4g")) if item.bearing > 0 else "lb = 0 (knife edge)"
    walls = "two side walls" if web.webs == 2 else "web"
    detail = phrase(item.what, f", {walls} tw = ", q("tw", web.tw, "mm", ".4g"), ", k = ", q("k", web.k, "mm", ".4g"), ", ", bearing,
                    f", {where}: yielding Rn/Ω = ", q("yielding", yielding, "kN", ".4g"), ", crippling Rn/Ω = ", q("crippling", crippling, "kN", ".4g"),
                    f"; {governs} governs (AISC 360-16 J10.2 and J10.3, Fy = ", q("Fy", fy, "MPa", ".4g"), ")")
    extra = {"method": METHOD, "element": item.what, "web_local_yielding": yielding, "web_crippling": crippling,
             "bearing": item.bearing, "yield_strength": fy, "governing_limit": governs}
    return CheckResult("web", float(force[c] / allowable), float(force[c]), allowable, item.at, design.solution.combination_names[c],
                       quantity="force", detail=detail, extra=extra)


def opposed_pairs(items: list[Concentrated], length: float) -> list[tuple[Concentrated, Concentrated]]:
    """(point loads, support) at one position: a force on one flange and a reaction on the other."""
    tol = 1e-9 * length
    supports = [item for item in items if item.what.startswith("support")]
    return [(load, support) for load in items if not load.what.startswith("support")
            for support in supports if abs(load.at - support.at) <= tol]


def _pair_result(design: Design, load: Concentrated, support: Concentrated, web: Web, force: np.ndarray, fy: float) -> CheckResult:
    """Web compression buckling under a load directly over a support (the smaller of the two opposed
    forces, in the combination where it is largest)."""
    end = min(load.at, design.member.length - load.at)
    allowable = web_compression_buckling(web, design.known_material.elastic_modulus, fy, end < web.depth / 2) / OMEGA_COMPRESSION
    c = int(np.argmax(force))
    element = phrase(load.what, " over ", support.what)
    detail = phrase(element, ": web compression buckling (AISC 360-16 J10.5) under the smaller of the two opposed forces, h = d - 2k = ",
                    q("h", web.depth - 2 * web.k, "mm", ".4g"), ", Rn/Ω = ", q("Rn_over_omega", allowable, "kN", ".4g"),
                    " (half: within d/2 of the end)" if end < web.depth / 2 else "", ", Fy = ", q("Fy", fy, "MPa", ".4g"))
    extra = {"method": METHOD, "element": element, "web_compression_buckling": allowable,
             "bearing": min(load.bearing, support.bearing), "yield_strength": fy, "governing_limit": "web compression buckling"}
    return CheckResult("web", float(force[c] / allowable), float(force[c]), allowable, load.at, design.solution.combination_names[c],
                       quantity="force", detail=detail, extra=extra)


@dataclass(frozen=True)
class WebColumns:
    """The webs along one axis of many sections, as arrays (S,) (see Web; `has`: the section has webs
    along that axis, the other columns 1 where not); the powers of the formulas taken in Python
    floats, as the one-web formulas take them (numpy's vectorized powers may round otherwise)."""

    has: np.ndarray
    depth: np.ndarray
    tw: np.ndarray
    tf: np.ndarray
    k: np.ndarray
    webs: np.ndarray
    thin: np.ndarray  # (tw / tf)^1.5
    tw2: np.ndarray  # tw^2
    tw3: np.ndarray  # tw^3


def web_columns(webs: Sequence[list[Web]], axis: int) -> WebColumns:
    """WebColumns along `axis` (1: section y; 2: section z) of sections with the webs `webs` (section_webs)."""
    found = [next((web for web in each if web.axis == axis), None) for each in webs]
    kept = [web or Web(axis, 1.0, 1.0, 1.0, 0.0, 1, 1.0) for web in found]
    def column(values: Iterable[float]) -> np.ndarray:
        return np.fromiter(values, float, len(kept))
    return WebColumns(np.array([web is not None for web in found], bool), column(w.depth for w in kept), column(w.tw for w in kept),
                      column(w.tf for w in kept), column(w.k for w in kept), column(w.webs for w in kept),
                      column(w.thin for w in kept), column(w.tw2 for w in kept), column(w.tw3 for w in kept))


def web_utilizations(solution: MemberSolution, material: Material, specs: Sequence[SectionSpec], masses: np.ndarray | None) -> np.ndarray:
    """(S,) the utilization web_check finds for each section of `specs` (0 where it makes none), each
    with its self-weight of `masses` (S,) kg/m (None: no self weight) on `solution`, a solution of the
    member without springs (its reactions do not depend on the section's rigidities): the same AISC
    360-16 J10 formulas as the one-web functions above (eqs. J10-2, J10-3, J10-4, J10-5a, J10-5b,
    J10-8, see docs/references.md), elementwise over the sections, for a screen of many. NaN where
    the check needs a yield strength that is not given (web_check says so)."""
    member, names = solution.member, solution.combination_names
    each = [section_webs(spec.shape, spec.dims) for spec in specs]
    axes = sorted({web.axis for webs in each for web in webs})
    reactions = solution.section_reactions(masses)[..., :3] if member.supports and axes else np.zeros((1, len(names), 0, 3))
    items = [item for item in concentrated_on(member, names, reactions) if not item.stiffened] if axes else []
    demands = []  # (webs along one axis, the force (S,) over every combination, the allowable as a function of Fy)
    for axis in axes:
        webs = web_columns(each, axis)
        for item in items:
            force = np.broadcast_to(np.abs(item.forces[..., axis]), (len(specs), len(names))).max(axis=1)
            demands.append((webs, force, _bearing_allowable(webs, item, member.length, material.elastic_modulus)))
        for load, support in opposed_pairs(items, member.length):
            pushed, held = load.forces[..., axis], support.forces[..., axis]
            force = np.broadcast_to(np.where(pushed * held < 0, np.minimum(np.abs(pushed), np.abs(held)), 0.0), (len(specs), len(names)))
            demands.append((webs, force.max(axis=1), _buckling_allowable(webs, load, member.length, material.elastic_modulus)))
    made = [(webs.has & (force > ZERO_ACTION), force, allowable) for webs, force, allowable in demands]
    found = np.zeros(len(specs))
    if not any(where.any() for where, _, _ in made):
        return found
    try:
        fy = yield_strength_for_webs(material, member.source)[0]
    except InputError:
        return np.where(np.logical_or.reduce([where for where, _, _ in made]), np.nan, found)
    for where, force, allowable in made:
        found = np.where(where, np.maximum(found, force / np.where(where, allowable(fy), 1.0)), found)
    return found


def _bearing_allowable(webs: WebColumns, item: Concentrated, length: float, E: float) -> Callable[[float], np.ndarray]:
    """Fy -> (S,) min(web local yielding, web crippling) / Omega under one concentrated force (as _web_result)."""
    end = min(item.at, length - item.at)
    return lambda fy: np.minimum(web_yielding(webs, fy, item.bearing, end <= webs.depth) / OMEGA_YIELDING,
                                 web_crippling(webs, E, fy, item.bearing, end < webs.depth / 2) / OMEGA_CRIPPLING)


def _buckling_allowable(webs: WebColumns, load: Concentrated, length: float, E: float) -> Callable[[float], np.ndarray]:
    """Fy -> (S,) web compression buckling / Omega under a load over a support (as _pair_result)."""
    end = min(load.at, length - load.at)
    return lambda fy: web_compression_buckling(webs, E, fy, end < webs.depth / 2) / OMEGA_COMPRESSION


def web_notes(design: Design) -> list[str]:
    """The web check's assumptions: the method, bearing lengths and stiffeners as used."""
    if no_web_reason(design.spec.shape):
        return []
    items = concentrated_forces(design)
    if not items:
        return []
    parts = [phrase(item.what, ": ", "stiffened, not checked" if item.stiffened else
                    phrase("bearing ", q("bearing", item.bearing, "mm", ".4g")) if item.bearing > 0 else
                    phrase("knife edge (bearing ", q("bearing", 0.0, "mm"), ", the default)")) for item in items]
    return [phrase(ASSUMPTIONS, " ", joined("; ", parts), ".")]


# ----------------------------------------------------------------------------------------------
# shear buckling of web panels

def shear_buckling_coefficient(h: float | np.ndarray, a: float | np.ndarray) -> np.ndarray:
    """k_tau of a panel h deep and a long, simply supported on all edges (Timoshenko & Gere ch. 9;
    EN 1993-1-5 Annex A.3, from memory): 5.34 + 4 (h/a)^2 for a/h >= 1, 4 + 5.34 (h/a)^2 for a/h < 1."""
    ratio = np.asarray(h, dtype=float) / np.asarray(a, dtype=float)
    return np.where(ratio <= 1.0, 5.34 + 4.0 * ratio**2, 4.0 + 5.34 * ratio**2)


def elastic_shear_buckling(k_tau: float | np.ndarray, E: float, nu: float, t: float, h: float) -> np.ndarray:
    """tau_cr = k_tau pi^2 E / (12 (1 - nu^2)) (t / h)^2 (Pa)."""
    return np.asarray(k_tau) * math.pi**2 * E / (12.0 * (1.0 - nu * nu)) * (t / h) ** 2


def panel_lengths(member: Member, xs: np.ndarray) -> np.ndarray:
    """The web panel length a (m) at each station: web_stiffener_spacing where given, else the span
    (between supports, or an overhang) the station is in, the longer one at a support."""
    from sizer.analysis.patterns import spans

    given = member.checks.web_stiffener_spacing
    if given is not None:
        return np.full(len(xs), given)
    found = spans(member) or []
    lengths = np.zeros(len(xs))
    tol = 1e-9 * member.length
    for span in found:
        inside = (xs >= span.start - tol) & (xs <= span.end + tol)
        lengths = np.where(inside, np.maximum(lengths, span.length), lengths)
    return np.where(lengths > 0, lengths, member.length)


@dataclass(frozen=True)
class ShearPanels:
    """The shear allowable of each station for shear along section y and z (Pa, (S,) each; the
    user's Fv where no web carries that shear or nothing buckles), and the numbers behind them."""

    allowable: np.ndarray  # (2, S): along y, along z
    critical: np.ndarray  # (2, S) tau_cr, inf without a web
    k_tau: np.ndarray  # (2, S)
    length: np.ndarray  # (S,) panel length a
    h: tuple[float, float]  # clear depth of the web along y and z (0 without one)
    t: tuple[float, float]


def shear_panels(design: Design, xs: np.ndarray, allowable: float) -> ShearPanels | None:
    """The reduced shear allowables at the stations xs (m); None for a section without a web."""
    from sizer.checks.local import poisson_ratio

    webs = section_webs(design.spec.shape, design.spec.dims)
    if not webs:
        return None
    material = design.known_material
    a = panel_lengths(design.member, xs)
    nu = poisson_ratio(material, design.member.source)
    fy = material.yield_strength
    tau_y = fy / math.sqrt(3.0) if fy else None
    reduced, critical, ks = np.full((2, len(xs)), allowable), np.full((2, len(xs)), np.inf), np.zeros((2, len(xs)))
    h, t = [0.0, 0.0], [0.0, 0.0]
    for web in webs:
        row = web.axis - 1
        ks[row] = shear_buckling_coefficient(web.h, a)
        critical[row] = elastic_shear_buckling(ks[row], material.elastic_modulus, nu, web.tw, web.h)
        reduced[row] = reduced_allowable(allowable, critical[row], tau_y, design.member.checks.buckling_safety_factor, PLATEAU_SHEAR)
        h[row], t[row] = web.h, web.tw
    return ShearPanels(reduced, critical, ks, a, (h[0], h[1]), (t[0], t[1]))


def shear_slenderness(critical: float, yield_strength: float | None) -> float | None:
    """lambda_w = sqrt((Fy / sqrt(3)) / tau_cr), None without a yield strength."""
    return float(slenderness(critical, yield_strength / math.sqrt(3.0))) if yield_strength else None
