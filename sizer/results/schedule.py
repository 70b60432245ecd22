"""The `sizer schedule` and `sizer span-table` documents (SI base units): rows, totals, bad rows,
assumptions and cautions; render.schedule shows them."""

from __future__ import annotations

from sizer.results.notes import CAUTIONS

UNITS_NOTE = "SI base units (m, N, N*m, Pa, kg/m, kg)"


def schedule_document(title: str, rows: list[dict], totals: dict, errors: list[dict], notes: list[str]) -> dict:
    """docs/design.md section 11 `schedule` document: members, totals, bad rows, assumptions and cautions."""
    return {"title": title, "members": rows, "totals": totals, "bad_rows": errors, "units": UNITS_NOTE,
            "assumptions": notes, "cautions": list(CAUTIONS)}


def span_table_document(title: str, mode: str, sections: list[dict], notes: list[str], resolution: float | None) -> dict:
    """docs/design.md section 11 `span-table` document; `resolution` (m) is the span step of mode "span"."""
    return {"title": title, "mode": mode, "resolution": resolution if mode == "span" else None,
            "sections": [_public_section(entry, mode) for entry in sections], "units": UNITS_NOTE, "assumptions": notes,
            "cautions": list(CAUTIONS)}


def _public_section(entry: dict, mode: str) -> dict:
    keys = ("load", "kind", "longest_span", "governing", "beyond_limit", "checks_made") if mode == "span" else \
        ("length", "kind", "largest_load", "governing", "beyond_limit", "checks_made")
    return {"section": entry["section"], "mass_per_length": entry["mass_per_length"], "rows": [{key: row[key] for key in keys} for row in entry["rows"]]}
