"""An audit against the previous register: readings that moved, rooms that left or
re-entered their floor window, findings that appeared or cleared.

Pure functions over register rows; `compare` pairs the rooms and words each change
in one line (the register's `change_since_previous`).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import replace

from ignite.records.register import (
    COMPARED,
    GONE,
    NEW,
    FindingKey,
    RegisterRow,
    RoomChange,
    severity_order,
)
from ignite.wording.numbers import format_si


def compare(then: Sequence[RegisterRow], now: Sequence[RegisterRow]) -> list[RoomChange]:
    """Each room of `now` against `then`, plus the rooms only `then` had.

    Rooms are paired by room id where the id is unique in both registers, otherwise
    (a room not assessed, or an id used twice) by file path.
    """
    unique = _unique_ids(then) & _unique_ids(now)
    left = list(then)
    matches: dict[int, RegisterRow] = {}
    for position, row in enumerate(now):
        if row.room_id in unique:
            matches[position] = next(r for r in left if r.room_id == row.room_id)
            left.remove(matches[position])
    for position, row in enumerate(now):
        if position not in matches and row.room_id not in unique:
            match = next((r for r in left if r.file == row.file and r.room_id not in unique), None)
            if match is not None:
                matches[position] = match
                left.remove(match)
    changes = [_change(matches.get(position), row) for position, row in enumerate(now)]
    changes += [_change(row, None) for row in left]
    return [replace(change, text=describe(change)) for change in changes]


def describe(change: RoomChange) -> str:
    """The change in one line, as the register's `change_since_previous` holds it."""
    if change.kind == NEW:
        return "new: not in the previous register"
    if change.kind == GONE:
        return "gone: in the previous register, not in this audit"
    parts: list[str] = []
    if change.status_then != change.status_now:
        parts.append(f"status {change.status_then} → {change.status_now}")
    if change.window_event:
        parts.append(f"{change.window_event} ({change.verdict_then} → {change.verdict_now})")
    if change.moved:
        then, now = change.readings_then, change.readings_now
        moves = []
        for point in change.moved:
            before = format_si(then[point - 1], "Ω") if point <= len(then) else "none"
            after = format_si(now[point - 1], "Ω") if point <= len(now) else "none"
            moves.append(f"#{point} {before} → {after}")
        total = max(len(then), len(now))
        parts.append(f"{len(change.moved)} of {total} readings moved: " + ", ".join(moves))
    if change.appeared:
        parts.append("appeared: " + ", ".join(map(str, change.appeared)))
    if change.cleared:
        parts.append("cleared: " + ", ".join(map(str, change.cleared)))
    return "; ".join(parts) if parts else "no change"


def _worst_first(key: FindingKey) -> tuple[int, str, str]:
    return severity_order(key.severity), key.rule, key.subject


def _unique_ids(rows: Sequence[RegisterRow]) -> set[str]:
    seen: dict[str, int] = {}
    for row in rows:
        if row.room_id:
            seen[row.room_id] = seen.get(row.room_id, 0) + 1
    return {room_id for room_id, count in seen.items() if count == 1}


def _change(then: RegisterRow | None, now: RegisterRow | None) -> RoomChange:
    some = now if now is not None else then
    assert some is not None
    if then is None or now is None:
        return RoomChange(
            some.room_id,
            some.room_name,
            some.file,
            NEW if then is None else GONE,
            status_then=then.status if then else "",
            status_now=now.status if now else "",
            verdict_then=then.verdict if then else "",
            verdict_now=now.verdict if now else "",
            readings_then=then.readings_ohm if then else (),
            readings_now=now.readings_ohm if now else (),
            window_low_ohm=some.window_low_ohm,
            window_high_ohm=some.window_high_ohm,
            worst_then=then.worst_severity if then else "",
            worst_now=now.worst_severity if now else "",
            date_then=then.assessed_on if then else "",
            date_now=now.assessed_on if now else "",
        )
    points = max(len(then.readings_ohm), len(now.readings_ohm))
    moved = tuple(
        point + 1
        for point in range(points)
        if point >= len(then.readings_ohm)
        or point >= len(now.readings_ohm)
        or then.readings_ohm[point] != now.readings_ohm[point]
    )
    if not then.readings_ohm or not now.readings_ohm:
        moved = ()  # one side was not assessed: its status says so, not its readings
    before = {f.identity: f for f in then.findings}
    after = {f.identity: f for f in now.findings}
    return RoomChange(
        now.room_id or then.room_id,
        now.room_name or then.room_name,
        now.file,
        COMPARED,
        status_then=then.status,
        status_now=now.status,
        verdict_then=then.verdict,
        verdict_now=now.verdict,
        readings_then=then.readings_ohm,
        readings_now=now.readings_ohm,
        moved=moved,
        window_low_ohm=now.window_low_ohm if now.readings_ohm else then.window_low_ohm,
        window_high_ohm=now.window_high_ohm if now.readings_ohm else then.window_high_ohm,
        appeared=tuple(sorted((f for k, f in after.items() if k not in before), key=_worst_first)),
        cleared=tuple(sorted((f for k, f in before.items() if k not in after), key=_worst_first)),
        worst_then=then.worst_severity,
        worst_now=now.worst_severity,
        date_then=then.assessed_on,
        date_now=now.assessed_on,
    )
