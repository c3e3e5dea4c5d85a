"""A small OpenQASM 2/3 reader and state-vector simulator of our own, written for these tests only.

It does not use qftplan's reader: it parses the text the module returns, applies each gate with numpy
using the matrices of the OpenQASM specification (OpenQASM 3 language specification, "Standard
library" gates: h, x, rz(t) = exp(-i t Z / 2), p(l) = diag(1, e^{il}), cx, cz, cp, swap; OpenQASM 2,
Cross et al., arXiv:1707.03429, 2017, qelib1.inc: u1 = p, cu1 = cp), and returns the unitary the
circuit applies to a register given its placement maps.
"""

import ast
import math
import operator
import re

import numpy as np

_OPS = {ast.Add: operator.add, ast.Sub: operator.sub, ast.Mult: operator.mul, ast.Div: operator.truediv,
        ast.Pow: operator.pow, ast.USub: operator.neg, ast.UAdd: operator.pos}


def eval_angle(text):
    """Evaluates an angle expression over numbers and pi (no names but pi, no calls)."""
    def ev(node):
        if isinstance(node, ast.Expression):
            return ev(node.body)
        if isinstance(node, ast.Constant) and isinstance(node.value, (int, float)):
            return node.value
        if isinstance(node, ast.Name) and node.id in ("pi", "π"):
            return math.pi
        if isinstance(node, ast.BinOp) and type(node.op) in _OPS:
            return _OPS[type(node.op)](ev(node.left), ev(node.right))
        if isinstance(node, ast.UnaryOp) and type(node.op) in _OPS:
            return _OPS[type(node.op)](ev(node.operand))
        raise ValueError(f"unsupported angle expression {text!r}")
    return float(ev(ast.parse(text.replace("π", "pi"), mode="eval")))


_GATE = re.compile(r"^([A-Za-z_][A-Za-z0-9_]*)\s*(?:\((.*)\))?\s+(.+)$")
_OPERAND = re.compile(r"^(?:\$(\d+)|[A-Za-z_][A-Za-z0-9_]*\[(\d+)\])$")


def parse(text):
    """The gate list of an OpenQASM 2 or 3 program: (name, qubits, angle or None) tuples on
    physical qubit numbers ($k in version 3, q[k] in version 2). Measurements and declarations are
    skipped."""
    body = re.sub(r"//[^\n]*", "", text)
    gates = []
    for stmt in body.split(";"):
        stmt = " ".join(stmt.split())
        if not stmt:
            continue
        head = stmt.split(" ", 1)[0]
        if head in ("OPENQASM", "include", "qubit", "bit", "qreg", "creg", "barrier") or head.startswith(("qubit[", "bit[")):
            continue
        if "measure" in stmt:
            continue
        m = _GATE.match(stmt)
        if not m:
            raise ValueError(f"cannot read statement {stmt!r}")
        name, params, args = m.group(1), m.group(2), m.group(3)
        qubits = []
        for a in args.split(","):
            om = _OPERAND.match(a.strip())
            if not om:
                raise ValueError(f"cannot read operand {a!r} in {stmt!r}")
            qubits.append(int(om.group(1) or om.group(2)))
        angle = eval_angle(params) if params else None
        gates.append((name, tuple(qubits), angle))
    return gates


_H = np.array([[1, 1], [1, -1]], dtype=complex) / math.sqrt(2)
_X = np.array([[0, 1], [1, 0]], dtype=complex)
_SX = np.array([[1 + 1j, 1 - 1j], [1 - 1j, 1 + 1j]], dtype=complex) / 2


def one_qubit_matrix(name, angle):
    """The matrix of a one-qubit gate of the OpenQASM standard library (sx = sqrt(x))."""
    if name == "h":
        return _H
    if name == "x":
        return _X
    if name == "sx":
        return _SX
    if name == "rz":
        return np.diag([np.exp(-0.5j * angle), np.exp(0.5j * angle)])
    if name in ("p", "u1", "phase"):
        return np.diag([1, np.exp(1j * angle)])
    raise ValueError(f"unsupported one-qubit gate {name}")


