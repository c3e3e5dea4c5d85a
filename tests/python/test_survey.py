"""A survey through the module gives the command line's CSV and JSON lines, and its rows agree with
single plans."""

import json
import re

import pytest

from conftest import TOPOLOGIES, run_cli

NOISY = str(TOPOLOGIES / "harbor-noisy-20.yaml")


@pytest.mark.parametrize("devices, qubits, approx, direction, strategy", [
    (["line:6", "grid:*"], "2:6:2", "none,3", "forward", "chain"),
    ([NOISY, "heavy-hex:*"], "4,9", "auto,2", "both", "chain,routed"),
    (["ring:5"], "3:7", "none", "inverse", "auto"),
])
def test_module_csv_equals_command_line_csv(qftplan, tmp_path, devices, qubits, approx, direction, strategy):
    csv_path = tmp_path / "s.csv"
    jsonl_path = tmp_path / "s.jsonl"
    run_cli("survey", *devices, "--qubits", qubits, "--approx", approx, "--direction", direction, "--strategy", strategy,
            "--jobs", 1, "--no-timing", "--quiet", "--csv", csv_path, "--jsonl", jsonl_path, check=True)
    inverse = {"forward": False, "inverse": True, "both": "both"}[direction]
    kwargs = dict(approx=approx, inverse=inverse, strategy=strategy.split(","))
    # The CSV is compared byte for byte (RFC 4180 line ends included): read without newline translation.
    assert qftplan.survey_csv(devices, qubits, **kwargs) == csv_path.read_bytes().decode()
    rows = qftplan.survey(devices, qubits, jobs=2, **kwargs)
    assert rows == [json.loads(line) for line in jsonl_path.read_text().splitlines()]


def test_rows_agree_with_single_plans(qftplan):
    rows = qftplan.survey([qftplan.grid(3, 3), "line:9"], [4, 7], approx=[None, 3])
    assert [r["index"] for r in rows] == list(range(8)) and all(r["of"] == 8 for r in rows)
    for r in rows:
        assert r["status"] == "ok"
        approx = "none" if r["asked_approx"] == "none" else int(r["asked_approx"])
        report = qftplan.plan(r["device"], r["qubits"], approx=approx).report
        for field, key in [("cx_count", "cx_count"), ("swaps", "swaps"), ("blocks", "two_qubit_blocks"),
                           ("depth_2q", "depth_2q"), ("network", "network"), ("strategy", "strategy")]:
            assert r[field] == report[key], (field, r, report[key])


def test_failed_cases_are_rows(qftplan):
    rows = qftplan.survey("line:4", [3, 6])
    assert [r["status"] for r in rows] == ["ok", "failed"]
    assert "fewer than the 6 requested" in rows[1]["reason"]


def test_timing_column(qftplan):
    assert "elapsed_ms" not in qftplan.survey("line:4", 3)[0]
    assert qftplan.survey("line:4", 3, timing=True)[0]["elapsed_ms"] >= 0


def test_bad_survey_arguments(qftplan):
    status, _, err = run_cli("survey", "line:4", "--qubits", "3", "--strategy", "teleport", "--quiet")
    assert status == 2
    with pytest.raises(qftplan.InputError) as info:
        qftplan.survey("line:4", 3, strategy="teleport")
    # The module names a setting as its keyword argument where the command line names its option.
    assert "qftplan: " + str(info.value) == re.sub(r"--([a-z-]+)", lambda m: m.group(1).replace("-", "_"),
                                                   err.rstrip("\n"))
    with pytest.raises(qftplan.InputError):
        qftplan.survey("line:4", "3:x")


def test_default_jobs_use_every_core_and_give_the_same_rows(qftplan):
    # Like the command line, the module runs a survey on every core unless told; rows do not depend on it.
    one = qftplan.survey(["line:6", "grid:*"], [3, 5], jobs=1)
    assert qftplan.survey(["line:6", "grid:*"], [3, 5]) == one
    with pytest.raises(qftplan.InputError, match="jobs"):
        qftplan.survey("line:4", 3, jobs=0)


def test_networks_compared_in_one_survey(qftplan, tmp_path):
    # network= takes a name or a list, like strategy=; the module's CSV is the command line's byte for byte.
    csv_path = tmp_path / "s.csv"
    run_cli("survey", "line:*", "--qubits", "16,24", "--approx", "4,none", "--network", "insertion,auto",
            "--jobs", 1, "--no-timing", "--quiet", "--csv", csv_path, check=True)
    kwargs = dict(approx=[4, None], network=["insertion", "auto"])
    assert qftplan.survey_csv("line:*", [16, 24], **kwargs) == csv_path.read_bytes().decode()
    rows = qftplan.survey("line:*", [16, 24], **kwargs)
    assert [(r["asked_network"], r["asked_approx"], r["qubits"]) for r in rows] == [
        (w, a, n) for w in ("insertion", "auto") for a in ("4", "none") for n in (16, 24)]
    for r in rows:
        if r["asked_network"] == "insertion" and r["asked_approx"] == "none":
            # The insertion network exists for approximate degrees only: a failed row with plan's reason.
            assert r["status"] == "failed" and r["cx_count"] is None and "insertion" in r["reason"]
            with pytest.raises(qftplan.InputError) as e:
                qftplan.plan(r["device"], r["qubits"], network="insertion")
            assert r["reason"] in str(e.value)
            continue
        assert r["status"] == "ok"
        approx = "none" if r["asked_approx"] == "none" else int(r["asked_approx"])
        report = qftplan.plan(r["device"], r["qubits"], approx=approx, network=r["asked_network"]).report
        assert (r["network"], r["cx_count"], r["cx_depth"]) == (report["network"], report["cx_count"], report["cx_depth"])
        if r["asked_network"] == "insertion":
            assert r["network"] == "insertion"
    # A single name is a list of one.
    one = qftplan.survey("line:*", 16, approx=4, network="insertion")
    assert [(r["asked_network"], r["network"]) for r in one] == [("insertion", "insertion")]


def test_bad_network_names(qftplan):
    status, _, err = run_cli("survey", "line:4", "--qubits", "3", "--network", "auto,teleport", "--quiet")
    assert status == 2 and "--network" in err and "teleport" in err
    with pytest.raises(qftplan.InputError, match="network"):
        qftplan.survey("line:4", 3, network="teleport")
    with pytest.raises(TypeError):
        qftplan.survey("line:4", 3, network=3)
