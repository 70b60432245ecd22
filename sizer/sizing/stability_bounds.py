"""Proven lower bounds of the buckling and lateral-torsional checks of every candidate at once.

Each check's utilization rises with its demand (the peak compression, or the peak major-axis
moment) and falls with the buckling load factor (sizer.checks.buckling and .lateral: the elastic
branch does not depend on the demand, the Johnson branch and the unreduced allowable rise with
it). So the screen's demands (exact at the screen's stations, which the check also uses: a lower
bound of the check's) with an upper bound of the load factor give a lower bound of the
utilization. The upper bounds are Rayleigh-Ritz bounds (sizer.stability.ritz) over trial shapes:
the buckled shapes that the full checks made so far found, projected onto the shapes every section
allows; each full check adds its shapes, so the bounds close in as the search goes on. A trial
shape bounds any load set, so the shapes found for one pattern arrangement serve every arrangement
of its combination (the full check solves arrangements the screen does not hold). Euler loads on
buckling lengths the user gives are exact bounds from the start.
"""

from __future__ import annotations

import numpy as np

from sizer.analysis import MemberSolution
from sizer.checks.buckling import given_euler_loads
from sizer.checks.reduction import PLATEAU_LATERAL, johnson, reduced_allowable
from sizer.checks.results import ZERO_ACTION
from sizer.checks.stability import StabilityReport
from sizer.model import Material, Member
from sizer.sizing.candidates import CandidateTable
from sizer.sizing.screen import Screen
from sizer.stability import MemberStability, StabilitySection, minor_axis_is_weaker
from sizer.stability.boundary import admissible_basis
from sizer.stability.problem import SameLoadSets, load_shape, term_coefficients
from sizer.stability.ritz import Projection, assemble, largest_inverse, orthonormal, projected, projected_elastic, strict_rows

Group = tuple[str, str]  # (kind, given combination): the load sets that share trial shapes


