"""`sizer sections`: keep the catalogue (list, show, add, build, import). Mounted by sizer.cli.

Heavy modules (numpy, sectionproperties, matplotlib, tomlkit) are imported inside the commands.
Bad input: one line on stderr, exit code 2, nothing written.
"""

from __future__ import annotations

import sys
from pathlib import Path
from typing import TYPE_CHECKING, List, Optional

import typer

from sizer.cli_common import FAMILY_OPTION, JSON_OPTION, catalogue_option, guarded, unit_system, units_option
from sizer.errors import InputError

if TYPE_CHECKING:
    from rich.console import Console

    from sizer.sections.catalogue import Catalogue
    from sizer.sections.properties import SectionProperties
    from sizer.sections.spec import SectionSpec

    MassRow = tuple[SectionSpec, SectionProperties, str | None, str]  # spec, properties with its mass, material name, note

app = typer.Typer(
    help="Keep the section catalogue: list, show, add, build (precompute), import a CSV stock list.",
    no_args_is_help=True,
    add_completion=False,
    pretty_exceptions_enable=False,
)

CATALOGUE_OPTION = catalogue_option(" Default: ./section_library/, else the shipped one.")
UNITS_OPTION = units_option("mm, kg/m, MPa", "in, lb/ft, ksi")


def _catalogue(paths: list[Path] | None) -> Catalogue:
    """The catalogue files `paths` name, else the default ones (./section_library/, else the shipped one)."""
    from sizer.sections import default_catalogue_paths, load_catalogue

    return load_catalogue(paths or default_catalogue_paths(None))


def _console() -> Console:
    """The terminal's console (render.common.console: 80 columns when piped, unless COLUMNS says)."""
    from sizer.render.common import console

    return console()


def _with_mass(catalogue: Catalogue, specs: list[SectionSpec]) -> list[MassRow]:
    """(spec, properties with the mass of its material, material name or None, note) per spec."""
    from sizer.sections import section_properties

    rows = []
    for spec in specs:
        material, note = catalogue.mass_material(spec)
        props = section_properties(spec, material.density if material else None)
        rows.append((spec, props, material.name if material else None, note))
    return rows


@app.command("list")
@guarded
def list_sections(
    catalogue: Optional[List[Path]] = CATALOGUE_OPTION,
    family: Optional[List[str]] = FAMILY_OPTION,
    json_output: bool = JSON_OPTION,
    units_system: str = UNITS_OPTION,
) -> int:
    """The catalogue's sections: shape, dimensions, mass per length, area, Iz, Iy."""
    from sizer.render.common import dumps
    from sizer.render.sections import list_json, list_table, with_build_progress
    from sizer.sections import section_table

    system = unit_system(units_system)
    loaded = _catalogue(catalogue)
    specs = loaded.select(family or [])
    with_build_progress("Section properties", lambda progress: section_table(specs, progress=progress))
    rows = _with_mass(loaded, specs)
    if json_output:
        typer.echo(dumps(list_json([(spec, props, name) for spec, props, name, _ in rows], loaded)))
    else:
        out = _console()
        out.print(list_table([(spec, props, note) for spec, props, _, note in rows], system, loaded))
    return 0


@app.command("show")
@guarded
def show_section(
    name: str = typer.Argument(..., help="Section name, as in `sizer sections list`."),
    catalogue: Optional[List[Path]] = CATALOGUE_OPTION,
    json_output: bool = JSON_OPTION,
    plot: Optional[Path] = typer.Option(None, "--plot", help="Draw the shape with its centroid and shear centre (PNG or SVG)."),
    units_system: str = UNITS_OPTION,
) -> int:
    """Every property of one section, with units."""
    from sizer.render.common import dumps
    from sizer.render.sections import section_json, show_renderables, write_section_plot

    system = unit_system(units_system)
    if plot is not None and plot.suffix.lower() not in (".png", ".svg"):
        raise InputError("", "--plot", f"cannot draw to {plot.name!r}", "give a file ending in .png or .svg")
    if plot is not None:
        from sizer.files import check_output

        check_output(plot, "--plot", [path for path in catalogue or [] if path.is_file()])
    loaded = _catalogue(catalogue)
    spec = loaded.get(name, "", "NAME")
    [(spec, props, material, note)] = _with_mass(loaded, [spec])
    if plot is not None:
        write_section_plot(spec, props, plot, system)
    if json_output:
        typer.echo(dumps(section_json(spec, props, material, note, loaded)))
    else:
        out = _console()
        for renderable in show_renderables(spec, props, note, system, loaded):
            out.print(renderable)
        if plot is not None:
            out.print(f"Drawing written to {plot}")
    return 0


