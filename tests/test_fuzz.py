"""Fuzzing member files, catalogue files and CSV stock lists through the command line (in process,
typer's CliRunner): whatever a file holds (random keys, values, units, unicode, huge and tiny
numbers, truncation), sizer ends with exit 0, 1 or 2, never a traceback, never a hang past 10 s and
never a non-finite number on screen; bad input is one line on stderr. These are invariants of the
program (docs/design.md sections 5 and 8), so no outside check values are needed.
"""

from __future__ import annotations

import re
import signal
import tempfile
from pathlib import Path
from typing import Any

import pytest
import tomlkit
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from typer.testing import CliRunner

from sizer.cli import app
from sizer.sections.shapes import SHAPES
from tests.steel import STEEL_TOML

FUZZ = settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large])
HANG_SECONDS = 10
NOT_FINITE = re.compile(r"(?<![A-Za-z])(nan|inf|infinity)(?![A-Za-z])", re.IGNORECASE)
FLAT = '[[sections]]\nname = "F 30x8"\nshape = "rectangle"\ndepth = "30 mm"\nwidth = "8 mm"\n'

NUMBERS = st.one_of(
    st.sampled_from(["0", "-0", "1", "2.5", "-12", ".5", "1e-300", "1e-7", "1e300", "1e308", "-1e308", "1e999", "9" * 400, "nan", "inf"]),
    st.floats(allow_nan=True, allow_infinity=True).map(repr),
    st.integers(-10**30, 10**30).map(str),
)
UNITS = st.sampled_from(["m", "mm", "µm", "km", "kN", "N", "kN/m", "kN*m", "kN·m", "N*m/rad", "MPa", "GPa", "Pa", "kg/m^3",
                         "kN/mm", "kN*m/rad", "ft", "in", "kip", "ksi", "", "blah", "m**2", "/ 0", "**10**10", "(m", "m)^99", "%"])
QUANTITIES = st.builds(lambda number, space, unit: f"{number}{space}{unit}", NUMBERS, st.sampled_from(["", " ", "  "]), UNITS)
VALUES = st.one_of(
    QUANTITIES, QUANTITIES, QUANTITIES,
    st.text(max_size=12),
    st.floats(allow_nan=True, allow_infinity=True), st.integers(-10**400, 10**400), st.booleans(),
    st.lists(QUANTITIES, max_size=3), st.sampled_from(["pin", "roller", "fixed", "top", "major", "minor", "-x", "dead", "F 30x8"]),
)
NAMES = st.sampled_from(["load", "dead", "imposed", "", " ", "é", "a.b", "dead + imposed"])
SIZES = st.one_of(st.floats(-1e13, 1e13, allow_nan=False).map(repr), st.floats(-1e3, 1e3).map(repr),
                  st.sampled_from(["0", "1e-300", "1e-7", "1e-6", "1e3", "1e12", "1e13", "1e300", "-1e308", "9" * 400]))
LENGTHS = st.one_of(st.floats(1e-7, 2e3).map(repr), st.sampled_from(["1e-6", "1e-300", "1000", "1001", "1e300"]))
POSITIONS = st.one_of(st.floats(0.0, 4.0).map(repr), st.sampled_from(["0", "4", "4.000000001", "-1e-9", "2", "1e-300"]))
# the keys the mutations touch, each with its numbers and units (a random value of any kind otherwise)
TYPED = {
    "length": (LENGTHS, ["m", "mm"]), "at": (POSITIONS, ["m"]), "from": (POSITIONS, ["m"]), "to": (POSITIONS, ["m"]),
    "buckling_length_major": (LENGTHS, ["m"]), "height": (SIZES, ["mm"]),
}
UNITS_OF = {
    "fx": ["kN", "N"], "fy": ["kN", "N"], "fz": ["kN", "N"], "mx": ["kN*m"], "my": ["kN*m"], "mz": ["kN*m", "N*m"],
    "wx": ["kN/m"], "wy": ["kN/m", "N/m"], "wz": ["kN/m"], "wy_end": ["kN/m"], "uy": ["kN/mm", "N/m"], "uz": ["N/m"], "rz": ["kN*m/rad"],
}
TYPED.update({key: (SIZES, units) for key, units in UNITS_OF.items()})
MEMBER_KEYS = st.sampled_from(["length", "length", "self_weight", "gravity", "orientation", "colour"])
SUPPORT_KEYS = st.sampled_from(["at", "at", "type", "restrain", "springs", "warping"])
LOAD_KEYS = {"point": ["at", "fx", "fy", "fz", "height", "case", "pattern"],
             "line": ["from", "to", "wx", "wy", "wz", "wy_end", "mx", "case", "height", "pattern"],
             "moment": ["at", "mx", "my", "mz", "case", "pattern"]}
