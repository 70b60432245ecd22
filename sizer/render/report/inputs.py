"""Section 1 of the calculation record, the inputs: the member, its supports, the loads as given
(before factors), the load cases and combinations, the material and its allowable stresses, the
section with its properties and picture, and the check settings with the buckling axes. Values in
display units; number cells carry the SI value.
"""

from __future__ import annotations

from pathlib import Path

from sizer import units
from sizer.checks import given_length_axes, spans
from sizer.checks.deflection import entry_text, limit_entries
from sizer.design import Design
from sizer.model import FREEDOMS, LineLoad, PointLoad
from sizer.render.report.markup import (
    _cell,
    _e,
    _figure,
    _fmt,
    _large,
    _num,
    _row,
    _table,
)
from sizer.render.report.section_picture import section_picture


def inputs_section(design: Design, system: str) -> str:
    return "\n".join([
        '<section id="inputs"><h2>1. Inputs</h2>',
        _member_table(design, system),
        _supports_table(design, system),
        _loads_table(design, system),
        _combinations_table(design),
        _material_table(design, system),
        _section_block(design, system),
        _settings_table(design, system),
        "</section>",
    ])


def _member_table(design: Design, system: str) -> str:
    member = design.member
    axis, sign = member.gravity
    weight = (f"case '{_e(member.self_weight_case)}', {_fmt(design.mass_per_length, 'mass_per_length', system)} "
              f"along {'+' if sign > 0 else '-'}{'xyz'[axis]}") if member.self_weight_case else "not included"
    span_text = ", ".join(f"{'overhang' if s.overhang else 'span'} {_fmt(s.start, 'length', system)} to {_fmt(s.end, 'length', system)}"
                          for s in spans(member)) or "none"
    rows = [("Length", _fmt(member.length, "length", system)), ("Section", f"{_e(design.spec.name)} ({_e(design.spec.shape)})"),
            ("Orientation", _e(member.orientation)), ("Material", _e(design.known_material.name)), ("Self-weight", weight),
            ("Spans", span_text),
            ("Internal hinges", ", ".join(_fmt(h.at, "length", system) for h in member.hinges) or "none")]
    body = "".join(_row([f"<th>{name}</th>", f"<td>{value}</td>"]) for name, value in rows)
    return f"<h3>1.1 Member</h3><table><tbody>{body}</tbody></table>"


def _supports_table(design: Design, system: str) -> str:
    rows = []
    for index, support in enumerate(design.member.supports, start=1):
        held = " ".join(f for f in FREEDOMS if f in support.restrain) or "—"
        springs = ", ".join(f"{f} {_fmt(k, 'translational_stiffness' if f.startswith('u') else 'rotational_stiffness', system)}"
                            for f, k in support.springs.items()) or "—"
        rows.append(_row([f"<td>S{index}</td>", _cell(_fmt(support.at, "length", system), support.at),
                          f"<td>{_e(support.label)}</td>", f"<td>{_e(held)}</td>", f"<td>{_e(springs)}</td>"]))
    return ("<h3>1.2 Supports and restraints</h3>" + _table(["support", "at", "type", "holds", "springs"], rows, numeric=[1])
            + _restraints_table(design, system))


def _restraints_table(design: Design, system: str) -> str:
    """The [[restraints]] as given: where, what each holds and at what height its lateral hold acts."""
    from sizer.render.plots.buckled_shape import height_text

    rows = []
    for index, restraint in enumerate(design.member.restraints, start=1):
        where = (f"{_fmt(restraint.start, 'length', system)} to {_fmt(restraint.end, 'length', system)} (continuous)"
                 if restraint.continuous else _fmt(restraint.start, "length", system))
        holds = " and ".join(word for word, on in (("lateral", restraint.lateral), ("twist", restraint.twist)) if on)
        height = height_text(restraint.height, system) if restraint.lateral else "—"
        rows.append(_row([f"<td>R{index}</td>", f"<td>{where}</td>", f"<td>{holds}</td>", f"<td>{_e(height)}</td>"]))
    if not rows:
        return "<p>Restraints against buckling: none given; the member is held against buckling at its supports only.</p>"
    return "<p>Restraints against buckling:</p>" + _table(["restraint", "at", "holds", "lateral hold acts at"], rows)


