"""Packaging: every package folder of sizer ships (pyproject.toml lists packages one by one, so a
new folder left off the list would be missing from a normal, non-editable install)."""

from __future__ import annotations

import tomllib
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]


def test_every_package_folder_is_listed_in_pyproject() -> None:
    listed = set(tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))["tool"]["setuptools"]["packages"])
    folders = {".".join(path.parent.relative_to(ROOT).parts) for path in (ROOT / "sizer").rglob("__init__.py")}
    assert folders <= listed, f"not in pyproject.toml [tool.setuptools] packages: {sorted(folders - listed)}"
    assert "sizer.section_library" in listed  # the shipped catalogue (package data)
