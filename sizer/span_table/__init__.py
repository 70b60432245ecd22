"""Span tables: for each catalogue section, the longest span that passes every check for each load
(mode "span"), or the largest load it carries at each span (mode "load").

Each cell (one section, one load or one span) is its own job (sizer.parallel). A trial builds the
member as the tables of a member file and reads them with `sizer.inputfile.member_from_tables`, so
every value goes through the normal reader and its errors, then runs the full check
`sizer.api.check` (every check `sizer check` makes, stability included). The boundary is found on a grid: spans are
multiples of the resolution; loads are the given load times 1.005^k (0.5 % steps). The search
brackets the boundary, then narrows the bracket with a guess from the trials so far (utilization
against span on log scales, against load on linear scales), checks the grid point next to the guess,
and falls back to halving whenever a guess does not halve the bracket: the result is the largest
grid value that passes with the next one failing, whatever path led there.

Layouts: simple (pin at 0, roller at L), cantilever (fixed at 0, free tip), continuous (n equal
spans: pin at 0, rollers at each support; the imposed load is patterned: every arrangement of
loaded and unloaded spans is a combination of its own). Loads act along -y (down) when negative.
A uniform load "kN/m" is on every span; a point load "kN" is at the middle of each span (the tip of
a cantilever). Restraint: "continuous" (a deck: lateral and twist held at the top from 0 to L),
"supports" (none between supports), or a spacing (point restraints holding lateral and twist at the
top, at that spacing from each span's start).

Modules: spec (the file and the records), members (a trial's member), search (the cells and the
whole table).
"""

from sizer.span_table.members import trial_member
from sizer.span_table.search import largest_passing, run_span_table
from sizer.span_table.spec import SpanTableResult, SpanTableSpec, Trial, read_span_table

__all__ = ["SpanTableResult", "SpanTableSpec", "Trial", "largest_passing", "read_span_table", "run_span_table", "trial_member"]
