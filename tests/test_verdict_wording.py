"""One wording of the chemical-accuracy verdict, derived from the verdict, in every place a result is shown."""

from __future__ import annotations

import re
from dataclasses import replace

import pytest

import groundkit as gk
from groundkit.widgets.html import result_html
from groundkit.widgets.live import RunView

WORDING = {"within": "within chemical accuracy", "outside": "outside chemical accuracy",
           "uncertain": "chemical accuracy uncertain at 2 sigma"}


def test_the_wording_is_declared_once():
    from groundkit.result import VERDICT_WORDING, verdict_text

    assert VERDICT_WORDING == WORDING and all(verdict_text(v) == w for v, w in WORDING.items())


@pytest.fixture(scope="module")
def exact_result() -> gk.RunResult:
    return gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.7414))).pipeline().run()


# (error, standard error) in Ha -> the verdict at 2 sigma against 1.6 mHa (common practice, no single source)
CASES = [((1.7e-3, 1e-3), "uncertain"), ((1.5e-3, 1e-3), "uncertain"), ((1.0e-3, 1e-4), "within"),
         ((3.0e-3, 1e-4), "outside"), ((0.0, 0.0), "within"), ((2.0e-3, 0.0), "outside")]


def shifted(result: gk.RunResult, error: float, stderr: float) -> gk.RunResult:
    return replace(result, energy=result.reference.energy + error, standard_error=stderr)


def claims(text: str) -> list[str]:
    """Every verdict wording found in a text, plus the bare claims an older wording made."""
    plain = re.sub(r"<[^>]+>", "", text)
    found = [v for v, words in WORDING.items() if words in plain]
    return found + (["bare"] if re.search(r"(?<!\w)(NOT within|within chemical accuracy,)", plain) else [])


@pytest.mark.parametrize(("error", "verdict"), CASES)
def test_summary_html_and_widget_say_the_verdict_and_nothing_else(exact_result, error, verdict):
    result = shifted(exact_result, *error)
    assert result.verdict == verdict
    assert result.within_chemical_accuracy == (verdict == "within")
    for shown in (result.summary(), result_html(result), RunView._final_status(result)):
        assert claims(shown) == [verdict], shown


def test_a_sampled_run_summary_agrees_with_its_verdict():
    pipeline = gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.7414))).pipeline()
    result = pipeline.estimator(gk.SampledEstimator(shots=2000, seed=11)).minimiser(gk.COBYLA()).run()
    assert result.standard_error > 0
    assert claims(result.summary()) == [result.verdict]
    assert result.summary().count(WORDING[result.verdict]) == 1


def test_tables_carry_the_verdict(exact_result):
    h2 = gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, 0.7414)))
    table = gk.compare(h2.pipeline(), estimators=[gk.ExactEstimator(), gk.SampledEstimator(shots=400, seed=2)],
                       minimisers=[gk.COBYLA()])
    assert list(table["verdict"])[0] == "within"
    assert list(table["within_chemical_accuracy"]) == [v == "within" for v in table["verdict"]]
    scan = gk.Pipeline().scan(lambda r: gk.MoleculeSpec(symbols=("H", "H"), coordinates=((0, 0, 0), (0, 0, r))),
                              [0.7414])
    assert list(scan.table["verdict"]) == ["within"]
    assert " within " in scan.summary().splitlines()[1]
