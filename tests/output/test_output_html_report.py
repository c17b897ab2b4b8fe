"""report.html (issue 17): one self-contained page, every scenario text escaped, the caution at
the top and the bottom; loaded in a real headless browser where one is installed.

The structure is read with Python's own HTML parser (html.parser, the standard library); the
browser check uses Debian's Chromium (package chromium) started by the test, and is skipped with
the reason where it is missing.
"""
from __future__ import annotations

import dataclasses
import html
import shutil
import subprocess
from html.parser import HTMLParser

import pytest

from thermo import CAUTION
from thermo.output.html_report import report_html, write_report_html

NAME = 'Car <b>bold</b> & "quoted" <script>alert(1)</script>'


class _Collect(HTMLParser):
    def __init__(self):
        super().__init__()
        self.tags, self.stack, self.text_in = [], [], {}

    def handle_starttag(self, tag, attrs):
        self.tags.append((tag, dict(attrs)))
        self.stack.append(tag)

    def handle_endtag(self, tag):
        while self.stack and self.stack.pop() != tag:
            pass

    def handle_data(self, data):
        if self.stack:
            self.text_in.setdefault(self.stack[-1], []).append(data)


@pytest.fixture
def page(results):
    """The output tests' invented results (tests/output/conftest.py) under a name holding HTML."""
    results = dataclasses.replace(results, scenario_name=NAME,
                                  warnings=("a <warning> & more",), overrides=(("scenario.name", '"<i>x</i>"'),))
    return results, report_html(results)


def test_the_page_is_self_contained_and_escapes_every_scenario_text(page):
    results, text = page
    parsed = _Collect()
    parsed.feed(text)
    tags = [t for t, _ in parsed.tags]
    assert "script" not in tags and "link" not in tags and "img" not in tags and "iframe" not in tags
    assert "http://" not in text.replace("http://www.w3.org", "") and "https://" not in text
    # the name shows as text: no <b> element came from it, and its characters are in the title and heading
    assert "b" not in tags and "i" not in tags
    assert NAME in "".join(parsed.text_in["h1"]) and NAME in "".join(parsed.text_in["title"])
    assert "a <warning> & more" in "".join(parsed.text_in["li"])
    caution = html.escape(CAUTION, quote=True)
    assert text.count(caution) == 2 and text.index(caution) < text.index("<h2>")
    assert tags.count("svg") >= 3                  # the plots, inline
    assert text.count("<h3>Corner ") == len(results.corners)     # a verdict table per corner


def test_the_report_command_writes_the_file(tmp_path, page):
    from thermo.cli.main import main
    from thermo.output.hdf5 import write_results_hdf5
    results, _ = page
    write_results_hdf5(results, tmp_path / "results.h5")
    assert main(["report", str(tmp_path / "results.h5")]) == 0
    assert (tmp_path / "report.html").read_text(encoding="utf-8").startswith("<!DOCTYPE html>")


def _chromium():
    for name in ("chromium", "chromium-browser", "google-chrome"):
        path = shutil.which(name)
        if path:
            return path
    return None


@pytest.mark.skipif(_chromium() is None, reason="no headless Chromium here (Debian package chromium); CI installs it")
def test_the_page_loads_in_a_headless_browser(page, tmp_path):
    results, _ = page
    path = tmp_path / "report.html"
    write_report_html(results, path)
    dom = load_in_chromium(path, tmp_path)
    # the browser built no <b> or <script> element from the name: it shows as text
    assert "<b>bold</b>" not in dom and "&lt;b&gt;bold&lt;/b&gt;" in dom


def load_in_chromium(path, tmp_path) -> str:
    """Open ``path`` in headless Chromium: assert it loads with no console error and that its
    screenshot is not blank; the DOM the browser built, as text."""
    base = [_chromium(), "--headless", "--no-sandbox", "--disable-gpu", "--disable-dev-shm-usage",
            "--enable-logging=stderr", "--v=0", f"--user-data-dir={tmp_path / 'profile'}"]
    dom = subprocess.run(base + ["--dump-dom", path.as_uri()], capture_output=True, text=True, timeout=120)
    assert dom.returncode == 0, dom.stderr[-2000:]
    # no console errors (Chromium logs the page's console messages as CONSOLE lines)
    assert not [line for line in dom.stderr.splitlines() if "CONSOLE" in line and "error" in line.lower()]
    shot = tmp_path / "shot.png"
    done = subprocess.run(base + ["--window-size=1200,1600", f"--screenshot={shot}", path.as_uri()],
                          capture_output=True, text=True, timeout=120)
    assert done.returncode == 0 and shot.is_file(), done.stderr[-2000:]
    from matplotlib.image import imread
    assert imread(shot).std() > 0.05               # not blank: text, tables and plots drawn
    return dom.stdout


def test_the_report_of_an_output_set_carries_the_same_plots(factory, tmp_path):
    """Issue 14: `--out` hands the report the SVG of the figures it drew as PNG; the page is the one
    the report draws on its own (a fixed time stamp so the pages compare whole)."""
    import datetime
    from thermo.output.plots import plot_run
    results = factory.results(dt=10.0)
    when = datetime.datetime(2024, 5, 1, 12, 0, tzinfo=datetime.timezone.utc)
    svg = []
    plot_run(results, tmp_path, svg=svg)
    assert len(svg) == 4 and all(s.startswith("<svg") for s in svg)
    assert report_html(results, generated=when, svg=svg) == report_html(results, generated=when)
