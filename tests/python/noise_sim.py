"""A noisy simulation of our own, written for the tests and tools/noise-sim only: it reads an OpenQASM file
qftplan wrote and a device YAML file, schedules the gates itself and simulates the circuit under the
channels the noise model of the README stands for, with numpy density matrices. It shares no code with
qftplan (its reader is qasm_sim.parse, its YAML reader PyYAML).

Channels (README "What the numbers mean"):
- after every timed gate, a Pauli (depolarising) channel with the calibrated error e: with probability e
  one of the 4^k - 1 non-identity Paulis on the gate's k qubits, uniformly (so the gate's entanglement
  fidelity is 1 - e; common practice for turning an error rate into a channel);
- on every idle interval t of a qubit holding information, amplitude damping with gamma = 1 - e^(-t/T1)
  and dephasing to a coherence decay e^(-t/T2) (the standard T1/T2 channel, Nielsen and Chuang,
  "Quantum Computation and Quantum Information", 2000, section 8.3.5-8.3.6); with `twirled=True` its Pauli
  twirl instead (Ghosh, Fowler, Geller, Phys. Rev. A 86, 062318, 2012: p_x = p_y = (1 - e^(-t/T1))/4,
  p_z = (1 - e^(-t/T2))/2 - p_x);
- before a measurement, a bit flip with the qubit's readout error.

The process fidelity of the noisy circuit to the ideal one is <Phi_U| rho |Phi_U> for the Choi state rho
(the circuit on half of a maximally entangled pair; Nielsen and Chuang, section 9.3, entanglement
fidelity), exact for up to 5 circuit qubits. Above that, the average fidelity over Haar-random input
states (sampled, with its standard error) gives it through F_pro = ((d + 1) F_avg - 1) / d (Horodecki,
Horodecki, Horodecki, Phys. Rev. A 60, 1888, 1999; Nielsen, Phys. Lett. A 303, 249, 2002).
"""

import math
import re

import numpy as np
import yaml

from qasm_sim import one_qubit_matrix, parse

DEFAULT_1Q_NS = 35.0   # README "Device files": the gate times used when a file gives none
DEFAULT_2Q_NS = 300.0
DEFAULT_READOUT_NS = 1000.0
TIMED_1Q = {"h", "x", "sx"}
FREE_1Q = {"rz", "p", "u1", "phase"}


class Calibration:
    """The calibration of a device file as the README defines it: device-wide values, per-qubit
    overrides, per-coupler values."""

    def __init__(self, path):
        with open(path) as f:
            d = yaml.safe_load(f)
        cal = d.get("calibration") or {}
        self.default = {
            "error_1q": cal.get("error_1q", 0.0), "error_readout": cal.get("error_readout", 0.0),
            "duration_1q_ns": cal.get("duration_1q_ns", DEFAULT_1Q_NS),
            "t1_us": cal.get("t1_us", math.inf), "t2_us": cal.get("t2_us", math.inf),
            # Dynamic circuits (README "Phase-estimation readout"): a mid-circuit measurement's length
            # (default 1000 ns) and the feed-forward latency (absent: none offered).
            "duration_readout_ns": cal.get("duration_readout_ns", DEFAULT_READOUT_NS),
            "feed_forward_ns": cal.get("feed_forward_ns")}
        self.qubit = {}
        for o in d.get("qubit_calibration") or []:
            q = dict(self.default)
            q.update({k: v for k, v in o.items() if k != "id"})
            self.qubit[o["id"]] = q
        self.error_2q = cal.get("error_2q", 0.0)
        self.duration_2q = cal.get("duration_2q_ns", DEFAULT_2Q_NS)
        self.coupler = {}
        for c in d.get("couplers") or []:
            pair, values = (c["pair"], c) if isinstance(c, dict) else (c, {})
            key = tuple(sorted(pair))
            self.coupler[key] = (values.get("error", self.error_2q), values.get("duration_ns", self.duration_2q))

    def of(self, q):
        return self.qubit.get(q, self.default)

    def pair(self, a, b):
        return self.coupler[tuple(sorted((a, b)))]


def measured_qubits(text):
    """Physical qubits measured at the end ($k in OpenQASM 3, q[k] in OpenQASM 2)."""
    return [int(a or b) for a, b in re.findall(r"measure\s+(?:\$(\d+)|[A-Za-z_]\w*\[(\d+)\])", text)]


def schedule(gates, cal, register):
    """The ASAP schedule of the gate list as events in order: ("gate", name, qubits, angle, error) and
    ("idle", qubit, t_ns); the idle intervals of qubits that hold information (register qubits from time 0,
    others from their first gate), including each holding qubit's wait until the end. Returns (events, end)."""
    events, end, _ = schedule_dynamic([("gate", name, qs, angle) for name, qs, angle in gates], cal, register)
    return events, end


