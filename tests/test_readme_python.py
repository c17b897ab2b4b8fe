"""README's "Python" section runs as written (a doctest of the public API)."""
from __future__ import annotations

import doctest
import re
from pathlib import Path

README = Path(__file__).resolve().parents[1] / "README.md"


def test_readme_python_section_runs():
    text = README.read_text(encoding="utf-8")
    section = text[text.index("## Python\n"):]
    section = section[:section.index("\n## ", 1)]
    code = re.search(r"```python\n(.*?)```", section, re.S).group(1)
    test = doctest.DocTestParser().get_doctest(code, {}, "README Python", str(README), 0)
    assert len(test.examples) > 10
    runner = doctest.DocTestRunner(optionflags=doctest.ELLIPSIS)
    runner.run(test)
    assert runner.failures == 0
