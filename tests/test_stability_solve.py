"""The eigen-solve's paths against each other and against published closed forms, each source named
beside its value:

- pinned column, flexural buckling: P_n = n^2 pi^2 E I / L^2 (Euler; Timoshenko & Gere, Theory of
  Elastic Stability, 2nd ed., ch. 2; from memory);
- fork-supported I-beam under uniform moment: Mcr = (pi/L) sqrt(E Iy G J) sqrt(1 + pi^2 E Iw / (G J L^2))
  (Timoshenko & Gere ch. 6; from memory).
The refined levels' dense solve starts from the coarser level's load factor (Reduced.near_hint): it
must give the full eigen-solve's lowest load factor, and nothing where its answer is not proven the
lowest. The dense and sparse matrices (sizer.stability.matrices) give the same load factors.
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
import pytest

from sizer.analysis import solve_member
from sizer.api import member_from_text
from sizer.model import Stiffness
from sizer.stability import MemberStability, StabilitySection
from sizer.stability.matrices import DENSE_LEAST, DENSE_MOST, dense_limit
from sizer.stability.solve import CERTIFIED, Reduced

E, G = 200e9, 77e9  # Pa, structural steel (docs/references.md, common practice)
IPE300 = dict(area=53.8e-4, Iz=8356e-8, Iy=604e-8, J=20.1e-8, Iw=125.9e3 * 1e-12, h=0.300)  # handbook IPE 300 (docs/references.md)


def ipe300() -> StabilitySection:
    s = IPE300
    return StabilitySection(EIz=E * s["Iz"], EIy=E * s["Iy"], EIyz=0.0, GJ=G * s["J"], EIw=E * s["Iw"], area=s["area"], Iz=s["Iz"],
                            Iy=s["Iy"], Iyz=0.0, y0=0.0, z0=0.0, Py=0.0, Pz=0.0, y_top=s["h"] / 2, y_bottom=s["h"] / 2)


def member(length: float, loads: str) -> tuple[MemberStability, np.ndarray]:
    """A simply supported member (pin, roller; twist held at both ends) without self-weight."""
    text = (f'[member]\nlength = "{length} m"\nmaterial = "steel"\nself_weight = false\n'
            f'[[supports]]\nat = "0 m"\ntype = "pin"\n[[supports]]\nat = "{length} m"\ntype = "roller"\n{loads}')
    parsed = member_from_text(text)
    solution = solve_member(parsed, Stiffness.unit(), None)
    return MemberStability(parsed, solution), solution.weights(None)[0]


def column(length: float, force: float = 1e3) -> tuple[MemberStability, np.ndarray]:
    return member(length, f'[[loads]]\ntype = "point"\nat = "{length} m"\nfx = "{-force} N"')


def uniform_moment(length: float, moment: float = 10e3) -> tuple[MemberStability, np.ndarray]:
    return member(length, f'[[loads]]\ntype = "moment"\nat = "0 m"\nmz = "{-moment} N*m"\n'
                          f'[[loads]]\ntype = "moment"\nat = "{length} m"\nmz = "{moment} N*m"')


def refined_pencil(model: MemberStability, kind: str, weights: np.ndarray, halvings: int = 2):
    """(the solver, B projected) of a load set on the member's mesh halved `halvings` times (dense)."""
    level = model.for_section(ipe300())
    for _ in range(halvings):
        level = level.finer()
    assert isinstance(level.reduced, Reduced)  # dense at these sizes
    return level.reduced, level.load_matrix(kind, weights)


def test_near_hint_gives_the_full_solve_lowest_load_factor_and_euler_load() -> None:
    length = 4.0
    model, weights = column(length, 1e3)
    reduced, b = refined_pencil(model, "axial", weights)
    full = reduced.projected_modes(b, 1)[0]
    coarse = model.for_section(ipe300()).reduced.modes(model.geometry("axial", ipe300(), weights), 1)[0]
    near = reduced.near_hint(b, coarse.load_factor)
    assert near is not None and near.mode is not None
    assert near.load_factor == pytest.approx(full.load_factor, rel=1e-9)
    euler = math.pi**2 * E * IPE300["Iy"] / length**2  # N, minor axis (Euler)
    assert near.load_factor * 1e3 == pytest.approx(euler, rel=1e-4)
    assert near.load_factor * 1e3 >= euler * (1 - 1e-9)  # a finite element mesh is no softer than the member


