"""sizer: internal forces, stresses, allowable-stress checks and sizing of one straight member.

The Python API (sizer.api) is reached from here and imported on first use, so that the command line
starts at once; forces, check and size here return results that also show themselves in a terminal
and a notebook (sizer.commands.notebook):

    import sizer
    member = sizer.read_member("examples/platform_joist.toml")
    result = sizer.check(member, section="IPE 220")
    result.passes, result.utilization, result.governing
"""

from __future__ import annotations

from typing import Any

__version__ = "0.1.0"

API_NAMES = (
    "CandidateSummary", "CheckOutcome", "ForcesOutcome", "SizeOutcome",
    "as_member", "check", "forces", "member_from_text", "read_member", "size",
)
SHOWN_NAMES = ("check", "forces", "size")  # their results show themselves
__all__ = ["__version__", *API_NAMES]


def __getattr__(name: str) -> Any:
    """The API names, imported from sizer.api when first asked for (the functions of SHOWN_NAMES
    through sizer.commands.notebook) and kept."""
    if name in SHOWN_NAMES:
        from sizer.commands import notebook

        globals()[name] = found = notebook(name)
        return found
    if name in API_NAMES:
        from sizer import api

        return getattr(api, name)
    raise AttributeError(f"module 'sizer' has no attribute {name!r}")


def __dir__() -> list[str]:
    """The public names: the version and the API, whether or not sizer.api is imported yet."""
    return sorted(__all__)
