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


def _one_qubit(name, angle):
    if name == "h":
        return _H
    if name == "x":
        return _X
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
            u = _one_qubit(name, angle)
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
