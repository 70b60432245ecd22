"""`sizer init`: a commented starter member file for one of four common layouts, written whole or
not at all, never over an existing file. The members are invented examples; the comments say what
each key means and which keys are optional (docs/member-file.md has them all).
"""

from __future__ import annotations

import re
from pathlib import Path

from sizer.errors import InputError

LAYOUTS = ("simple", "cantilever", "continuous", "post")

_HEAD = """\
# A member file for sizer ({what}).
# Every dimensioned value is a string with its unit: "4.8 m", "250 mm", "-2.5 kN/m", "165 MPa".
# Axes: x along the member from end A (x = 0); y the section's depth direction (up for a beam);
# z completes a right-handed set. Loads and reactions are positive along +x, +y, +z.
# Every key is described in docs/member-file.md. Run:  sizer check {name}   or   sizer size {name}
title = "{title}"
"""

_MATERIAL = """
# The material: "mild-steel" and "aluminium-6061-t6" ship with sizer (their allowables are starting
# values only). Define your own here, with the allowable stresses your governing code gives:
# [materials.my-steel]
# elastic_modulus = "200 GPa"
# shear_modulus = "77 GPa"          # or poisson_ratio = 0.3
# density = "7850 kg/m^3"
# yield_strength = "250 MPa"        # optional: inelastic buckling (Johnson parabola)
# [materials.my-steel.allowable]
# tension = "150 MPa"
# compression = "150 MPa"
# bending = "165 MPa"
# shear = "100 MPa"
# equivalent = "170 MPa"            # optional: von Mises limit
"""

_BODIES = {
    "simple": ("a simply supported beam", "Floor beam on two supports", """
[member]
length = "4.8 m"
material = "mild-steel"
section = "IPE 200"              # a catalogue name; `sizer size` finds the lightest that passes
orientation = "major"            # "major" (default): bends about the strong axis; "minor": turned a quarter
self_weight = "dead"             # the load case that gets the section's own weight; false for none

[[supports]]                     # end A: a pin holds ux, uy, uz and twist rx
at = "0 m"
type = "pin"

[[supports]]                     # end B: a roller holds uy, uz and twist rx (free to slide along x)
at = "4.8 m"
type = "roller"

[[loads]]                        # finishes and services, along the whole length (from/to default to the ends)
type = "line"
case = "dead"
wy = "-1.2 kN/m"                 # negative: downward (along -y)

[[loads]]                        # occupancy
type = "line"
case = "imposed"
wy = "-3.0 kN/m"

# [[restraints]]                 # bracing: a deck that holds the top flange sideways all along
# from = "0 m"
# to = "4.8 m"
# hold = ["lateral"]             # "lateral" and/or "twist"
# height = "top"                 # top | centre | bottom | "+80 mm" from the shear centre

[combinations]                   # optional; default: one combination "all", every case x 1.0
"dead + imposed" = { dead = 1.0, imposed = 1.0 }

[checks]
deflection_limit = 360           # span / 360
# buckling_safety_factor = 2.0   # default 2.0, stated in every output
"""),
    "cantilever": ("a cantilever", "Bracket arm fixed at one end", """
[member]
length = "1.2 m"
material = "mild-steel"
section = "RHS 150x100x6"
self_weight = "dead"

[[supports]]                     # end A: built in (holds all six freedoms, and warping)
at = "0 m"
type = "fixed"

[[loads]]                        # a hoist hanging from the tip
type = "point"
case = "imposed"
at = "1.2 m"
fy = "-4 kN"
# height = "bottom"              # where the load acts on the section; default: the face it pushes on

# [[loads]]                      # a torque, if the load hangs off the member's axis
# type = "moment"
# case = "imposed"
# at = "1.2 m"
# mx = "0.4 kN*m"

[combinations]
"dead + imposed" = { dead = 1.0, imposed = 1.0 }

[checks]
deflection_limit = 360           # spans between supports (none here)
deflection_limit_overhang = 180  # the cantilever: length / 180
"""),
    "continuous": ("a beam continuous over three supports", "Purlin over two spans", """
[member]
length = "9 m"
material = "mild-steel"
section = "C 150x75x6"
self_weight = "dead"

[[supports]]
at = "0 m"
type = "pin"

[[supports]]                     # the middle support: the member is continuous over it
at = "4.5 m"
type = "roller"

[[supports]]
at = "9 m"
type = "roller"
# springs = { uy = "20 kN/mm" }  # an elastic support instead of a rigid one on that freedom

# [[hinges]]                     # an internal hinge releases the bending moments there
# at = "6 m"

[[loads]]                        # roof sheeting
type = "line"
case = "dead"
wy = "-0.4 kN/m"

[[loads]]                        # snow, heavier on the first span
type = "line"
case = "snow"
from = "0 m"
to = "4.5 m"
wy = "-1.6 kN/m"
wy_end = "-1.0 kN/m"             # varies linearly to this value at `to`

[[restraints]]                   # the sheeting holds the top flange sideways along the whole length
from = "0 m"
to = "9 m"
hold = ["lateral"]
height = "top"

[combinations]
"dead + snow" = { dead = 1.0, snow = 1.0 }
"dead only" = { dead = 1.0 }

[checks]
deflection_limit = 200
deflection_combinations = ["dead + snow"]   # default: every combination
"""),
    "post": ("a vertical post", "Post carrying a platform corner", """
[member]
length = "3 m"
material = "mild-steel"
section = "SHS 80x80x5"
self_weight = "dead"
gravity = "-x"                   # the post stands on end A: its weight acts along -x (down the post)

[[supports]]                     # base plate
at = "0 m"
type = "fixed"

[[supports]]                     # the platform holds the top sideways but lets it twist and slide
at = "3 m"
restrain = ["uy", "uz"]          # any freedoms: ux, uy, uz, rx, ry, rz

[[loads]]                        # the platform's load, down the post
type = "point"
case = "imposed"
at = "3 m"
fx = "-35 kN"

[[loads]]                        # wind on the post
type = "line"
case = "wind"
wz = "0.3 kN/m"

[combinations]
"dead + imposed" = { dead = 1.0, imposed = 1.0 }
"dead + imposed + wind" = { dead = 1.0, imposed = 0.9, wind = 0.9 }

[checks]
buckling_length_major = "3 m"    # optional: Euler load on these lengths kept beside the member's own solve
buckling_length_minor = "3 m"
"""),
}


