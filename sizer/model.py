"""The member model: plain dataclasses, SI floats, no behaviour beyond small derived values.

Axes and signs (docs/design.md section 2): x along the member from end A (x = 0) to end B (x = L); y is the
section's depth direction (up for a horizontal beam); z completes a right-handed set. Forces and
moments act along or about +x, +y, +z. Freedoms: ux, uy, uz (translations), rx (twist), ry, rz.
"""

from __future__ import annotations

from dataclasses import dataclass, field

FREEDOMS: tuple[str, ...] = ("ux", "uy", "uz", "rx", "ry", "rz")
ACTIONS: tuple[str, ...] = ("N", "Vy", "Vz", "T", "My", "Mz")
SUPPORT_TYPES: dict[str, frozenset[str]] = {
    "fixed": frozenset(FREEDOMS),
    "pin": frozenset({"ux", "uy", "uz", "rx"}),
    "roller": frozenset({"uy", "uz", "rx"}),
}
HEIGHT_FACES: tuple[str, ...] = ("top", "centre", "bottom")
ACROSS_NAMES: tuple[str, ...] = ("shear-centre", "centroid")
DEFAULT_ACROSS = "centroid"
WARPING_CHOICES: tuple[str, ...] = ("free", "held")
RESTRAINT_HOLDS: tuple[str, ...] = ("lateral", "twist")
DEFAULT_CASE = "load"
DEFAULT_COMBINATION = "all"


@dataclass(frozen=True)
class Allowables:
    """Allowable stresses entered by the user from the governing code, Pa; None where not given."""

    tension: float | None = None
    compression: float | None = None
    bending: float | None = None
    shear: float | None = None
    equivalent: float | None = None


@dataclass(frozen=True)
class Material:
    """An isotropic linear elastic material. Moduli and strengths in Pa, density in kg/m^3."""

    name: str
    elastic_modulus: float
    shear_modulus: float
    density: float
    yield_strength: float | None = None
    allowable: Allowables = field(default_factory=Allowables)
    source: str = ""  # file it was read from


@dataclass(frozen=True)
class Support:
    """A support at `at` (m). `restrain`: freedoms held rigidly. `springs`: freedom -> stiffness
    (N/m for ux, uy, uz; N*m/rad for rx, ry, rz), elastic instead of rigid on those freedoms.
    A freedom is never both in `restrain` and `springs`."""

    at: float
    restrain: frozenset[str]
    springs: dict[str, float] = field(default_factory=dict)
    label: str = ""  # e.g. "pin", "roller", "fixed", "custom"
    warping: str | None = None  # for stability: "free" or "held"; None: held by fixed supports, free otherwise
    bearing: float = 0.0  # stiff bearing length along the member (m) for the web check; 0: knife edge
    stiffened: bool = False  # a web stiffener here: no web check at this support

    @property
    def holds_warping(self) -> bool:
        """True when the support holds warping: as given, else when it holds rx, ry and rz (built in)."""
        if self.warping is not None:
            return self.warping == "held"
        return {"rx", "ry", "rz"} <= set(self.restrain)


@dataclass(frozen=True)
class Hinge:
    """An internal hinge at `at` (m): releases both bending moments (My and Mz); N, Vy, Vz and T
    pass through it."""

    at: float


@dataclass(frozen=True)
class PointLoad:
    """Concentrated force (N) and moment (N*m) at `at` (m), in load case `case`.
    force = (fx, fy, fz), moment = (mx, my, mz); mx is a torque about the member axis."""

    case: str
    at: float
    force: tuple[float, float, float] = (0.0, 0.0, 0.0)
    moment: tuple[float, float, float] = (0.0, 0.0, 0.0)
    height: str | float | None = None  # where a transverse force acts on the section (see Restraint); None: default
    pattern: bool = False  # pattern loading: the span it is on is loaded in some arrangements only (analysis.patterns)
    bearing: float = 0.0  # stiff bearing length along the member (m) for the web check; 0: knife edge
    stiffened: bool = False  # a web stiffener here: no web check under this load
    across: str | float = DEFAULT_ACROSS  # where across the section the force acts: "shear-centre", "centroid" or z from the shear centre (m)


@dataclass(frozen=True)
class Pressure:
    """An area load as given: pressures (px, py, pz) in Pa at the load's start and end (varying
    linearly between) on a tributary `width` (m). The line load it makes is pressure x width (N/m)."""

    p_start: tuple[float, float, float]
    p_end: tuple[float, float, float]
    width: float


@dataclass(frozen=True)
class LineLoad:
    """Distributed load from `start` to `end` (m), varying linearly from `q_start` to `q_end`.
    Each q is (wx, wy, wz, mx): forces per length (N/m) along x, y, z and torque per length (N*m/m).
    `area`: the pressure and width it was made from, for display (None: given as a line load)."""

    case: str
    start: float
    end: float
    q_start: tuple[float, float, float, float]
    q_end: tuple[float, float, float, float]
    height: str | float | None = None  # where the transverse load acts on the section (see Restraint); None: default
    pattern: bool = False  # pattern loading: each span it covers is loaded in some arrangements only (analysis.patterns)
    area: Pressure | None = None
    across: str | float = DEFAULT_ACROSS  # where across the section the load acts: "shear-centre", "centroid" or z from the shear centre (m)


Load = PointLoad | LineLoad


