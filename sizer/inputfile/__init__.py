"""Member files (TOML, docs/design.md section 3) to `model.Member`, with errors that name file, key and line.

Every dimensioned value is a string with its unit, parsed by `units.parse` to SI. Unknown keys are
errors (a misspelt key would otherwise be silently ignored).

Modules: reader (KeyLines, Reader, TOML errors, heights), materials ([materials.NAME]), loads
([[loads]]: point, moment, line, area), checks_table ([checks]), member (the whole file: [member],
supports, hinges, restraints, self-weight, combinations).
"""

from sizer.inputfile.checks_table import CHECK_KEYS, DEFLECTION_KEYS, SINGLE_DEFLECTION_KEYS
from sizer.inputfile.loads import AREA_COMPONENTS, LINE_COMPONENTS, LOAD_KEYS
from sizer.inputfile.materials import ALLOWABLE_KEYS, MATERIAL_KEYS, parse_material
from sizer.inputfile.member import (
    GRAVITY_DIRECTIONS,
    MEMBER_KEYS,
    RESTRAINT_KEYS,
    SUPPORT_KEYS,
    TOP_KEYS,
    member_from_tables,
    parse_member_text,
    read_member_file,
)
from sizer.inputfile.reader import LARGEST_NUMBER, KeyLines, Reader, parse_toml, read_height

__all__ = [
    "ALLOWABLE_KEYS", "AREA_COMPONENTS", "CHECK_KEYS", "DEFLECTION_KEYS", "GRAVITY_DIRECTIONS", "LARGEST_NUMBER", "LINE_COMPONENTS",
    "LOAD_KEYS", "MATERIAL_KEYS", "MEMBER_KEYS", "RESTRAINT_KEYS", "SINGLE_DEFLECTION_KEYS", "SUPPORT_KEYS", "TOP_KEYS", "KeyLines",
    "Reader", "member_from_tables", "parse_material", "parse_member_text", "parse_toml", "read_height", "read_member_file",
]
