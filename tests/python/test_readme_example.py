"""The worked example of README section "Python" runs and prints what the README says it prints."""

import contextlib
import io
import os
import re

from conftest import SOURCE_DIR


def readme_example():
    text = (SOURCE_DIR / "README.md").read_text()
    section = text.split("\n## Python\n", 1)[1]
    return re.search(r"```python\n(.*?)```", section, re.S).group(1)


def test_readme_python_example(qftplan):
    code = readme_example()
    # Standalone comment lines are the expected output, in order.
    expected = [line.strip()[2:] for line in code.splitlines() if line.strip().startswith("# ")]
    out = io.StringIO()
    cwd = os.getcwd()
    os.chdir(SOURCE_DIR)
    try:
        with contextlib.redirect_stdout(out):
            exec(compile(code, "README.md", "exec"), {})
    finally:
        os.chdir(cwd)
    assert out.getvalue().splitlines() == expected