class Simulator:
    """State vectors of `width` local qubits for a batch of inputs at once: array shape (2,)*width + (batch,).
    Local qubit i is axis i; basis index sum_i bit_i 2^i is formed explicitly when reading out."""

    def __init__(self, width, batch):
        self.width = width
        self.psi = np.zeros((2,) * width + (batch,), dtype=complex)

    def apply(self, name, qs, angle):
        psi = self.psi
        if len(qs) == 1:
            u = one_qubit_matrix(name, angle)
            self.psi = np.moveaxis(np.tensordot(u, psi, axes=([1], [qs[0]])), 0, qs[0])
            return
        a, b = qs
        idx11 = [slice(None)] * psi.ndim
        idx11[a] = 1
        idx11[b] = 1
        if name in ("cp", "cu1", "cphase"):
            psi[tuple(idx11)] *= np.exp(1j * angle)
        elif name == "cz":
            psi[tuple(idx11)] *= -1
        elif name in ("cx", "CX"):
            i10 = [slice(None)] * psi.ndim
            i10[a] = 1
            i10[b] = 0
            tmp = psi[tuple(i10)].copy()
            psi[tuple(i10)] = psi[tuple(idx11)]
            psi[tuple(idx11)] = tmp
        elif name == "swap":
            self.psi = np.swapaxes(psi, a, b).copy()
        else:
            raise ValueError(f"unsupported two-qubit gate {name}")


def register_unitary(gates, placement, final_placement):
    """The 2^n x 2^n matrix U with U[y, j] = amplitude of register value y (bit k read from physical
    qubit final_placement[k]) when the register value j (bit k on physical qubit placement[k]) goes in,
    every other qubit starting in |0>. Also returns the probability left outside the register
    subspace (other qubits not back in |0>) for the worst input."""
    n = len(placement)
    used = sorted(set(placement) | set(final_placement) | {q for _, qs, _ in gates for q in qs})
    local = {q: i for i, q in enumerate(used)}
    width = len(used)
    dim = 2 ** n
    sim = Simulator(width, dim)
    for j in range(dim):
        index = [0] * width
        for k in range(n):
            index[local[placement[k]]] = (j >> k) & 1
        sim.psi[tuple(index) + (j,)] = 1
    for name, qs, angle in gates:
        sim.apply(name, tuple(local[q] for q in qs), angle)
    u = np.zeros((dim, dim), dtype=complex)
    for y in range(dim):
        index = [0] * width
        for k in range(n):
            index[local[final_placement[k]]] = (y >> k) & 1
        u[y, :] = sim.psi[tuple(index)]
    leak = float(np.max(1 - np.sum(np.abs(u) ** 2, axis=0)))
    return u, leak


def equal_up_to_phase(u, v, tol=1e-9):
    """True when u = e^{i phi} v for one global phase phi (entrywise within tol)."""
    k = np.unravel_index(np.argmax(np.abs(v)), v.shape)
    if abs(v[k]) < tol:
        return bool(np.allclose(u, v, atol=tol))
    phase = u[k] / v[k]
    return abs(abs(phase) - 1) < tol and bool(np.allclose(u, phase * v, atol=tol))


# ----- dynamic circuits: mid-circuit measurement and phases conditioned on one bit -----
# OpenQASM 3 specification ("Classical control flow", the branching statement `if (condition)
# statement`, and measurement `c[k] = measure q;`); OpenQASM 2 (Cross et al., arXiv:1707.03429,
# section 3: `measure q -> c;` and `if(creg==int) qop;` on a whole register).

_IF = re.compile(r"^if\s*\(\s*([A-Za-z_][A-Za-z0-9_]*)\s*(?:\[(\d+)\])?\s*(?:==\s*(\d+))?\s*\)\s*(.+)$")
_MEASURE3 = re.compile(r"^([A-Za-z_][A-Za-z0-9_]*)\[(\d+)\]\s*=\s*measure\s+(\S+)$")
_MEASURE2 = re.compile(r"^measure\s+(\S+)\s*->\s*([A-Za-z_][A-Za-z0-9_]*)\[(\d+)\]$")
_CREG = re.compile(r"^creg\s+([A-Za-z_][A-Za-z0-9_]*)\[(\d+)\]$")
_BITS3 = re.compile(r"^bit\[(\d+)\]\s+([A-Za-z_][A-Za-z0-9_]*)$")


