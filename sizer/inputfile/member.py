"""Member files (TOML, docs/design.md section 3) to `model.Member`: the [member] table, supports, hinges,
restraints, self-weight and combinations; loads, checks and materials come from their own modules.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any

from sizer import units
from sizer.files import read_text
from sizer.inputfile.checks_table import read_checks
from sizer.inputfile.loads import read_loads
from sizer.inputfile.materials import parse_material
from sizer.inputfile.reader import Reader, array_of_tables, parse_toml, read_bearing, read_height, refuse_control_characters
from sizer.model import DEFAULT_COMBINATION, FREEDOMS, RESTRAINT_HOLDS, SUPPORT_TYPES, WARPING_CHOICES, Hinge, Load, Member, Restraint, Support

GRAVITY_DIRECTIONS = {"-x": (0, -1), "+x": (0, 1), "-y": (1, -1), "+y": (1, 1), "-z": (2, -1), "+z": (2, 1)}


TOP_KEYS = {"title", "member", "supports", "hinges", "restraints", "loads", "combinations", "checks", "materials"}


MEMBER_KEYS = {"length", "material", "section", "orientation", "self_weight", "gravity"}


SUPPORT_KEYS = {"at", "type", "restrain", "springs", "warping", "bearing", "stiffened"}


RESTRAINT_KEYS = {"at", "from", "to", "hold", "height"}


SHORTEST_ZONE = 0.1  # m: see shortest_zone


def read_member_file(path: str | Path) -> Member:
    """Read a member file into a Member. Raises InputError (one line: file, key, line, fix)."""
    path = Path(path)
    return parse_member_text(read_text(path, "the file"), path)


def parse_member_text(text: str, path: Path) -> Member:
    """Parse member-file text (docs/design.md section 3) read from `path`."""
    text = text.removeprefix("\ufeff")
    return _read_member(parse_toml(text, path), Reader(path, text))


def member_from_tables(data: dict, path: Path) -> Member:
    """A Member from member-file tables made in code (the values as tomllib reads them from a file),
    through every check a file's values meet; errors name `path` and the key, without a line."""
    refuse_control_characters(data, path, "")
    return _read_member(data, Reader(path, ""))


def _read_member(data: dict, reader: Reader) -> Member:
    """The Member of a member file's parsed tables; `reader` names the file and finds the lines."""
    reader.known_keys(data, TOP_KEYS, "")
    if "member" not in data:
        raise reader.error("member", "the [member] table is missing", 'add [member] with length = "6 m"')
    member_table = reader.table(data["member"], "member")
    reader.known_keys(member_table, MEMBER_KEYS, "member")
    length = reader.required_quantity(member_table, "length", "length", "member", 'give e.g. length = "6 m"')
    if length <= 0:
        raise reader.error("member.length", "the length must be greater than zero", 'give e.g. length = "6 m"')
    supports = tuple(_read_supports(reader, data.get("supports", []), length))
    hinges = tuple(_read_hinges(reader, data.get("hinges", []), length))
    restraints = tuple(_read_restraints(reader, data.get("restraints", []), length))
    loads = tuple(read_loads(reader, data.get("loads", []), length))
    self_weight_case = _read_self_weight(reader, member_table)
    combinations, given = _read_combinations(reader, data.get("combinations"), loads, self_weight_case)
    materials = {
        name: parse_material(name, reader.table(table, f"materials.{name}"), reader, f"materials.{name}")
        for name, table in reader.table(data.get("materials", {}), "materials").items()
    }
    return Member(
        length=length,
        material=_optional_string(reader, member_table, "material", "member") or "",
        supports=supports,
        loads=loads,
        combinations=combinations,
        section=_optional_string(reader, member_table, "section", "member"),
        orientation=_read_choice(reader, member_table, "orientation", ("major", "minor"), "major"),
        self_weight_case=self_weight_case,
        gravity=GRAVITY_DIRECTIONS[_read_choice(reader, member_table, "gravity", tuple(GRAVITY_DIRECTIONS), "-y")],
        hinges=hinges,
        restraints=restraints,
        checks=read_checks(reader, data.get("checks", {}), length, combinations),
        materials=materials,
        title=_optional_string(reader, data, "title", "") or "",
        source=reader.file,
        combinations_given=given,
    )


def _optional_string(reader: Reader, table: dict, name: str, key_prefix: str) -> str | None:
    if name not in table:
        return None
    value = table[name]
    key = f"{key_prefix}.{name}" if key_prefix else name
    if not isinstance(value, str) or not value.strip():
        raise reader.error(key, f"expected a non-empty string, got {value!r}", f'write {name} = "..."')
    return value.strip()


