"""Member stability: elastic buckling load factors of the member as it is (its supports, restraints,
load heights and internal-action diagrams), by thin-walled beam finite elements (Vlasov theory) and
a symmetric generalized eigen-solve.

Modules: section (what the solver needs of a section), mesh (nodes and freedoms), elements (shape
functions and Gauss integration), terms (the energy's matrices), heights (load heights),
boundary (supports, springs, restraints), solve (the eigen-solve), problem (one member's solves).
SI units throughout; the fields are in the section's own axes (y along its depth).
"""

from sizer.stability.problem import MemberStability, mode_name
from sizer.stability.section import StabilitySection, minor_axis_is_weaker, stability_section
from sizer.stability.solve import Buckling

__all__ = ["Buckling", "MemberStability", "StabilitySection", "minor_axis_is_weaker", "mode_name", "stability_section"]
