"""Plans made through the Python module, simulated by our own small simulator (qasm_sim.py) from the
OpenQASM text the module returns, against numpy's FFT (exact QFT) and the AQFT's defining formula."""

import numpy as np
import pytest

from conftest import TOPOLOGIES, aqft_matrix, qft_matrix
from qasm_sim import equal_up_to_phase, parse, register_unitary

DEVICES = ["line:6", "ring:6", "grid:3x3", "heavy-hex:1x1", str(TOPOLOGIES / "harbor-noisy-20.yaml")]


def simulate(plan):
    u, leak = register_unitary(parse(plan.qasm), plan.placement, plan.final_placement)
    assert leak < 1e-9, "qubits outside the register did not return to |0>"
    return u


def test_numpy_convention_is_the_textbook_qft():
    # Nielsen & Chuang (2000), eq. 5.2, written out element by element for n = 3.
    n, dim = 3, 8
    expected = np.array([[np.exp(2j * np.pi * j * y / dim) for j in range(dim)] for y in range(dim)]) / np.sqrt(dim)
    assert np.allclose(qft_matrix(n), expected)
    assert np.allclose(qft_matrix(n, inverse=True), expected.conj().T)
    # With every rotation kept the AQFT formula is the QFT (Coppersmith 1994: degree n is exact).
    assert np.allclose(aqft_matrix(n, n), expected)


@pytest.mark.parametrize("device", DEVICES)
@pytest.mark.parametrize("n", [1, 2, 3, 4, 5])
@pytest.mark.parametrize("inverse", [False, True])
def test_exact_plan_matches_numpy_fft(qftplan, device, n, inverse):
    plan = qftplan.plan(device, n, inverse=inverse, gates="logical")
    assert equal_up_to_phase(simulate(plan), qft_matrix(n, inverse))


@pytest.mark.parametrize("gates", ["logical", "cx", "cz"])
@pytest.mark.parametrize("fmt", ["qasm3", "qasm2"])
@pytest.mark.parametrize("strategy", ["chain", "routed"])
def test_every_gate_set_and_format(qftplan, gates, fmt, strategy):
    n = 5
    plan = qftplan.plan("grid:3x3", n, gates=gates, format=fmt, strategy=strategy)
    assert plan.format == fmt
    assert equal_up_to_phase(simulate(plan), qft_matrix(n))


@pytest.mark.parametrize("device", ["line:7", "grid:3x3", str(TOPOLOGIES / "harbor-hex-21.yaml")])
@pytest.mark.parametrize("degree", [1, 2, 3, 4])
@pytest.mark.parametrize("inverse", [False, True])
def test_approximate_plan_matches_the_aqft_formula(qftplan, device, degree, inverse):
    n = 6
    plan = qftplan.plan(device, n, approx=degree, inverse=inverse)
    assert plan.report["approx_degree"] == degree
    assert equal_up_to_phase(simulate(plan), aqft_matrix(n, degree, inverse))


@pytest.mark.parametrize("device", DEVICES)
@pytest.mark.parametrize("approx", ["none", 2, 3])
@pytest.mark.parametrize("inverse", [False, True])
@pytest.mark.parametrize("strategy", ["auto", "chain", "routed"])
def test_end_order_same_is_the_transform_with_the_identity_map(qftplan, device, approx, inverse, strategy):
    n = 5
    plan = qftplan.plan(device, n, approx=approx, inverse=inverse, strategy=strategy, end_order="same")
    assert plan.final_placement == plan.placement
    assert plan.report["end_order"] == "same"
    # The same map at both ends: output bit k is read where input bit k was written.
    u, leak = register_unitary(parse(plan.qasm), plan.placement, plan.placement)
    assert leak < 1e-9
    expected = qft_matrix(n, inverse) if approx == "none" else aqft_matrix(n, approx, inverse)
    assert equal_up_to_phase(u, expected)


def test_gate_list_is_the_text(qftplan):
    plan = qftplan.plan("grid:3x3", 4, gates="cx")
    from_text = parse(plan.qasm)
    from_list = [(name, qs, angle) for name, qs, angle in plan.gate_list() if name != "measure"]
    assert [(g[0], g[1]) for g in from_list] == [(g[0], g[1]) for g in from_text]
    for (_, _, a), (_, _, b) in zip(from_list, from_text):
        assert (a is None and b is None) or abs(a - b) < 1e-12
    u, _ = register_unitary(from_list, plan.placement, plan.final_placement)
    assert equal_up_to_phase(u, qft_matrix(4))


def test_module_text_equals_the_command_line_output(qftplan, tmp_path):
    from conftest import run_cli
    out = tmp_path / "c.qasm"
    device = str(TOPOLOGIES / "harbor-noisy-20.yaml")
    run_cli("plan", "--device", device, "--qubits", 7, "--approx", 3, "--measure", "--output", out, check=True)
    plan = qftplan.plan(device, 7, approx=3, measure=True)
    assert plan.qasm == out.read_text()
