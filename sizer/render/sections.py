"""Tables, JSON and pictures for `sizer sections`: every number carries its unit on screen
(sizer.units.fmt); JSON is in SI base units (m, m^2, m^4, m^6, kg/m, Pa per N or per N*m, rad)."""

from __future__ import annotations

import io
import math
from pathlib import Path
from typing import TYPE_CHECKING, Any, Callable, TypeVar

from sizer import units
from sizer.files import write_atomic
from sizer.results.notes import CAUTIONS
from sizer.render.axis_names import axis_words, named
from sizer.sections import SectionProperties, SectionSpec

if TYPE_CHECKING:
    from sizer.render.text import Ledger
    from sizer.sections.catalogue import Catalogue

T = TypeVar("T")
HANDBOOK = {"major": " (EN y-y, AISC x-x)", "minor": " (EN z-z, AISC y-y)", "equal": ""}  # docs/output.md maps the axes

AXES_NOTE = ("Member axes: y along the depth (up as drawn), z = -across (to the left as drawn, looking at "
             "the +x cut face), x along the member. Iz is about the horizontal axis, Iy about the vertical one; the larger "
             "is the major axis (handbooks: EN y-y, AISC x-x), the smaller the minor (EN z-z, AISC y-y).")
PEAK_NOTE = ("Unit peaks: largest stress at the mesh nodes per unit action (finite-element elasticity "
             "solution, Poisson's ratio 0, loads through the shear centre).")
_SHORT = {"depth": "d", "width": "b", "thickness": "t", "flange_thickness": "tf", "web_thickness": "tw",
          "diameter": "⌀", "root_radius": "r", "outer_radius": "ro"}


def dimensions_text(spec: SectionSpec, system: str = "si") -> str:
    """The key dimensions in one short line, e.g. "d 300 · b 150 · tf 10.7 · tw 7.1 · r 15 mm"."""
    label = units.unit_label("dimension", system)
    if spec.shape == "polygon":
        return f"{len(spec.points)} points" + (f", {len(spec.holes)} holes" if spec.holes else "")
    parts = [f"{_SHORT[key]} {units.to_display(value, 'dimension', system):.4g}"
             for key, value in spec.dims.items() if value > 0 or key not in ("root_radius", "outer_radius")]
    return " · ".join(parts) + f" {label}"


def list_table(items: list[tuple[SectionSpec, SectionProperties, str]], system: str = "si", catalogue: Catalogue | None = None) -> Ledger:
    """The catalogue as a ledger: name, family, mass per length, A, Iz, Iy (units in the headers),
    with the shape and its dimensions on the line under each name (and its price and stock lengths
    where the `catalogue` gives any); the caption says which material gave each mass."""
    from rich.markup import escape

    from sizer.render.text import Column, Ledger

    notes = sorted({note for _, _, note in items})
    caption = "Mass per length from: " + "; ".join(notes) + ".\n" + AXES_NOTE if notes else AXES_NOTE

    def header(name: str, kind: str) -> str:
        return f"{name} ({units.unit_label(kind, system)})"

    table = Ledger("Catalogue sections", [Column("name"), Column("family"), Column(header("mass", "mass_per_length"), right=True),
                                          Column(header("A", "area"), right=True), Column(header("Iz", "inertia"), right=True),
                                          Column(header("Iy", "inertia"), right=True)], caption=escape(caption))

    def number(value: float | None, kind: str) -> str:
        if value is None:
            return "—"  # no density: no mass
        return units.fmt_number(units.to_display(value, kind, system))

    for spec, props, _ in items:
        table.add_row(escape(spec.name), escape(spec.family or ""), number(props.mass_per_length, "mass_per_length"),
                      number(props.area, "area"), number(props.Iz, "inertia"), number(props.Iy, "inertia"),
                      note=f"{spec.shape}: {escape(dimensions_text(spec, system))}" + _purchase_note(spec, catalogue, system))
    return table


