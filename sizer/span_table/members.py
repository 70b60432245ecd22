"""The member of one span-table trial, made as the tables of a member file (supports of the layout,
restraints at the spacing, the loads, for continuous layouts the imposed load patterned over the
spans: analysis.patterns checks every arrangement of loaded spans, the case on none included) and
read with the normal reader (`inputfile.member_from_tables`), so every value meets the checks of a
member file; no text is written in between.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any

from sizer.errors import InputError
from sizer.model import Member
from sizer.span_table.spec import DEAD, IMPOSED, AppliedLoad, SpanTableSpec


def member_document(spec: SpanTableSpec, section: str, span: float, imposed: AppliedLoad) -> dict:
    """The member file's tables (as tomllib would read them) for `section` at span `span` (m) under `imposed`."""
    count = spec.spans
    length = span * count
    document: dict[str, Any] = {
        "title": f"{spec.title or 'Span table'}: {section}, {spec.layout} span {span:.6g} m",
        "member": {"length": _metres(length), "material": spec.material, "section": section, "orientation": spec.orientation,
                   "self_weight": spec.self_weight if spec.self_weight else False},
        "supports": _supports(spec.layout, span, count),
        "restraints": _restraints(spec, span),
        "loads": _loads(spec, span, imposed),
        "combinations": user_combinations(spec),
    }
    if spec.checks:
        document["checks"] = dict(spec.checks)
    if spec.materials:
        document["materials"] = spec.materials
    return {key: value for key, value in document.items() if value != []}


def _metres(value: float) -> str:
    return f"{value!r} m"


def _supports(layout: str, span: float, count: int) -> list[dict]:
    if layout == "cantilever":
        return [{"at": _metres(0.0), "type": "fixed"}]
    return [{"at": _metres(0.0), "type": "pin"}] + [{"at": _metres(span * i), "type": "roller"} for i in range(1, count + 1)]


def restraint_positions(spec: SpanTableSpec, span: float) -> list[float]:
    """Point restraints (m from end A) at the spacing from each span's start, inside each span (a
    cantilever's tip included)."""
    spacing = spec.restraint
    if not isinstance(spacing, float):
        return []
    positions = []
    for index in range(spec.spans):
        k = 1
        while k * spacing < span * (1 - 1e-9) or (spec.layout == "cantilever" and k * spacing <= span * (1 + 1e-9)):
            positions.append(min(index * span + k * spacing, span * spec.spans))
            k += 1
    return positions


def _restraints(spec: SpanTableSpec, span: float) -> list[dict]:
    hold = ["lateral", "twist"]
    if spec.restraint == "continuous":
        return [{"from": _metres(0.0), "to": _metres(span * spec.spans), "hold": hold, "height": "top"}]
    return [{"at": _metres(x), "hold": hold, "height": "top"} for x in restraint_positions(spec, span)]


def _loads(spec: SpanTableSpec, span: float, imposed: AppliedLoad) -> list[dict]:
    loads = []
    if spec.dead_load is not None:
        loads.append({"type": "line", "case": DEAD, "wy": f"{spec.dead_load!r} N/m"})
    patterned: dict[str, Any] = {"pattern": True} if spec.spans > 1 else {}
    for index in range(spec.spans):
        start = index * span
        if imposed.kind == "line":
            loads.append({"type": "line", "case": IMPOSED, "from": _metres(start), "to": _metres(start + span),
                          "wy": f"{imposed.value!r} N/m", **patterned})
        else:
            at = span if spec.layout == "cantilever" else start + span / 2
            loads.append({"type": "point", "case": IMPOSED, "at": _metres(at), "fy": f"{imposed.value!r} N", **patterned})
    return loads


def _cases(spec: SpanTableSpec) -> list[str]:
    cases = [spec.self_weight] if spec.self_weight else []
    if spec.dead_load is not None and DEAD not in cases:
        cases.append(DEAD)
    return cases + [IMPOSED]


def user_combinations(spec: SpanTableSpec) -> dict[str, dict]:
    """The combinations as written, or one: every case x 1.0."""
    if spec.combinations is not None:
        return spec.combinations
    cases = _cases(spec)
    return {" + ".join(cases): {case: 1.0 for case in cases}}


def trial_member(spec: SpanTableSpec, section: str, span: float, imposed: AppliedLoad) -> Member:
    """The trial's Member, read from its member-file tables by the normal reader; an error in a value
    that came from the span-table file names that file, its key and line."""
    from sizer.inputfile import member_from_tables

    try:
        return member_from_tables(member_document(spec, section, span, imposed), Path(spec.path))
    except InputError as error:
        raise span_table_error(spec, error) from None


def span_table_error(spec: SpanTableSpec, error: InputError) -> InputError:
    """An error the member reader raised about the generated member, named as the span-table key it came from."""
    if error.file != spec.path:
        return error
    key = error.key
    if key.startswith(("checks", "combinations")):
        key = "span_table." + key
    elif key == "member.length":  # the trial's span: from the lengths, or a step of the resolution
        key = "span_table.lengths" if spec.mode == "load" else "span_table.resolution"
    elif key.startswith("member."):
        key = "span_table." + key.removeprefix("member.")
    elif not key.startswith("materials"):
        key = "span_table"
    from sizer.inputfile import KeyLines

    return InputError(error.file, key, error.problem, error.fix, KeyLines(spec.text).find(key))
