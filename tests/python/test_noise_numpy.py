"""The noise model against a noisy simulation of our own (noise_sim.py, numpy density matrices): the
reported ESP figures equal the product of no-error probabilities recounted from the written file and the
YAML with the README's formulas, and the simulated process fidelity is never below esp_total (ESP is the
probability that no channel errs, and an erring run can still land on the right state, so ESP is a lower
estimate of the fidelity; README "What the numbers mean")."""

import math

import numpy as np
import pytest

from conftest import TOPOLOGIES
import noise_sim

BUNDLED = sorted(p.name for p in TOPOLOGIES.glob("*.yaml"))


def plan_on(qftplan, name, n, **kw):
    # The simulator follows the unitary transform then a readout; the semi-classical readout (chosen by
    # default on chips with feed-forward) has its own tests (test_semiclassical.py).
    if kw.get("measure"):
        kw.setdefault("readout", "unitary")
    path = str(TOPOLOGIES / name)
    return path, qftplan.plan(path, n, **kw)


def test_channels_match_their_kraus_forms():
    # The simulator's channels against their textbook Kraus forms on a random 3-qubit state: amplitude
    # damping K0 = diag(1, sqrt(1 - gamma)), K1 = sqrt(gamma)|0><1| followed by phase flips that bring the
    # coherence to e^(-t/T2) (Nielsen and Chuang 2000, section 8.3.5-8.3.6), and the two-qubit
    # depolarising channel as the sum over the 15 non-identity Paulis.
    rng = np.random.default_rng(0)
    d = 8
    a = rng.normal(size=(d, d)) + 1j * rng.normal(size=(d, d))
    rho = a @ a.conj().T
    rho /= np.trace(rho)
    op = lambda m: np.kron(np.kron(np.eye(2), m), np.eye(2))  # on the middle qubit (axis 1)
    g1, g2 = math.exp(-500 / 20000), math.exp(-500 / 30000)
    k0, k1 = np.diag([1, math.sqrt(g1)]), np.array([[0, math.sqrt(1 - g1)], [0, 0]])
    damped = op(k0) @ rho @ op(k0).conj().T + op(k1) @ rho @ op(k1).conj().T
    p = (1 - g2 / math.sqrt(g1)) / 2
    z = op(np.diag([1, -1]))
    expected = (1 - p) * damped + p * z @ damped @ z
    sim = noise_sim.DensityMatrix(rho.copy(), 3)
    sim.damp(1, 500, 20, 30, twirled=False)
    assert np.abs(sim.rho.reshape(d, d) - expected).max() < 1e-14
    total = np.zeros((d, d), dtype=complex)
    for i in range(4):
        for j in range(4):
            if i or j:
                m = np.kron(np.kron(noise_sim.PAULIS[i], np.eye(2)), noise_sim.PAULIS[j])
                total += m @ rho @ m.conj().T
    sim = noise_sim.DensityMatrix(rho.copy(), 3)
    sim.pauli_channel([0, 2], 0.3)
    assert np.abs(sim.rho.reshape(d, d) - (0.7 * rho + 0.3 / 15 * total)).max() < 1e-14
    # The twirled idle channel keeps the state with (1 + e^(-t/T1) + 2 e^(-t/T2)) / 4 (Ghosh, Fowler, Geller,
    # Phys. Rev. A 86, 062318, 2012): its entanglement fidelity, equal to the untwirled channel's.
    phi = np.zeros(4, dtype=complex)
    phi[0] = phi[3] = 1 / math.sqrt(2)
    for twirled in (False, True):
        choi = noise_sim.DensityMatrix(np.outer(phi, phi.conj()), 2)
        choi.damp(0, 700, 40, 25, twirled)
        f = np.vdot(phi, choi.rho.reshape(4, 4) @ phi).real
        assert f == pytest.approx(noise_sim.twirled_keep(700, 40, 25), abs=1e-15)