def _purchase_note(spec: SectionSpec, catalogue: Catalogue | None, system: str) -> str:
    """"; 1.45 EUR/kg; stocked, bars of 6.000 m, 12.00 m" where the catalogue gives purchase terms, else ""."""
    from rich.markup import escape

    from sizer.render.cost import price_text, stock_text

    if catalogue is None or not catalogue.has_purchase_terms:
        return ""
    terms = catalogue.purchase(spec)
    return escape(f"; {price_text(terms, catalogue.currency)}; {stock_text(terms, system)}")


def _per_unit(value: float, per: str, system: str) -> str:
    """A stress per unit action (Pa per N or per N*m) per one display unit of that action."""
    factor = units.DISPLAY[system][per].factor
    return f"{units.fmt(value * factor, 'stress', system)} per {units.unit_label(per, system)}"


def property_rows(props: SectionProperties, system: str = "si") -> list[tuple[str, str, str]]:
    """(symbol, value with unit, meaning) for every property."""
    f = units.fmt
    angle = f"{f(props.principal_angle, 'rotation', system)} ({math.degrees(props.principal_angle):.2f}°)"
    rows = [
        ("A", f(props.area, "area", system), "area"),
        ("m", f(props.mass_per_length, "mass_per_length", system), "mass per length"),
        ("depth, width", f"{f(props.depth, 'dimension', system)}, {f(props.width, 'dimension', system)}", "bounding box"),
        ("y_c, z_c", f"{f(props.centroid[0], 'dimension', system)}, {f(props.centroid[1], 'dimension', system)}", "centroid from the bounding box centre"),
        (named("Iz", props), f(props.Iz, "inertia", system), "second moment about the horizontal axis" + HANDBOOK[axis_words(props)[0]]),
        (named("Iy", props), f(props.Iy, "inertia", system), "second moment about the vertical axis" + HANDBOOK[axis_words(props)[1]]),
        ("Iyz", f(props.Iyz, "inertia", system), "product of inertia (∫ y z dA)"),
        ("I11, I22", f"{f(props.I11, 'inertia', system)}, {f(props.I22, 'inertia', system)}", "principal second moments"),
        ("α", angle, "principal angle: z axis to the 11 axis, positive about +x"),
        ("Sz top, bottom", f"{f(props.Sz_top, 'modulus_section', system)}, {f(props.Sz_bottom, 'modulus_section', system)}", "elastic moduli Iz / y at the top and bottom fibres"),
        ("Sy +z, -z", f"{f(props.Sy_plus, 'modulus_section', system)}, {f(props.Sy_minus, 'modulus_section', system)}", "elastic moduli Iy / z at the +z and -z fibres"),
        ("Zz, Zy", f"{f(props.Zz, 'modulus_section', system)}, {f(props.Zy, 'modulus_section', system)}", "plastic moduli"),
        ("rz, ry", f"{f(props.rz, 'dimension', system)}, {f(props.ry, 'dimension', system)}", "radii of gyration"),
        ("J", f(props.J, "inertia", system), "torsion constant (Saint-Venant)"),
        ("Iw", f(props.Iw, "warping", system), "warping constant"),
        ("y_s, z_s", f"{f(props.shear_centre[0], 'dimension', system)}, {f(props.shear_centre[1], 'dimension', system)}", "shear centre from the centroid"),
        ("Avy, Avz", f"{f(props.Avy, 'area', system)}, {f(props.Avz, 'area', system)}", "shear areas for shear along y and z"),
        ("perimeter", f(props.perimeter, "dimension", system), "outline and holes"),
        ("σ/N", _per_unit(props.sigma_peak[0], "force", system), "peak normal stress per unit axial force"),
        ("σ/My", _per_unit(props.sigma_peak[1], "moment", system), "peak normal stress per unit My"),
        ("σ/Mz", _per_unit(props.sigma_peak[2], "moment", system), "peak normal stress per unit Mz"),
        ("τ/Vy", _per_unit(props.tau_peak[0], "force", system), "peak shear stress per unit Vy"),
        ("τ/Vz", _per_unit(props.tau_peak[1], "force", system), "peak shear stress per unit Vz"),
        ("τ/T", _per_unit(props.tau_peak[2], "moment", system), "peak shear stress per unit torque"),
    ]
    return rows


