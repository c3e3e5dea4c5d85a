"""The module's devices and plans agree with the command line's output for the same request."""

import json
import warnings

import pytest

from conftest import TOPOLOGIES, run_cli


def test_version_and_docstrings(qftplan):
    assert qftplan.__version__ == run_cli("--version")[1].split()[1]
    for name in ("load_device", "plan", "check", "check_file", "survey", "survey_csv", "Device", "Plan", "CheckResult",
                 "InputError", "PlanningError"):
        assert getattr(qftplan, name).__doc__, name


def test_device_matches_the_command_line(qftplan):
    path = TOPOLOGIES / "harbor-hex-21.yaml"
    dev = qftplan.load_device(path)
    assert dev.to_yaml() == run_cli("device", path, check=True)[1]
    assert dev.summary_text() == run_cli("device", path, "--summary", check=True)[1]
    assert dev == qftplan.device_from_yaml(dev.to_yaml())
    s = dev.summary()
    assert (s["qubits"], s["couplers"], s["bipartite"]) == (len(dev), dev.coupler_count, True)


def test_lattice_generators(qftplan):
    # Counts from the README's lattice definitions: a grid has R(C-1) + C(R-1) couplers; the heavy-hexagon
    # lattice 5RC + 4R + 4C - 1 qubits and 6RC + 4R + 4C - 2 couplers.
    g = qftplan.grid(3, 4)
    assert (g.qubit_count, g.coupler_count) == (12, 3 * 3 + 4 * 2)
    hh = qftplan.heavy_hex(2, 3)
    assert (hh.qubit_count, hh.coupler_count) == (5 * 6 + 8 + 12 - 1, 6 * 6 + 8 + 12 - 2)
    assert qftplan.full(5).coupler_count == 10 and qftplan.ring(5).coupler_count == 5
    assert qftplan.line(4).neighbours(1) == [0, 2] and qftplan.line(4).coupled(2, 3)
    with pytest.raises(IndexError):
        qftplan.line(4).neighbours(4)


def test_report_matches_the_command_line(qftplan, tmp_path):
    device = str(TOPOLOGIES / "harbor-noisy-20.yaml")
    path = tmp_path / "r.json"
    run_cli("plan", "--device", device, "--qubits", 9, "--approx", 3, "--placement", "0,1,2,3,4,9,8,7,6",
            "--report", path, check=True)
    cli = json.loads(path.read_text())
    plan = qftplan.plan(device, 9, approx=3, placement=[0, 1, 2, 3, 4, 9, 8, 7, 6], circuit=False)
    assert plan.qasm is None
    mine = plan.report
    for r in (cli, mine):
        r.pop("elapsed_ms")
        r.pop("output_bytes", None)
    assert mine == cli
    assert plan.summary().startswith("QFT on 9 qubits")
    assert "placement: pinned" in plan.explanation()


def test_network_choice_matches_the_command_line(qftplan):
    # Counts from the README's networks table: on a chain of n qubits the exact QFT needs 3 n(n-1)/2 CX
    # on the reversal network (Fowler, Devitt and Hollenberg 2004, fused blocks of 3 CX) and n^2 - 1 on
    # the parity network (ours, include/qftplan/networks/parity_qft.hpp).
    n = 7
    for network, cx in (("reversal", 3 * n * (n - 1) // 2), ("parity", n * n - 1)):
        mine = qftplan.plan("line:7", n, network=network, strategy="chain", circuit=False).report
        cli = json.loads(run_cli("plan", "--device", "line:7", "--qubits", n, "--network", network,
                                 "--strategy", "chain", "--report", "-", check=True)[1])
        assert (mine["network"], mine["cx_count"]) == (network, cx) == (cli["network"], cli["cx_count"])
    with pytest.raises(qftplan.InputError, match="network"):
        qftplan.plan("line:4", 4, network="zigzag")


def test_time_limit_warns_and_returns_a_plan(qftplan):
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        plan = qftplan.plan("heavy-hex:3x3", 60, time_limit=1e-6, circuit=False, strategy="chain")
    if plan.cut_short is not None:
        assert any(issubclass(w.category, RuntimeWarning) for w in caught)
    assert len(plan.placement) == 60
    with pytest.raises(qftplan.InputError):
        qftplan.plan("line:4", 3, time_limit=-1)


def test_peephole_keyword_matches_the_command_line(qftplan, tmp_path):
    # Issue 18: the cz chip's QFT of 10 qubits held 45 adjacent h h pairs (h h = I: Nielsen and Chuang,
    # "Quantum Computation and Quantum Information", 2000, section 4.2); 46 since the parity network's
    # last Hadamard follows a cx onto its qubit (issue 19, depth 5n - 4). The pass removes them, and
    # peephole=False / --no-peephole keeps the gates as decomposed.
    device = str(TOPOLOGIES / "harbor-grid-5x5.yaml")
    lean = qftplan.plan(device, 10, gates="cz")
    raw = qftplan.plan(device, 10, gates="cz", peephole=False)
    assert raw.report["peephole_removed"] is None
    assert lean.report["peephole_removed"] == 92
    count = lambda text, name: sum(1 for line in text.splitlines() if line.startswith(name + " "))
    assert (count(raw.qasm, "h"), count(lean.qasm, "h")) == (208, 116)
    assert count(raw.qasm, "cz") == count(lean.qasm, "cz") == lean.report["cx_count"]
    assert sum(lean.report["gate_counts"].values()) == sum(raw.report["gate_counts"].values()) - 92
    path = tmp_path / "r.json"
    run_cli("plan", "--device", device, "--qubits", 10, "--gates", "cz", "--no-peephole", "--report", path, check=True)
    cli = json.loads(path.read_text())
    assert cli["peephole_removed"] is None and cli["gate_counts"] == raw.report["gate_counts"]
