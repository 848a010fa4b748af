"""The worksheets read in plain words (issue 13): checked on the text a reader gets.

Regression tests of our own output. The three sample rooms are assessed and their PDFs
read back with pypdf: identifiers break only at their dots, dashes and underscores, no
internal result name is printed, the glossary spells out every abbreviation it needs,
and a quantity that appears in several places has one value.
"""

from __future__ import annotations

import io
import re
from functools import cache
from pathlib import Path

import pytest
import yaml
from pypdf import PdfReader

from ignite import pipeline
from ignite.findings.registry import RESULTS
from ignite.report.worksheet import render_worksheet
from ignite.room.ranges import Sampling
from ignite.simulate.compute import METHODS
from ignite.wording import sentences

ROOT = Path(__file__).resolve().parent.parent
SAMPLES = sorted((ROOT / "sample_rooms").glob("*.yaml"))


@cache
def _book():
    return pipeline.open_rulebook()


@cache
def _worksheet(path: Path, nominal: bool = False) -> tuple[str, int, tuple[str, ...]]:
    """(the text, the pages before the appendices, the rule ids printed)"""
    book = _book()
    bound, results = pipeline.evaluate_room(path, book, Sampling(nominal=nominal))
    pdf = render_worksheet(
        results,
        pipeline.rule_rows(book, set(bound.consulted)),
        METHODS,
        path.read_text(encoding="utf-8"),
    )
    pages = [page.extract_text() for page in PdfReader(io.BytesIO(pdf)).pages]
    appendix = " ".join(sentences.APPENDIX_RULES.split())
    before = next(
        (n for n, text in enumerate(pages) if appendix in " ".join(text.split())), len(pages)
    )
    return "\n".join(pages), before, tuple(sorted(bound.consulted))


def _broken_anywhere(name: str) -> str:
    return r"\s?".join(re.escape(c) for c in name)


def _broken_at_joints(name: str) -> str:
    return re.sub(r"([._-])", r"\1\\s?", re.escape(name).replace(r"\-", "-"))


@pytest.mark.parametrize("path", SAMPLES, ids=lambda p: p.stem)
def test_identifiers_break_only_after_their_dots_dashes_and_underscores(path):
    text, _, ids = _worksheet(path)
    # ids with a joint (a one-word id such as `esd` may be any word's letters)
    for rule_id in (i for i in ids if re.search(r"[._-]", i)):
        anywhere = len(re.findall(_broken_anywhere(rule_id), text))
        at_joints = len(re.findall(_broken_at_joints(rule_id), text))
        assert anywhere >= 1, rule_id  # every rule used is listed
        assert anywhere == at_joints, f"{rule_id} is broken inside a name"


@pytest.mark.parametrize("path", SAMPLES, ids=lambda p: p.stem)
def test_no_internal_name_or_placeholder_is_printed(path):
    text, _, _ = _worksheet(path)
    # an identifier wrapped at its joints is joined again; then a result name must not
    # stand on its own (a rule id such as electrical.bonding_resistance_max may hold one)
    joined = re.sub(r"([._-])\s+", r"\1", re.sub(r"\s+", " ", text))
    for name in RESULTS:
        assert not re.search(rf"(?<![\w.]){re.escape(name)}(?![\w.])", joined), name
    assert "(not computed)" not in text
    assert not re.search(r"\{[a-z_]+\}", text)


@pytest.mark.parametrize("path", SAMPLES, ids=lambda p: p.stem)
def test_the_glossary_spells_out_every_abbreviation_used(path):
    text, _, _ = _worksheet(path)
    flat = re.sub(r"\s+", " ", text)
    for term, meaning in sentences.GLOSSARY:
        if re.search(rf"(?<!\w){re.escape(term)}(?!\w)", flat):
            assert f"{term}: {meaning}" in flat, term


@pytest.mark.parametrize("path", SAMPLES, ids=lambda p: p.stem)
def test_every_flag_used_is_explained(path):
    text, _, _ = _worksheet(path)
    flat = re.sub(r"\s+", " ", text)
    for flag, meaning in sentences.FLAG_MEANINGS.items():
        if f"({flag})" in flat:
            assert f"{flag}: {meaning}" in flat, flag


def _flat(path: Path) -> str:
    return re.sub(r"\s+", " ", _worksheet(path)[0])


def test_one_value_for_each_waiting_time():
    flat = _flat(ROOT / "sample_rooms" / "day-surgery-head-neck.yaml")
    time = r"(\d+(?:\.\d+)? (?:s|min|h))"
    # the drape action, the plan and the case table give the same safe draping time
    actions = set(re.findall(rf"Drape no earlier than {time} after the end of the prep", flat))
    plan = set(re.findall(rf"drapes at {time}: too early, no earlier than {time}", flat))
    table = set(re.findall(rf"pocket below the vapour margin if after {time}", flat))
    computed = set(re.findall(rf"the computed pocket limit is {time}", flat))
    assert actions and {later for _, later in plan} <= actions
    # where the label's minimum governs, the action gives the computed time beside it
    assert table - {"0 s"} <= actions | computed  # 0 s: no wait, no action
    # the stop-oxygen action, the plan and the case table give the same needed stop
    stops = set(re.findall(rf"Stop open oxygen at least {time} before the first activation", flat))
    planned = set(re.findall(rf"too late, at least {time} before it", flat))
    needed = set(re.findall(rf"needed {time}", flat))
    assert stops and planned == stops and needed - {"0 s"} == stops  # 0 s: no open oxygen


@pytest.mark.parametrize("path", SAMPLES, ids=lambda p: p.stem)
def test_the_document_fits_its_purpose(path):
    purpose = yaml.safe_load(path.read_text(encoding="utf-8"))["room"]["purpose"]
    text, _, _ = _worksheet(path)
    heading = sentences.document_heading(purpose)
    prompt, decisions = sentences.sign_off(purpose)
    flat = re.sub(r"\s+", " ", text)
    assert flat.startswith(heading)
    assert prompt in flat
    assert all(decision in flat for decision in decisions)


def test_a_two_case_list_plan_runs_to_at_most_six_pages_before_the_appendices(tmp_path):
    source = ROOT / "sample_rooms" / "day-surgery-head-neck.yaml"
    room = yaml.safe_load(source.read_text(encoding="utf-8"))
    room["cases"] = room["cases"][:2]
    kept = {str(case["id"]) for case in room["cases"]}
    electrical = room.get("electrical", {})
    electrical["cases"] = [c for c in electrical.get("cases", []) if str(c["case"]) in kept]
    path = tmp_path / "two-cases.yaml"
    path.write_text(yaml.safe_dump(room, allow_unicode=True, sort_keys=False), encoding="utf-8")
    # at central values: sampled over its ranges, the bands, the chance column and the
    # drivers charts take the same list to 8 pages
    text, before, _ = _worksheet(path, nominal=True)
    assert sentences.SECTION_PLAN in text and sentences.SECTION_ACTIONS in text
    assert before <= 6


def test_every_result_a_check_reads_has_plain_words():
    missing = [name for name in RESULTS if name not in sentences.RESULT_WORDS]
    assert not missing