def schedule_dynamic(ops, cal, register):
    """The schedule of any file (qasm_sim.parse_dynamic ops), as schedule() for gates, and for dynamic
    circuits as README "What the numbers mean" defines it: a measurement starts when its qubit is free, takes
    the qubit's duration_readout_ns, and ends the qubit's idling; a phase conditioned on a bit takes no time,
    but the qubit's next timed gate (or measurement) waits until feed_forward_ns (of the measured qubit) after
    that bit's measurement ended, one idle interval; the last measurement's own length is not scheduled.
    Returns (events, end, measured qubits), the events also holding ("measure", qubit, bit) and the
    conditioned phases ("if", bit, name, qubits, angle) in order."""
    ready, not_before, bit_ready, holds, events, measured = {}, {}, {}, set(register), [], []

    def wait(q, gap):
        if gap > 0 and q in holds:
            events.append(("idle", q, gap))

    def start(q):
        t = not_before.get(q, 0.0)
        if t > ready.get(q, 0.0):
            wait(q, t - ready.get(q, 0.0))
            ready[q] = t

    for op in ops:
        if op[0] == "measure":
            q, b = op[1], op[2]
            start(q)
            c = cal.of(q)
            bit_ready[b] = ready.get(q, 0.0) + c["duration_readout_ns"] + c["feed_forward_ns"]
            holds.discard(q)
            measured.append(q)
            events.append(("measure", q, b))
        elif op[0] == "if":
            q = op[3][0]
            not_before[q] = max(not_before.get(q, 0.0), bit_ready[op[1]])
            events.append(op)
        elif len(op[2]) == 2:
            name, qs, angle = op[1], op[2], op[3]
            for q in qs:
                start(q)
            error, dur = cal.pair(*qs)
            t = max(ready.get(q, 0.0) for q in qs)
            for q in qs:
                wait(q, t - ready.get(q, 0.0))
                holds.add(q)
                ready[q] = t + dur
            events.append(("gate", name, qs, angle, error))
        else:
            name, qs, angle = op[1], op[2], op[3]
            q = qs[0]
            holds.add(q)
            if name in TIMED_1Q:
                start(q)
                c = cal.of(q)
                ready[q] = ready.get(q, 0.0) + c["duration_1q_ns"]
                events.append(("gate", name, qs, angle, c["error_1q"]))
            else:
                events.append(("gate", name, qs, angle, 0.0))
    end = max(ready.values(), default=0.0)
    for q in sorted(holds):
        wait(q, end - ready.get(q, 0.0))
    return events, end, measured


def twirled_keep(t_ns, t1_us, t2_us):
    """(1 + e^(-t/T1) + 2 e^(-t/T2)) / 4: the no-error probability of the twirled channel."""
    return (1 + math.exp(-t_ns / (t1_us * 1000)) + 2 * math.exp(-t_ns / (t2_us * 1000))) / 4


def no_error_probability(events, cal, measured):
    """The product of the no-error probabilities of every channel of the schedule: gates, idling, readout."""
    gates = idle = readout = 1.0
    for e in events:
        if e[0] == "gate":
            gates *= 1 - e[4]
        elif e[0] == "idle":
            c = cal.of(e[1])
            idle *= twirled_keep(e[2], c["t1_us"], c["t2_us"])
    for q in measured:
        readout *= 1 - cal.of(q)["error_readout"]
    return gates, idle, readout


_X = one_qubit_matrix("x", None)
_Y = np.array([[0, -1j], [1j, 0]], dtype=complex)
_Z = np.diag([1.0, -1.0]).astype(complex)
PAULIS = [np.eye(2, dtype=complex), _X, _Y, _Z]


def gate_matrix(name, angle):
    """The gate's matrix (OpenQASM 3 specification, standard library; two-qubit gates as 4x4 on
    (first, second) with the first qubit the more significant); one-qubit gates as qasm_sim reads them."""
    if name in ("h", "x", "sx", "rz", "p", "u1", "phase"):
        return one_qubit_matrix(name, angle)
    if name in ("cx", "CX"):
        return np.array([[1, 0, 0, 0], [0, 1, 0, 0], [0, 0, 0, 1], [0, 0, 1, 0]], dtype=complex)
    if name == "cz":
        return np.diag([1, 1, 1, -1]).astype(complex)
    if name in ("cp", "cu1", "cphase"):
        return np.diag([1, 1, 1, np.exp(1j * angle)])
    if name == "swap":
        return np.array([[1, 0, 0, 0], [0, 0, 1, 0], [0, 1, 0, 0], [0, 0, 0, 1]], dtype=complex)
    raise ValueError(f"unsupported gate {name}")