def _load_height(load: PointLoad | LineLoad, design: Design, system: str) -> str:
    """Where a load acts on the section's depth, for stability: as given, else the default; "—" for
    a load with no component along the depth."""
    from sizer.render.plots.buckled_shape import height_text
    from sizer.stability.heights import depth_axis

    axis = depth_axis(design.member.orientation)
    along = [load.force[axis]] if isinstance(load, PointLoad) else [load.q_start[axis], load.q_end[axis]]
    if not any(along):
        return "—"
    if load.height is not None:
        return height_text(load.height, system)
    return "the face it pushes on (default)"


def _load_across(load: PointLoad | LineLoad, system: str) -> str:
    """Where across the section (along z) a load acts: "centroid" (the default), "shear-centre", or
    its signed offset from the shear centre in display units."""
    from sizer.model import DEFAULT_ACROSS

    if isinstance(load.across, str):
        return load.across + (" (default)" if load.across == DEFAULT_ACROSS else "")
    text = _fmt(load.across, "dimension", system)
    return (text if text.startswith("-") else "+" + text) + " from the shear centre"


def _load_values(load: PointLoad | LineLoad, system: str) -> str:
    """The non-zero components of a load as given (unfactored); an area load as its pressure x
    tributary width = the line load it makes; "patterned" when it is."""
    text = _components(load, system)
    return text + (" · patterned: every arrangement of loaded spans is checked" if load.pattern else "")


def _components(load: PointLoad | LineLoad, system: str) -> str:
    if isinstance(load, LineLoad) and load.area is not None:
        return _area_values(load, system)
    if isinstance(load, PointLoad):
        parts = [(n, v, "force") for n, v in zip(("fx", "fy", "fz"), load.force)]
        parts += [(n, v, "moment") for n, v in zip(("mx", "my", "mz"), load.moment)]
        return ", ".join(f"{n} = {_fmt(v, kind, system)}" for n, v, kind in parts if v) or "zero"
    texts = []
    for i, name in enumerate(("wx", "wy", "wz", "mx")):
        a, b = load.q_start[i], load.q_end[i]
        if a or b:
            kind = "moment_per_length" if i == 3 else "force_per_length"
            texts.append(f"{name} = {_fmt(a, kind, system)}" if a == b else f"{name} = {_fmt(a, kind, system)} → {_fmt(b, kind, system)}")
    return ", ".join(texts) or "zero"


def _area_values(load: LineLoad, system: str) -> str:
    """"py = -2.5 kPa x 1.2 m = -3 kN/m" for each pressure of an area load (→ where it varies)."""
    area, texts = load.area, []
    assert area is not None  # shown for area loads only
    for i, name in enumerate(("px", "py", "pz")):
        p0, p1, q0, q1 = area.p_start[i], area.p_end[i], load.q_start[i], load.q_end[i]
        if p0 or p1:
            pressure = _fmt(p0, "pressure", system) if p0 == p1 else f"{_fmt(p0, 'pressure', system)} → {_fmt(p1, 'pressure', system)}"
            line = _fmt(q0, "force_per_length", system) if q0 == q1 else f"{_fmt(q0, 'force_per_length', system)} → {_fmt(q1, 'force_per_length', system)}"
            texts.append(f"{name} = {pressure} x {_fmt(area.width, 'length', system)} = {line}")
    return ", ".join(texts) or "zero"


def _loads_table(design: Design, system: str) -> str:
    rows = []
    for index, load in enumerate(design.member.given_loads, start=1):
        if isinstance(load, PointLoad):
            kind = "moment" if not any(load.force) else "point"
            where = _fmt(load.at, "length", system)
        else:
            kind = "area" if load.area is not None else "line"
            where = f"{_fmt(load.start, 'length', system)} to {_fmt(load.end, 'length', system)}"
        rows.append(_row([f"<td>L{index}</td>", f"<td>{_e(load.case)}</td>", f"<td>{kind}</td>", f"<td>{where}</td>",
                          f"<td>{_e(_load_values(load, system))}</td>", f"<td>{_e(_load_height(load, design, system))}</td>",
                          f"<td>{_e(_load_across(load, system))}</td>"]))
    member = design.member
    if member.self_weight_case:
        axis, sign = member.gravity
        assert design.mass_per_length is not None  # the report is of a design with a section
        rows.append(_row(["<td>SW</td>", f"<td>{_e(member.self_weight_case)}</td>", "<td>line</td>",
                          f"<td>{_fmt(0.0, 'length', system)} to {_fmt(member.length, 'length', system)}</td>",
                          f"<td>self-weight {_fmt(design.mass_per_length * units.GRAVITY, 'force_per_length', system)} "
                          f"along {'+' if sign > 0 else '-'}{'xyz'[axis]} (mass per length × g)</td>", "<td>centroid</td>", "<td>centroid</td>"]))
    text = "<h3>1.3 Loads (as given, before factors)</h3>"
    if not rows:
        return text + "<p>No loads.</p>"
    return text + _table(["load", "case", "type", "where", "components (+ along +x, +y, +z; moments about them)",
                          "acts at (height on the section)", "across the section"], rows)


