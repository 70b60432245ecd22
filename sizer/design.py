"""From a member file to a solved design: the section and material it names, the rigidities that
follow from them, the mass per length for self-weight, and the solution of every load case.

Orientation (docs/design.md section 2): a catalogue section is drawn with its depth along y. "major": the
member's x-y bending uses the section's Iz (major); "minor": the section is turned a quarter turn,
so x-y bending uses the section's Iy (minor) and x-z bending its Iz.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, Any, Sequence

from sizer.analysis import MemberSolution, solve_member
from sizer.errors import InputError
from sizer.model import Material, Member, Stiffness
from sizer.phrase import phrase, q
from sizer.units import GRAVITY

if TYPE_CHECKING:
    from sizer.sections.catalogue import Catalogue
    from sizer.sections.properties import SectionProperties


@dataclass
class Design:
    """A member with its section and material resolved and every load case solved."""

    member: Member
    solution: MemberSolution
    material: Material | None = None
    spec: Any = None  # sections.SectionSpec
    props: Any = None  # sections.SectionProperties
    stiffness: Stiffness | None = None
    mass_per_length: float | None = None
    notes: list[str] = field(default_factory=list)

    @property
    def known_material(self) -> Material:
        """The material of a design with a section (the checks and reports run only on those)."""
        if self.material is None:
            raise ValueError("this design has no section and material")
        return self.material

    @property
    def known_stiffness(self) -> Stiffness:
        """The rigidities of a design with a section (the checks and reports run only on those)."""
        if self.stiffness is None:
            raise ValueError("this design has no section and rigidities")
        return self.stiffness


def catalogue_for(member: Member, catalogue_paths: Sequence[Path]) -> Catalogue:
    """The catalogue from --catalogue paths, else the member folder's section_library/, else the shipped one."""
    from sizer.sections import default_catalogue_paths, load_catalogue

    paths = list(catalogue_paths) or default_catalogue_paths(Path(member.source) if member.source else None)
    return load_catalogue(paths)


def shipped_materials() -> dict[str, Material]:
    """The materials of the section_library/ installed with sizer (package data)."""
    from sizer.sections import load_catalogue
    from sizer.sections.catalogue import shipped_library

    return load_catalogue([shipped_library()]).materials


def resolve_material(member: Member, catalogue: Catalogue | None) -> Material:
    """The member's material: from the member file first, then from the catalogue files, then from
    the materials shipped with sizer (so a catalogue of the user's own keeps them; the user's
    definitions win)."""
    if not member.material:
        raise InputError(member.source, "member.material", "no material is given", 'add material = "mild-steel" (defined in [materials.NAME] here or in a catalogue file)')
    if member.material in member.materials:
        return member.materials[member.material]
    if catalogue is not None and member.material in catalogue.materials:
        return catalogue.materials[member.material]
    shipped = shipped_materials()
    if member.material in shipped:
        return shipped[member.material]
    known = sorted(set(member.materials) | set(catalogue.materials if catalogue is not None else ()) | set(shipped))
    raise InputError(member.source, "member.material", f"unknown material {member.material!r}",
                     "define [materials." + member.material + "] or use one of: " + (", ".join(known) or "(none defined)"))


def oriented_stiffness(props: Any, material: Material, orientation: str) -> Stiffness:
    """Member rigidities from section properties: EA, GJ, EIz (x-y bending), EIy (x-z bending).
    `props`: one section's SectionProperties, or a table of many (floats or arrays alike)."""
    E, G = material.elastic_modulus, material.shear_modulus
    major, minor = props.Iz, props.Iy
    if orientation == "minor":
        major, minor = minor, major
    return Stiffness(EA=E * props.area, GJ=G * props.J, EIz=E * major, EIy=E * minor)