class DensityMatrix:
    """rho over `width` qubits as a tensor with axes (ket_0 .. ket_{w-1}, bra_0 .. bra_{w-1}); the noise acts
    on the first `system` qubits (the circuit's), the rest are the reference half of a Choi state."""

    def __init__(self, rho, width):
        self.w = width
        self.rho = rho.reshape((2,) * (2 * width))

    def unitary(self, u, axes):
        k = len(axes)
        u = u.reshape((2,) * (2 * k))
        rho = np.tensordot(u, self.rho, axes=(list(range(k, 2 * k)), list(axes)))
        rho = np.moveaxis(rho, list(range(k)), list(axes))
        bra = [a + self.w for a in axes]
        rho = np.tensordot(rho, u.conj(), axes=(bra, list(range(k, 2 * k))))
        self.rho = np.moveaxis(rho, list(range(2 * self.w - k, 2 * self.w)), bra)

    def pauli_channel(self, axes, error):
        """(1 - e) rho + e/(4^k - 1) sum over non-identity Paulis P rho P, using the twirl identity
        sum over all 4^k Paulis P rho P = 2^k I (x) Tr_S(rho) (Nielsen and Chuang, section 8.3.4, exercise on
        the depolarising channel)."""
        if error == 0:
            return
        k, n = len(axes), 2 * self.w
        letters = [chr(ord("a") + i) for i in range(n)]
        for a in axes:
            letters[a + self.w] = letters[a]  # ket and bra of a traced axis share a letter
        kept = [letters[i] for i in range(n) if i not in axes and i - self.w not in axes]
        traced = np.einsum("".join(letters) + "->" + "".join(kept), self.rho)
        mixed = np.zeros_like(self.rho)
        for bits in np.ndindex(*(2,) * k):
            index = [slice(None)] * n
            for a, bit in zip(axes, bits):
                index[a] = index[a + self.w] = bit
            mixed[tuple(index)] = traced
        self.rho = (1 - error) * self.rho + error / (4 ** k - 1) * (2 ** k * mixed - self.rho)

    def damp(self, a, t_ns, t1_us, t2_us, twirled):
        """The T1/T2 channel of an idle interval on qubit a (or its Pauli twirl)."""
        g1 = math.exp(-t_ns / (t1_us * 1000))
        g2 = math.exp(-t_ns / (t2_us * 1000))
        if twirled:
            px = (1 - g1) / 4
            pz = (1 - g2) / 2 - px
            saved, out = self.rho, (1 - 2 * px - pz) * self.rho
            for p, w in ((_X, px), (_Y, px), (_Z, pz)):
                self.rho = saved
                self.unitary(p, [a])
                out = out + w * self.rho
            self.rho = out
            return
        b = a + self.w
        r = self.rho
        idx = lambda i, j: tuple(i if ax == a else j if ax == b else slice(None) for ax in range(2 * self.w))
        r00, r11 = r[idx(0, 0)].copy(), r[idx(1, 1)].copy()
        r[idx(0, 0)] = r00 + (1 - g1) * r11
        r[idx(1, 1)] = g1 * r11
        r[idx(0, 1)] *= g2
        r[idx(1, 0)] *= g2

    def bit_flip(self, a, p):
        if p == 0:
            return
        saved = self.rho
        self.unitary(_X, [a])
        self.rho = (1 - p) * saved + p * self.rho


def _run(rho, pure, width, local, events, cal, measured, twirled):
    """Applies the schedule to rho (noisy) and to the pure vector `pure` (ideal), both over `width` qubits."""
    for e in events:
        if e[0] == "gate":
            _, name, qs, angle, error = e
            axes = [local[q] for q in qs]
            u = gate_matrix(name, angle)
            rho.unitary(u, axes)
            k = len(axes)
            pure = np.moveaxis(np.tensordot(u.reshape((2,) * (2 * k)), pure, axes=(list(range(k, 2 * k)), axes)),
                               list(range(k)), axes)
            rho.pauli_channel(axes, error)
        else:
            c = cal.of(e[1])
            rho.damp(local[e[1]], e[2], c["t1_us"], c["t2_us"], twirled)
    for q in measured:
        rho.bit_flip(local[q], cal.of(q)["error_readout"])
    return pure