def _combinations_table(design: Design) -> str:
    member = design.member
    given = member.given_combinations
    cases = list(dict.fromkeys(load.case for load in member.given_loads))
    if member.self_weight_case and member.self_weight_case not in cases:
        cases.append(member.self_weight_case)
    for factors in given.values():
        cases += [c for c in factors if c not in cases]
    rows = []
    counts = {name: sum(1 for arranged in member.combinations if member.origin(arranged) == name) for name in given}
    for name, factors in given.items():
        cells = [f"<td>{_e(name)}</td>"] + [_cell(f"{factors[c]:g}" if c in factors else "—", factors.get(c)) for c in cases]
        if member.patterning is not None:
            cells.append(_cell(str(counts[name]), counts[name]))
        rows.append(_row(cells))
    headers = ["combination"] + cases + (["arrangements checked"] if member.patterning is not None else [])
    note = ""
    if member.patterning is not None:
        spans_text = "; ".join(f"{k}: {a:g}–{b:g} m" for k, (a, b) in enumerate(member.patterning.spans, start=1))
        note = (f'<p class="note">Patterned loads: each combination that uses them is checked in every arrangement of loaded '
                f"spans, with the same factors (spans, overhangs included: {_e(spans_text)}). {len(member.combinations)} combinations in all; "
                "each result names its arrangement.</p>")
    return "<h3>1.4 Load cases and combinations (factors)</h3>" + _table(headers, rows, range(1, len(headers))) + note


def _material_table(design: Design, system: str) -> str:
    material = design.known_material
    allowable = material.allowable
    rows = [("Elastic modulus E", _fmt(material.elastic_modulus, "modulus", system)),
            ("Shear modulus G", _fmt(material.shear_modulus, "modulus", system)),
            ("Density", _fmt(material.density, "density", system)),
            ("Yield strength", _fmt(material.yield_strength, "stress", system) if material.yield_strength else "not given")]
    rows += [(f"Allowable {name}", _fmt(getattr(allowable, name), "stress", system) if getattr(allowable, name) is not None else "not given")
             for name in ("tension", "compression", "bending", "shear", "equivalent")]
    body = "".join(_row([f"<th>{_e(name)}</th>", f'<td class="num">{value}</td>']) for name, value in rows)
    source = Path(material.source).name if material.source else "the member file"
    return (f"<h3>1.5 Material {_e(material.name)} and allowable stresses</h3>"
            f"<p class=\"note\">From {_e(source)}. The allowable stresses are the user's, taken from the governing code.</p>"
            f"<table><tbody>{body}</tbody></table>")


SECTION_ROWS = (
    ("area", "Area A", "area"), ("Iz", "Second moment Iz (about the horizontal axis: {Iz})", "inertia"),
    ("Iy", "Second moment Iy (about the vertical axis: {Iy})", "inertia"), ("Iyz", "Product of inertia Iyz", "inertia"),
    ("I11", "Principal I11", "inertia"), ("I22", "Principal I22", "inertia"),
    ("Sz_top", "Elastic modulus Sz, top fibre", "modulus_section"), ("Sz_bottom", "Elastic modulus Sz, bottom fibre", "modulus_section"),
    ("Sy_plus", "Elastic modulus Sy, +z fibre", "modulus_section"), ("Sy_minus", "Elastic modulus Sy, -z fibre", "modulus_section"),
    ("Zz", "Plastic modulus Zz", "modulus_section"), ("Zy", "Plastic modulus Zy", "modulus_section"),
    ("rz", "Radius of gyration rz", "dimension"), ("ry", "Radius of gyration ry", "dimension"),
    ("J", "Torsion constant J", "inertia"), ("Iw", "Warping constant Iw", "warping"),
    ("depth", "Depth", "dimension"), ("width", "Width", "dimension"),
)