RESTRAINT_KEYS = st.sampled_from(["at", "from", "to", "hold", "hold", "height", "height"])
HOLDS = st.lists(st.sampled_from(["lateral", "twist", "lateral", "warping", ""]), max_size=3)
CHECK_KEYS = st.sampled_from(["deflection_limit", "deflection_limit_overhang", "buckling_length_major", "buckling_safety_factor"])


def base_member() -> dict[str, Any]:
    return {
        "member": {"length": "4 m", "material": "steel", "self_weight": False},
        "supports": [{"at": "0 m", "type": "pin"}, {"at": "4 m", "type": "roller"}],
        "loads": [{"type": "point", "at": "2 m", "fy": "-5 kN"}, {"type": "line", "wy": "-1 kN/m", "case": "dead"}],
    }


@st.composite
def value_for(draw, key: str) -> Any:
    """A value for `key`: mostly a number with a unit of the key's kind, sometimes anything."""
    if key == "springs":
        return {freedom: draw(value_for(freedom)) for freedom in draw(st.lists(st.sampled_from(["uy", "uz", "rz"]), min_size=1, unique=True))}
    if key == "hold":
        return draw(st.one_of(HOLDS, VALUES))
    if key == "pattern":
        return draw(st.one_of(st.booleans(), st.booleans(), VALUES))
    if key == "height" and not draw(st.integers(0, 3)):
        return draw(st.sampled_from(["top", "centre", "bottom", "middle", "+15 mm", "-15.000001 mm", "-5 m", "1e-300 mm"]))
    if key == "restrain":
        return draw(st.lists(st.sampled_from(["ux", "uy", "uz", "rx", "ry", "rz", "up"]), max_size=4, unique=True))
    if key in ("deflection_limit", "deflection_limit_overhang", "buckling_safety_factor") and draw(st.booleans()):
        return draw(st.one_of(st.floats(allow_nan=True, allow_infinity=True), st.integers(-10**400, 10**400)))
    if key in TYPED and draw(st.integers(0, 4)):
        numbers, units = TYPED[key]
        return f"{draw(numbers)} {draw(st.sampled_from(units))}"
    return draw(VALUES)