def _read_choice(reader: Reader, table: dict, name: str, choices: tuple[str, ...], default: str) -> str:
    value = table.get(name, default)
    if value not in choices:
        raise reader.error(f"member.{name}", f"{value!r} is not allowed", "use one of: " + ", ".join(f'"{c}"' for c in choices))
    return value


def _read_supports(reader: Reader, value: Any, length: float) -> list[Support]:
    supports: list[Support] = []
    for index, table in enumerate(array_of_tables(reader, value, "supports"), start=1):
        prefix = f"supports[{index}]"
        reader.known_keys(table, SUPPORT_KEYS, prefix)
        at = reader.position(table, "at", prefix, length)
        restrain, label = _support_freedoms(reader, table, prefix)
        springs = _read_springs(reader, table.get("springs", {}), f"{prefix}.springs")
        restrain = restrain - set(springs)
        if not restrain and not springs:
            raise reader.error(prefix, "this support holds nothing", 'give type = "pin" or a restrain list or springs')
        for other in supports:
            if abs(other.at - at) <= 1e-9 * length:
                raise reader.error(f"{prefix}.at", f"two supports at {units.fmt(at, 'length')}",
                                   "merge them into one support with the freedoms of both")
        warping = _read_warping(reader, table, prefix)
        bearing, stiffened = read_bearing(reader, table, prefix)
        supports.append(Support(at=at, restrain=frozenset(restrain), springs=springs, label=label if not springs or label == "springs" else f"{label} + springs",
                                warping=warping, bearing=bearing, stiffened=stiffened))
    return supports


def _support_freedoms(reader: Reader, table: dict, prefix: str) -> tuple[set[str], str]:
    if "type" in table and "restrain" in table:
        raise reader.error(f"{prefix}.restrain", "give either type or restrain, not both", "remove one of them")
    if "type" in table:
        kind = table["type"]
        if not isinstance(kind, str) or kind not in SUPPORT_TYPES:
            raise reader.error(f"{prefix}.type", f"unknown support type {kind!r}", 'use "fixed", "pin" or "roller", or a restrain list')
        return set(SUPPORT_TYPES[kind]), kind
    if "restrain" in table:
        freedoms = table["restrain"]
        if not isinstance(freedoms, list) or not all(isinstance(item, str) for item in freedoms):
            raise reader.error(f"{prefix}.restrain", "expected a list of freedoms", 'write e.g. restrain = ["uy", "rz"]')
        for item in freedoms:
            if item not in FREEDOMS:
                raise reader.error(f"{prefix}.restrain", f"unknown freedom {item!r}", "use: " + ", ".join(FREEDOMS))
        return set(freedoms), "restrain " + " ".join(freedoms)
    if "springs" in table:
        return set(), "springs"
    raise reader.error(f"{prefix}.type", "the support has no type", 'give type = "fixed", "pin" or "roller", or restrain = [...]')


def _read_springs(reader: Reader, value: Any, prefix: str) -> dict[str, float]:
    springs: dict[str, float] = {}
    for freedom, text in reader.table(value, prefix).items():
        if freedom not in FREEDOMS:
            raise reader.error(f"{prefix}.{freedom}", f"unknown freedom {freedom!r}", "use: " + ", ".join(FREEDOMS))
        kind = "translational_stiffness" if freedom.startswith("u") else "rotational_stiffness"
        stiffness = units.parse(text, kind, reader.file, f"{prefix}.{freedom}", reader.key_lines.find(f"{prefix}.{freedom}"))
        if stiffness <= 0:
            raise reader.error(f"{prefix}.{freedom}", "a spring stiffness must be greater than zero",
                               "give a positive stiffness, or hold the freedom rigidly with restrain")
        springs[freedom] = stiffness
    return springs


def _read_hinges(reader: Reader, value: Any, length: float) -> list[Hinge]:
    hinges = []
    for index, table in enumerate(array_of_tables(reader, value, "hinges"), start=1):
        prefix = f"hinges[{index}]"
        reader.known_keys(table, {"at"}, prefix)
        at = reader.position(table, "at", prefix, length)
        if at <= 0 or at >= length:
            raise reader.error(f"{prefix}.at", "a hinge must be inside the member, not at an end",
                               "move it inside, or use a pin support at the end")
        hinges.append(Hinge(at))
    return hinges


def _read_warping(reader: Reader, table: dict, prefix: str) -> str | None:
    """A support's `warping` ("free" or "held"), None when not given."""
    value = table.get("warping")
    if value is not None and value not in WARPING_CHOICES:
        raise reader.error(f"{prefix}.warping", f"{str(value)[:40]!r} is not a warping condition", 'use warping = "free" or "held"')
    return value