def _section_block(design: Design, system: str) -> str:
    props, spec = design.props, design.spec
    dims = ", ".join(f"{_e(key.replace('_', ' '))} {_fmt(value, 'dimension', system)}" for key, value in spec.dims.items() if value)
    from sizer.render.axis_names import axis_words

    words = dict(zip(("Iz", "Iy"), axis_words(props)))
    rows = [_row([f"<th>{_e(label.format(**words))}</th>", _cell(_large(getattr(props, name), kind, system), float(getattr(props, name)))])
            for name, label, kind in SECTION_ROWS]
    ys, zs = props.shear_centre
    rows.append(_row(["<th>Shear centre (y, z) from the centroid</th>",
                      f'<td class="num">{_num(ys, "dimension", system)}, {_num(zs, "dimension", system)} {units.unit_label("dimension", system)}</td>']))
    rows.append(_row(["<th>Mass per length</th>", _cell(_fmt(design.mass_per_length, "mass_per_length", system), design.mass_per_length)]))
    rows.append(_row(["<th>Mesh</th>", f'<td class="num">{props.mesh_elements} elements, {props.mesh_nodes} nodes</td>']))
    table = f"<table><tbody>{''.join(rows)}</tbody></table>"
    picture = _figure(section_picture(design, system), "The section as installed, seen on the +x cut face (y up, z to the left); "
                      "centroid ⊕, shear centre ×, dots: the stress-analysis mesh nodes.", width=300)
    orientation = ("Properties in the section's own axes (depth along y); in <b>minor</b> orientation the section is turned a "
                   "quarter turn on the member, so member x-y bending uses Iy." if design.member.orientation == "minor" else
                   "Properties in the section's own axes (depth along y), which are the member's axes in major orientation.")
    return (f"<h3>1.6 Section {_e(spec.name)}</h3><p>Shape {_e(spec.shape)}: {dims or 'polygon outline'}. "
            f"Computed from the geometry: exact integrals over the outline, and a finite-element elasticity solution for torsion "
            f"and shear on the mesh (sectionproperties' formulation). {orientation}</p>"
            f'<div class="two"><div>{table}</div><div>{picture}</div></div>')


def _settings_table(design: Design, system: str) -> str:
    settings = design.member.checks
    entries = limit_entries(settings)
    deflection = "; ".join(f"({k}) {entry_text(entry)}" if len(entries) > 1 else entry_text(entry)
                           for k, entry in enumerate(entries, start=1)) or "not checked (no deflection limit given)"
    rows = [_row(["<th>Deflection limits</th>", f"<td>{_e(deflection)}</td>"]),
            _row(["<th>Buckling safety factor</th>",
                  f"<td>{settings.buckling_safety_factor:g} ({'given' if settings.buckling_safety_factor_given else 'default'})</td>"])]
    axes = given_length_axes(design.member, design.props, design.known_material)
    if not axes:
        return (f"<h3>1.7 Check settings</h3><table><tbody>{''.join(rows)}</tbody></table>"
                "<p>Buckling lengths: none given; the eigen-solve on the member as it is decides (section 6 gives the effective "
                "lengths it implies).</p>")
    axis_rows = [_row([f"<td>{_e(a.axis)}</td>", _cell(_fmt(a.length, "length", system), a.length),
                       _cell(_fmt(a.radius, "dimension", system), a.radius), _cell(f"{a.slenderness:.1f}", a.slenderness),
                       f"<td>{_e(a.formula)}</td>", _cell(_fmt(a.critical_stress, "stress", system), a.critical_stress)])
                 for a in axes]
    return (f"<h3>1.7 Check settings</h3><table><tbody>{''.join(rows)}</tbody></table>"
            + "<p>Buckling lengths given (Euler's load on each is kept beside the eigen-solve; the lower governs):</p>"
            + _table(["buckling axis", "length KL", "radius r", "KL/r", "formula", "critical stress σcr"], axis_rows, (1, 2, 3, 5)))