@st.composite
def member_texts(draw) -> str:
    """A valid member file with a few random changes, written as TOML and sometimes damaged as text."""
    data = base_member()
    for _ in range(draw(st.integers(1, 3))):
        where = draw(st.sampled_from(["member", "supports", "supports", "loads", "loads", "loads", "checks", "combinations", "hinges",
                                      "restraints", "restraints", "supports_more"]))
        if where == "member":
            key = draw(MEMBER_KEYS)
            data["member"][key] = draw(value_for(key))
        elif where in ("supports", "loads"):
            entries = data[where]
            index = draw(st.integers(0, len(entries)))
            if index == len(entries):
                kind = draw(st.sampled_from(list(LOAD_KEYS)))
                entries.append({"type": kind, "at": "1 m", "mz" if kind == "moment" else "fy": "1 kN"} if where == "loads" and kind != "line"
                               else {"type": "line", "wy": "1 kN/m"} if where == "loads" else {"type": "roller", "at": draw(value_for("at"))})
            entry = entries[index]
            key = draw(SUPPORT_KEYS if where == "supports" else st.sampled_from(LOAD_KEYS.get(str(entry.get("type")), LOAD_KEYS["point"]) + ["type"]))
            entries[index][key] = draw(value_for(key))
            if key in ("restrain", "springs"):
                entries[index].pop("type", None)
        elif where == "checks":
            key = draw(CHECK_KEYS)
            data.setdefault("checks", {})[key] = draw(value_for(key))
        elif where == "combinations":
            factor = draw(st.one_of(st.floats(-1e7, 1e7), st.floats(allow_nan=True, allow_infinity=True), st.integers(-10**400, 10**400)))
            data["combinations"] = {draw(NAMES): {draw(st.sampled_from(["load", "dead", "wind"])): factor, "dead": 1.0}}
        elif where == "restraints":
            restraint = draw(st.sampled_from([{"at": "2 m", "hold": ["lateral", "twist"]}, {"from": "0 m", "to": "4 m", "hold": ["lateral"]}]))
            for key in draw(st.lists(RESTRAINT_KEYS, min_size=1, max_size=3)):
                restraint[key] = draw(value_for(key))
            data.setdefault("restraints", []).append(restraint)
        elif where == "supports_more":  # more spans, for pattern loading
            count = draw(st.integers(1, 14))
            data["supports"] += [{"at": f"{4 * k / (count + 1)!r} m", "type": "roller"} for k in range(1, count + 1)]
        else:
            data.setdefault("hinges", []).append({"at": draw(value_for("at"))})
    if draw(st.integers(0, 3)):
        data["member"]["section"] = "F 30x8"
    text = tomlkit.dumps(data)
    damage = draw(st.sampled_from(["none"] * 8 + ["cut", "insert", "bom"]))
    if damage == "cut":
        text = text[: draw(st.integers(0, len(text)))]
    elif damage == "insert":
        at = draw(st.integers(0, len(text)))
        text = text[:at] + draw(st.text(max_size=8)) + text[at:]
    elif damage == "bom":
        text = "\ufeff" + text
    return text + "\n" + STEEL_TOML


DIMENSIONS = st.one_of(st.floats(0.1, 500.0).map(lambda v: f"{v!r} mm"), st.floats(1e-4, 1.0).map(lambda v: f"{v!r} m"),
                       st.sampled_from(["0.001 mm", "1e-7 m", "1e300 m", "0 mm", "-5 mm", "1 km", "30 mm / 0", "30", "nan mm"]))


@st.composite
def catalogue_texts(draw) -> str:
    """A catalogue file of one to three sections: each shape's keys, mostly with plain lengths
    (thin, thick, huge, tiny), sometimes a key missing, added or of another kind."""
    entries = []
    for index in range(draw(st.integers(1, 3))):
        shape = draw(st.sampled_from(list(SHAPES) + ["hexagon"]))
        odd_name = not draw(st.integers(0, 12))
        entry: dict[str, Any] = {"name": draw(st.sampled_from([f"S{index} é", "F 30x8", ""])) if odd_name else f"S{index}", "shape": shape}
        if shape == "polygon":
            entry["points"] = draw(st.one_of(st.lists(st.lists(DIMENSIONS, min_size=2, max_size=2), min_size=2, max_size=5),
                                             st.just([["0 mm", "0 mm"], ["100 mm", "0 mm"], ["100 mm", "100 mm"], ["0 mm", "100 mm"]])))
            if draw(st.booleans()):  # holes anywhere: inside, touching, crossing or outside the outline
                corner = st.sampled_from(["0 mm", "0.05 mm", "10 mm", "50 mm", "99.99 mm", "100 mm", "120 mm"])
                entry["holes"] = draw(st.lists(st.lists(st.lists(corner, min_size=2, max_size=2), min_size=3, max_size=4), max_size=2))
        elif shape in SHAPES:
            for key in SHAPES[shape].all:
                if draw(st.integers(0, 15)):
                    entry[key] = draw(VALUES) if not draw(st.integers(0, 8)) else draw(DIMENSIONS)
        if not draw(st.integers(0, 10)):
            entry[draw(st.sampled_from(["colour", "family", "material"]))] = draw(VALUES)
        entries.append(entry)
    document: dict[str, Any] = {"sections": entries}
    if draw(st.booleans()):  # a material of its own, sometimes damaged; or none at all
        material = tomlkit.parse(STEEL_TOML)["materials"]["steel"]
        if draw(st.booleans()):
            material[draw(st.sampled_from(["density", "elastic_modulus", "poisson_ratio"]))] = draw(VALUES)
        document["materials"] = {"fuzz-steel": material}
    return tomlkit.dumps(document)


