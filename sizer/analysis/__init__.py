"""Member analysis: reactions, internal actions and displacements of one straight member.

Method. A straight member splits into four uncoupled 1-D problems (`problems`):

- axial: ux, rigidity EA, loads fx and wx;
- torsion: rx, rigidity GJ, loads mx (point) and mx per length;
- bending in x-y: uy and rz = duy/dx, rigidity EIz, loads fy, mz and wy;
- bending in x-z: uz and ry = -duz/dx, rigidity EIy, loads fz, my and wz.

Each is solved by the stiffness method (`solve`) with nodes at both ends, every support and every
hinge (`layout`). Point loads and (partial, linearly varying) line loads between nodes enter through
their exact fixed-end forces, written with singularity (Macaulay) functions (`element_loads`), so
the nodal values are exact for Euler-Bernoulli theory. (Nodes at load positions as well would be no
more exact, and a node very close to another makes a very stiff short element whose stiffness
swamps the long element next to it in floating point: k_short + k_long == k_short once the gap is
below about 1e-5 of the span.) The x-z problem is solved as an x-y problem in (uz, theta = duz/dx)
with the moment my entering as -my (it does work on ry = -theta).
An internal hinge releases My and Mz: its node has separate rotation freedoms on each side in both
bending problems. A support at a hinge holds the hinge pin, so its ry/rz restraints and rotational
springs act on nothing (the moment is zero on both sides of a hinge); a hinge at an end releases the
member's end from the support's rotational restraint in the same way. A load that drives a free
rigid-body motion is a mechanism (`mechanisms`).

Reactions come from statics bay by bay (`reactions`). Internal actions at x come from the method of
sections (`cuts`): every load and reaction on the left segment [0, x] is summed exactly. They are
the actions on the +x face of the left segment (docs/design.md section 2): N, Vy, Vz, T, My, Mz.
Beam convention for x-y loading: V = -Vy, M = Mz (sagging positive).

Displacements inside an element (`displacements`): Hermite cubic (linear for axial and twist) from
the nodal values plus the fixed-fixed particular solution of the element's loads.

Load combinations are superpositions of the solved cases (`member_solution`); self weight is one
unit (1 N/m) case scaled by mass per length * GRAVITY and the combination's factor on the
self-weight case. Check stations, zero-shear points and extremes are in `stations`.

Pattern loading (`patterns`): patterned loads split by span into load cases of their own (one solve
per span), and each combination that uses them made into one combination per arrangement of loaded
spans. Envelopes (`envelope`): the largest and smallest of each action over every combination.

Units: SI throughout (m, N, N*m, rad).
"""

from sizer.analysis.case import CaseSolution
from sizer.analysis.cuts import SIDES
from sizer.analysis.layout import POSITION_TOLERANCE, distinct
from sizer.analysis.loads import self_weight_load
from sizer.analysis.member_solution import MemberSolution, solve_member
from sizer.analysis.envelope import (
    ActionEnvelope,
    Bound,
    LargestDeflection,
    ReactionEnvelope,
    action_envelope,
    displacement_bounds,
    envelope_curves,
    largest_deflection,
    reaction_envelope,
)
from sizer.analysis.patterns import Span, arrangements_of, expand_patterns, spans
from sizer.analysis.solve import solve_case
from sizer.analysis.stations import (
    EXTREME_ACTIONS,
    Extreme,
    extreme_positions,
    extremes,
    load_sign_change_points,
    load_sign_change_positions,
    stations,
    zero_shear_points,
    segment_ends,
    zero_shear_positions,
)

__all__ = [
    "ActionEnvelope",
    "Bound",
    "LargestDeflection",
    "ReactionEnvelope",
    "action_envelope",
    "displacement_bounds",
    "envelope_curves",
    "largest_deflection",
    "reaction_envelope",
    "EXTREME_ACTIONS",
    "POSITION_TOLERANCE",
    "SIDES",
    "CaseSolution",
    "Extreme",
    "MemberSolution",
    "Span",
    "arrangements_of",
    "expand_patterns",
    "spans",
    "distinct",
    "extreme_positions",
    "extremes",
    "load_sign_change_points",
    "load_sign_change_positions",
    "self_weight_load",
    "solve_case",
    "solve_member",
    "stations",
    "zero_shear_points",
    "segment_ends",
    "zero_shear_positions",
]
