"""What a check gives: one CheckResult per check (utilization = demand / allowable, 1.0 at the
limit; demand and allowable in Pa, m or N as `quantity` says) and the CheckReport of a section
with its governing check and verdict.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from sizer.checks.bracing import BraceDemand
    from sizer.checks.reserve import Reserve
    from sizer.checks.second_order import SecondOrderActions
    from sizer.checks.stability import StabilityReport
    from sizer.checks.torsion import TorsionSummary
    from sizer.design import Design

CHECK_NAMES = ("axial", "bending", "interaction", "shear", "equivalent", "deflection", "buckling", "lateral-torsional", "local", "web",
               "second-order")
CHUNK_VALUES = 4_000_000  # station x node values evaluated at once (memory bound, ~32 MB per array)
ZERO_ACTION = 1e-9  # N or N*m: below this an action is treated as absent (round-off)


TIED = 1e-9  # relative: utilizations this close are the same for naming the governing check


@dataclass(frozen=True)
class CheckResult:
    """One check. utilization None: not made (reason says why). demand/allowable in Pa for stresses,
    m for deflection, N for buckling (see `quantity`)."""

    check: str
    utilization: float | None
    demand: float | None = None
    allowable: float | None = None
    at: float | None = None
    combination: str | None = None
    quantity: str = "stress"  # "stress", "deflection", "force", "ratio"
    detail: str = ""  # what the numbers are, e.g. "compression", "about the minor axis", "span 2"
    extra: dict = field(default_factory=dict)  # check-specific values (docs/design.md section 6), e.g. critical_load, mode

    @property
    def made(self) -> bool:
        return self.utilization is not None

    @property
    def passes(self) -> bool:
        return self.utilization is None or self.utilization <= 1.0

    @property
    def made_utilization(self) -> float:
        """The utilization of a made check (ValueError for one not made)."""
        if self.utilization is None:
            raise ValueError(f"the {self.check} check was not made")
        return self.utilization


@dataclass
class CheckReport:
    """Every check of one section, the governing one and the verdict."""

    section: str
    checks: list[CheckResult]
    notes: list[str] = field(default_factory=list)
    stations_checked: int = 0
    nodes: int = 0
    stability: StabilityReport | None = None  # load factors and buckled shapes
    restraints: list[BraceDemand] = field(default_factory=list)  # what each restraint must carry
    torsion: TorsionSummary | None = None  # peaks of T, Tw, B; None when nothing twists the member
    reserve: Reserve | None = None  # where found (check, size, schedules)
    second_order: SecondOrderActions | None = None  # None: first order only
    design: Design | None = None  # the design the checks used: the one checked, with the pattern arrangements that govern among its combinations

    @property
    def made(self) -> list[CheckResult]:
        return [c for c in self.checks if c.made]

    @property
    def governing(self) -> CheckResult | None:
        """The check with the largest utilization; checks within TIED of it count as equal and the
        first in the report's order governs (a wall whose allowable has no reduction ties with
        bending, say: round-off must not decide which is named)."""
        made = self.made
        if not made:
            return None
        top = max(c.made_utilization for c in made)
        return next(c for c in made if c.made_utilization >= top * (1 - TIED))

    @property
    def utilization(self) -> float:
        governing = self.governing
        return governing.made_utilization if governing else 0.0

    @property
    def passes(self) -> bool:
        return all(c.passes for c in self.checks)