def run_briefly(args: list[str]) -> Any:
    """Invoke the CLI; a run longer than HANG_SECONDS is stopped and reported as a hang."""
    def stop(signum: int, frame: Any) -> None:
        raise TimeoutError(f"sizer {' '.join(args)} ran past {HANG_SECONDS} s")

    previous = signal.signal(signal.SIGALRM, stop)
    signal.setitimer(signal.ITIMER_REAL, HANG_SECONDS)
    try:
        return CliRunner().invoke(app, args)
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, previous)


def assert_well_behaved(result: Any) -> None:
    """Exit 0, 1 or 2; no traceback or escaped exception; bad input as one line; no NaN or
    infinity among the terminal output's words."""
    assert result.exception is None or isinstance(result.exception, SystemExit), repr(result.exception)
    assert result.exit_code in (0, 1, 2), result.exit_code
    assert "Traceback" not in result.stdout + result.stderr
    if result.exit_code == 2:
        lines = result.stderr.strip().splitlines()
        assert len(lines) == 1 and lines[0].startswith("sizer: "), result.stderr
    found = NOT_FINITE.search(result.stdout)
    assert found is None, result.stdout[max(0, found.start() - 200): found.end() + 50]


@pytest.fixture(scope="module")
def catalogue_folder(tmp_path_factory: pytest.TempPathFactory) -> Path:
    folder = tmp_path_factory.mktemp("fuzz-catalogue")
    (folder / "stock.toml").write_text(STEEL_TOML.replace("materials.steel", "materials.catalogue-steel") + FLAT, encoding="utf-8")
    return folder


@FUZZ
@given(text=member_texts(), command=st.sampled_from([["forces"], ["forces", "--json"], ["check"], ["check", "--json"], ["forces", "--at", "1 m"]]))
def test_member_files(catalogue_folder: Path, text: str, command: list[str]) -> None:
    with tempfile.TemporaryDirectory() as work:
        path = Path(work) / "member.toml"
        path.write_text(text, encoding="utf-8")
        before = sorted(Path(work).iterdir())
        result = run_briefly([command[0], str(path), "--catalogue", str(catalogue_folder), *command[1:]])
        assert_well_behaved(result)
        assert sorted(Path(work).iterdir()) == before  # nothing written beside the member file


@FUZZ
@given(text=catalogue_texts())
def test_catalogue_files(catalogue_folder: Path, text: str) -> None:
    with tempfile.TemporaryDirectory() as work:
        folder = Path(work)
        (folder / "stock.toml").write_text((catalogue_folder / "stock.toml").read_text(encoding="utf-8"), encoding="utf-8")
        (folder / "fuzzed.toml").write_text(text, encoding="utf-8")
        member = folder.parent / f"{folder.name}-member.toml"
        member.write_text(tomlkit.dumps({**base_member(), "member": {"length": "4 m", "material": "catalogue-steel",
                                                                      "section": "F 30x8", "self_weight": False}}), encoding="utf-8")
        try:
            assert_well_behaved(run_briefly(["check", str(member), "--catalogue", str(folder)]))
        finally:
            member.unlink()


MARKS = st.one_of(st.sampled_from(["B1", "B2", "B1", "", " ", "é", "B\x1b[2K", "a,b", "=1+1"]), st.text(max_size=6))
ROW_KEYS = ["mark", "file", "do", "quantity", "length", "section", "material"]