def _qubit(text):
    om = _OPERAND.match(text.strip())
    if not om:
        raise ValueError(f"cannot read operand {text!r}")
    return int(om.group(1) or om.group(2))


def parse_dynamic(text):
    """The operations of a program with mid-circuit measurements, in order: ("gate", name, qubits,
    angle), ("measure", qubit, bit) and ("if", bit, name, qubits, angle), where a bit is a global
    index: the bit registers laid end to end in declaration order."""
    body = re.sub(r"//[^\n]*", "", text)
    offsets, total, ops = {}, 0, []

    def bit(name, index):
        return offsets[name] + int(index or 0)

    for stmt in body.split(";"):
        stmt = " ".join(stmt.split())
        if not stmt:
            continue
        head = stmt.split(" ", 1)[0]
        if head in ("OPENQASM", "include", "qreg", "barrier"):
            continue
        m = _CREG.match(stmt) or None
        if m:
            offsets[m.group(1)] = total
            total += int(m.group(2))
            continue
        m = _BITS3.match(stmt)
        if m:
            offsets[m.group(2)] = total
            total += int(m.group(1))
            continue
        m = _MEASURE3.match(stmt)
        if m:
            ops.append(("measure", _qubit(m.group(3)), bit(m.group(1), m.group(2))))
            continue
        m = _MEASURE2.match(stmt)
        if m:
            ops.append(("measure", _qubit(m.group(1)), bit(m.group(2), m.group(3))))
            continue
        m = _IF.match(stmt)
        if m:
            if m.group(3) not in (None, "1"):
                raise ValueError(f"only conditions on 1 are simulated: {stmt!r}")
            (name, qubits, angle), = parse(m.group(4))
            ops.append(("if", bit(m.group(1), m.group(2)), name, qubits, angle))
            continue
        (name, qubits, angle), = parse(stmt)
        ops.append(("gate", name, qubits, angle))
    return ops, total


def outcome_distribution(ops, bits, placement, state):
    """The probability of every value of the bits 0 .. n-1 (bit k of weight 2^k) when the register
    holds `state` (a vector of 2^n amplitudes, index bit k = the qubit placement[k]) and the program
    runs; every measurement branch is followed (projected and renormalised), depth first."""
    n = len(placement)
    used = sorted(set(placement) | {op[2][0] if op[0] == "gate" else (op[1] if op[0] == "measure" else op[3][0])
                                     for op in ops})
    local = {q: i for i, q in enumerate(used)}
    width = len(used)
    psi = np.zeros((2,) * width, dtype=complex)
    for j in range(2 ** n):
        index = [0] * width
        for k in range(n):
            index[local[placement[k]]] = (j >> k) & 1
        psi[tuple(index)] = state[j]
    dist = np.zeros(2 ** n)

    def run(start, psi, values, weight):
        sim = Simulator(width, 1)
        sim.psi = psi[..., None].copy()
        for i in range(start, len(ops)):
            op = ops[i]
            if op[0] == "gate":
                sim.apply(op[1], tuple(local[q] for q in op[2]), op[3])
            elif op[0] == "if":
                if values[op[1]]:
                    sim.apply(op[2], tuple(local[q] for q in op[3]), op[4])
            else:
                axis = local[op[1]]
                for outcome in (0, 1):
                    branch = sim.psi[..., 0].copy()
                    index = [slice(None)] * width
                    index[axis] = 1 - outcome
                    branch[tuple(index)] = 0
                    p = float(np.sum(np.abs(branch) ** 2))
                    if p < 1e-15:
                        continue
                    v = list(values)
                    v[op[2]] = outcome
                    run(i + 1, branch / math.sqrt(p), v, weight * p)
                return
        dist[sum(values[k] << k for k in range(n))] += weight

    run(0, psi, [0] * max(bits, n), 1.0)
    return dist