def _read_restraints(reader: Reader, value: Any, length: float) -> list[Restraint]:
    """[[restraints]]: at a point (`at`) or continuous (`from`, `to`), holding lateral and/or twist."""
    restraints = []
    for index, table in enumerate(array_of_tables(reader, value, "restraints"), start=1):
        prefix = f"restraints[{index}]"
        reader.known_keys(table, RESTRAINT_KEYS, prefix)
        if "at" in table and ("from" in table or "to" in table):
            raise reader.error(f"{prefix}.at", "give either at (a point restraint) or from and to (a continuous one), not both", "remove one")
        if "at" in table:
            start = end = reader.position(table, "at", prefix, length)
        elif "from" in table or "to" in table:
            start = reader.position(table, "from", prefix, length, default=0.0)
            end = reader.position(table, "to", prefix, length, default=length)
            if end <= start:
                raise reader.error(f"{prefix}.to", "'to' must be beyond 'from'", "give from < to along the member, or use at for a point")
            shortest = shortest_zone(length)
            if end - start < shortest * (1 - 1e-9):
                raise reader.error(f"{prefix}.to", f"a continuous restraint {(end - start) * 1e3:.4g} mm long is shorter than "
                                   f"{shortest * 1e3:.4g} mm, too short to hold the member's slope",
                                   "use at = for a point restraint, or give a zone at least that long (see docs/limits.md)")
        else:
            raise reader.error(prefix, "the restraint has no position", 'give at = "3 m", or from = "0 m" and to = "6 m" for a deck')
        holds = table.get("hold")
        if (not isinstance(holds, list) or not holds or not all(isinstance(item, str) for item in holds)
                or not set(holds) <= set(RESTRAINT_HOLDS)):
            raise reader.error(f"{prefix}.hold", f"expected a list of {' and/or '.join(RESTRAINT_HOLDS)}, got {holds!r}",
                               'write e.g. hold = ["lateral", "twist"]')
        if "height" in table and "lateral" not in holds:
            raise reader.error(f"{prefix}.height", "a height is where a lateral hold acts, and this restraint holds only twist",
                               'remove height, or add "lateral" to hold')
        height = read_height(reader, table, prefix, "centre")
        restraints.append(Restraint(start, end, "lateral" in holds, "twist" in holds, height))
    return restraints


def shortest_zone(length: float) -> float:
    """The shortest continuous restraint (m) on a member `length` (m) long: 100 mm, or length / 20 on a
    member shorter than 2 m. A zone holds the member's slope as well as its movement; a shorter
    attachment (a cleat, a bolt) holds a point and is given with at."""
    return min(SHORTEST_ZONE, length / 20)


def _read_self_weight(reader: Reader, member_table: dict) -> str | None:
    value = member_table.get("self_weight", "dead")
    if value is False:
        return None
    if value is True:
        return "dead"
    if not isinstance(value, str) or not value.strip():
        raise reader.error("member.self_weight", f"expected a case name or false, got {value!r}", 'write self_weight = "dead" or false')
    return value.strip()


def _read_combinations(reader: Reader, value: Any, loads: tuple[Load, ...], self_weight_case: str | None) -> tuple[dict[str, dict[str, float]], bool]:
    cases = list(dict.fromkeys(load.case for load in loads))
    if self_weight_case and self_weight_case not in cases:
        cases.append(self_weight_case)
    if value is None:
        return {DEFAULT_COMBINATION: {case: 1.0 for case in cases}}, False
    table = reader.table(value, "combinations")
    if not table:
        raise reader.error("combinations", "no combinations are given", "add one, or remove [combinations] to combine every case x 1.0")
    combinations: dict[str, dict[str, float]] = {}
    for name, factors in table.items():
        prefix = f"combinations.{name}"
        if not name.strip():
            raise reader.error(f'combinations."{name}"', "a combination has an empty name", 'give it a name, e.g. "dead + imposed" = { dead = 1.0, imposed = 1.0 }')
        factors = reader.table(factors, prefix)
        for case, factor in factors.items():
            if case not in cases:
                raise reader.error(f"{prefix}.{case}", f"no load case is named {case!r}",
                                   "use one of: " + ", ".join(cases) if cases else "add loads with that case")
            reader.number(factor, f"{prefix}.{case}", positive=False)
        combinations[name] = {case: float(factor) for case, factor in factors.items()}
    if self_weight_case and not any(self_weight_case in factors for factors in combinations.values()):
        raise reader.error("member.self_weight", f"the self-weight case {self_weight_case!r} is in no combination ({', '.join(combinations)}), so the weight would be left out",
                           f"add {self_weight_case} = 1.0 (or your factor) to the combinations, or set self_weight = false")
    return combinations, True
