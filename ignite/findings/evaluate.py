"""(Bound, Results) -> Results with findings. Never prints; never raises on a hazard.

Each bound check reads one named result (registered by the families in
`ignite.findings.floor`, `.charge` and `.cases`), compares each subject's value with its
limit, and words the finding from the check's detail and mitigation texts.
"""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import replace

from ignite.findings import (  # noqa: F401  (they register their results)
    cases,
    charge,
    electrical,
    floor,
    spread,
)
from ignite.findings.registry import RESULTS, Context, Scope
from ignite.records.results import Amount, Finding, Results, severity_rank
from ignite.rules.bound import Bound, BoundCheck, BoundLimit

UNITS = {
    "resistance": "Ω",
    "current": "A",
    "voltage": "V",
    "energy": "J",
    "time": "s",
    "fraction": "fraction",
    "flag": "",
    "count": "",
}

_COMPARISON_WORDS = {
    "above": "above",
    "at-or-above": "at or above",
    "below": "below",
    "at-or-below": "at or below",
}


def known_results() -> dict[str, str]:
    """Result names a check may read, with their dimension (for the rule loader)."""
    return {name: registered.dimension for name, registered in RESULTS.items()}


def evaluate(bound: Bound, results: Results) -> Results:
    """Results with the findings of every check, worst first."""
    scope = Scope(results, bound)
    findings: list[Finding] = []
    for check in bound.checks:
        findings.extend(_run_check(check, scope))
    findings = _keep_worst_in_groups(findings, {c.id: c.group for c in bound.checks})
    findings.sort(key=lambda f: (severity_rank(f.severity), f.rule, f.subject))
    return replace(results, findings=tuple(findings))


def _limit_value(limit: BoundLimit, scope: Scope) -> float | None:
    """The limit's SI value, or None when it does not apply to this room."""
    if not limit.result:
        return limit.value
    items = list(RESULTS[limit.result].items(scope))
    value = items[0].value if items else None
    return None if value is None else float(value)


def _limit_by_subject(limit: BoundLimit | None, scope: Scope) -> dict[str, float]:
    """For a limit read from another result: its value for each subject."""
    if limit is None or not limit.result:
        return {}
    return {
        i.subject: float(i.value) for i in RESULTS[limit.result].items(scope) if i.value is not None
    }


def _holds(test: str, value: float, limit: float, inclusive_outside: bool | None) -> bool:
    if inclusive_outside is not None:  # window limits: the window says whether equality is outside
        if test in ("below", "at-or-below"):
            return value <= limit if inclusive_outside else value < limit
        return value >= limit if inclusive_outside else value > limit
    return {
        "above": value > limit,
        "at-or-above": value >= limit,
        "below": value < limit,
        "at-or-below": value <= limit,
    }[test]


def _run_check(check: BoundCheck, scope: Scope) -> Iterator[Finding]:
    registered = RESULTS[check.reads]
    limit = check.limit
    limit_value: float | None = None
    source, flag = check.source, check.flag
    if limit is not None:
        limit_value = _limit_value(limit, scope)
        if limit_value is None:
            return
        if limit.source:
            source, flag = limit.source, limit.flag
    unit = UNITS[registered.dimension]
    per_subject = _limit_by_subject(limit, scope)
    inclusive_outside = limit.inclusive_outside if limit is not None else None
    for item in registered.items(scope):
        if item.value is None:
            continue
        item_limit = per_subject.get(item.subject, limit_value)
        if check.test == "is-true":
            if not item.value:
                continue
            measured, limit_amount, comparison = Amount(1.0, ""), Amount(None, ""), "present"
        else:
            if item_limit is None:
                continue
            if not _holds(check.test, float(item.value), item_limit, inclusive_outside):
                continue
            comparison = _COMPARISON_WORDS[check.test]
            measured, limit_amount = Amount(float(item.value), unit), Amount(item_limit, unit)
        context = _SafeContext(item.context)
        yield Finding(
            rule=check.id,
            title=check.title,
            severity=check.severity,
            subject=item.subject,
            measured=measured,
            limit=limit_amount,
            comparison=comparison,
            source=source,
            flag=flag,
            mitigations=tuple(
                text for text in (m.format_map(context).strip() for m in check.mitigations) if text
            ),
            detail=check.detail.format_map(context).strip(),
            value_kind=registered.kind,
            limit_kind=_limit_kind(limit) if limit_amount.value is not None else "",
        )


def _limit_kind(limit: BoundLimit | None) -> str:
    """What a check's limit is to the reader: a threshold of the rules, or another result."""
    if limit is None:
        return ""
    if limit.result:
        return RESULTS[limit.result].kind
    return "threshold"


class _SafeContext(dict[str, str | int]):
    """Missing placeholders print as an honest gap rather than raising."""

    def __init__(self, context: Context) -> None:
        super().__init__(context)

    def __missing__(self, key: str) -> str:
        return "(not computed)"


def _keep_worst_in_groups(findings: list[Finding], groups: dict[str, str]) -> list[Finding]:
    best: dict[tuple[str, str], Finding] = {}
    kept: list[Finding] = []
    for finding in findings:
        group = groups.get(finding.rule, "")
        if not group:
            kept.append(finding)
            continue
        key = (group, finding.subject)
        current = best.get(key)
        if current is None or severity_rank(finding.severity) < severity_rank(current.severity):
            best[key] = finding
    return kept + list(best.values())
