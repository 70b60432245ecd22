"""Sentences with their numbers kept apart (sizer.phrase): the SI text is exactly what an f-string
writes, the quantities survive joining, pickling (worker processes) and the JSON kept on disk, and
the check document gives each detail's numbers in SI beside the SI sentence. Conversion factors:
NIST SP 811 (docs/references.md)."""

from __future__ import annotations

import json
import pickle

import pytest

from sizer.phrase import Phrase, fq, joined, phrase, phrase_from_json, phrase_json, q, values_json
from sizer.render.phrases import in_display_units


def test_the_si_text_is_what_an_f_string_writes() -> None:
    moment, stress, bow = 214_321.0, 1.234567e8, 0.00412
    sentence = phrase("M_cr = ", q("M_cr", moment, "kN·m", ".4g"), ", σ = ", q("sigma", stress, "MPa", ".4g"),
                      ", bow ", q("bow", bow, "mm", "+.3g"), ", span ", q("span", (0.0, 4.5), "m"))
    assert sentence == f"M_cr = {moment / 1e3:.4g} kN·m, σ = {stress / 1e6:.4g} MPa, bow {bow * 1e3:+.3g} mm, span 0–4.5 m"
    assert isinstance(sentence, str) and json.dumps([sentence]) == json.dumps([str(sentence)])


def test_quantities_survive_joining_pickling_and_the_disk_form() -> None:
    first = phrase("at ", q("at", 3.0, "m"))
    second = "load " + first + "; " + joined(", ", [phrase(q("at", 4.5, "m")), "free"])
    assert isinstance(second, Phrase) and second == "load at 3 m; 4.5 m, free"
    assert list(second.quantities()) == ["at", "at_2"]
    for again in (pickle.loads(pickle.dumps(second)), phrase_from_json(json.loads(json.dumps(phrase_json(second))))):
        assert again == second and again.parts == second.parts
    assert phrase_from_json(phrase_json("plain")) == "plain"
    odd = phrase("a = ", q("a", float("inf"), "m"), ", dz = ", q("dz", -0.0, "mm", "+.3g"))
    assert phrase_from_json(json.loads(json.dumps(phrase_json(odd)))) == odd == "a = inf m, dz = -0 mm"


def test_us_display_converts_each_quantity_and_keeps_its_sign() -> None:
    """1 m = 3.2808 ft, 1 kN = 0.22481 kip, 1 mm = 0.03937 in (NIST SP 811)."""
    sentence = phrase("x = ", q("x", 1.0, "m"), ", P = ", q("P", 1e3, "kN"), ", e = ", q("e", 0.01, "mm", "+g"),
                      ", a = ", fq("a", 0.15, "dimension"), ", g = ", q("g", 9.80665, "m/s²"))
    assert in_display_units(sentence, "si") == "x = 1 m, P = 1 kN, e = +10 mm, a = 150.0 mm, g = 9.80665 m/s²"
    assert in_display_units(sentence, "us") == "x = 3.281 ft, P = 0.2248 kip, e = +0.3937 in, a = 5.906 in, g = 32.17 ft/s²"


def test_values_give_si_numbers_with_their_base_units() -> None:
    sentence = phrase("M_cr = ", q("M_cr", 214_300.0, "kN·m", ".4g"), ", span ", q("span", (1.0, 2.5), "m"))
    assert values_json(sentence) == {"M_cr": {"value": 214_300.0, "unit": "N*m"}, "span": {"value": [1.0, 2.5], "unit": "m"}}
    assert values_json("no numbers") == {}
    with pytest.raises(ValueError):
        q("x", 1.0, "furlong")


def test_the_check_document_gives_each_detail_its_numbers() -> None:
    """The lateral-torsional detail's M_cr in `values` is the check's critical moment (SI), and the
    SI detail sentence shows it in kN·m to 4 figures (common practice: one number, two forms)."""
    import sizer

    member = sizer.member_from_text(MEMBER)
    document = sizer.api.check(member, section="IPE 200").to_json()
    entry = next(c for c in document["checks"] if c["check"] == "lateral-torsional")
    critical = entry["critical_moment"]
    assert entry["values"]["M_cr"] == {"value": pytest.approx(critical, rel=1e-12), "unit": "N*m"}
    assert f"M_cr = {critical / 1e3:.4g} kN·m" in entry["detail"]
    assert all(isinstance(entry["values"], dict) for entry in document["checks"])


MEMBER = """
[member]
length = "5 m"
material = "mild-steel"
section = "IPE 200"

[[supports]]
at = "0 m"
type = "pin"

[[supports]]
at = "5 m"
type = "roller"

[[loads]]
type = "line"
wy = "-6 kN/m"
"""