@app.command("build")
@guarded
def build_sections(
    catalogue: Optional[List[Path]] = CATALOGUE_OPTION,
    workers: Optional[int] = typer.Option(None, "--workers", help="Processes to use (default: one per core)."),
) -> int:
    """Precompute the properties and stress fields of a whole catalogue, in parallel, into the cache."""
    from sizer.sections import build_catalogue
    from sizer.sections.cache import cache_folder

    if workers is not None and workers < 1:
        raise InputError("", "--workers", f"{workers} is not a number of processes", "give 1 or more")
    loaded = _catalogue(catalogue)
    specs = list(loaded.sections.values())
    from sizer.progress import ProgressBar

    with ProgressBar("Building", transient=False) as bar:
        summary = build_catalogue(specs, workers, bar.report)
    typer.echo(f"{summary.sections} sections ({summary.geometries} distinct shapes): {summary.computed} computed "
               f"with {summary.workers} process(es), {summary.from_cache} already cached; {summary.seconds:.1f} s. "
               f"Cache: {cache_folder()}")
    return 0


@app.command("add")
@guarded
def add_section(
    file: Path = typer.Argument(..., help="Catalogue file to append to (created if absent)."),
    name: str = typer.Option(..., "--name", help="Section name, unique in the catalogue folder."),
    shape: str = typer.Option(..., "--shape", help="rectangle, round, rectangular_tube, round_tube, i_beam, channel, tee or angle."),
    depth: Optional[str] = typer.Option(None, "--depth", help='Depth with its unit, e.g. "200 mm".'),
    width: Optional[str] = typer.Option(None, "--width", help="Width with its unit."),
    thickness: Optional[str] = typer.Option(None, "--thickness", help="Wall thickness (tubes, angles)."),
    flange_thickness: Optional[str] = typer.Option(None, "--flange-thickness", help="Flange thickness (i_beam, channel, tee)."),
    web_thickness: Optional[str] = typer.Option(None, "--web-thickness", help="Web thickness (i_beam, channel, tee)."),
    root_radius: Optional[str] = typer.Option(None, "--root-radius", help="Root radius (i_beam, channel, tee, angle)."),
    outer_radius: Optional[str] = typer.Option(None, "--outer-radius", help="Outer corner radius (rectangular_tube)."),
    diameter: Optional[str] = typer.Option(None, "--diameter", help="Outside diameter (round, round_tube)."),
    family: Optional[str] = typer.Option(None, "--family", help="Family, for filters."),
    material: Optional[str] = typer.Option(None, "--material", help="Default material, defined in the catalogue folder."),
    units_system: str = UNITS_OPTION,
) -> int:
    """Append one section to a catalogue file, keeping its comments and other entries, and say
    which dimensions it was given."""
    from sizer.files import check_output
    from sizer.sections.editing import add_section as append_section, ordered_table

    check_output(file, "FILE")
    if shape == "polygon":
        raise InputError("", "--shape", "polygons cannot be given as options", "write the [[sections]] entry with its points in the file")
    given = {"depth": depth, "width": width, "thickness": thickness, "flange_thickness": flange_thickness,
             "web_thickness": web_thickness, "root_radius": root_radius, "outer_radius": outer_radius, "diameter": diameter}
    values = {key: value for key, value in given.items() if value is not None}
    system = unit_system(units_system)
    spec = append_section(file, ordered_table(name, shape, values, family, material))
    typer.echo(f"Added {spec.name} ({spec.shape}: {added_dimensions(spec, system)}) to {file}.")
    return 0


def added_dimensions(spec: SectionSpec, system: str) -> str:
    """The section's given dimensions in display units: "depth 60.00 mm, width 8.000 mm"."""
    from sizer import units

    return ", ".join(f"{key.replace('_', ' ')} {units.fmt(value, 'dimension', system)}" for key, value in spec.dims.items() if value)


@app.command("import")
@guarded
def import_sections(
    table: Path = typer.Argument(..., help="CSV stock list: a header row naming the shape's keys, one row per section."),
    shape: str = typer.Option(..., "--shape", help="The shape of every row."),
    into: Optional[Path] = typer.Option(None, "--into", help="Catalogue file to append to (created if absent); default: print TOML."),
) -> int:
    """Turn a spreadsheet stock list (CSV) into catalogue entries, row by row.

    Columns: name, the shape's dimensions (values with units, or the unit in the header, as in
    "depth (mm)" or "depth \\[mm]"), optional family and material. Refused rows are listed on stderr
    with the reason. Exit 0 all rows taken, 1 some refused (the others written), 2 none usable."""
    from sizer.files import check_output
    from sizer.sections.editing import append_tables, catalogue_text, import_stock_list

    if into is not None:
        check_output(into, "--into", [table])
    result = import_stock_list(table, shape, into)
    for error in result.refused:
        typer.echo(f"sizer: refused: {error}", err=True)
    if not result.tables:
        raise InputError(str(table), "", f"no usable rows ({len(result.refused)} refused)", "mend the rows listed above")
    if into is None:
        sys.stdout.write(catalogue_text(result.tables, f"imported from {table.name} by `sizer sections import --shape {shape}`"))
    else:
        append_tables(into, result.tables)
        typer.echo(f"Added {len(result.tables)} sections to {into}; {len(result.refused)} rows refused.")
    return 1 if result.refused else 0
