"""The lightest passing section of a catalogue, and why each lighter one fails.

Speed by design:
1. Superposition: each load case is solved once with unit rigidities, plus one unit self-weight
   solution. A section's actions are A_loads + m * A_unit_weight (m: its mass per length); its
   displacements are the unit-rigidity ones divided by its own rigidities, problem by problem.
   Exact without springs; with springs the forces depend on stiffness and each section is solved.
2. Screen (`screen`): every section x combination x station at once, one block of sections at a
   time: exact axial, deflection and stability demands at the screen's stations, stress estimates
   from the per-unit-action peaks.
3. Lower bounds: the exact parts of the screen; the full stress field at the screen's worst station
   (`screen.prove_lower_bounds`); Rayleigh-Ritz upper bounds of the buckling load factors, which
   give lower bounds of the buckling and lateral-torsional utilizations (`stability_bounds`). Above
   1.0 the section certainly fails.
4. Confirm (`search`): the choice, the runners-up shown, and every section the bounds cannot decide
   rest on the full check (checks.check_design), the same as `sizer check`, with the member's
   stability model shared; each full check's buckled shapes sharpen the bounds of the rest.
"""

from sizer.sizing.candidates import Candidate, CandidateTable, candidate_sections, design_for
from sizer.sizing.screen import Screen, load_and_weight_factors, screen
from sizer.sizing.search import SizingResult, size_member

__all__ = ["Candidate", "CandidateTable", "Screen", "SizingResult", "candidate_sections", "design_for", "load_and_weight_factors",
           "screen", "size_member"]
