"""The stability part of section 6 of the record, by hand, following the member:

- column buckling only where some combination compresses the member: for each principal axis the
  effective length from the member's own flexural eigen-solve, KL = pi sqrt(E I / P_cr)
  (sizer.checks.effective_length), its K = KL / L named where it is close to a textbook value,
  then KL/r, Euler's load and the Johnson parabola; the lowest eigen-value (which may twist) last;
- lateral-torsional buckling, where that check was made: the closed form on each segment between
  holds (sizer.checks.lateral_closed_form) beside the eigen-solve's M_cr, with the difference
  explained. Values in display units.
"""

from __future__ import annotations

import math

from sizer import units
from sizer.checks import CheckReport
from sizer.design import Design
from sizer.render.report.markup import _e, _fmt
from sizer.render.phrases import in_display_units

TEXTBOOK_K = ((0.5, "both ends fixed"), (0.699, "one end fixed, one pinned"), (1.0, "both ends pinned"),
              (2.0, "a free-standing cantilever"))  # Euler's four cases (Timoshenko & Gere, section 2.1)
NEAR = 0.03  # K within 3 % of a textbook value is named after it


def textbook_words(k: float) -> str:
    """", close to the textbook K = 2 of a free-standing cantilever" and the like, or ""."""
    for value, words in TEXTBOOK_K:
        if abs(k - value) <= NEAR * value:
            return f", close to the textbook K = {value:g} of {words}"
    return ", not a textbook case"


def column_items(design: Design, report: CheckReport, system: str) -> list[str]:
    """One line per principal axis, then the eigen-solve's lowest load; empty without compression."""
    from sizer.checks.buckling import critical_stress
    from sizer.checks.effective_length import axis_lengths

    buckling = next((c for c in report.checks if c.check == "buckling" and c.made), None)
    if buckling is None or report.stability is None:
        return []
    material, props, s = design.known_material, design.props, system
    E, Fy = material.elastic_modulus, material.yield_strength
    given = {"major": design.member.checks.buckling_length_major, "minor": design.member.checks.buckling_length_minor}
    lines = []
    assert buckling.combination is not None  # a made buckling check names its combination
    for axis in axis_lengths(design, report.stability, buckling.combination):
        name = "Iz (major)" if axis.axis == "major" else "Iy (minor)"
        radius = math.sqrt(axis.inertia / props.area)
        if not math.isfinite(axis.length):
            lines.append(f"{axis.axis} axis: no flexural buckling mode about this axis (held along its length)")
            continue
        k = axis.length / design.member.length
        head = (f"{axis.axis} axis: the member's own flexural eigen-solve about it gives P_cr = {units.fmt(axis.critical_load, 'force', s)}, "
                f"so KL = π √(E I / P_cr) = π √({units.fmt(E, 'modulus', s)} x {units.fmt(axis.inertia, 'inertia', s)} [{name}] / "
                f"{units.fmt(axis.critical_load, 'force', s)}) = {units.fmt(axis.length, 'length', s)}, K = KL / L = {k:.2f}{textbook_words(k)}")
        length, given_length = axis.length, given[axis.axis]
        if given_length is not None:
            length = min(length, given_length)
            head += f"; the given buckling length {units.fmt(given_length, 'length', s)} is used where shorter"
        slender = length / radius
        euler = math.pi**2 * E * props.area / slender**2
        text = (f"{head}. KL/r = {units.fmt(length, 'dimension', s)} / {units.fmt(radius, 'dimension', s)} = {slender:.1f}; "
                f"P_e = π² E A / (KL/r)² = π² x {units.fmt(E, 'modulus', s)} x {units.fmt(props.area, 'area', s)} / {slender:.1f}² = "
                f"{units.fmt(euler, 'force', s)}")
        if Fy:
            transition = math.pi * math.sqrt(2 * E / Fy)
            stress, formula = critical_stress(slender, E, Fy)
            text += f"; Cc = π √(2 E / Fy) = {transition:.1f}"
            text += (f" > KL/r, so the Johnson parabola: σ = Fy (1 - (KL/r)² / (2 Cc²)) = {units.fmt(stress, 'stress', s)}"
                     if formula == "Johnson" else " ≤ KL/r, so Euler's load applies")
        lines.append(text)
    lines.append(f"The lowest mode of the full eigen-solve (with twist): P_cr = {_fmt(buckling.extra.get('critical_load'), 'force', s)} "
                 f"({in_display_units(buckling.extra.get('mode', ''), s)}) in combination {buckling.combination}; the buckling "
                 "check uses it. It equals the lower of the two lines above unless the member twists as it buckles; P_cr is the peak "
                 "compression at buckling, so where the axial force varies along the member (self-weight of a post) KL is the "
                 "length that gives that peak in Euler's formula.")
    return lines


