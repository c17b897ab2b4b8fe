"""report.html of a comparison (issue 17): the variants side by side, the margin gained per check
and corner, each variant's overrides, the caution at the top and bottom, every name escaped, no
scripts or network; loaded in a real headless browser where one is installed.

Built from the output tests' invented runs (tests/output/conftest.py): a variant whose front
temperatures rise above ambient by 0.9 of the baseline's, so its gains follow from the formulas
there. The structure is read with Python's own HTML parser; the browser is Debian's Chromium.
"""
from __future__ import annotations

import dataclasses
import html
from html.parser import HTMLParser

import pytest

from thermo import CAUTION
from thermo.output.html_compare import comparison_html, variant_overrides, write_comparison_html
from thermo.studies.compare import comparison_dict
from test_output_html_report import _chromium, _Collect, load_in_chromium

NAME = 'cool <b>duct</b> & "more" <script>alert(1)</script>'
DUCT = ("corners.front.ducts.main.inlet_area_mm2", "18000")


@pytest.fixture
def compared(factory):
    base = factory.results()
    cooler = dataclasses.replace(base, corners=(factory.corner("front_left", 0.9), base.corners[1]),
                                 overrides=base.overrides + (DUCT,), warnings=("a <warning> of the variant",))
    runs = [("baseline", base), (NAME, cooler)]
    data = comparison_dict(runs)
    return data, runs, comparison_html(data, runs, warnings=["variant moves the <bias>"])


def _rows(text: str, heading: str) -> list[list[str]]:
    """Cell texts of the body rows of the first table after the first ``heading`` (an h3's text)."""
    start = text.index(f"<h3>{heading}</h3>")
    table = text[start:text.index("</table>", start)]
    rows: list[list[str]] = []

    class Cells(HTMLParser):
        cell = None

        def handle_starttag(self, tag, attrs):
            if tag == "tr":
                rows.append([])
            elif tag == "td":
                self.cell = ""

        def handle_endtag(self, tag):
            if tag == "td":
                rows[-1].append(self.cell)
                self.cell = None

        def handle_data(self, data):
            if self.cell is not None:
                self.cell += data
    Cells().feed(table)
    return [r for r in rows if r]


def test_the_page_is_self_contained_and_escapes_every_name(compared):
    data, runs, text = compared
    parsed = _Collect()
    parsed.feed(text)
    tags = [t for t, _ in parsed.tags]
    assert "script" not in tags and "link" not in tags and "img" not in tags and "iframe" not in tags
    assert "http://" not in text.replace("http://www.w3.org", "") and "https://" not in text
    assert "b" not in tags                           # the variant's <b> shows as text, builds no element
    assert NAME in "".join(parsed.text_in["th"]) and NAME in "".join(parsed.text_in["td"])
    items = "".join(parsed.text_in["li"])
    assert "variant moves the <bias>" in items and f"{NAME}: a <warning> of the variant" in items
    caution = html.escape(CAUTION, quote=True)
    assert text.count(caution) == 2 and text.index(caution) < text.index("<h2>")
    assert text.rstrip().endswith("</html>") and text.rindex(caution) > text.rindex("</table>")
    assert tags.count("svg") == 3                   # an overlay per corner and the margin-gain bars, inline
    assert text.count("<h2>Corner ") == 2


def test_margin_gained_per_check_and_corner(compared, factory):
    data, runs, text = compared
    gains = _rows(text, "Margin gained against the baseline [K]")          # the front corner's table
    fluid_rise = factory.BUMPS["fluid"][0]
    by_check = {row[0]: row for row in gains}
    # the fluid peak (sampled at its bump's centre) is ambient + 0.9 x 140 K instead of + 140 K,
    # so every fluid check gains 14.0 K; the bearing peak falls by 0.1 x 100 K
    assert by_check["fluid_boiling_dry"][1:] == ["fluid", f"{0.1 * fluid_rise:+.1f}"]
    assert by_check["fluid_boiling_wet"][2] == f"{0.1 * fluid_rise:+.1f}"
    assert float(by_check["bearing_grease"][2]) == pytest.approx(0.1 * factory.BUMPS["bearing"][0], abs=0.05)
    # and it is what compare --json says
    assert float(by_check["fluid_boiling_dry"][2]) == pytest.approx(
        data["changes"][0]["corners"][0]["margin_change_k"]["fluid_boiling_dry"], abs=0.05)
    rear = text.index("<h2>Corner rear_left</h2>")
    assert "+14.0" not in text[rear:text.index("<h2>Plots</h2>")]        # the rear corner is the same


def test_side_by_side_and_overrides(compared):
    data, runs, text = compared
    rows = {row[0]: row for row in _rows(text, "Side by side (change against the baseline in brackets)")}
    base_margin = data["variants"][0]["corners"][0]["checks"][1]["margin_k"]
    assert rows["margin fluid_boiling_wet [K]"][2] == f"{base_margin:+.1f} EXCEEDED"
    assert rows["margin fluid_boiling_wet [K]"][3] == f"{base_margin + 14.0:+.1f} (+14.0) EXCEEDED"
    assert rows["peak fluid [degC]"][3] == "156.0 (-14.0)"      # 30 degC ambient + 0.9 x 140 K
    assert variant_overrides(runs) == [(NAME, [DUCT])]           # the --set ones of every run taken off
    section = text[text.index("<h2>Variants and their overrides</h2>"):text.index("<h2>Corner ")]
    assert html.escape(DUCT[0]) in section and html.escape(NAME, quote=True) in section
    assert "corners.front.piston.shim_thickness_mm" not in section        # the common override, listed once below


@pytest.mark.skipif(_chromium() is None, reason="no headless Chromium here (Debian package chromium); CI installs it")
def test_the_page_loads_in_a_headless_browser(compared, tmp_path):
    data, runs, _ = compared
    path = tmp_path / "report.html"
    write_comparison_html(data, runs, path)
    dom = load_in_chromium(path, tmp_path)
    assert "<b>duct</b>" not in dom and "&lt;b&gt;duct&lt;/b&gt;" in dom
