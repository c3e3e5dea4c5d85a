// Dense state-vector simulation, every gate applied straight from its matrix definition.

#include "qftplan/check/statevector.hpp"

#include <cmath>
#include <stdexcept>
#include <string>

namespace qftplan {

using cplx = std::complex<double>;

StateVector::StateVector(int qubits) : n_(qubits) {
  if (qubits < 0 || qubits > 30) throw std::invalid_argument("StateVector supports 0..30 qubits");
  a_.assign(std::size_t{1} << qubits, cplx(0.0, 0.0));
  a_[0] = 1.0;
}

void StateVector::set_basis(std::size_t index) {
  if (index >= a_.size()) throw std::invalid_argument("basis index out of range");
  std::fill(a_.begin(), a_.end(), cplx(0.0, 0.0));
  a_[index] = 1.0;
}

namespace {

// Plain complex product: std::complex's operator* calls the IEEE-careful __muldc3 (NaN/inf
// recovery), several times slower and pointless for unit-modulus phases.
inline cplx cmul(cplx a, cplx b) {
  return {a.real() * b.real() - a.imag() * b.imag(), a.real() * b.imag() + a.imag() * b.real()};
}

// Calls f(i0, i1) for every pair of indices differing only in bit q (i0 has it clear).
template <class F>
void for_each_pair(std::size_t size, int q, F&& f) {
  const std::size_t stride = std::size_t{1} << q;
  for (std::size_t base = 0; base < size; base += 2 * stride)
    for (std::size_t i = base; i < base + stride; ++i) f(i, i + stride);
}

// Calls f(i) for every index whose bits `lo` and `hi` (lo < hi) are both zero.
template <class F>
void for_pairs(std::size_t size, int lo, int hi, F&& f) {
  const std::size_t slo = std::size_t{1} << lo, shi = std::size_t{1} << hi;
  for (std::size_t a = 0; a < size; a += 2 * shi)
    for (std::size_t b = a; b < a + shi; b += 2 * slo)
      for (std::size_t i = b; i < b + slo; ++i) f(i);
}

}  // namespace

void StateVector::apply(const Gate& g) {
  auto check = [&](int q) {
    if (q < 0 || q >= n_) throw std::invalid_argument("gate qubit " + std::to_string(q) + " outside the state vector");
  };
  check(g.q0);
  if (is_two_qubit(g.kind)) {
    check(g.q1);
    if (g.q0 == g.q1) throw std::invalid_argument("two-qubit gate on one qubit");
  }
  const double t = g.angle.radians();
  const std::size_t size = a_.size();
  auto& a = a_;
  switch (g.kind) {
    case GateKind::h: {
      // H = [[1, 1], [1, -1]] / sqrt(2).
      const double r = 1.0 / std::sqrt(2.0);
      for_each_pair(size, g.q0, [&](std::size_t i0, std::size_t i1) {
        const cplx x0 = a[i0], x1 = a[i1];
        a[i0] = (x0 + x1) * r;
        a[i1] = (x0 - x1) * r;
      });
      return;
    }
    case GateKind::x:
      for_each_pair(size, g.q0, [&](std::size_t i0, std::size_t i1) { std::swap(a[i0], a[i1]); });
      return;
    case GateKind::sx: {
      // sx = [[1+i, 1-i], [1-i, 1+i]] / 2 (OpenQASM 3 stdgates.inc).
      const cplx u(0.5, 0.5), v(0.5, -0.5);
      for_each_pair(size, g.q0, [&](std::size_t i0, std::size_t i1) {
        const cplx x0 = a[i0], x1 = a[i1];
        a[i0] = cmul(u, x0) + cmul(v, x1);
        a[i1] = cmul(v, x0) + cmul(u, x1);
      });
      return;
    }
    case GateKind::rz: {
      // rz(t) = diag(e^{-it/2}, e^{it/2}).
      const cplx e0 = std::polar(1.0, -t / 2), e1 = std::polar(1.0, t / 2);
      for_each_pair(size, g.q0, [&](std::size_t i0, std::size_t i1) {
        a[i0] = cmul(e0, a[i0]);
        a[i1] = cmul(e1, a[i1]);
      });
      return;
    }
    case GateKind::p: {
      // p(t) = diag(1, e^{it}).
      const cplx e1 = std::polar(1.0, t);
      for_each_pair(size, g.q0, [&](std::size_t, std::size_t i1) { a[i1] = cmul(e1, a[i1]); });
      return;
    }
    case GateKind::parity_step:
      // The parity block is its three gates (gate.hpp).
      apply(make_gate(GateKind::cx, g.q1, g.q0));
      apply(make_gate(GateKind::cx, g.q0, g.q1));
      apply(make_gate(GateKind::rz, g.q0, -1, g.angle));
      return;
    default:
      break;
  }
  const int lo = std::min(g.q0, g.q1), hi = std::max(g.q0, g.q1);
  const std::size_t b0 = std::size_t{1} << g.q0, b1 = std::size_t{1} << g.q1;
  switch (g.kind) {
    case GateKind::cx:
      // Control q0 set: swap the target's two amplitudes.
      for_pairs(size, lo, hi, [&](std::size_t i) { std::swap(a[i | b0], a[i | b0 | b1]); });
      return;
    case GateKind::cz:
      for_pairs(size, lo, hi, [&](std::size_t i) { a[i | b0 | b1] = -a[i | b0 | b1]; });
      return;
    case GateKind::cp: {
      // cp(t) = diag(1, 1, 1, e^{it}).
      const cplx ph = std::polar(1.0, t);
      for_pairs(size, lo, hi, [&](std::size_t i) { a[i | b0 | b1] = cmul(ph, a[i | b0 | b1]); });
      return;
    }
    case GateKind::swap:
      for_pairs(size, lo, hi, [&](std::size_t i) { std::swap(a[i | b0], a[i | b1]); });
      return;
    case GateKind::cp_swap: {
      // The fused block: cp(t), then swap.
      const cplx ph = std::polar(1.0, t);
      for_pairs(size, lo, hi, [&](std::size_t i) {
        a[i | b0 | b1] = cmul(ph, a[i | b0 | b1]);
        std::swap(a[i | b0], a[i | b1]);
      });
      return;
    }
    default:
      throw std::invalid_argument("gate " + std::string(gate_name(g.kind)) + " cannot be simulated");
  }
}

double overlap(const std::vector<std::complex<double>>& a, const std::vector<std::complex<double>>& b) {
  if (a.size() != b.size()) throw std::invalid_argument("overlap of vectors of different sizes");
  cplx s = 0.0;
  for (std::size_t i = 0; i < a.size(); ++i) s += std::conj(a[i]) * b[i];
  return std::abs(s);
}

}  // namespace qftplan
