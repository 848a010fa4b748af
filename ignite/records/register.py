"""The audit register as data: what it holds for each room file, how a room stands
against an earlier audit, and everything the register files and the summary are made of.

Plain frozen records and the few facts that follow from them (a row's verdict, its
worst severity; whether a room left its window). No files, no sentences: reading and
writing the register live in `ignite.audit.io`, the comparison with an earlier register
in `ignite.audit.compare`, and the summary's wording in the report.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field
from pathlib import Path

from ignite.records.results import SEVERITIES, Finding, Results, severity_rank

ASSESSED, INVALID, ERROR = "assessed", "invalid", "error"
"""Row statuses: worksheet written; the room file has problems; ignite failed on it."""

PASS, FAIL = "pass", "fail"
"""Floor verdicts, as the register writes them."""

COMPARED, NEW, GONE = "compared", "new", "gone"
"""How a room pairs with the previous register: in both; only now; only then."""

ELECTRICAL_RULES = "electrical."
"""The id prefix of the patient environment's electrical checks (rules/checks-electrical.yaml)."""

LEFT_WINDOW, REENTERED_WINDOW = "left its window", "re-entered its window"
"""A floor's verdict turning from pass to fail, and back."""


def severity_order(severity: str) -> int:
    """`severity_rank`, with anything that is not a severity ("none", "") after them all.

    >>> [severity_order(s) for s in ("high", "note", "none", "")]
    [0, 3, 4, 4]
    """
    return severity_rank(severity) if severity in SEVERITIES else len(SEVERITIES)


def one_line(text: str) -> str:
    """`text` with every run of white space (newlines too) made one space."""
    return " ".join(text.split())


@dataclass(frozen=True, order=True)
class FindingKey:
    """What identifies a finding from one audit to the next."""

    rule: str
    subject: str
    severity: str = field(compare=False, default="note")

    @property
    def identity(self) -> tuple[str, str]:
        return self.rule, self.subject

    def __str__(self) -> str:
        return f"{self.rule} ({self.subject})" if self.subject else self.rule


@dataclass(frozen=True)
class RegisterRow:
    """One room file of an audit: what the register holds for it."""

    file: str  # path relative to the audited folder, with "/"
    status: str  # ASSESSED | INVALID | ERROR
    room_id: str = ""
    room_name: str = ""
    purpose: str = ""
    assessed_on: str = ""
    assessor: str = ""
    floor_criteria: str = ""
    floor_passed: bool | None = None
    window_low_ohm: float | None = None
    window_high_ohm: float | None = None
    readings_ohm: tuple[float, ...] = ()
    points_outside: tuple[int, ...] = ()  # 1-based test points outside the window
    findings: tuple[FindingKey, ...] = ()
    input_sha256: str = ""
    worksheet: str = ""  # file name in the output folder; "" when none was written
    worksheet_sha256: str = ""
    warnings: tuple[str, ...] = ()
    problems: tuple[str, ...] = ()
    worst_electrical: FindingKey | None = None  # the worst electrical finding, if any
    # the largest probability of a hazard over the spread of the room's ranges; None when
    # the room was not assessed with ranges
    worst_probability: float | None = None

    @property
    def assessed(self) -> bool:
        return self.status == ASSESSED or (self.status == ERROR and bool(self.room_id))

    @property
    def verdict(self) -> str:
        if self.floor_passed is None:
            return ""
        return PASS if self.floor_passed else FAIL

    @property
    def lowest_ohm(self) -> float | None:
        return min(self.readings_ohm) if self.readings_ohm else None

    @property
    def highest_ohm(self) -> float | None:
        return max(self.readings_ohm) if self.readings_ohm else None

    @property
    def worst_severity(self) -> str:
        """The worst severity found; "none" for a room without findings, "" if not assessed."""
        if not self.findings:
            return "none" if self.assessed else ""
        return min((f.severity for f in self.findings), key=severity_rank)

    def count(self, severity: str) -> int:
        return sum(1 for f in self.findings if f.severity == severity)


