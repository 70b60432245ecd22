"""Catalogue sections: reading and checking catalogue files, their shapes, their properties and unit
stress fields (exact integrals over the outline; a finite-element solution for torsion and shear,
checked against sectionproperties), and the disk cache that makes repeated look-ups instant.

Modules, each importing only those before it: spec (SectionSpec, the data), shapes (keys and fit
rules), catalogue_cache (parsed catalogue files remembered on disk), catalogue (files -> SectionSpec,
Catalogue), geometry (outlines and the mesh rule), polygon (exact area integrals of a polygon),
fields (UnitStressField), geometric (the geometric tier: what the outline settles), tri6 (six-node
triangles: torsion and shear on the mesh, every element at once), warping (the torsion-and-warping
tier and the unit stress fields), cache (disk entries and tables), properties (the tiers looked
up, computed and kept; SectionProperties, section_table; see its docstring for the axis mapping),
editing (adding sections to files, CSV import).

Mesh rule (sizer.sections.geometry): largest element area min((t_min / 1.25)^2, A / 200) with t_min
the thinnest wall; 8 points per root or corner radius; 96 per full circle.

scipy.sparse and the mesher are imported only when the warping tier or the stress fields must be
computed (sectionproperties only for a report's drawing); a warm look-up reads the cache: an
unchanged catalogue file is one remembered parse, and a list of sections tabled before is one
array file.
"""

from sizer.sections.catalogue import (
    Catalogue,
    SectionSpec,
    default_catalogue_paths,
    load_catalogue,
    parse_material,
    shipped_library,
)
from sizer.sections.properties import (
    BuildSummary,
    SectionProperties,
    UnitStressField,
    build_catalogue,
    peak_unit_stresses,
    section_properties,
    section_properties_many,
    section_table,
    unit_stress_field,
)
from sizer.sections.shapes import SHAPES

__all__ = [
    "SHAPES",
    "BuildSummary",
    "Catalogue",
    "SectionProperties",
    "SectionSpec",
    "UnitStressField",
    "build_catalogue",
    "default_catalogue_paths",
    "load_catalogue",
    "parse_material",
    "peak_unit_stresses",
    "section_properties",
    "section_properties_many",
    "section_table",
    "shipped_library",
    "unit_stress_field",
]
