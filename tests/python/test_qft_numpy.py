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


def blockwise_matrix(n, m, inverse=False):
    """The block construction of Kahanamoku-Meyer, Blue, Bergamaschi, Gidney and Chuang ("A log-depth
    in-place quantum Fourier transform that rarely needs ancillas", arXiv:2505.00701, 2025) from its
    description, with numpy's FFT for each block transform: blocks of m bits from bit 0; A, the in-place
    transform of each block pair (2i+1, 2i); B, each block of those pairs read back by its inverse; C, block
    0, each pair (2i+2, 2i+1), and the top block when A paired it. An in-place transform of a bit range is
    the QFT of the range's value (sqrt(S) ifft, as qft_matrix) followed by reversing the range's bits (the
    textbook circuit without its final swaps, Nielsen & Chuang 2000, eq. 5.4); the output bits are read in
    the order of eq. 5.2 (all bits reversed at the end)."""
    dim = 2 ** n
    blocks = [(low, min(m, n - low)) for low in range(0, n, m)]
    k = len(blocks)
    steps = [(blocks[b - 1][0], blocks[b - 1][1] + blocks[b][1], False) for b in range(1, k, 2)]
    for b in range(1, k, 2):
        steps += [(blocks[b][0], blocks[b][1], True), (blocks[b - 1][0], blocks[b - 1][1], True)]
    steps.append((blocks[0][0], blocks[0][1], False))
    steps += [(blocks[b - 1][0], blocks[b - 1][1] + blocks[b][1], False) for b in range(2, k, 2)]
    if k % 2 == 0 and k > 1:
        steps.append((blocks[k - 1][0], blocks[k - 1][1], False))

    # Tensor axes: axis t holds bit n-1-t of the row index; the last axis is the column.
    def reverse_range(u, low, size):
        axes = list(range(n + 1))
        lo, hi = n - low - size, n - low  # the range's axes, most significant first
        axes[lo:hi] = axes[lo:hi][::-1]
        return u.transpose(axes)

    def range_qft(u, low, size, inv):
        lo = n - low - size
        shape = u.shape
        v = u.reshape(shape[:lo] + (2 ** size,) + shape[lo + size:])
        s = 2 ** size
        v = np.fft.fft(v, axis=lo) / np.sqrt(s) if inv else np.fft.ifft(v, axis=lo) * np.sqrt(s)
        return v.reshape(shape)

    def in_place(u, low, size, inv):  # the in-place transform of a range, or its inverse
        if not inv:
            return reverse_range(range_qft(u, low, size, False), low, size)
        return range_qft(reverse_range(u, low, size), low, size, True)

    u = np.eye(dim, dtype=complex).reshape((2,) * n + (dim,))
    if not inverse:
        for low, size, inv in steps:
            u = in_place(u, low, size, inv)
        u = reverse_range(u, 0, n)
    else:  # every step undone, in reverse order
        u = reverse_range(u, 0, n)
        for low, size, inv in steps[::-1]:
            u = in_place(u, low, size, not inv)
    return u.reshape(dim, dim)


def test_blockwise_numpy_reference_is_exact_with_two_blocks():
    # With at most two blocks the construction is the QFT (the paper's base case): the reference agrees.
    for n, m in [(4, 2), (5, 3), (6, 6)]:
        assert np.allclose(blockwise_matrix(n, m), qft_matrix(n))
        assert np.allclose(blockwise_matrix(n, m, inverse=True), qft_matrix(n, inverse=True))
    assert not np.allclose(blockwise_matrix(7, 2), qft_matrix(7), atol=1e-3)


@pytest.mark.parametrize("device", ["line:8", "grid:3x3"])
@pytest.mark.parametrize("m", [1, 2, 3])
@pytest.mark.parametrize("inverse", [False, True])
def test_blockwise_plan_matches_numpy(qftplan, device, m, inverse):
    n = 8
    plan = qftplan.plan(device, n, approx=m, network="blockwise", inverse=inverse, strategy="chain")
    assert plan.report["block_length"] == m
    u = simulate(plan)
    ref = blockwise_matrix(n, m, inverse)
    assert equal_up_to_phase(u, ref)
    # The report's figures against the reference: readout success E_x |<QFT x|U x>|^2 and the normalised
    # Frobenius distance ||U - QFT||_F / sqrt(2^n) (no phase removed), both over every basis input.
    f = qft_matrix(n, inverse)
    overlaps = np.einsum("ij,ij->j", f.conj(), ref)
    if not inverse:
        assert abs(plan.report["readout_success"] - np.mean(np.abs(overlaps) ** 2)) < 1e-9
        frob = np.linalg.norm(ref - f) / np.sqrt(2 ** n)
        assert abs(plan.report["blockwise"]["frobenius_distance"] - frob) < 1e-9
    assert qftplan.check(plan.qasm, device, n, block_length=m, inverse=inverse).outcome == "proved"