def row_from_results(
    file: str,
    results: Results,
    *,
    status: str = ASSESSED,
    worksheet: str = "",
    worksheet_sha256: str = "",
    problems: Sequence[str] = (),
) -> RegisterRow:
    """The register row of a room that was assessed (`results`), with its worksheet."""
    floor = results.floor
    return RegisterRow(
        file=file,
        status=status,
        room_id=results.room.id,
        room_name=results.room.name,
        purpose=results.room.purpose,
        assessed_on=results.room.assessed_on,
        assessor=results.room.assessor,
        floor_criteria=floor.criteria,
        floor_passed=floor.passed,
        window_low_ohm=floor.window_low_ohm,
        window_high_ohm=floor.window_high_ohm,
        readings_ohm=tuple(floor.readings_ohm),
        points_outside=tuple(i + 1 for i in floor.readings_outside),
        findings=tuple(
            FindingKey(f.rule, one_line(f.subject), f.severity) for f in results.findings
        ),
        input_sha256=results.input_sha256,
        worksheet=worksheet,
        worksheet_sha256=worksheet_sha256,
        warnings=tuple(results.warnings),
        problems=tuple(problems),
        worst_electrical=worst_electrical(results.findings),
        worst_probability=(
            results.uncertainty.worst_probability if results.uncertainty is not None else None
        ),
    )


def worst_electrical(findings: Sequence[Finding]) -> FindingKey | None:
    """The worst finding of the electrical checks (the first of the worst severity)."""
    electrical = [f for f in findings if f.rule.startswith(ELECTRICAL_RULES)]
    if not electrical:
        return None
    worst = min(electrical, key=lambda f: severity_rank(f.severity))
    return FindingKey(worst.rule, one_line(worst.subject), worst.severity)


@dataclass(frozen=True)
class SiteFinding:
    """One finding of one room, for the summary's list of the worst across the site."""

    room_id: str
    room_name: str
    finding: Finding


@dataclass(frozen=True)
class RoomChange:
    """How one room stands against the previous audit."""

    room_id: str
    room_name: str
    file: str
    kind: str  # COMPARED | NEW (not in the previous register) | GONE (only there)
    status_then: str = ""
    status_now: str = ""
    verdict_then: str = ""
    verdict_now: str = ""
    readings_then: tuple[float, ...] = ()
    readings_now: tuple[float, ...] = ()
    moved: tuple[int, ...] = ()  # 1-based points whose reading changed or exists on one side only
    window_low_ohm: float | None = None
    window_high_ohm: float | None = None
    appeared: tuple[FindingKey, ...] = ()
    cleared: tuple[FindingKey, ...] = ()
    worst_then: str = ""
    worst_now: str = ""
    date_then: str = ""  # assessed_on in the previous register
    date_now: str = ""
    text: str = ""  # the change in one line, as `ignite.audit.compare` words it

    @property
    def window_event(self) -> str:
        if self.verdict_then == PASS and self.verdict_now == FAIL:
            return LEFT_WINDOW
        if self.verdict_then == FAIL and self.verdict_now == PASS:
            return REENTERED_WINDOW
        return ""

    @property
    def changed(self) -> bool:
        return bool(
            self.kind != COMPARED
            or self.status_then != self.status_now
            or self.verdict_then != self.verdict_now
            or self.moved
            or self.appeared
            or self.cleared
        )

    def describe(self) -> str:
        """The change in one line, as the register's `change_since_previous` holds it."""
        return self.text


@dataclass(frozen=True)
class Register:
    """A register read back from disk (an earlier audit)."""

    path: Path
    sha256: str
    rows: tuple[RegisterRow, ...]
    tool_version: str = ""
    rules_digest: str = ""


@dataclass(frozen=True)
class AuditReport:
    """Everything the register and the summary are made from."""

    folder: str
    tool_version: str
    rules_digest: str
    rows: tuple[RegisterRow, ...]
    site_findings: tuple[SiteFinding, ...]  # every finding of the site, worst first
    previous: Register | None = None
    changes: tuple[RoomChange, ...] = ()
    paper: str = "a4"

    @property
    def not_assessed(self) -> tuple[RegisterRow, ...]:
        return tuple(row for row in self.rows if row.status != ASSESSED)

    def change_for(self, row: RegisterRow) -> RoomChange | None:
        for change in self.changes:
            if change.kind != GONE and change.file == row.file:
                return change
        return None