def prepare(member: Member, catalogue_paths: Sequence[Path] = (), section: str | None = None,
            need_section: bool = False) -> Design:
    """Resolve section and material and solve. `section` overrides the member file's.

    Without a section (and need_section False) the forces are solved with unit rigidities: self-weight
    and deflections are left out, and a member with springs is refused (its forces depend on stiffness).
    """
    name = section or member.section
    if name is None:
        if need_section:
            raise InputError(member.source, "member.section", "no section is given",
                             'add section = "NAME" under [member] or pass --section NAME')
        solution = solve_member(member, None, None)
        notes = ["No section given: self-weight and deflections are left out; forces use unit rigidities, "
                 "which is exact for these supports (no springs)."]
        return Design(solution.member, solution, notes=notes)
    from sizer.sections import section_properties

    catalogue = catalogue_for(member, catalogue_paths)
    key = "member.section" if section is None else "--section"
    spec = catalogue.get(name, member.source if section is None else "", key)
    material = resolve_material(member, catalogue)
    props = section_properties(spec, material.density)
    misfit = height_outside(member, props)
    if misfit is not None:
        raise misfit
    stiffness = oriented_stiffness(props, material, member.orientation)
    mass = props.area * material.density
    solution = solve_member(member, stiffness, mass if member.self_weight_case else None)
    notes = [f"Section {spec.name} ({spec.shape}) in {member.orientation} orientation, material {material.name} "
             f"(E, G, density from {Path(material.source).name or 'the member file'})."]
    if member.self_weight_case:
        notes.append(phrase("Self-weight ", q("mass_per_length", mass, "kg/m", ".3g"), " x g = ", q("g", GRAVITY, "m/s²"),
                            f" applied along {_gravity_text(member)} in case '{member.self_weight_case}'."))
    else:
        notes.append("Self-weight is not included (self_weight = false).")
    notes.append("Deflections by Euler-Bernoulli beam theory (no shear deformation), small displacements.")
    return Design(solution.member, solution, material, spec, props, stiffness, mass, notes)


def given_heights(member: Member) -> list[tuple[str, float]]:
    """(key, height in m above the shear centre) of every load and restraint height given as a number."""
    found = [(f"loads[{index}].height", load.height) for index, load in enumerate(member.loads, start=1)]
    found += [(f"restraints[{index}].height", restraint.height) for index, restraint in enumerate(member.restraints, start=1)]
    return [(key, float(height)) for key, height in found if isinstance(height, (int, float)) and not isinstance(height, bool)]


def height_outside(member: Member, props: SectionProperties) -> InputError | None:
    """The error for the first load or restraint height (a number, m above the shear centre along the
    section's depth) that lies outside the section `props` (SectionProperties), between its bottom
    and top faces; None when every one lies within. A height outside would turn a load into one hung
    below the section or stood above it, which changes the lateral-torsional buckling load (below:
    on the unsafe side)."""
    return heights_outside_faces(member, props.name, float(props.shear_centre[0]), float(props.y_top), float(props.y_bottom),
                                 float(props.depth))


def heights_outside_faces(member: Member, name: str, y0: float, y_top: float, y_bottom: float, depth: float) -> InputError | None:
    """height_outside from the section's scalars (m): the shear centre's offset y0 from the centroid,
    the distances y_top and y_bottom from the centroid to the top and bottom fibres, the depth."""
    top, bottom = y_top - y0, -y_bottom - y0
    slack = 1e-9 * depth
    for key, height in given_heights(member):
        if not bottom - slack <= height <= top + slack:
            return InputError(member.source, key, f"a height of {height * 1e3:.6g} mm from the shear centre is outside the section "
                              f"{name} (its faces are at {bottom * 1e3:+.1f} mm and {top * 1e3:+.1f} mm)",
                              'give a height within the section, or "top", "centre" or "bottom" (see docs/limits.md)',
                              _line_of(member.source, key))
    return None


def _line_of(source: str, key: str) -> int | None:
    """The line of `key` in the member file `source` (read again: only for a message), None if unknown."""
    from sizer.files import read_text
    from sizer.inputfile import KeyLines

    try:
        return KeyLines(read_text(source)).find(key) if source else None
    except InputError:
        return None


def _gravity_text(member: Member) -> str:
    axis, sign = member.gravity
    return ("+" if sign > 0 else "-") + "xyz"[axis]
