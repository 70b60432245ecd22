"""The contributor guide's recipes name real code, and the repository stands on its own.

No check values here: these are program invariants of the repository (common practice: a guide that
names a module which no longer exists sends the next contributor astray).
"""

from __future__ import annotations

import importlib
import re
from pathlib import Path
from types import ModuleType

import pytest

ROOT = Path(__file__).resolve().parents[1]
GUIDE = (ROOT / "DEVELOPERS.md").read_text(encoding="utf-8")
NAMES = sorted(set(re.findall(r"`([A-Za-z_][\w./]*)`", GUIDE)))
NON_CODE = {"sys.exit", "axes.unicode_minus"}  # names of other libraries the guide mentions


def _is_path(name: str) -> bool:
    return name.endswith(".py") or name.endswith(".md") or name.endswith("/")


def _resolves_as_path(name: str) -> bool:
    """A path relative to the repository, to sizer/, or (a bare file name) anywhere under sizer/."""
    if (ROOT / name).exists() or (ROOT / "sizer" / name).exists():
        return True
    if "/" not in name.rstrip("/"):
        return any((ROOT / "sizer").rglob(name.rstrip("/")))
    return False


@pytest.mark.parametrize("name", [n for n in NAMES if _is_path(n) and not n.startswith(("runs", "catalogues", "/"))])
def test_every_file_the_guide_names_exists(name: str) -> None:
    assert _resolves_as_path(name), f"DEVELOPERS.md names {name!r}, which is not in the repository"


def _dotted(name: str) -> bool:
    return "." in name and not _is_path(name) and name not in NON_CODE and "/" not in name and "..." not in name


def _module_names(first: str) -> list[str]:
    """Modules under sizer/ named `first` (a file or a package), or defining a class `first`."""
    found = []
    for path in sorted((ROOT / "sizer").rglob("*.py")):
        parts = path.relative_to(ROOT).with_suffix("").parts
        if parts[-1] == "__init__":
            parts = parts[:-1]
        if parts[-1] == first or re.search(rf"^class {first}\b", path.read_text(encoding="utf-8"), re.M):
            found.append(".".join(parts))
    return found


def _attribute(obj: object, attr: str) -> object:
    """getattr, a submodule, or a dataclass field of that name."""
    if isinstance(obj, ModuleType) and not hasattr(obj, attr):
        try:
            return importlib.import_module(f"{obj.__name__}.{attr}")
        except ImportError:
            pass
    if hasattr(obj, attr):
        return getattr(obj, attr)
    fields = getattr(obj, "__dataclass_fields__", {})
    assert attr in fields, f"{obj!r} has no {attr!r}"
    return fields[attr]


def _resolve(name: str) -> object:
    """The object a dotted name of the guide means: sizer.<name>, or a module (or class) of that
    name anywhere under sizer/ followed by its attributes."""
    parts = name.split(".")
    if parts[0] == "sizer":
        parts = parts[1:]
    for module in [f"sizer.{parts[0]}", *_module_names(parts[0])]:
        try:
            obj: object = importlib.import_module(module)
        except ImportError:
            continue
        rest = parts[1:] if module.split(".")[-1] == parts[0] else parts
        for attr in rest:
            obj = _attribute(obj, attr)
        return obj
    raise AssertionError(f"DEVELOPERS.md names {name!r}, which is not in sizer/")


@pytest.mark.parametrize("name", [n for n in NAMES if _dotted(n)])
def test_every_code_name_the_guide_gives_exists(name: str) -> None:
    _resolve(name)


RECIPE_TITLES = {"a load type", "a shape", "a check", "an output format"}


def _recipes() -> dict[str, list[str]]:
    """Each recipe of the guide ("### How to add X") as its numbered steps (a step with its
    continuation lines)."""
    section = GUIDE[GUIDE.index("\n## Recipes"):]
    section = section[:section.find("\n## ", 1)] if "\n## " in section[1:] else section
    recipes = {}
    for part in re.split(r"^### How to add ", section, flags=re.M)[1:]:
        title, _, body = part.partition("\n")
        recipes[title.strip()] = re.split(r"^\d+\. ", body, flags=re.M)[1:]
    return recipes


def _top_level_names(path: Path) -> set[str]:
    """What a module defines at its top level: functions, classes and assigned names."""
    import ast

    names = set()
    for node in ast.parse(path.read_text(encoding="utf-8")).body:
        if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef, ast.ClassDef)):
            names.add(node.name)
        elif isinstance(node, (ast.Assign, ast.AnnAssign)):
            targets = node.targets if isinstance(node, ast.Assign) else [node.target]
            names.update(target.id for target in targets if isinstance(target, ast.Name))
    return names


def _step_names() -> list[tuple[str, str, list[Path]]]:
    """(recipe, bare name, the sizer modules its step names) for every name without a dot or a slash
    that a recipe step gives in backticks: a function, class or table of one of those modules."""
    found = []
    for title, steps in _recipes().items():
        for step in steps:
            names = re.findall(r"`([A-Za-z_][\w./]*)`", step)
            modules = [ROOT / "sizer" / name for name in names if name.endswith(".py") and (ROOT / "sizer" / name).is_file()]
            found += [(title, name, modules) for name in names if "." not in name and "/" not in name]
    return found


def test_the_guide_has_the_four_recipes_each_naming_its_modules() -> None:
    recipes = _recipes()
    assert set(recipes) == RECIPE_TITLES
    for title, steps in recipes.items():
        named = [name for step in steps for name in re.findall(r"`([\w/]+\.py)`", step) if not name.startswith("tests/")]
        assert len(named) >= 2, f"the recipe for {title} names fewer than two modules"


@pytest.mark.parametrize("title, name, modules", _step_names(), ids=lambda value: value if isinstance(value, str) else "")
def test_every_name_a_recipe_step_gives_is_in_a_module_of_that_step(title: str, name: str, modules: list[Path]) -> None:
    """A recipe's function or table exists where its step says: renamed or moved, the recipe is stale."""
    assert modules, f"the step of '{title}' naming {name!r} names no module of sizer/"
    assert any(name in _top_level_names(path) for path in modules), (
        f"DEVELOPERS.md, how to add {title}: {name!r} is not in {', '.join(str(p.relative_to(ROOT)) for p in modules)}")


def test_nothing_in_the_repository_points_outside_it() -> None:
    """The contract and the sources live in docs/design.md and docs/references.md."""
    for folder in ("sizer", "tests", "benchmarks", "docs", "examples", "section_library"):
        for path in (ROOT / folder).rglob("*"):
            if path.suffix not in {".py", ".md", ".toml", ".csv"} or path.name == Path(__file__).name:
                continue
            lines = path.read_text(encoding="utf-8", errors="replace").splitlines()
            text = "\n".join(line for line in lines if " not in " not in line)  # tests asserting the absence
            for pattern in ("../shared", "SPEC.md", "SPEC section", "REFERENCES.md"):
                assert pattern not in text, f"{path.relative_to(ROOT)} points outside the repository ({pattern})"
    for path in (ROOT / "README.md", ROOT / "DEVELOPERS.md"):
        assert "../shared" not in path.read_text(encoding="utf-8")
    assert (ROOT / "docs" / "design.md").exists() and (ROOT / "docs" / "references.md").exists()
