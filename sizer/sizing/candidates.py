"""The candidates of a sizing: the catalogue's sections after the filters, in order of mass per
length, with their scalars as one table (SI: m^2, m^4, kg/m, Pa per unit action), and a Design of
any one of them solved without a new solve (the unit-rigidity solution rescaled, when no support
has a spring).

The table starts either whole (every tier) or with the geometric tier alone (`lazy`: the sizing's
way), its warping columns NaN until the search reveals a row (CandidateTable.reveal), which it
does only for the candidates whose verdict needs them. What the search knows is thus the same
whatever the cache holds, and so is its answer.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import cached_property
from typing import TYPE_CHECKING, Any, Callable, Sequence

import numpy as np

from sizer.analysis import MemberSolution, solve_member
from sizer.checks import CheckReport
from sizer.design import Design, oriented_stiffness
from sizer.errors import InputError
from sizer.model import Material, Member
from sizer.sizing.cost import Costing, Ranking, costing, ranking_depth
from sizer.stability import StabilitySection
from sizer.stability.section import SCALARS, section_of

if TYPE_CHECKING:
    from sizer.sections.properties import SectionProperties
    from sizer.sections.catalogue import Catalogue
    from sizer.sections.spec import SectionSpec


@dataclass(frozen=True, eq=False)
class CandidateTable:
    """One row per candidate, in candidate order: every scalar of sizer.sections.properties.SCALAR_NAMES
    by name (`column`), the mass per length (kg/m) and the peak stresses per unit action. `known`:
    the rows whose warping tier (sizer.sections.warping.WARPING_NAMES) is filled in; the other
    rows hold NaN there."""

    column: dict[str, np.ndarray]
    mass: np.ndarray
    specs: tuple[Any, ...] = ()  # the candidates' SectionSpecs, in order
    known: np.ndarray = field(default_factory=lambda: np.ones(0, bool))

    def __getattr__(self, name: str) -> np.ndarray:
        column = self.__dict__.get("column", {})
        if name in column:
            return column[name]
        raise AttributeError(name)

    @property
    def sigma_peak(self) -> np.ndarray:
        """(S, 3) |sigma| per unit N, My, Mz (section axes)."""
        from sizer.sections.properties import SIGMA_PEAK_NAMES

        return np.column_stack([self.column[name] for name in SIGMA_PEAK_NAMES])

    @property
    def tau_peak(self) -> np.ndarray:
        """(S, 3) |tau| per unit Vy, Vz, T."""
        from sizer.sections.properties import TAU_PEAK_NAMES

        return np.column_stack([self.column[name] for name in TAU_PEAK_NAMES])

    def subset(self, rows: Sequence[int]) -> "CandidateTable":
        """The table of `rows` alone (copies)."""
        return CandidateTable({name: values[rows] for name, values in self.column.items()}, self.mass[rows],
                              tuple(self.specs[row] for row in rows), self.known[rows])

    def reveal(self, rows: Sequence[int]) -> None:
        """Fill in the warping tier of `rows` (from the section cache: computed there first if missing)."""
        from sizer.sections.properties import warping_row
        from sizer.sections.warping import WARPING_NAMES

        for row in rows:
            for name, value in zip(WARPING_NAMES, warping_row(self.specs[row])):
                self.column[name][row] = value
            self.known[row] = True

    def stability_sections(self, material: Material, rows: np.ndarray | None = None) -> StabilitySection:
        """Every candidate (or those `rows`) as one StabilitySection of arrays (the section's own axes)."""
        values = {name: self.column[name] if rows is None else self.column[name][rows] for name in SCALARS}
        return section_of(values, material.elastic_modulus, material.shear_modulus)


@dataclass
class Candidate:
    """One catalogue section in the sizing run."""

    name: str
    spec: SectionSpec
    mass_per_length: float
    density: float
    index: int  # row in the CandidateTable and the Screen
    costing: Costing  # its cost for the member and whether it is available (sizer.sizing.cost)
    bounds: dict[str, float] = field(default_factory=dict)  # check -> proven lower bound of its utilization
    report: CheckReport | None = None  # full check, where made
    design: Design | None = None  # the solved design of that full check
    rank: tuple = ()  # its sort key (sizer.sizing.cost.Ranking.key)
    unchecked: bool = False  # a runner-up shown from its proven lower bounds alone: not checked in full, it may pass or fail

    @cached_property
    def props(self) -> SectionProperties:
        from sizer.sections import section_properties

        return section_properties(self.spec, self.density)

    @property
    def full_report(self) -> CheckReport:
        """The report of the full check (only for a candidate that had one: the choice, the strongest)."""
        if self.report is None:
            raise ValueError(f"{self.name} was not checked in full")
        return self.report

    @property
    def decided_by(self) -> str:
        if self.report is not None:
            return "full stress field"
        return "not checked in full" if self.unchecked else "screen"

    @property
    def passes(self) -> bool:
        return self.report.passes if self.report is not None else False

    @property
    def lower_bound(self) -> tuple[str, float]:
        """(check, utilization) of the largest proven lower bound."""
        return max(self.bounds.items(), key=lambda item: item[1], default=("", 0.0))

    @property
    def certainly_fails(self) -> bool:
        return self.report is None and any(value > 1.0 for value in self.bounds.values())

    @property
    def utilization(self) -> float:
        return self.report.utilization if self.report is not None else self.lower_bound[1]

    @property
    def governing(self) -> str:
        if self.report is not None:
            return self.report.governing.check if self.report.governing is not None else ""
        return self.lower_bound[0]

    def raise_bound(self, check: str, value: float) -> None:
        """Keep the larger of two proven lower bounds of one check."""
        self.bounds[check] = max(self.bounds.get(check, 0.0), float(value))


def candidate_sections(catalogue: Catalogue, member: Member, material: Material, families: Sequence[str],
                       max_depth: float | None, max_width: float | None,
                       progress: Callable[[int, int, str], None] | None = None, lazy: bool = False,
                       ranking: Ranking | None = None) -> tuple[list[Candidate], CandidateTable]:
    """Catalogue sections after the filters, in the order of `ranking` (default: by mass per
    length), each with its cost for the member, and their table: every tier (any not cached computed
    first, reporting to `progress`), or with `lazy` the geometric tier alone (no sectionproperties;
    the warping columns NaN). Depth and width are as installed (a minor orientation swaps them)."""
    from sizer.sections.properties import SCALAR_NAMES, geometric_table, section_table
    from sizer.sections.geometric import GEOMETRIC_NAMES

    specs = catalogue.select(families)
    if not specs:
        files = ", ".join(str(path) for path in catalogue.files) or "the catalogue"
        raise InputError(files, "sections", "the catalogue holds no sections", "add [[sections]] entries, or pass --catalogue with a stock list")
    if lazy:
        geometric = geometric_table(specs)
        column = {name: geometric[:, k] for k, name in enumerate(GEOMETRIC_NAMES)}  # the other tiers NaN (below)
    else:
        table = section_table(specs, progress=progress)
        column = {name: table[:, k] for k, name in enumerate(SCALAR_NAMES)}
    depth, width = (column["depth"], column["width"]) if member.orientation == "major" else (column["width"], column["depth"])
    keep = np.ones(len(specs), bool)
    if max_depth is not None:
        keep &= depth <= max_depth * (1 + 1e-9)
    if max_width is not None:
        keep &= width <= max_width * (1 + 1e-9)
    if not keep.any():
        raise InputError("", "--max-depth", "no catalogue section fits the depth and width limits", "relax --max-depth / --max-width")
    keep &= _holding_the_heights(specs, member, keep, progress)
    mass = column["area"] * material.density
    ranking = ranking or Ranking()
    kept = np.flatnonzero(keep).tolist()
    costs = {i: costing(catalogue.purchase(specs[i]), float(mass[i]), member.length) for i in kept}
    installed_depth = ranking_depth(column, member.orientation)
    keys = {i: ranking.key(specs[i].name, float(mass[i]), float(installed_depth[i]), costs[i]) for i in kept}
    order = sorted(kept, key=keys.__getitem__)
    candidates = [Candidate(specs[i].name, specs[i], float(mass[i]), material.density, k, costing=costs[i], rank=keys[i])
                  for k, i in enumerate(order)]
    rows = np.array(order, dtype=int)
    ordered = {name: column[name][rows] if name in column else np.full(len(rows), np.nan) for name in SCALAR_NAMES}
    return candidates, CandidateTable(ordered, mass[rows], tuple(specs[i] for i in order), np.full(len(order), not lazy))


def _holding_the_heights(specs: Sequence[Any], member: Member, keep: np.ndarray,
                         progress: Callable[[int, int, str], None] | None) -> np.ndarray:
    """Which sections hold every load and restraint height given as a number (design.height_outside:
    `sizer check` refuses the others, so they are no candidates); InputError when none does. Only
    with such heights are the kept sections' shear centres needed here: their every tier is tabled
    (computed in parallel where not cached, reporting to `progress`)."""
    from sizer.design import given_heights, heights_outside_faces
    from sizer.sections.properties import SCALAR_NAMES, section_table

    holds = np.ones(len(specs), bool)
    if not given_heights(member):
        return holds
    rows: list[int] = np.flatnonzero(keep).tolist()
    table = section_table([specs[i] for i in rows], progress=progress)
    column = {name: table[:, SCALAR_NAMES.index(name)] for name in ("ys", "y_top", "y_bottom", "depth")}
    misfit = None
    for k, i in enumerate(rows):
        misfit = heights_outside_faces(member, specs[i].name, *(float(column[name][k]) for name in ("ys", "y_top", "y_bottom", "depth")))
        holds[i] = misfit is None
    if not (holds & keep).any():
        assert misfit is not None  # a section was kept and tested
        misfit.problem += "; no candidate section holds it"
        raise misfit
    return holds


def design_for(member: Member, material: Material, candidate: Candidate, base: MemberSolution | None = None) -> Design:
    """A solved Design for one candidate (its own stiffness and self-weight): the unit-rigidity
    solution `base` rescaled when given (no springs), else solved."""
    stiffness = oriented_stiffness(candidate.props, material, member.orientation)
    mass = candidate.mass_per_length if member.self_weight_case else None
    solution = base.for_section(stiffness, mass) if base is not None else solve_member(member, stiffness, mass)
    return Design(solution.member, solution, material, candidate.spec, candidate.props, stiffness, candidate.mass_per_length)
