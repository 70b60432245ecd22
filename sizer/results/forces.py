"""The `sizer forces` document (SI base units): reactions, actions and displacements at cuts,
extremes and deflections of each combination, and the envelope over them (pattern arrangements
included); the cuts shown by default. render.forces shows the same in display units."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from sizer.analysis import MemberSolution, action_envelope, extremes, largest_deflection, reaction_envelope
from sizer.model import ACTIONS, LineLoad, Member, PointLoad
from sizer.results.jsonable import reactions_without_round_off, without_round_off
from sizer.results.notes import CAUTIONS

REACTION_NAMES = ("Fx", "Fy", "Fz", "Mx", "My", "Mz")
DISPLACEMENT_NAMES = ("ux", "uy", "uz", "rx")  # reported at cuts: the translations and the twist
DISPLACEMENT_KINDS = ("deflection", "deflection", "deflection", "rotation")
TINY_FORCE = 1e-9  # N; smaller values are shown as zero (round-off)


def is_planar(member: Member) -> bool:
    """True when every load acts in the x-y plane (so V and M in the beam convention apply)."""
    if member.self_weight_case and member.gravity[0] == 2:
        return False
    for load in member.loads:
        if isinstance(load, PointLoad) and (load.force[2] or load.moment[0] or load.moment[1]):
            return False
        if isinstance(load, LineLoad) and (load.q_start[2] or load.q_end[2] or load.q_start[3] or load.q_end[3]):
            return False
    return True


def concentrated_positions(member: Member) -> np.ndarray:
    """Positions (m) where a point load, moment or support makes the actions jump."""
    xs = [load.at for load in member.loads if isinstance(load, PointLoad)] + [support.at for support in member.supports]
    return np.unique(np.asarray(xs, dtype=float))


def default_cuts(member: Member) -> np.ndarray:
    """Cuts shown when the user names none: ends, supports, hinges, point loads, line-load ends."""
    xs = [0.0, member.length] + [s.at for s in member.supports] + [h.at for h in member.hinges]
    for load in member.loads:
        xs += [load.at] if isinstance(load, PointLoad) else [load.start, load.end]
    return np.unique(np.round(np.asarray(xs, dtype=float), 12))


@dataclass(frozen=True)
class Cut:
    """Actions at one cut; `left`/`right` differ only on a concentrated load or support."""

    at: float
    left: np.ndarray  # (6,) N, Vy, Vz, T, My, Mz just left of the cut
    right: np.ndarray  # (6,) just right
    jump: bool


def cuts_for(solution: MemberSolution, combination: str, xs: np.ndarray) -> list[Cut]:
    """Actions at each x, both sides."""
    jumps = concentrated_positions(solution.member)
    left = solution.actions(combination, xs, side="left")
    right = solution.actions(combination, xs, side="right")
    scale = max(solution.member.length, 1.0) * 1e-12
    return [Cut(float(x), left[i], right[i], bool(np.any(np.abs(jumps - x) <= scale))) for i, x in enumerate(xs)]


def action_dict(values: np.ndarray) -> dict[str, float]:
    out = {name: float(value) for name, value in zip(ACTIONS, values)}
    out["V"] = -out["Vy"]
    out["M"] = out["Mz"]
    return out


def deflection_summary(solution: MemberSolution, combination: str, n: int = 801) -> dict[str, float] | None:
    """Largest transverse deflection sqrt(uy^2 + uz^2) (m) and where; None without a section."""
    if not solution.has_displacements:
        return None
    xs = np.linspace(0.0, solution.member.length, n)
    for support in solution.member.supports:
        xs = np.append(xs, support.at)
    xs = np.unique(xs)
    moved = solution.displacements(combination, xs)
    transverse = np.hypot(moved[:, 1], moved[:, 2])
    index = int(np.argmax(transverse))
    return {"max": float(transverse[index]), "at": float(xs[index]), "uy": float(moved[index, 1]), "uz": float(moved[index, 2])}


def forces_document(solution: MemberSolution, combination: str, xs: np.ndarray) -> dict[str, Any]:
    """docs/design.md section 6 `forces` object for one combination (SI base units)."""
    reactions = reactions_without_round_off(solution.reactions(combination), solution.member.length)
    document: dict[str, Any] = {
        "combination": combination,
        "reactions": [
            {"at": support.at, "type": support.label, **{name: float(v) for name, v in zip(REACTION_NAMES, reactions[i])}}
            for i, support in enumerate(solution.member.supports)
        ],
        "cuts": [],
        "deflection": deflection_summary(solution, combination),
    }
    end = solution.member.length * (1 - 1e-12)
    for cut in cuts_for(solution, combination, xs):
        on_member = cut.left if cut.at >= end else cut.right  # at end B the x+ side is off the member
        entry: dict[str, Any] = {"at": cut.at, **action_dict(on_member)}
        if cut.jump:
            entry["left"] = action_dict(cut.left)
            entry["right"] = action_dict(cut.right)
        document["cuts"].append(entry)
    if solution.has_displacements and len(xs):
        for entry, moved in zip(document["cuts"], cut_displacements(solution, combination, xs)):
            entry["displacements"] = {**dict(zip(DISPLACEMENT_NAMES, moved)),
                                      "directions": {name: displacement_words(solution.member, name, value)
                                                     for name, value in zip(DISPLACEMENT_NAMES, moved) if value != 0}}
    return document


def cut_displacements(solution: MemberSolution, combination: str, xs: np.ndarray) -> list[list[float]]:
    """ux, uy, uz (m) and the twist rx (rad) of a combination at each cut (on the member at end B),
    round-off set to zero; needs a section."""
    length = solution.member.length
    sides = np.where(xs >= length * (1 - 1e-12), "left", "right")
    moved = solution.displacements(combination, xs, sides)
    translation, rotation = np.abs(moved[:, :3]).max(initial=0.0), np.abs(moved[:, 3:]).max(initial=0.0)
    shifts = without_round_off(moved[:, :3], max(translation, rotation * length))
    twist = without_round_off(moved[:, 3:4], max(rotation, translation / length))
    return np.column_stack([shifts, twist]).tolist()


def displacement_words(member: Member, freedom: str, value: float) -> str:
    """Which way a displacement at a cut goes, in words: up or down where gravity is along its axis;
    ux towards end A or B; the twist rx clockwise or counter-clockwise seen from end B (looking
    towards A; positive about +x by the right-hand rule); else along +y, -z and so on."""
    if freedom == "rx":
        return ("counter-clockwise" if value > 0 else "clockwise") + " seen from end B"
    if freedom == "ux" and member.gravity[0] != 0:
        return "towards end B (along +x)" if value > 0 else "towards end A (along -x)"
    return direction_words(member, freedom, value)


def extremes_json(solution: MemberSolution, combination: str, planar: bool) -> list[dict[str, Any]]:
    """The largest and smallest value of each action along the member and where (N, N*m, m)."""
    found = extremes(solution, combination)
    return [{"action": name, "max": found[name].max_value, "max_at": found[name].max_at,
             "min": found[name].min_value, "min_at": found[name].min_at} for name in shown_actions(planar)]


def forces_json(solution: MemberSolution, combinations: list[str], xs: np.ndarray, notes: list[str], envelope: bool = False) -> dict[str, Any]:
    """The whole --json document (docs/design.md section 6): {"combinations": [one object per combination,
    always a list], ["envelope": over those combinations,] "units", "assumptions", "cautions"}."""
    planar = is_planar(solution.member)
    documents = []
    for name in combinations:
        document = forces_document(solution, name, xs)
        document["extremes"] = extremes_json(solution, name, planar)
        documents.append(document)
    out: dict[str, Any] = {"combinations": documents}
    if envelope:
        out["envelope"] = envelope_json(solution, combinations, planar)
    return {**out, "units": "SI base units (m, N, N*m, Pa, kg/m)", "assumptions": notes, "cautions": list(CAUTIONS)}


def envelope_json(solution: MemberSolution, combinations: list[str], planar: bool) -> dict[str, Any]:
    """The envelope over `combinations`: for each action the largest and smallest along the member
    with where and which combination; each support's reactions likewise; the largest deflection."""
    found = action_envelope(solution, combinations)
    actions = {name: {"max": found[name].largest.value, "max_at": found[name].largest.at, "max_combination": found[name].largest.combination,
                      "min": found[name].smallest.value, "min_at": found[name].smallest.at, "min_combination": found[name].smallest.combination}
               for name in (ACTIONS + ("V", "M") if planar else ACTIONS)}
    member = solution.member
    reactions = []
    for entry in reaction_envelope(solution, combinations):
        support = member.supports[entry.support]
        item: dict[str, Any] = {"at": support.at, "type": support.label}
        for k, name in enumerate(REACTION_NAMES):
            (high, high_name), (low, low_name) = entry.largest[k], entry.smallest[k]
            item[name] = {"max": clean_force(high), "max_combination": high_name, "min": clean_force(low), "min_combination": low_name}
        reactions.append(item)
    deflection = largest_deflection(solution, combinations)
    return {"combinations": len(combinations), "actions": actions, "reactions": reactions,
            "deflection": None if deflection is None else {"max": deflection.value, "at": deflection.at, "combination": deflection.combination,
                                                           "uy": deflection.uy, "uz": deflection.uz}}


def clean_force(value: float) -> float:
    return 0.0 if abs(value) < TINY_FORCE else value


def shown_actions(planar: bool) -> tuple[str, ...]:
    return ("N", "V", "M") if planar else ACTIONS


def direction_words(member: Member, freedom: str, value: float, short: bool = False) -> str:
    """Which way a displacement uy or uz goes: "down (along -y)" where that axis is the direction of
    gravity (member.gravity), else "along -y"; `short`: "down" alone where it applies."""
    axis = freedom[-1]
    sense = "+" if value > 0 else "-"
    gravity_axis, gravity_sign = member.gravity
    if gravity_axis == "xyz".index(axis):
        word = "down" if value * gravity_sign > 0 else "up"
        return word if short else f"{word} (along {sense}{axis})"
    return f"along {sense}{axis}"