def show_renderables(spec: SectionSpec, props: SectionProperties, mass_note: str, system: str = "si", catalogue: Catalogue | None = None) -> list[Any]:
    """The `sections show` screen: dimensions, then every property with its unit and meaning."""
    from rich.markup import escape

    from sizer.render.text import Column, Heading, Ledger, Paragraph

    head: list[Any] = [Heading(f"{escape(spec.name)}  ({spec.shape}{', family ' + escape(spec.family) if spec.family else ''})", rule="─")]
    rows = [("outline", dimensions_text(spec, system))] if spec.shape == "polygon" else []
    rows += [(key.replace("_", " "), units.fmt(value, "dimension", system)) for key, value in spec.dims.items()]
    rows += [("mass from", mass_note), ("source", f"{spec.source}" + (f":{spec.line}" if spec.line else ""))]
    if catalogue is not None:
        from sizer.render.cost import price_text, stock_text

        terms = catalogue.purchase(spec)
        rows += [("price", price_text(terms, catalogue.currency)), ("stock", stock_text(terms, system))]
    head += [Paragraph(f"[bold]{escape(label):<16}[/] {escape(text)}", hang=17) for label, text in rows]
    caption = (f"{AXES_NOTE}\n{PEAK_NOTE}\nMesh: {props.mesh_elements} six-node triangles, {props.mesh_nodes} nodes, "
               f"largest element {units.fmt(props.max_element_area, 'area', system)}.")
    body = Ledger("Properties", [Column("property"), Column("value", right=True), Column("meaning", wrap=True)], caption=escape(caption))
    for symbol, value, meaning in property_rows(props, system):
        body.add_row(escape(symbol), escape(value), escape(meaning))
    return head + ["", body]


def section_json(spec: SectionSpec, props: SectionProperties, mass_material: str | None, mass_note: str, catalogue: Catalogue | None = None) -> dict[str, Any]:
    """`sections show --json`: SI base units."""
    from sizer.results.cost import purchase_json

    data: dict[str, Any] = {
        "name": spec.name, "shape": spec.shape, "family": spec.family, "material": spec.material,
        "dimensions": dict(spec.dims),
        "area": props.area, "Iz": props.Iz, "Iy": props.Iy, "J": props.J, "Iw": props.Iw,
        "mass_per_length": props.mass_per_length, "density": props.density,
        "mass_material": mass_material, "mass_note": mass_note,
        "centroid": {"y": props.centroid[0], "z": props.centroid[1]},
        "Iyz": props.Iyz, "I11": props.I11, "I22": props.I22, "principal_angle": props.principal_angle,
        "Sz_top": props.Sz_top, "Sz_bottom": props.Sz_bottom, "Sy_plus": props.Sy_plus, "Sy_minus": props.Sy_minus,
        "extreme_fibres": {"y_top": props.y_top, "y_bottom": props.y_bottom, "z_plus": props.z_plus, "z_minus": props.z_minus},
        "Zz": props.Zz, "Zy": props.Zy, "rz": props.rz, "ry": props.ry,
        "shear_centre": {"y": props.shear_centre[0], "z": props.shear_centre[1]},
        "Avy": props.Avy, "Avz": props.Avz, "depth": props.depth, "width": props.width, "perimeter": props.perimeter,
        "unit_stress_peaks": {
            "sigma_per_N": props.sigma_peak[0], "sigma_per_My": props.sigma_peak[1], "sigma_per_Mz": props.sigma_peak[2],
            "tau_per_Vy": props.tau_peak[0], "tau_per_Vz": props.tau_peak[1], "tau_per_T": props.tau_peak[2],
        },
        "mesh": {"elements": props.mesh_elements, "nodes": props.mesh_nodes, "max_element_area": props.max_element_area},
        "source": spec.source, "line": spec.line, "axes": AXES_NOTE, "cautions": list(CAUTIONS),
    }
    if catalogue is not None:
        data.update(purchase_json(catalogue.purchase(spec), catalogue.currency))
    if spec.shape == "polygon":
        data["points"] = [list(point) for point in spec.points]
        data["holes"] = [[list(point) for point in hole] for hole in spec.holes]
    return data


