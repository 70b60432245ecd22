"""Section 7 of the calculation record, stability: the eigen-solve stated in words, what holds the
member (supports as forks, restraints, load heights), the load factors and critical values of every
combination, the reduced allowables with their formula and numbers
(F_red = min(F, F sigma_J / Fy, sigma_cr / SF), sizer.checks.reduction), and the buckled shape of the
governing stability check. Values in display units.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

from sizer import units
from sizer.checks import CheckReport, CheckResult
from sizer.checks.reduction import johnson, reduction_factor, slenderness
from sizer.design import Design
from sizer.render.basis import lateral_sigma, safety_text
from sizer.render.plots.buckled_shape import buckling_pick, height_text, holds_at_supports
from sizer.render.report.markup import _cell, _e, _fmt, _row, _table

if TYPE_CHECKING:
    from matplotlib.figure import Figure


def _factor(value: float | None) -> str:
    if value is None:
        return "—"
    return "no buckling" if math.isinf(value) else f"{value:.4g}"


def solve_words(design: Design, report: CheckReport) -> str:
    """How the critical values were found, in words: only the solves that were made."""
    stability = report.stability
    assert stability is not None  # written only for a report with its stability solves
    elements = len(stability.model.mesh.nodes) - 1
    axial = any(entry.axial is not None for entry in stability.combinations)
    lateral = any(entry.lateral is not None for entry in stability.combinations)
    kinds = ([("under the axial force alone (flexural, torsional and flexural-torsional column buckling)", "peak compression")] if axial else [])
    kinds += [("under the bending with the load heights (lateral-torsional buckling)", "peak moment")] if lateral else []
    if not kinds:
        return ("<p>No eigen-solve was needed: no combination compresses the member, and "
                f"{_e(stability.lateral_reason or 'none bends it about its major axis')}.</p>")
    solved = " and ".join(what for what, _ in kinds)
    peaks = " or ".join(peak for _, peak in kinds)
    return ("<p>For each combination sizer finds the elastic buckling of the member as it is: the member is cut into "
            f"{elements} thin-walled beam elements (sideways displacement and its slope, twist and its rate, with warping); "
            "the elastic stiffness K comes from the section's E Iy, G J and E Iw, the geometric stiffness G from the combination's "
            "own internal actions (exact between nodes), the heights at which the loads act and the shear-centre offset. The "
            "eigen-solve K d + λ G d = 0 gives the lowest positive λ, the <i>load factor</i>: the whole combination times λ would "
            f"buckle the member, in the shape d. It is solved {_e(solved)}. Critical values are the load factor times the "
            f"combination's {peaks}. Safety factor: {_e(safety_text(design))}.</p>")


def holds_list(design: Design, system: str) -> str:
    """What holds the member against buckling: supports, restraints and load heights."""
    from sizer.stability.boundary import warping_held

    items = []
    for support, (x, sideways, twist) in zip(design.member.supports, holds_at_supports(design)):
        held = [word for word, on in (("sideways", sideways), ("twist", twist)) if on]
        items.append(f"support {support.label} at {units.fmt(x, 'length', system)}: holds {' and '.join(held) or 'neither sideways movement nor twist'}, "
                     f"warping {'held' if warping_held(support) else 'free'}")
    for restraint in design.member.restraints:
        holds = " and ".join(word for word, on in (("lateral", restraint.lateral), ("twist", restraint.twist)) if on)
        where = (f"from {units.fmt(restraint.start, 'length', system)} to {units.fmt(restraint.end, 'length', system)} (continuous)"
                 if restraint.continuous else f"at {units.fmt(restraint.start, 'length', system)}")
        height = f", acting at {height_text(restraint.height, system)}" if restraint.lateral else ""
        items.append(f"restraint {where}: holds {holds}{height}")
    if not design.member.restraints:
        items.append("no restraints given: held against buckling at the supports only")
    heights = sorted({height_text(load.height, system) for load in design.member.loads if load.height is not None})
    items.append("load heights: each transverse load on the face it pushes on (top for a downward load)"
                 + (f", except where given ({', '.join(heights)})" if heights else "")
                 + ("; self-weight at the centroid" if design.member.self_weight_case else ""))
    return "<ul>" + "".join(f"<li>{_e(item)}</li>" for item in items) + "</ul>"


def combinations_table(report: CheckReport, system: str) -> str:
    """Peak compression and moment, load factors and critical values of every combination."""
    rows = []
    stability = report.stability
    assert stability is not None  # written only for a report with its stability solves
    for entry in stability.combinations:
        axial = entry.axial.load_factor if entry.axial is not None else None
        lateral = entry.lateral.load_factor if entry.lateral is not None else None
        p_cr = axial * entry.compression if axial is not None and math.isfinite(axial) else None
        m_cr = lateral * entry.moment if lateral is not None and math.isfinite(lateral) else None
        at_least = "≥ " if entry.lateral_bound else ""  # a proven lower bound: this arrangement cannot govern
        rows.append(_row([f"<td>{_e(entry.combination)}</td>", _cell(_fmt(entry.compression, "force", system), entry.compression),
                          _cell(_factor(axial), axial), _cell(_fmt(p_cr, "force", system), p_cr),
                          _cell(_fmt(entry.moment, "moment", system), entry.moment), _cell(at_least + _factor(lateral), lateral),
                          _cell(at_least + _fmt(m_cr, "moment", system), m_cr)]))
    note = ("<p class=\"note\">— : not solved (no compression, no major-axis bending, or a section that does not buckle "
            f"sideways{': ' + _e(stability.lateral_reason) if stability.lateral_reason else ''}). "
            "≥ : a pattern arrangement not solved on its own: a proven lower bound of its load factor (one eigen-solve bounds "
            "every arrangement that loads the spans fixed so far), which shows it cannot govern.</p>")
    return _table(["combination", "peak compression", "load factor (axial)", "P_cr", "peak |M|", "load factor (bending)", "M_cr"],
                  rows, range(1, 7)) + note


def reduction_lines(design: Design, report: CheckReport, system: str) -> list[str]:
    """The reduced allowable of each stability check made, with its formula and the numbers."""
    checks = {c.check: c for c in report.checks if c.made}
    lines = []
    if "buckling" in checks:
        lines.append(_buckling_line(design, checks["buckling"], system))
    if "lateral-torsional" in checks:
        lines.append(_lateral_line(design, report, checks["lateral-torsional"], system))
    if "local" in checks:
        lines.append(_local_line(design, checks["local"], system))
    if "shear" in checks and "critical_shear_stress" in checks["shear"].extra:
        lines.append(_web_shear_line(design, checks["shear"], system))
    if "web" in checks:
        lines.append(_web_line(design, checks["web"], system))
    return lines


def _web_shear_line(design: Design, result: CheckResult, system: str) -> str:
    """Web shear buckling: k_tau, tau_cr and the reduced shear allowable with its terms."""
    fy, sf = design.known_material.yield_strength, design.member.checks.buckling_safety_factor
    critical, k_tau = float(result.extra["critical_shear_stress"]), float(result.extra["k_tau"])
    shear_yield = fy / math.sqrt(3.0) if fy else None
    formula = _reduced(design.known_material.allowable.shear, critical, shear_yield, sf, system, "Fv_red",
                       float(result.extra.get("plateau_slenderness", 0.0)))
    return (f"Web shear buckling, combination {result.combination}: panel a = {_fmt(result.extra['panel_length'], 'length', system)}, "
            f"k_τ = 5.34 + 4 (h/a)² or 4 + 5.34 (h/a)² = {k_tau:.4g}; τ_cr = k_τ π² E / (12 (1 - ν²)) (t / h)² = "
            f"{_fmt(critical, 'stress', system)}; with the shear yield Fy / √3 in place of Fy, {formula} = "
            f"{_fmt(result.allowable, 'stress', system)} against the peak shear stress {_fmt(result.demand, 'stress', system)}.")


def _web_line(design: Design, result: CheckResult, system: str) -> str:
    """The web under the governing concentrated force: the published method and its two limits."""
    extra = result.extra
    if "web_compression_buckling" in extra:
        return (f"Web under a load directly over a support, {extra['element']}, combination {result.combination}: web compression "
                f"buckling (AISC 360-16 J10.5), Rn / 1.67 = {_fmt(result.allowable, 'force', system)} with "
                f"Fy = {_fmt(extra['yield_strength'], 'stress', system)}, against the smaller of the two opposed forces "
                f"{_fmt(result.demand, 'force', system)}.")
    return (f"Web under a concentrated force, {extra['element']}, combination {result.combination}: {extra['method']}, "
            f"Fy = {_fmt(extra['yield_strength'], 'stress', system)}, stiff bearing lb = {_fmt(extra['bearing'], 'length', system)}; "
            f"allowable force min(web local yielding Rn / 1.50 = {_fmt(extra['web_local_yielding'], 'force', system)}, "
            f"web crippling Rn / 2.00 = {_fmt(extra['web_crippling'], 'force', system)}) = {_fmt(result.allowable, 'force', system)} "
            f"({extra['governing_limit']}) against {_fmt(result.demand, 'force', system)}.")


def _buckling_line(design: Design, result: CheckResult, system: str) -> str:
    area, sf, fy = design.props.area, design.member.checks.buckling_safety_factor, design.known_material.yield_strength
    critical = float(result.extra.get("critical_load") or math.inf)
    sigma_e = critical / area
    sigma = float(johnson(sigma_e, fy))
    how = ("σ = σ_e (elastic: σ_e ≤ Fy / 2, or no yield strength)" if sigma == sigma_e else
           f"σ = Fy (1 - Fy / (4 σ_e)) = {_fmt(fy, 'stress', system)} x (1 - {_fmt(fy, 'stress', system)} / (4 x {_fmt(sigma_e, 'stress', system)}))")
    return (f"Column buckling, combination {result.combination}: σ_e = P_cr / A = {_fmt(critical, 'force', system)} / "
            f"{_fmt(area, 'area', system)} = {_fmt(sigma_e, 'stress', system)}; {how} = {_fmt(sigma, 'stress', system)}; allowable load "
            f"σ A / SF = {_fmt(sigma, 'stress', system)} x {_fmt(area, 'area', system)} / {sf:g} = {_fmt(result.allowable, 'force', system)} "
            f"against the peak compression {_fmt(result.demand, 'force', system)}.")


def _reduced(allowable: float | None, sigma_cr: float, fy: float | None, sf: float, system: str, name: str, plateau: float) -> str:
    """F_red = min(F, F rho, sigma_cr / SF) written out with its terms; rho = 1 within the plateau
    lambda <= lambda_0, then the Johnson curve (sizer.checks.reduction)."""
    terms = [_fmt(allowable, "stress", system)]
    if fy:
        assert allowable is not None  # reduced only where it is given
        lam = float(slenderness(sigma_cr, fy))
        rho = float(reduction_factor(sigma_cr, fy, plateau))
        where = ("within the plateau, no reduction" if lam <= plateau else
                 "Johnson σ_J / Fy" if math.isclose(rho, float(johnson(sigma_cr, fy)) / fy, rel_tol=1e-12) else "transition")
        terms.append(f"{_fmt(allowable, 'stress', system)} x ρ = {_fmt(allowable, 'stress', system)} x {rho:.4g} "
                     f"(λ = √(Fy / σ_cr) = {lam:.3g}, plateau λ_0 = {plateau:.3g}: {where}) = {_fmt(allowable * rho, 'stress', system)}")
    terms.append(f"{_fmt(sigma_cr, 'stress', system)} / {sf:g} = {_fmt(sigma_cr / sf, 'stress', system)}")
    formula = "min(F, F ρ, σ_cr / SF)" if fy else "min(F, σ_cr / SF)"
    return f"{name} = {formula} = min({'; '.join(terms)})"


def _lateral_line(design: Design, report: CheckReport, result: CheckResult, system: str) -> str:
    factor = result.extra.get("load_factor")
    if factor is None:
        return (f"Lateral-torsional buckling, combination {result.combination}: no sideways buckling mode (the restraints hold the "
                f"member along its length), so Fb_LT = Fb = {_fmt(result.allowable, 'stress', system)}.")
    sigma = lateral_sigma(design, report, result)
    fb, fy, sf = design.known_material.allowable.bending, design.known_material.yield_strength, design.member.checks.buckling_safety_factor
    sigma_j = (f"; σ_J = {'σ_cr' if sigma <= fy / 2 else 'Fy (1 - Fy / (4 σ_cr))'} = {_fmt(float(johnson(sigma, fy)), 'stress', system)}"
               if fy else "")
    return (f"Lateral-torsional buckling, combination {result.combination}: load factor {factor:.4g}, "
            f"M_cr = {_fmt(result.extra['critical_moment'], 'moment', system)}, σ_cr = M_cr / S = {_fmt(sigma, 'stress', system)}"
            f"{sigma_j}; {_reduced(fb, sigma, fy, sf, system, 'Fb_LT', float(result.extra.get('plateau_slenderness', 0.0)))} = {_fmt(result.allowable, 'stress', system)} "
            f"against the peak major-axis bending stress {_fmt(result.demand, 'stress', system)}.")


def _local_line(design: Design, result: CheckResult, system: str) -> str:
    allowable = design.known_material.allowable
    given = [value for value in (allowable.compression, allowable.bending) if value is not None]
    critical = float(result.extra.get("critical_stress") or math.inf)
    sf, fy = design.member.checks.buckling_safety_factor, design.known_material.yield_strength
    formula = _reduced(max(given), critical, fy, sf, system, "F_red", float(result.extra.get("plateau_slenderness", 0.0))) if given and math.isfinite(critical) else "F_red"
    return (f"Local buckling of the {result.extra.get('element', 'wall')}, combination {result.combination}: plate buckling "
            f"σ_cr = k π² E / (12 (1 - ν²)) (t / b)² = {_fmt(critical, 'stress', system)}; {formula} = "
            f"{_fmt(result.allowable, 'stress', system)} (F: the larger of the compression and bending allowables) against the "
            f"peak compression in that wall {_fmt(result.demand, 'stress', system)}.")


def buckled_figure(design: Design, report: CheckReport, system: str) -> Figure | None:
    """The buckled shape of the governing stability check as its own small figure, or None."""
    import matplotlib
    from matplotlib.figure import Figure

    from sizer.render.plots.buckled_shape import draw_buckled_shape
    from sizer.render.plots.figure import length_axis
    from sizer.render.plots.style import FIG_WIDTH, LEFT, RIGHT, style

    pick = buckling_pick(report)
    if pick is None:
        return None
    with matplotlib.rc_context(style()):
        figure = Figure(figsize=(FIG_WIDTH, 3.6))
        width = (FIG_WIDTH - LEFT - RIGHT) / FIG_WIDTH
        ax_w = figure.add_axes((LEFT / FIG_WIDTH, 0.58, width, 0.32))
        ax_phi = figure.add_axes((LEFT / FIG_WIDTH, 0.14, width, 0.32), sharex=ax_w)
        draw_buckled_shape(ax_w, ax_phi, design, pick, system)
        for ax in (ax_w, ax_phi):
            ax.tick_params(labelbottom=False, direction="in", length=3)
            ax.spines[["top", "right"]].set_visible(False)
        length_axis({"sideways": ax_w, "twist": ax_phi}, design.member.length, system)
    return figure


def stability_section(design: Design, report: CheckReport, system: str) -> str:
    """The HTML of section 7 (a short note where the report carries no stability data)."""
    from sizer.render.report.markup import _figure

    head = '<section id="stability"><h2>7. Stability</h2>'
    if report.stability is None:
        return head + "<p>No stability data.</p></section>"
    lines = "".join(f"<li>{_e(line)}</li>" for line in reduction_lines(design, report, system))
    figure = buckled_figure(design, report, system)
    picture = _figure(figure, "The buckled shape of the governing stability check (sideways w and twist φ, each scaled so that its "
                      "largest value is 1); triangles: supports that hold it, squares and hatched strips: restraints.") if figure else ""
    return (head + solve_words(design, report) + "<h3>What holds the member</h3>" + holds_list(design, system)
            + "<h3>Load factors and critical values</h3>" + combinations_table(report, system)
            + "<h3>Reduced allowables</h3>" + (f"<ul>{lines}</ul>" if lines else "<p>No stability check was made.</p>")
            + picture + "</section>")
