"""report.html of a study: the probability of boiling first, every name escaped, no scripts or
network, the caution at the top and the bottom; loaded in a headless browser where one is installed."""
from __future__ import annotations

import html
import sys
from pathlib import Path

import pytest

from study_cases import DUCT, SHRINK, small_copy
from thermo import CAUTION
from thermo.output.html_study import sweep_html, uncertainty_html, write_study_html
from thermo.studies.sweep import sweep, sweep_dict
from thermo.studies.uncertainty import uncertainty, uncertainty_dict

sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "output"))
from test_output_html_report import _chromium, _Collect, load_in_chromium  # noqa: E402

NAME = 'car <b>C-37</b> & "friends" <script>alert(1)</script>'
TABLE = """
[uncertainty]
samples = 5
seed = 11
stints = 1
[[uncertainty.inputs]]
name = "duct <i>inlet</i>"
key = "corners.front.ducts.main.inlet_area_mm2"
distribution = "uniform"
low = 6000
high = 14000
"""


@pytest.fixture(scope="module")
def studied(tmp_path_factory):
    path = small_copy(tmp_path_factory.mktemp("report"), TABLE)
    overrides = SHRINK + (("scenario.name", NAME),)
    plan, record = uncertainty(path, overrides=overrides, workers=1)
    swept = sweep(path, [f"{DUCT}=[6000, 14000]"], overrides=overrides, stints=1, workers=1)
    return (uncertainty_dict(plan, record), record), (sweep_dict(swept), swept)


def _self_contained(text: str) -> _Collect:
    parsed = _Collect()
    parsed.feed(text)
    tags = [t for t, _ in parsed.tags]
    assert "script" not in tags and "link" not in tags and "img" not in tags and "b" not in tags and "i" not in tags
    assert "https://" not in text and "http://" not in text.replace("http://www.w3.org", "")
    caution = html.escape(CAUTION, quote=True)
    assert text.count(caution) == 2 and text.index(caution) < text.index("<h2>") < text.rindex(caution)
    assert NAME in "".join(parsed.text_in["h1"])
    return parsed


def test_the_uncertainty_page_leads_with_the_probability_of_boiling(studied):
    (data, record), _ = studied
    text = uncertainty_html(data, record)
    parsed = _self_contained(text)
    headings = parsed.text_in["h2"]
    assert headings[0] == "Probability that the brake fluid boils" and "Every check" in headings
    assert "duct <i>inlet</i>" in "".join(parsed.text_in["td"])
    assert [t for t, _ in parsed.tags].count("svg") == 4        # peaks and tornado per corner


def test_the_sweep_page_lists_every_point(studied):
    _, (data, record) = studied
    text = sweep_html(data, record)
    parsed = _self_contained(text)
    cells = parsed.text_in["td"]
    assert "6000" in cells and "14000" in cells
    assert [t for t, _ in parsed.tags].count("svg") == 1        # the margin against the one varied key


@pytest.mark.skipif(_chromium() is None, reason="no headless Chromium here (Debian package chromium); CI installs it")
def test_the_uncertainty_page_loads_in_a_headless_browser(studied, tmp_path):
    (data, record), _ = studied
    path = tmp_path / "report.html"
    write_study_html("uncertainty", data, record, path)
    dom = load_in_chromium(path, tmp_path)
    assert "<b>C-37</b>" not in dom and "&lt;b&gt;C-37&lt;/b&gt;" in dom
