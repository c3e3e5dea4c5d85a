"""The semi-classical readout (issue 20) simulated outside the project: our own small simulator
(qasm_sim.py) follows every measurement branch of the OpenQASM text the module returns, and the
outcome distribution is compared with numpy's FFT (the exact QFT), the AQFT's defining formula, and
phase estimation (Nielsen and Chuang, "Quantum Computation and Quantum Information", 2000, section
5.2: the measured inverse QFT of sum_y e^{2 pi i phi y} |y> / sqrt(N) gives j with certainty when
phi = j / N, and the distribution |sum_y e^{2 pi i (phi - x/N) y}|^2 / N^2 otherwise)."""

import math

import numpy as np
import pytest

from conftest import aqft_matrix, qft_matrix, run_cli
from qasm_sim import outcome_distribution, parse_dynamic


def dynamic_chip(tmp_path, n=8, ff=300):
    text = (f"name: dyn-{n}\nqubits: {n}\ncalibration:\n  error_1q: 0.001\n  error_2q: 0.01\n  error_readout: 0.02\n"
            f"  duration_1q_ns: 40\n  duration_2q_ns: 300\n  t1_us: 100\n  t2_us: 80\n"
            f"  duration_readout_ns: 800\n  feed_forward_ns: {ff}\ncouplers:\n")
    text += "".join(f"  - [{q}, {q + 1}]\n" for q in range(n - 1))
    path = tmp_path / f"dyn-{n}-{ff}.yaml"
    path.write_text(text)
    return str(path)


def distribution(plan, state):
    ops, bits = parse_dynamic(plan.qasm)
    return outcome_distribution(ops, bits, plan.placement, state)


def phase_state(n, phi):
    y = np.arange(2 ** n)
    return np.exp(2j * np.pi * phi * y) / math.sqrt(2 ** n)