@pytest.mark.parametrize("name", BUNDLED)
@pytest.mark.parametrize("measure", [False, True])
def test_reported_esp_equals_the_recount_from_the_file(qftplan, name, measure):
    for n, strategy in ((6, "auto"), (5, "routed")):
        path, plan = plan_on(qftplan, name, n, measure=measure, strategy=strategy)
        r = plan.report
        cal = noise_sim.Calibration(path)
        events, end = noise_sim.schedule(noise_sim.parse(plan.qasm), cal, plan.placement)
        esp, idle, readout = noise_sim.no_error_probability(events, cal, noise_sim.measured_qubits(plan.qasm))
        assert r["duration_ns"] == pytest.approx(end, rel=1e-12)
        assert r["esp"] == pytest.approx(esp, rel=1e-9)
        assert r["esp_idle"] == pytest.approx(idle, rel=1e-9)
        assert (r["esp_readout"] is None) == (not measure)
        assert (r["esp_readout"] or 1.0) == pytest.approx(readout, rel=1e-9)
        assert r["esp_total"] == pytest.approx(esp * idle * readout, rel=1e-9)


@pytest.mark.parametrize("name", BUNDLED)
def test_simulated_process_fidelity_is_at_least_esp_total(qftplan, name):
    # Exact (Choi state) on 4 qubits, measured (readout flips included), with the T1/T2 channel itself and
    # with its Pauli twirl: ESP is the no-error probability of the twirled model, so below its fidelity;
    # the untwirled channel has the same per-interval fidelity and must stay above ESP too.
    path, plan = plan_on(qftplan, name, 4, measure=True)
    for twirled in (False, True):
        s = noise_sim.simulate(plan.qasm, path, plan.placement, twirled=twirled)
        assert s["esp_total"] == pytest.approx(plan.report["esp_total"], rel=1e-9)
        assert s["process_fidelity"] <= 1 + 1e-12
        assert s["process_fidelity"] >= plan.report["esp_total"] - 1e-12, (name, twirled, s)
        # And not a vacuous bound: on these chips errors that still give the right state are rare, so the
        # fidelity exceeds ESP by a small part of the error probability (a model several times too harsh,
        # as the product exp(-t/T1) exp(-t/T2) over the whole run was, fails here).
        assert s["process_fidelity"] - plan.report["esp_total"] <= 0.1 * (1 - plan.report["esp_total"]), s


def test_sampled_process_fidelity_on_eight_qubits(qftplan):
    # n = 8 by Haar-random input states (F_pro = ((d + 1) F_avg - 1) / d; Nielsen, Phys. Lett. A 303, 249,
    # 2002): within four standard errors, never below esp_total.
    path, plan = plan_on(qftplan, "harbor-noisy-20.yaml", 8, measure=True)
    s = noise_sim.simulate(plan.qasm, path, plan.placement, samples=12, seed=3)
    assert s["esp_total"] == pytest.approx(plan.report["esp_total"], rel=1e-9)
    assert s["process_fidelity"] + 4 * s["process_fidelity_se"] >= plan.report["esp_total"]
    assert s["process_fidelity"] - 4 * s["process_fidelity_se"] <= 1


def test_the_noise_sim_tool_prints_the_report_figures(qftplan, tmp_path):
    # tools/noise-sim, as the README runs it: the register from the file's header, the figures recounted.
    import subprocess
    import sys
    from conftest import SOURCE_DIR, run_cli
    device = TOPOLOGIES / "harbor-ring-16.yaml"
    out = tmp_path / "r.qasm"
    run_cli("plan", "--device", device, "--qubits", 4, "--measure", "-o", out, "--quiet", check=True)
    plan = qftplan.plan(str(device), 4, measure=True)
    proc = subprocess.run([sys.executable, str(SOURCE_DIR / "tools" / "noise-sim"), str(out), "--device", str(device)],
                          capture_output=True, text=True, check=True)
    fields = dict(line.split(None, 1) for line in proc.stdout.splitlines() if line.startswith("esp_"))
    assert float(fields["esp_total"]) == pytest.approx(plan.report["esp_total"], rel=1e-5)
    assert "process fidelity" in proc.stdout and "(exact)" in proc.stdout