@st.composite
def schedule_texts(draw) -> tuple[str, str]:
    """(name, text) of a schedule as TOML or CSV: rows with random marks, files, what to do,
    quantities and overrides, sometimes with a byte-order mark or cut short."""
    rows = []
    for _ in range(draw(st.integers(0, 3))):
        row: dict[str, Any] = {"mark": draw(MARKS), "file": draw(st.sampled_from(["member.toml", "member.toml", "none.toml", "", "."]))}
        for key in draw(st.lists(st.sampled_from(ROW_KEYS[2:]), max_size=3, unique=True)):
            row[key] = draw({"do": st.sampled_from(["size", "check", "design", ""]),
                             "quantity": st.one_of(st.integers(-5, 10**7), st.sampled_from([10**30, 0])),
                             "length": st.sampled_from(["3 m", "0 m", "-1 m", "1e300 m", "3", "nan m"]),
                             "section": st.sampled_from(["F 30x8", "none", ""]),
                             "material": st.sampled_from(["steel", "catalogue-steel", "unobtainium"])}[key] | VALUES)
        rows.append(row)
    if draw(st.booleans()):
        text = tomlkit.dumps({"members": rows})
        name = "schedule.toml"
    else:
        header = draw(st.sampled_from([ROW_KEYS, ["mark", "file"], ["mark", "file", "quantity", "colour"]]))
        lines = [",".join(header)] + [",".join(str(row.get(key, "")).replace("\n", " ") for key in header) for row in rows]
        text = "\n".join(lines) + "\n"
        name = "schedule.csv"
    damage = draw(st.sampled_from(["none"] * 6 + ["cut", "bom"]))
    if damage == "cut":
        text = text[: draw(st.integers(0, len(text)))]
    elif damage == "bom":
        text = "\ufeff" + text
    return name, text


@FUZZ
@given(schedule=schedule_texts(), options=st.sampled_from([[], ["--json"], ["--keep-going"], ["--csv", "out.csv"]]))
def test_schedules(catalogue_folder: Path, schedule: tuple[str, str], options: list[str]) -> None:
    name, text = schedule
    with tempfile.TemporaryDirectory() as work:
        folder = Path(work)
        (folder / "member.toml").write_text(tomlkit.dumps({**base_member(), "member": {"length": "4 m", "material": "catalogue-steel",
                                                                                      "self_weight": False}}), encoding="utf-8")
        (folder / name).write_text(text, encoding="utf-8")
        before = sorted(folder.iterdir())
        result = run_briefly(["schedule", str(folder / name), "--jobs", "1", "--catalogue", str(catalogue_folder),
                              *[str(folder / option) if option.endswith(".csv") else option for option in options]])
        if "--keep-going" in options and result.exit_code == 2 and result.stdout:  # the good rows' table, the bad rows listed in it
            assert result.exception is None or isinstance(result.exception, SystemExit), repr(result.exception)
            assert "Traceback" not in result.stdout + result.stderr and NOT_FINITE.search(result.stdout) is None
        else:
            assert_well_behaved(result)
        if result.exit_code == 2 and not result.stdout:
            assert sorted(folder.iterdir()) == before  # bad input: nothing written
        assert "\x1b" not in result.stdout + result.stderr


@FUZZ
@given(rows=st.lists(st.lists(st.one_of(QUANTITIES, NUMBERS, st.text(max_size=6)), min_size=3, max_size=3), max_size=4),
       header=st.sampled_from(["name,depth,width", "name,depth [mm],width (mm)", "name,depth", "name,colour,width"]))
def test_stock_lists(rows: list[list[str]], header: str) -> None:
    with tempfile.TemporaryDirectory() as work:
        table = Path(work) / "stock.csv"
        table.write_text("\n".join([header] + [",".join(cell.replace(",", " ").replace("\n", " ") for cell in row) for row in rows]) + "\n",
                         encoding="utf-8")
        result = run_briefly(["sections", "import", str(table), "--shape", "rectangle"])
        assert result.exception is None or isinstance(result.exception, SystemExit), repr(result.exception)
        assert result.exit_code in (0, 1, 2) and "Traceback" not in result.stdout + result.stderr
