"""`qftplan --version`, `qftplan help TOPIC` and the manual page all come from the program's option tables:
help TOPIC must be the command's --help, and the manual must list every option of every command."""

import pathlib
import re
import shutil
import subprocess

import pytest

from conftest import BINARY, run_cli


def commands():
    _, out, _ = run_cli("--help")
    section = out.split("Subcommands:", 1)[1]
    return [line.split()[0] for line in section.splitlines() if line.startswith("  ") and line.split()]


def options_of(help_text):
    return set(re.findall(r"(?<![\w-])(--[a-z][a-z0-9-]*)", help_text))


def test_version(qftplan):
    status, out, _ = run_cli("--version")
    assert status == 0 and out.strip() == f"qftplan {qftplan.__version__}"


def test_every_command_is_a_topic():
    names = commands()
    assert {"device", "plan", "check", "help"} <= set(names)


@pytest.mark.parametrize("topic", ["device", "plan", "check", "survey", "help"])
def test_help_topic_is_the_commands_own_help(topic):
    if topic not in commands():
        pytest.skip(f"no '{topic}' command in this build")
    status, via_help, _ = run_cli("help", topic)
    assert status == 0
    _, via_flag, _ = run_cli(topic, "--help")
    # --help names the program as it was invoked; help TOPIC names it 'qftplan'.
    assert via_help == via_flag.replace(f"Usage: {BINARY} ", "Usage: qftplan ")
    assert f"Usage: qftplan {topic}" in via_help


def test_help_without_topic_is_the_overview():
    _, via_help, _ = run_cli("help")
    _, via_flag, _ = run_cli("--help")
    assert via_help == via_flag.replace(f"Usage: {BINARY} ", "Usage: qftplan ")


def test_unknown_topic():
    status, _, err = run_cli("help", "teleport")
    assert status == 2
    assert err.startswith("qftplan: unknown help topic 'teleport' (topics: device, plan, check")


def test_manual_lists_every_option_of_every_command():
    status, man, _ = run_cli("help", "--man")
    assert status == 0 and man.startswith(".TH QFTPLAN 1")
    plain = man.replace("\\-", "-").replace("\\fB", "").replace("\\fI", "").replace("\\fR", "")
    for topic in commands():
        assert f'.SH "COMMAND: {topic}"' in plain
        _, text, _ = run_cli("help", topic)
        missing = options_of(text) - {"--help"} - options_of(plain)
        assert not missing, (topic, missing)
    # The build generates the installed page with the same command.
    built = pathlib.Path(BINARY).parent / "qftplan.1"
    if built.exists():
        assert built.read_text() == man


@pytest.mark.skipif(shutil.which("groff") is None, reason="groff not installed")
def test_manual_renders_without_warnings(tmp_path):
    page = tmp_path / "qftplan.1"
    page.write_text(run_cli("help", "--man")[1])
    # -ww: every warning; -z: no output, only the diagnostics (groff(1)).
    proc = subprocess.run(["groff", "-man", "-Tutf8", "-ww", "-z", str(page)], capture_output=True, text=True)
    assert proc.returncode == 0 and proc.stderr == "", proc.stderr