def simulate(text, device_path, register, twirled=False, samples=0, seed=1):
    """Returns a dict: esp, esp_idle, esp_readout, esp_total (the product of no-error probabilities of the
    schedule), duration_ns, process_fidelity and its standard error (0 when exact). `register`: the
    physical qubits holding the input (the plan's placement)."""
    cal = Calibration(device_path)
    gates = parse(text)
    measured = measured_qubits(text)
    events, end = schedule(gates, cal, register)
    esp, idle, readout = no_error_probability(events, cal, measured)
    used = sorted(set(register) | {q for _, qs, _ in gates for q in qs})
    if set(used) != set(register):
        raise ValueError("the simulation covers register qubits only (no ancillas)")
    k = len(used)
    local = {q: i for i, q in enumerate(used)}
    out = {"esp": esp, "esp_idle": idle, "esp_readout": readout, "esp_total": esp * idle * readout,
           "duration_ns": end, "qubits": k}
    d = 2 ** k
    if samples == 0:
        if k > 5:
            raise ValueError(f"an exact process fidelity is computed for at most 5 qubits, not {k}: give samples")
        # Choi state over 2k qubits: system qubits 0..k-1, reference k..2k-1.
        phi = (np.eye(d, dtype=complex) / math.sqrt(d)).reshape((2,) * (2 * k))
        # axis i of phi is system qubit i (most significant first), axis k + i reference qubit i.
        rho = DensityMatrix(np.einsum("a,b->ab", phi.reshape(-1), phi.reshape(-1).conj()), 2 * k)
        pure = _run(rho, phi, 2 * k, local, events, cal, measured, twirled).reshape(-1)
        f = np.vdot(pure, rho.rho.reshape(d * d, d * d) @ pure).real
        out.update(process_fidelity=float(f), process_fidelity_se=0.0)
        return out
    rng = np.random.default_rng(seed)
    values = []
    for _ in range(samples):
        v = rng.normal(size=d) + 1j * rng.normal(size=d)  # Haar-random state (normalised Gaussian)
        v /= np.linalg.norm(v)
        psi = v.reshape((2,) * k)
        rho = DensityMatrix(np.outer(v, v.conj()), k)
        pure = _run(rho, psi, k, local, events, cal, measured, twirled).reshape(-1)
        values.append(np.vdot(pure, rho.rho.reshape(d, d) @ pure).real)
    f_avg, se_avg = float(np.mean(values)), float(np.std(values, ddof=1) / math.sqrt(samples))
    out.update(process_fidelity=((d + 1) * f_avg - 1) / d, process_fidelity_se=(d + 1) / d * se_avg)
    return out


def simulate_dynamic(events, cal, register, state, twirled=True):
    """The outcome distribution (bits 0 .. n-1, bit k of weight 2^k) of a semi-classical schedule
    (schedule_dynamic) run on the register state `state` (index bit k = qubit register[k]) under the
    channels above: one density matrix per record of measured bits; a measurement projects, and its
    readout error records the other value with that probability (the wrong bit is also what the
    conditioned phases after it read)."""
    n = len(register)
    local = {q: k for k, q in enumerate(register)}
    # Axis k of the tensor is qubit k of the register: index bit k is axis n-1-k in numpy's C order.
    psi = np.asarray(state, dtype=complex).reshape((2,) * n)
    psi = np.transpose(psi, list(reversed(range(n))))
    bits = max([e[2] + 1 for e in events if e[0] == "measure"] + [n])
    branches = {(0,) * bits: DensityMatrix(np.tensordot(psi, psi.conj(), axes=0), n)}
    for e in events:
        if e[0] == "gate":
            _, name, qs, angle, error = e
            for dm in branches.values():
                dm.unitary(gate_matrix(name, angle), [local[q] for q in qs])
                dm.pauli_channel([local[q] for q in qs], error)
        elif e[0] == "idle":
            c = cal.of(e[1])
            for dm in branches.values():
                dm.damp(local[e[1]], e[2], c["t1_us"], c["t2_us"], twirled)
        elif e[0] == "if":
            _, b, name, qs, angle = e
            for record, dm in branches.items():
                if record[b]:
                    dm.unitary(gate_matrix(name, angle), [local[q] for q in qs])
        else:
            _, q, b = e
            a, flip = local[q], cal.of(q)["error_readout"]
            after = {}
            for record, dm in branches.items():
                for outcome in (0, 1):
                    proj = dm.rho.copy()
                    index = [slice(None)] * (2 * n)
                    for axis in (a, a + n):
                        index[axis] = 1 - outcome
                        proj[tuple(index)] = 0
                        index[axis] = slice(None)
                    for value, weight in ((outcome, 1 - flip), (1 - outcome, flip)):
                        key = record[:b] + (value,) + record[b + 1:]
                        if key in after:
                            after[key].rho = after[key].rho + weight * proj
                        else:
                            after[key] = DensityMatrix(weight * proj, n)
            branches = after
    dist = np.zeros(2 ** n)
    for record, dm in branches.items():
        m = dm.rho.reshape(2 ** n, 2 ** n)
        dist[sum(record[k] << k for k in range(n))] += float(np.real(np.trace(m)))
    return dist