def test_near_hint_gives_the_lateral_torsional_load_factor() -> None:
    length, moment = 6.0, 10e3
    model, weights = uniform_moment(length, moment)
    reduced, b = refined_pencil(model, "lateral", weights)
    full = reduced.projected_modes(b, 1)[0]
    near = reduced.near_hint(b, full.load_factor * 1.01)  # a coarser mesh's: at or above the finer one's
    assert near is not None
    assert near.load_factor == pytest.approx(full.load_factor, rel=1e-9)
    s = IPE300
    timoshenko = math.pi / length * math.sqrt(E * s["Iy"] * G * s["J"] * (1 + math.pi**2 * E * s["Iw"] / (G * s["J"] * length**2)))
    assert near.load_factor * moment == pytest.approx(timoshenko, rel=1e-4)


def test_near_hint_refuses_a_higher_mode() -> None:
    """A hint near the second Euler load (4 x the first) finds that mode, which the Cholesky test
    proves is not the lowest: nothing is returned, and the solve falls back to the full one."""
    length = 4.0
    model, weights = column(length, 1e3)
    reduced, b = refined_pencil(model, "axial", weights)
    first = reduced.projected_modes(b, 1)[0].load_factor
    assert reduced.near_hint(b, 4.02 * first) is None
    assert reduced.projected_modes(b, 1, 4.02 * first)[0].load_factor == pytest.approx(first, rel=1e-9)


def test_near_hint_is_an_upper_bound_proven_close() -> None:
    """The answer is a Rayleigh quotient (at or above the mesh's lowest load factor) and lies within
    CERTIFIED of the full solve's (Sylvester's law of inertia)."""
    model, weights = uniform_moment(3.0)
    reduced, b = refined_pencil(model, "lateral", weights, halvings=1)
    full = reduced.projected_modes(b, 1)[0].load_factor
    near = reduced.near_hint(b, full * 1.05)
    assert near is not None
    assert full * (1 - CERTIFIED) <= near.load_factor <= full * (1 + 1e-10)


def test_dense_and_sparse_matrices_give_the_same_load_factors() -> None:
    model, weights = uniform_moment(6.0)
    sparse = MemberStability(model.member, model.solution, mesh=replace(model.mesh, sparse=True))
    for kind in ("lateral",):
        dense_found = model.for_section(ipe300()).reduced.modes(model.geometry(kind, ipe300(), weights), 1)[0]
        sparse_found = sparse.for_section(ipe300()).reduced.modes(sparse.geometry(kind, ipe300(), weights), 1)[0]
        assert sparse_found.load_factor == pytest.approx(dense_found.load_factor, rel=1e-8)


def test_dense_limit_follows_the_load_case_columns() -> None:
    """Few load-case columns: dense to DENSE_MOST freedoms; many (a patterned member's): DENSE_LEAST."""
    assert dense_limit(4) == DENSE_MOST
    assert dense_limit(22) == DENSE_LEAST
    assert all(dense_limit(n) >= dense_limit(n + 1) for n in range(1, 40))


def test_a_kept_section_solver_is_handed_over_once_and_solves_the_same() -> None:
    """A sizing seed's solver (for_section keep=True) is taken by the next call for the same section
    on the same model, once; its unrefined load factor lies at or above the converged one (Galerkin
    eigenvalues lie above the exact ones: Strang & Fix ch. 6, from memory), and its converged value is
    a fresh solver's and the Timoshenko & Gere value."""
    length, moment = 6.0, 10e3
    model, weights = uniform_moment(length, moment)
    kept = model.for_section(ipe300(), keep=True)
    unrefined = kept.unrefined("lateral", weights)
    assert model.for_section(replace(ipe300())) is kept
    fresh = model.for_section(ipe300())
    assert fresh is not kept
    converged = kept.load_set("lateral", weights).load_factor
    assert converged == fresh.load_set("lateral", weights).load_factor
    assert unrefined.load_factor >= converged
    s = IPE300
    timoshenko = math.pi / length * math.sqrt(E * s["Iy"] * G * s["J"] * (1 + math.pi**2 * E * s["Iw"] / (G * s["J"] * length**2)))
    assert converged * moment == pytest.approx(timoshenko, rel=1e-4)