@dataclass(frozen=True)
class Patterning:
    """How pattern loading expanded a member (analysis.patterns): the loads and combinations as given,
    the spans (start, end in m, numbered from 1 at end A) the patterned loads were split over, and for
    every combination of the expanded member the given combination it comes from; for each given
    combination its switches (a patterned case's part on one span and its factor), and for each
    arrangement of the expanded member the switches it loads (indices into its origin's switches)."""

    loads: tuple[Load, ...]
    combinations: dict[str, dict[str, float]]
    spans: tuple[tuple[float, float], ...]
    origins: dict[str, str]
    switches: dict[str, tuple[tuple[str, float], ...]] = field(default_factory=dict)
    loaded: dict[str, frozenset[int]] = field(default_factory=dict)


@dataclass(frozen=True)
class Restraint:
    """Bracing that holds the member against buckling, at a point (start == end, m) or continuously
    from start to end (a deck, sheeting). `lateral`: holds the sideways movement (across the
    section's depth, along its weak-axis direction) of the point at `height`; `twist`: holds the
    rotation about the member axis. `height`: "top", "centre" (the shear centre), "bottom", or metres
    from the shear centre along the section's depth (positive towards the top). The same form gives
    the height of a transverse load on the section."""

    start: float
    end: float
    lateral: bool
    twist: bool
    height: str | float = "centre"

    @property
    def continuous(self) -> bool:
        return self.end > self.start


@dataclass(frozen=True)
class DeflectionLimit:
    """One deflection limit: a span may deflect span / `limit`, an overhang overhang / `overhang_limit`
    (None: that kind is not checked by this limit), in the given `combinations` (names as given in
    the member file, each with all its pattern arrangements; None: every combination), measured from
    the chord between the span's supports (`relative_to_supports`) or from the original position."""

    limit: float | None
    overhang_limit: float | None
    combinations: tuple[str, ...] | None = None
    relative_to_supports: bool = True


@dataclass(frozen=True)
class CheckSettings:
    """The `[checks]` table. Lengths in m; None means the documented default. The single deflection
    keys and the `[[checks.deflection]]` entries (`deflection`) are two ways of giving limits; the
    checks use both (checks.deflection.limit_entries)."""

    deflection_limit: float | None = None  # span / limit
    deflection_limit_overhang: float | None = None  # default: deflection_limit / 2
    deflection_combinations: tuple[str, ...] | None = None  # default: every combination
    deflection: tuple[DeflectionLimit, ...] = ()  # [[checks.deflection]] entries
    buckling_length_major: float | None = None  # default: member length
    buckling_length_minor: float | None = None  # default: member length
    buckling_safety_factor: float = 2.0
    buckling_safety_factor_given: bool = False
    web_stiffener_spacing: float | None = None  # panel length for web shear buckling; None: the span between supports
    second_order: bool = True  # actions from a second-order elastic solve (sizer.stability.second_order)
    imperfection_ratio: float | None = None  # initial bow = ratio x member length ("L/1000": 0.001); None: see below
    imperfection_length: float | None = None  # initial bow given as a length (m); both None: no bow

    def bow(self, length: float) -> float:
        """The initial bow (m) of a member `length` m long: 0 without an imperfection."""
        if self.imperfection_ratio is not None:
            return self.imperfection_ratio * length
        return self.imperfection_length or 0.0


@dataclass(frozen=True)
class Member:
    """One straight member as read from a member file. All lengths in m from end A."""

    length: float
    material: str
    supports: tuple[Support, ...]
    loads: tuple[Load, ...]
    combinations: dict[str, dict[str, float]]
    section: str | None = None
    orientation: str = "major"  # "major" or "minor"
    self_weight_case: str | None = "dead"  # None: no self-weight
    gravity: tuple[int, int] = (1, -1)  # (axis index 0=x 1=y 2=z, sign)
    hinges: tuple[Hinge, ...] = ()
    restraints: tuple[Restraint, ...] = ()
    checks: CheckSettings = field(default_factory=CheckSettings)
    materials: dict[str, Material] = field(default_factory=dict)
    title: str = ""
    source: str = ""  # path of the member file
    combinations_given: bool = False  # False: the default "all" combination was made
    patterning: Patterning | None = None  # set when patterned loads were expanded into arrangements

    @property
    def given_loads(self) -> tuple[Load, ...]:
        """The loads as the member file gave them (patterned loads whole, not split by span)."""
        return self.patterning.loads if self.patterning else self.loads

    @property
    def given_combinations(self) -> dict[str, dict[str, float]]:
        """The combinations as the member file gave them (before pattern arrangements)."""
        return self.patterning.combinations if self.patterning else self.combinations

    def origin(self, combination: str) -> str:
        """The given combination that `combination` (a name of self.combinations) comes from."""
        return self.patterning.origins.get(combination, combination) if self.patterning else combination

    @property
    def has_springs(self) -> bool:
        """True when a support has a spring: the forces then depend on the member's stiffness."""
        return any(support.springs for support in self.supports)

    @property
    def cases(self) -> tuple[str, ...]:
        """Load case names in order of first appearance (loads first, then the self-weight case)."""
        names: list[str] = []
        for load in self.loads:
            if load.case not in names:
                names.append(load.case)
        if self.self_weight_case and self.self_weight_case not in names:
            names.append(self.self_weight_case)
        return tuple(names)


@dataclass(frozen=True)
class Stiffness:
    """Member rigidities: EA (N), GJ (N*m^2), EIz for bending in the x-y plane and EIy for bending
    in the x-z plane (N*m^2), already accounting for the section's orientation on the member."""

    EA: float
    GJ: float
    EIz: float
    EIy: float

    @staticmethod
    def unit() -> "Stiffness":
        """Unit rigidities: forces are right for any layout without springs; displacements are not."""
        return Stiffness(1.0, 1.0, 1.0, 1.0)