def starter_text(layout: str, name: str = "member.toml", system: str = "si") -> str:
    """The commented member file for `layout` (one of LAYOUTS), its values in `system`'s units."""
    if layout not in LAYOUTS:
        raise InputError("", "--layout", f"unknown layout {layout!r}", "use one of: " + ", ".join(LAYOUTS))
    what, title, body = _BODIES[layout]
    text = _HEAD.format(what=what, name=name, title=title) + body + _MATERIAL
    return text if system == "si" else _VALUE.sub(lambda match: _converted(match, system), text)


_KINDS = {"m": "length", "mm": "dimension", "kN": "force", "kN/m": "force_per_length", "kN*m": "moment", "MPa": "stress",
          "GPa": "modulus", "kN/mm": "translational_stiffness", "kg/m^3": "density"}  # the starters' SI units by kind
_VALUE = re.compile(r'"(-?\d+(?:\.\d+)?) (' + "|".join(re.escape(unit) for unit in sorted(_KINDS, key=len, reverse=True)) + r')"')


def _converted(match: re.Match[str], system: str) -> str:
    """A quoted SI value of the starter, written in `system`'s display unit to 4 significant figures."""
    from sizer import units

    kind = _KINDS[match.group(2)]
    value = units.parse(f"{match.group(1)} {match.group(2)}", "length" if kind == "dimension" else kind, "", "starter")
    return f'"{units.fmt(value, kind, system)}"'


def write_starter(path: str | Path, layout: str, system: str = "si") -> Path:
    """Write the starter file for `layout` to `path`, its values in `system`'s units; InputError if
    the file exists (it is never overwritten), cannot be written (files.check_output) or the layout
    is unknown."""
    from sizer.files import check_output, write_atomic

    path = Path(path)
    text = starter_text(layout, path.name, system)
    if path.exists():
        raise InputError(str(path), "-o", "the file already exists; sizer init never overwrites a file",
                         "give another name with -o, or remove the file first")
    check_output(path, "-o")
    write_atomic(path, text)
    return path
