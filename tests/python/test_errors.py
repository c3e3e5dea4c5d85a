"""Bad input raises qftplan.InputError with the command line's message (file:line:column), a setting named
as the module's keyword argument where the command line names its option; a request that cannot be planned
raises qftplan.PlanningError; both carry what `qftplan` prints after 'qftplan: '."""

import re

import pytest

from conftest import SOURCE_DIR, run_cli

BAD_DEVICES = sorted((SOURCE_DIR / "tests" / "data" / "bad_devices").glob("*.yaml"))


def cli_message(*args):
    status, _, err = run_cli(*args)
    assert err.startswith("qftplan: "), err
    return status, err[len("qftplan: "):].rstrip("\n")


def test_exception_classes(qftplan):
    assert issubclass(qftplan.InputError, ValueError)
    assert issubclass(qftplan.PlanningError, RuntimeError)


@pytest.mark.parametrize("path", BAD_DEVICES, ids=[p.name for p in BAD_DEVICES])
def test_bad_device_files_give_the_command_line_message(qftplan, path):
    status, message = cli_message("device", path)
    assert status == 2
    with pytest.raises(qftplan.InputError) as info:
        qftplan.load_device(str(path))
    assert str(info.value) == message
    e = info.value
    assert e.file == str(path)
    # The position the message starts with is the one the attributes carry.
    prefix = str(path)
    if e.line is not None:
        prefix += f":{e.line}"
        if e.column is not None:
            prefix += f":{e.column}"
    assert message == f"{prefix}: {e.message}"


def test_a_position_is_reported(qftplan):
    path = SOURCE_DIR / "tests" / "data" / "bad_devices" / "coupler_duplicate.yaml"
    with pytest.raises(qftplan.InputError) as info:
        qftplan.Device(path)  # a path-like works too
    assert (info.value.line, info.value.column) == (8, 5)
    assert str(info.value).startswith(f"{path}:8:5: ")


def test_yaml_text_names_its_source(qftplan):
    with pytest.raises(qftplan.InputError) as info:
        qftplan.device_from_yaml("name: x\nqbits: 3\ncouplers: []\n", source="mine.yaml")
    assert info.value.file == "mine.yaml" and info.value.line == 2
    assert "did you mean 'qubits'?" in str(info.value)


@pytest.mark.parametrize("kwargs, flags", [
    ({"approx": "seven"}, ["--approx", "seven"]),
    ({"approx": 0}, ["--approx", "0"]),
    ({"gates": "cy"}, ["--gates", "cy"]),
    ({"end_order": "reversed"}, ["--end-order", "reversed"]),
    ({"placement": "0,1,x"}, ["--placement", "0,1,x"]),
    ({"placement": [0, 1, 1]}, ["--placement", "0,1,1"]),
    ({"strategy": "teleport"}, ["--strategy", "teleport"]),
    ({"format": "qasm4"}, ["--format", "qasm4"]),
])
def test_bad_plan_arguments_give_the_command_line_message(qftplan, kwargs, flags):
    status, message = cli_message("plan", "--device", "line:5", "--qubits", 3, *flags)
    assert status == 2
    with pytest.raises(qftplan.InputError) as info:
        qftplan.plan("line:5", 3, **kwargs)
    # The module names a setting as its keyword argument (--end-order -> end_order), the rest is the same.
    assert str(info.value) == re.sub(r"--([a-z-]+)", lambda m: m.group(1).replace("-", "_"), message)


def test_unplannable_request_raises_planning_error(qftplan):
    status, message = cli_message("plan", "--device", "line:4", "--qubits", 6)
    assert status == 1
    with pytest.raises(qftplan.PlanningError) as info:
        qftplan.plan("line:4", 6)
    assert str(info.value) == message


def test_unknown_device_spec(qftplan):
    status, message = cli_message("device", "hexagon:3")
    assert status == 2
    with pytest.raises(qftplan.InputError) as info:
        qftplan.load_device("hexagon:3")
    assert str(info.value) == message
    with pytest.raises(qftplan.InputError):
        qftplan.grid(0, 3)


def test_bad_circuit_gives_line_and_column(qftplan, tmp_path):
    path = tmp_path / "bad.qasm"
    path.write_text('OPENQASM 3.0;\ninclude "stdgates.inc";\nh $0;\nfrobnicate $1;\n')
    status, message = cli_message("check", path, "--device", "line:3", "--qubits", 2, "--initial", "0,1", "--final", "1,0")
    assert status == 2
    with pytest.raises(qftplan.InputError) as info:
        qftplan.check_file(path, "line:3", 2, initial=[0, 1], final=[1, 0])
    assert str(info.value) == message
    assert info.value.file == str(path) and info.value.line == 4
    with pytest.raises(qftplan.InputError) as info:
        qftplan.check(path.read_text(), "line:3", 2, initial=[0, 1], final=[1, 0], source=str(path))
    assert str(info.value) == message


def test_wrong_circuit_is_a_verdict_not_an_exception(qftplan, tmp_path):
    plan = qftplan.plan("line:4", 4, gates="logical", network="anchored")
    assert "cp(pi/2**2)" in plan.qasm
    text = plan.qasm.replace("cp(pi/2**2)", "cp(pi/2**3)", 1)
    path = tmp_path / "wrong.qasm"
    path.write_text(text)
    status, _, err = run_cli("check", path, "--device", "line:4", "--qubits", 4)
    assert status == 1
    message = err.rstrip("\n")  # a verdict is printed without the program's name
    verdict = qftplan.check_file(path, "line:4", 4)
    assert not verdict and verdict.line is not None
    assert str(verdict) == message
    assert verdict.outcome == "wrong"
    good = qftplan.check(plan.qasm, "line:4", 4)
    assert good and good.structural_proved and good.outcome == "proved"
    assert good.lost_track_line is None and good.lost_track_reason is None


def test_check_outcomes_of_equivalent_rewrites(qftplan):
    # Issue 21: 'h h' is the identity (H^2 = I: Nielsen and Chuang, 2000, section 4.2). In a cz file an
    # inserted pair may make the structural proof lose track; simulation of every basis input then
    # proves the circuit, and with simulation switched off (more qubits than the limit would do the
    # same) the verdict is "cannot prove", never "wrong".
    plan = qftplan.plan("line:5", 5, gates="cz")
    lines = plan.qasm.splitlines(keepends=True)
    for at in range(len(lines)):
        if not lines[at].startswith("h "):
            continue
        text = "".join(lines[: at + 1]) + "h $3;\nh $3;\n" + "".join(lines[at + 1 :])
        verdict = qftplan.check(text, "line:5", 5)
        assert verdict.outcome == "proved", (at, str(verdict))
        assert verdict and (verdict.structural_proved or verdict.exhaustive)


def test_wrong_argument_types(qftplan):
    with pytest.raises(TypeError):
        qftplan.plan(3.5, 3)
    with pytest.raises(TypeError):
        qftplan.plan("line:4", 3, approx=True)


def test_time_limit_before_any_plan_raises_planning_error(qftplan, monkeypatch):
    # The counting clock (DEVELOPERS.md) runs the limit out at its first reading, before a chain of 4400
    # qubits can exist: the docstring's PlanningError, not a bare RuntimeError.
    monkeypatch.setenv("QFTPLAN_TEST_CLOCK_TICK", "1")
    with pytest.raises(qftplan.PlanningError, match="time limit"):
        qftplan.plan("heavy-hex:30x30", 4400, time_limit=0.5, strategy="chain", circuit=False)
