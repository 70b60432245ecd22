"""`sizer report`: one self-contained HTML calculation record for a reviewer.

Contents: the verdict and the cautions first; the inputs (member, supports, loads, cases and
combinations, material and allowables, the section with its properties and outline); reactions;
the diagrams of the governing combination and of every combination; the method of sections at the
governing cut (free body of the left segment, each load and reaction on it, the equilibrium
equations with the numbers put in, and the actions they give beside the analysis's); every check;
the governing station by hand (each stress by its formula beside the full field, column buckling
with KL/r from the effective lengths of the eigen-solve, and the lateral-torsional closed form); stability (the eigen-solve in words, load factors, critical values, reduced allowables
with their numbers, the buckled shape); the verdict; the assumptions; the cautions again.

Every check number shown is taken from render.check.check_json (the `sizer check --json`
document), which is also embedded whole as <script type="application/json" id="sizer-data">,
so the record and the JSON cannot disagree. Pictures are inline (base64 SVG), styles inline.

Modules, each importing only those above it:
  markup           style sheet, escaping, display-unit values, cells, tables, inline pictures
  section_picture  the section's outline on the cut face and its picture
  inputs           1. inputs: member, supports, loads, combinations, material, section, settings
  segment          the governing cut and the left segment's items and equilibrium, in numbers
  equilibrium      2. reactions and overall equilibrium; 4. the method of sections at the cut
  checks           the verdict, 5. the checks and 8. the verdict again
  by_hand          6. the governing station by hand
  stability        7. stability
  document         the whole record (header, contents, diagrams, assumptions) and writing it
  notebook         short HTML summaries of the API's results for notebooks, from the same pieces
"""

from sizer.render.report.document import check_report_path, report_html, write_report
from sizer.render.report.notebook import check_summary_html, forces_summary_html, size_summary_html
from sizer.render.report.section_picture import section_outline
from sizer.render.report.segment import segment_balance

__all__ = [
    "check_report_path",
    "check_summary_html",
    "forces_summary_html",
    "report_html",
    "section_outline",
    "segment_balance",
    "size_summary_html",
    "write_report",
]