def lateral_items(design: Design, report: CheckReport, system: str) -> list[str]:
    """The closed form on each segment beside the eigen-solve; empty where the check was not made."""
    from sizer.checks.lateral_closed_form import ClosedForm, closed_forms

    result = next((c for c in report.checks if c.check == "lateral-torsional" and c.made), None)
    if result is None or result.extra.get("load_factor") is None:
        return []
    s, props = system, design.props
    eigen = float(result.extra["load_factor"])
    assert result.combination is not None  # a made lateral-torsional check names its combination
    found = closed_forms(design, result.combination)
    lines = []
    for item in found:
        segment = item.segment if isinstance(item, ClosedForm) else item
        where = f"segment {units.fmt(segment.start, 'length', s)} to {units.fmt(segment.end, 'length', s)}"
        if not isinstance(item, ClosedForm):
            lines.append(f"{where}: no closed form: {segment.why_not}.")
            continue
        span = segment.end - segment.start
        peak, a, b, c = (units.fmt(m, "moment", s) for m in item.moments)
        height = "a load acts above the shear centre, destabilising" if item.destabilising else "no load above the shear centre"
        plan = ("neither end", "one end", "both ends")[segment.ends_on_plan]
        lines.append(
            f"{where}: L = {units.fmt(span, 'length', s)}, k = {item.k:g} ({height}; {plan} held on plan), "
            f"L_e = k L = {units.fmt(item.k * span, 'length', s)}; M_cr0 = (π / L_e) √(E Iy G J) √(1 + π² E Iw / (G J L_e²)) with "
            f"Iy (minor) = {units.fmt(props.Iy, 'inertia', s)}, J = {units.fmt(props.J, 'inertia', s)}, Iw = {units.fmt(props.Iw, 'warping', s)}: "
            f"{units.fmt(item.uniform, 'moment', s)}; Cb = 12.5 M_max / (2.5 M_max + 3 M_A + 4 M_B + 3 M_C) = 12.5 x {peak} / "
            f"(2.5 x {peak} + 3 x {a} + 4 x {b} + 3 x {c}) = {item.cb:.3f}; M_cr = Cb M_cr0 = {units.fmt(item.critical, 'moment', s)}, "
            f"load factor M_cr / M_max = {item.load_factor:.3g}.")
    forms = [item for item in found if isinstance(item, ClosedForm)]
    eigen_line = (f"The eigen-solve on the whole member: load factor {eigen:.4g}, M_cr = {_fmt(result.extra['critical_moment'], 'moment', s)} "
                  f"at the peak moment, combination {result.combination}; the check uses it.")
    if forms:
        low = min(forms, key=lambda f: f.load_factor)
        diff = 100 * (low.load_factor - eigen) / eigen
        eigen_line += (f" The lowest closed-form load factor, {low.load_factor:.3g}, is {diff:+.1f} % against it. They differ because the closed "
                       "form takes each segment on its own with fork ends (no help from stiffer neighbouring segments, no hold at a "
                       "restraint's height), the moment diagram through one factor Cb and the load height through one length factor, "
                       "for a doubly symmetric section; the eigen-solve takes the member whole with its own moment diagram, load "
                       "heights, restraint heights and section constants.")
    lines.append(eigen_line)
    return lines


def hand_stability_html(design: Design, report: CheckReport, system: str) -> str:
    """The column and lateral-torsional blocks of section 6 (each only where it applies)."""
    parts = []
    columns = column_items(design, report, system)
    if columns:
        parts.append("<h3>Column buckling by formula</h3><ul>" + "".join(f"<li>{_e(line)}</li>" for line in columns) + "</ul>")
    else:
        parts.append("<p class=\"note\">No combination compresses the member: there is no column buckling to work by hand.</p>")
    lateral = lateral_items(design, report, system)
    if lateral:
        parts.append("<h3>Lateral-torsional buckling by formula</h3><p>Uniform-moment closed form of Timoshenko &amp; Gere, with the "
                     "moment factor Cb of AISC 360-16 eq. F1-1 and the effective-length factor k of BS 5950-1:2000 Table 13 for the "
                     "load height and the ends' hold on plan, on each segment between points held against sideways movement and "
                     "twist:</p><ul>" + "".join(f"<li>{_e(line)}</li>" for line in lateral) + "</ul>")
    return "".join(parts)