@pytest.mark.parametrize("fmt", ["qasm3", "qasm2"])
@pytest.mark.parametrize("n", [1, 2, 3, 4, 5, 6])
def test_phase_estimation_against_numpy_fft(qftplan, tmp_path, fmt, n):
    plan = qftplan.plan(dynamic_chip(tmp_path), n, inverse=True, measure=True, readout="semiclassical", format=fmt)
    assert plan.report["readout"]["chosen"] == "semiclassical"
    dim = 2 ** n
    # Exact phases j / N: outcome j with certainty (Nielsen and Chuang, section 5.2).
    for j in sorted({0, 1, dim // 2, dim - 1}):
        dist = distribution(plan, phase_state(n, j / dim))
        assert dist[j] == pytest.approx(1, abs=1e-9)
    # Inexact phases: numpy's fft of the input (the inverse QFT is fft / sqrt(N), conftest.qft_matrix).
    for phi in (1 / 3, 0.3141, 0.999):
        a = phase_state(n, phi)
        want = np.abs(np.fft.fft(a) / math.sqrt(dim)) ** 2
        assert np.allclose(distribution(plan, a), want, atol=1e-9)
        # The textbook closed form of the same distribution (Nielsen and Chuang, eq. 5.26 before the bound).
        x = np.arange(dim)
        closed = np.abs(np.array([sum(np.exp(2j * np.pi * (phi - xi / dim) * y) for y in range(dim)) for xi in x])) ** 2
        assert np.allclose(want, closed / dim ** 2, atol=1e-9)


@pytest.mark.parametrize("inverse", [False, True])
@pytest.mark.parametrize("approx", ["none", 1, 2, 3])
def test_distribution_is_the_unitary_transform_then_measurement(qftplan, tmp_path, inverse, approx):
    n = 5
    plan = qftplan.plan(dynamic_chip(tmp_path), n, inverse=inverse, measure=True, readout="semiclassical",
                        approx=approx)
    # Exact: numpy's FFT; degree M: the AQFT's defining formula (Coppersmith 1994; conftest.aqft_matrix).
    u = qft_matrix(n, inverse) if approx == "none" else aqft_matrix(n, approx, inverse)
    rng = np.random.default_rng(20)
    states = [np.eye(2 ** n)[j] for j in (0, 5, 31)]
    for _ in range(3):
        a = rng.normal(size=2 ** n) + 1j * rng.normal(size=2 ** n)
        states.append(a / np.linalg.norm(a))
    for a in states:
        assert np.allclose(distribution(plan, a), np.abs(u @ a) ** 2, atol=1e-9)


def test_readout_keyword_and_auto(qftplan, tmp_path):
    fast, slow = dynamic_chip(tmp_path, ff=200), dynamic_chip(tmp_path, ff=40000)
    for chip, want in ((fast, "semiclassical"), (slow, "unitary")):
        auto = qftplan.plan(chip, 6, inverse=True, measure=True, circuit=False)
        u = qftplan.plan(chip, 6, inverse=True, measure=True, readout="unitary", circuit=False)
        s = qftplan.plan(chip, 6, inverse=True, measure=True, readout="semiclassical", circuit=False)
        assert auto.report["readout"]["chosen"] == want
        assert auto.report["esp_total"] == pytest.approx(max(u.report["esp_total"], s.report["esp_total"]), rel=1e-12)
        assert auto.report["readout"]["unitary_esp_total"] == pytest.approx(u.report["esp_total"], rel=1e-12)
        assert auto.report["readout"]["semiclassical_esp_total"] == pytest.approx(s.report["esp_total"], rel=1e-12)
    with pytest.raises(qftplan.InputError, match="readout semiclassical needs a measured plan"):
        qftplan.plan(fast, 3, readout="semiclassical")


def test_command_line_plans_checks_and_refuses(tmp_path):
    chip = dynamic_chip(tmp_path)
    out = tmp_path / "sc.qasm"
    status, _, err = run_cli("plan", "--device", chip, "-n", "4", "--inverse", "--readout", "semiclassical")
    assert status == 2 and "--readout semiclassical needs a measured plan (--measure)" in err
    status, text, _ = run_cli("plan", "--device", chip, "-n", "5", "--inverse", "--measure", "--explain", "-o", str(out))
    assert status == 0 and "readout: semiclassical chosen" in text and "unitary        esp_total" in text
    status, text, _ = run_cli("check", "--device", chip, str(out))
    assert status == 0 and "proved (semi-classical)" in text
    # A correction conditioned on the wrong bit: rejected (exit 1) with its line.
    bad = tmp_path / "bad.qasm"
    bad.write_text(out.read_text().replace("if (c[1]) p(-pi/2**2)", "if (c[0]) p(-pi/2**2)", 1))
    status, _, err = run_cli("check", "--device", chip, str(bad))
    assert status == 1 and "conditioned on c[0] add up to" in err
    # No feed-forward on the chip: refused with the reason.
    status, _, err = run_cli("plan", "--device", "line:5", "-n", "3", "--measure", "--readout", "semiclassical")
    assert status == 1 and "offers no feed-forward" in err


def test_surveys_take_the_same_setting(qftplan, tmp_path):
    chip = dynamic_chip(tmp_path)
    rows = qftplan.survey([chip], [3, 6], inverse=True, measure=True, readout="semiclassical", jobs=1)
    assert [r["strategy"] for r in rows] == ["semiclassical", "semiclassical"]
    for r in rows:
        single = qftplan.plan(chip, r["qubits"], inverse=True, measure=True, readout="semiclassical", circuit=False)
        assert r["esp_total"] == pytest.approx(single.report["esp_total"], rel=1e-12)
    with pytest.raises(qftplan.InputError, match="readout semiclassical needs a measured plan"):
        qftplan.survey([chip], 3, readout="semiclassical")
    status, _, err = run_cli("survey", chip, "--qubits", "3", "--readout", "semiclassical")
    assert status == 2 and "--readout semiclassical needs a measured plan" in err
    status, out, _ = run_cli("survey", chip, "--qubits", "3", "--inverse", "--measure", "--readout", "semiclassical",
                             "--csv", "-", "--no-timing")
    assert status == 0 and "semiclassical" in out


@pytest.mark.parametrize("chip", ["harbor-line-12", "dyn"])
@pytest.mark.parametrize("n", [2, 5, 8])
def test_esp_figures_recounted_from_the_file(qftplan, tmp_path, chip, n):
    # noise_sim schedules the file itself from README "What the numbers mean" (dynamic circuits) and the
    # YAML read by PyYAML; the report's figures must be its products.
    import noise_sim
    from conftest import TOPOLOGIES
    path = str(TOPOLOGIES / "harbor-line-12.yaml") if chip == "harbor-line-12" else dynamic_chip(tmp_path)
    plan = qftplan.plan(path, n, inverse=True, measure=True, readout="semiclassical")
    ops, _ = parse_dynamic(plan.qasm)
    cal = noise_sim.Calibration(path)
    events, end, measured = noise_sim.schedule_dynamic(ops, cal, plan.placement)
    gates, idle, readout = noise_sim.no_error_probability(events, cal, measured)
    r = plan.report
    assert gates == pytest.approx(r["esp"], rel=1e-9)
    assert idle == pytest.approx(r["esp_idle"], rel=1e-9)
    assert readout == pytest.approx(r["esp_readout"], rel=1e-9)
    assert gates * idle * readout == pytest.approx(r["esp_total"], rel=1e-9)
    assert end == pytest.approx(r["duration_ns"], rel=1e-12)
    assert sum(e[2] for e in events if e[0] == "idle") == pytest.approx(r["idle_ns"], rel=1e-12)


@pytest.mark.parametrize("n", [2, 3, 4])
def test_noisy_simulation_stays_within_esp_total(qftplan, n):
    # The noisy simulation of noise_sim (Pauli channels after gates, the twirled T1/T2 channel on the idle
    # intervals, readout flips that the later phases also read) of the semi-classical plan on
    # harbor-line-12: the noise model is a mixture "no error with probability esp_total, else anything",
    # so the outcome distribution is within total variation 1 - esp_total of the ideal one, and phase
    # estimation of an exact phase succeeds with probability at least esp_total.
    import noise_sim
    from conftest import TOPOLOGIES
    path = str(TOPOLOGIES / "harbor-line-12.yaml")
    plan = qftplan.plan(path, n, inverse=True, measure=True, readout="semiclassical")
    ops, _ = parse_dynamic(plan.qasm)
    cal = noise_sim.Calibration(path)
    events, _, _ = noise_sim.schedule_dynamic(ops, cal, plan.placement)
    esp_total = plan.report["esp_total"]
    dim = 2 ** n
    for j in (1, dim - 1):
        state = phase_state(n, j / dim)
        noisy = noise_sim.simulate_dynamic(events, cal, plan.placement, state)
        ideal = np.abs(np.fft.fft(state) / math.sqrt(dim)) ** 2
        assert noisy.sum() == pytest.approx(1, abs=1e-9)
        assert 0.5 * np.abs(noisy - ideal).sum() <= 1 - esp_total + 1e-12
        assert noisy[j] >= esp_total - 1e-12
        # And not vacuous: the errors do change the outcome.
        assert noisy[j] < 1 - 1e-4
    # With every error off the same simulation is the ideal distribution.
    clean = noise_sim.Calibration(path)
    clean.default = dict(clean.default, error_1q=0.0, error_readout=0.0, t1_us=math.inf, t2_us=math.inf)
    clean.qubit = {}
    events, _, _ = noise_sim.schedule_dynamic(ops, clean, plan.placement)
    state = phase_state(n, 0.3141)
    assert np.allclose(noise_sim.simulate_dynamic(events, clean, plan.placement, state),
                       np.abs(np.fft.fft(state) / math.sqrt(dim)) ** 2, atol=1e-9)