class StabilityBounds:
    """Lower bounds of the stability checks of every candidate (see the module docstring)."""

    def __init__(self, model: MemberStability, base: MemberSolution, table: CandidateTable, found: Screen, member: Member,
                 material: Material) -> None:
        self.model, self.table, self.member, self.material = model, table, member, material
        self.demand = {"axial": found.compression, "lateral": found.moment}
        self.lateral_applies = minor_axis_is_weaker(table)  # Iz and Iy: the geometric tier, known for every row
        wanted = {(kind, c) for kind, demand in self.demand.items() for c in range(len(base.combination_names))
                  if np.any(demand[c] > ZERO_ACTION)}
        self.alias = same_load_sets(model, wanted)
        self.wanted = {key for key, (representative, _) in self.alias.items() if key == representative}
        self.basis: np.ndarray | None = None  # made with the first shapes
        self.origin = [base.member.origin(name) for name in base.combination_names]
        self.shapes: dict[Group, list[np.ndarray]] = {(kind, self.origin[c]): [] for kind, c in self.wanted}
        self.projections: dict[tuple[str, int], Projection] = {}
        self.stale: set[Group] = set()
        self.epoch = 0  # counts the full checks and seeds whose shapes were taken

    def add(self, report: StabilityReport) -> None:
        """Take a full check's buckled shapes as trial shapes (projected onto every section's allowed
        shapes), each for every load set of its given combination: its pattern arrangements too."""
        self.epoch += 1
        for entry in report.combinations:
            origin = report.model.member.origin(entry.combination)
            for kind, found in (("axial", entry.axial), ("lateral", entry.lateral)):
                if found is not None and found.mode is not None:
                    self._take((kind, origin), found.mode)  # a combination that scales this one has the same shape: taken once

    def seed(self, index: int, section: StabilitySection, mass: float) -> None:
        """Take the buckled shapes of candidate row `index` (`section`, self-weight `mass` kg/m) on the
        base mesh, not refined, under every load set bounded here, as trial shapes. The finer meshes
        hold the base mesh's shapes, so its base-mesh load factors lie above its converged ones, and
        its own bounds come within the refinement's change of its check's: one small eigen-solve per
        load set can rule it out where its check would fail on stability, in place of its full check
        (the converged solves of every combination, its pattern arrangements too, the second-order
        actions and the stress field)."""
        self.epoch += 1
        solver = self.model.for_section(section, keep=True)  # its solves then start the section's full check
        loads, per_mass = self.model.rows
        for kind, c in sorted(self.wanted):
            if kind == "lateral" and not self.lateral_applies[index]:
                continue
            found = solver.unrefined(kind, loads[c] + mass * per_mass[c])
            mode = solver.on_base(found.mode)
            if mode is not None and not found.free_movement:
                self._take((kind, self.origin[c]), mode)

    def _take(self, group: Group, mode: np.ndarray) -> None:
        """A buckled shape on the base mesh as a trial shape of a group (where it has load sets bounded here)."""
        if group not in self.shapes:
            return
        if self.basis is None:
            self.basis = admissible_basis(self.model.mesh.size, strict_rows(self.model), self.model.mesh.sparse)
        self.shapes[group].append(self.basis @ (self.basis.T @ mode))
        self.stale.add(group)

    def lower_bounds(self, rows: np.ndarray) -> dict[str, np.ndarray]:
        """check -> (len(rows),) proven lower bound of its utilization for the candidates `rows`, with
        the trial shapes so far."""
        for group in sorted(self.stale):
            self.projections.update(self._projections(group))
        self.stale.clear()
        solved = {key: self._ritz(key, rows) for key in self.projections}
        factors = {key: solved[representative] / scale for key, (representative, scale) in self.alias.items() if representative in solved}
        return {"buckling": self._buckling(rows, factors), "lateral-torsional": self._lateral(rows, factors)}

    def _projections(self, group: Group) -> dict[tuple[str, int], Projection]:
        """The Projection of every load set of a group over its trial shapes: each load-case column's
        geometric terms projected once (per sign of its factor), a load set's the weighted sum of its
        columns' (the terms are linear in the weights; a load's default height follows the sign of its
        factor, so each column is taken at the sign of its weight: MemberStability.column_terms)."""
        kind, origin = group
        trial = orthonormal(np.column_stack(self.shapes[group]))
        elastic, springs = projected_elastic(self.model, trial), (trial.T * self.model.springs) @ trial
        loads, per_mass = self.model.rows
        columns: dict[tuple[int, bool], dict[str, np.ndarray]] = {}

        def summed(weights: np.ndarray) -> dict[str, np.ndarray]:
            total: dict[str, np.ndarray] = {}
            for column, weight in enumerate(weights):
                if weight == 0.0:
                    continue
                side = (column, bool(weight > 0))
                if side not in columns:
                    terms = self.model.column_terms(kind, *side)
                    columns[side] = {name: projected(trial, terms, name) for name in terms}
                for name, matrix in columns[side].items():
                    total[name] = total[name] + abs(weight) * matrix if name in total else abs(weight) * matrix
            return total

        found = {}
        for key in sorted(key for key in self.wanted if key[0] == kind and self.origin[key[1]] == origin):
            terms_loads, terms_mass = summed(loads[key[1]]), summed(per_mass[key[1]])
            zero = np.zeros((trial.shape[1],) * 2)
            names = set(terms_loads) | set(terms_mass)
            found[key] = Projection(elastic, springs, {name: terms_loads.get(name, zero) for name in names},
                                    {name: terms_mass.get(name, zero) for name in names})
        return found

    def _ritz(self, key: tuple[str, int], rows: np.ndarray) -> np.ndarray:
        """(len(rows),) upper bounds of the load factors of one combination and kind; infinite (no
        bound yet) for a row whose warping tier (J, Iw, shear centre) the search has not revealed."""
        factor = np.full(len(rows), np.inf)
        known = self.table.known[rows]
        if known.any():
            sections = self.table.stability_sections(self.material, rows[known])
            stiffness, geometric = assemble(self.projections[key], sections, self.table.mass[rows[known]], term_coefficients(key[0], sections))
            factor[known] = largest_inverse(stiffness, geometric)
        return factor

    def _buckling(self, rows: np.ndarray, factors: dict[tuple[str, int], np.ndarray]) -> np.ndarray:
        """Every combination at once (combinations x rows), the worst of each row."""
        table, material, settings = self.table, self.material, self.member.checks
        area = table.area[rows]
        given = given_euler_loads(self.member, table.I11[rows], table.I22[rows], material.elastic_modulus)
        compression = self.demand["axial"][:, rows]
        factor = np.full(compression.shape, np.inf)
        for (kind, c), values in factors.items():
            if kind == "axial":
                factor[c] = values
        with np.errstate(divide="ignore", invalid="ignore"):
            load = np.minimum(np.where(compression > ZERO_ACTION, factor * compression, np.inf), given)
            allowable = johnson(load / area, material.yield_strength) * area / settings.buckling_safety_factor
            value = np.where(compression > ZERO_ACTION, compression / allowable, 0.0)
        return np.nan_to_num(value, nan=0.0).max(axis=0, initial=0.0)

    def _lateral(self, rows: np.ndarray, factors: dict[tuple[str, int], np.ndarray]) -> np.ndarray:
        """The combinations with a bound at once (combinations x rows), the worst of each row."""
        table, material = self.table, self.material
        bending = material.allowable.bending
        bounded = sorted(c for kind, c in factors if kind == "lateral")
        if bending is None or not bounded:
            return np.zeros(len(rows))
        modulus = np.minimum(table.Sz_top, table.Sz_bottom)[rows]
        moment = self.demand["lateral"][bounded][:, rows]
        factor = np.stack([factors[("lateral", c)] for c in bounded])
        with np.errstate(invalid="ignore", over="ignore"):
            allowable = reduced_allowable(bending, np.where(moment > ZERO_ACTION, factor * moment, np.inf) / modulus, material.yield_strength,
                                          self.member.checks.buckling_safety_factor, PLATEAU_LATERAL)
            bound = (moment > ZERO_ACTION) & self.lateral_applies[rows] & np.isfinite(factor)  # else the bending check says as much
            value = np.where(bound, moment * table.sigma_peak_Mz[rows] / allowable, 0.0)
        return np.nan_to_num(value, nan=0.0).max(axis=0, initial=0.0)


def same_load_sets(model: MemberStability, keys: set[tuple[str, int]]) -> dict[tuple[str, int], tuple[tuple[str, int], float]]:
    """(kind, combination) -> (the first such key whose load set, for every mass of self-weight, this
    one's is k > 0 times, k): its load factor is that one's / k and its buckled shape the same, so
    one bound serves both (as one solve serves both in the full check). Load cases that give no
    geometric term of the kind (a sideways wind in the lateral solve) do not count."""
    loads, per_mass = model.rows
    columns = loads.shape[1]
    seen = {"axial": SameLoadSets(), "lateral": SameLoadSets()}
    found: dict[tuple[str, int], tuple[tuple[str, int], float]] = {}
    for kind, c in sorted(keys):
        live = sorted(model.live_columns(kind))
        # the loads' columns, then the self-weight's per kg/m as columns of their own: the same shape for every mass
        shape, scale = load_shape([(j, loads[c, j]) for j in live] + [(columns + j, per_mass[c, j]) for j in live])
        match = seen[kind].find(shape) if shape else None
        if match is None:
            seen[kind].add(shape, ((kind, c), scale))
            found[(kind, c)] = ((kind, c), 1.0)
        else:
            found[(kind, c)] = (match[0], scale / match[1])
    return found