def list_json(items: list[tuple[SectionSpec, SectionProperties, str | None]], catalogue: Catalogue | None = None) -> dict[str, Any]:
    """`sections list --json`: {"sections": one small record per section, "cautions"}, SI base units;
    with the `catalogue`, each section's purchase terms too."""
    from sizer.results.cost import purchase_json

    rows = [{"name": spec.name, "shape": spec.shape, "family": spec.family, "dimensions": dict(spec.dims),
             "mass_per_length": props.mass_per_length, "mass_material": mass_material,
             "area": props.area, "Iz": props.Iz, "Iy": props.Iy, "J": props.J, "depth": props.depth, "width": props.width,
             **(purchase_json(catalogue.purchase(spec), catalogue.currency) if catalogue is not None else {})}
            for spec, props, mass_material in items]
    return {"sections": rows, "cautions": list(CAUTIONS)}


def write_section_plot(spec: SectionSpec, props: SectionProperties, path: Path, system: str = "si") -> None:
    """Draw the outline in member axes (display dimension units, from the centroid) with the
    centroid and shear centre; PNG or SVG by the file's suffix, written atomically."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    from sizer.sections.geometry import outline

    polygon = outline(spec).geom
    cx, cy = polygon.centroid.x, polygon.centroid.y

    scale = 1e-3 / units.DISPLAY[system]["dimension"].factor  # display units per mm
    label = units.unit_label("dimension", system)

    def member(coords: Any) -> tuple[list[float], list[float]]:
        """Drawing (across, up) in mm -> (z, y) from the centroid in display units."""
        return [-(x - cx) * scale for x, _ in coords], [(y - cy) * scale for _, y in coords]

    figure = Figure(figsize=(5.5, 5.5))
    FigureCanvasAgg(figure)
    axes = figure.add_subplot()
    z, y = member(polygon.exterior.coords)
    axes.fill(z, y, color="#b8c9dc", edgecolor="#23405f", linewidth=1.2)
    for hole in polygon.interiors:
        z, y = member(hole.coords)
        axes.fill(z, y, color="white", edgecolor="#23405f", linewidth=1.2)
    axes.plot([0], [0], marker="+", markersize=14, color="black", linestyle="none", label="centroid")
    ys, zs = props.shear_centre
    axes.plot([units.to_display(zs, "dimension", system)], [units.to_display(ys, "dimension", system)], marker="x", markersize=10, color="#c0392b", linestyle="none", label="shear centre")
    axes.set_aspect("equal")
    axes.invert_xaxis()  # z points left when looking at the +x cut face: the drawing reads as drawn
    axes.set_xlabel(f"z [{label}] (positive to the left)")
    axes.set_ylabel(f"y [{label}]")
    axes.set_title(f"{spec.name} ({spec.shape})")
    axes.grid(True, linewidth=0.3)
    axes.legend(loc="upper left", bbox_to_anchor=(1.02, 1.0), fontsize="small")
    buffer = io.BytesIO()
    figure.savefig(buffer, format=path.suffix.lower().lstrip("."), bbox_inches="tight")
    write_atomic(path, buffer.getvalue())


def with_build_progress(description: str, work: Callable[[Callable[[int, int, str], None]], T]) -> T:
    """work(progress) with the progress bar (sizer.progress) for the section properties it computes
    (shown only when there is something to compute; it goes when the work is done)."""
    from sizer.progress import ProgressBar

    with ProgressBar(description) as bar:
        return work(bar.report)
