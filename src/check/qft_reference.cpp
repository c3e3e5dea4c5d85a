// The references of the state-vector check: the exact QFT by a radix-2 FFT, and the textbook
// approximate QFT simulated gate by gate.

#include <algorithm>
#include <cmath>
#include <complex>
#include <numbers>
#include <stdexcept>
#include <vector>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/check/statevector.hpp"

namespace qftplan {

using cplx = std::complex<double>;

std::vector<cplx> exact_qft(std::vector<cplx> a, bool inverse) {
  const std::size_t size = a.size();
  if (size == 0 || (size & (size - 1)) != 0) throw std::invalid_argument("exact_qft needs a power-of-two length");
  // Iterative radix-2 FFT with exp(sign * 2 pi i j y / N), sign + for the forward QFT.
  for (std::size_t i = 1, j = 0; i < size; ++i) {
    std::size_t bit = size >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) std::swap(a[i], a[j]);
  }
  const double sign = inverse ? -1.0 : 1.0;
  std::vector<cplx> roots(size / 2);
  for (std::size_t k = 0; k < size / 2; ++k)  // each root computed directly, for accuracy
    roots[k] = std::polar(1.0, sign * 2.0 * std::numbers::pi * static_cast<double>(k) / static_cast<double>(size));
  for (std::size_t len = 2; len <= size; len <<= 1) {
    const std::size_t half = len / 2, step = size / len;
    for (std::size_t i = 0; i < size; i += len)
      for (std::size_t k = 0; k < half; ++k) {
        const cplx u = a[i + k], v = a[i + k + half] * roots[k * step];
        a[i + k] = u + v;
        a[i + k + half] = u - v;
      }
  }
  const double norm = 1.0 / std::sqrt(static_cast<double>(size));
  for (auto& x : a) x *= norm;
  return a;
}

std::vector<cplx> reference_qft(const QftSpec& spec, const std::vector<cplx>& a) {
  const int n = spec.qubits;
  if (a.size() != (std::size_t{1} << n)) throw std::invalid_argument("reference_qft: wrong vector length");
  if (spec.effectively_exact()) return exact_qft(a, spec.inverse);
  // Textbook approximate QFT on processing wires (Nielsen & Chuang 2000, Fig. 5.1, with the
  // rotations beyond the degree dropped, Coppersmith 1994): wire i gets H, then the controlled
  // phases with wires i+1..i+d; the inverse runs the list backwards with negated angles.
  const int d = spec.max_distance();
  StateVector sv(n);
  auto& amp = sv.amplitudes();
  auto wire_index = [&](std::size_t j, bool output) {
    std::size_t idx = 0;
    for (int k = 0; k < n; ++k)
      if (j >> k & 1) idx |= std::size_t{1} << (output ? spec.output_wire(k) : spec.input_wire(k));
    return idx;
  };
  for (std::size_t j = 0; j < a.size(); ++j) amp[wire_index(j, false)] = a[j];
  if (!spec.inverse) {
    for (int i = 0; i < n; ++i) {
      sv.apply(make_gate(GateKind::h, i));
      for (int j = i + 1; j <= std::min(n - 1, i + d); ++j) sv.apply(make_gate(GateKind::cp, i, j, spec.rotation(j - i)));
    }
  } else {
    for (int i = n - 1; i >= 0; --i) {
      for (int j = std::min(n - 1, i + d); j > i; --j) sv.apply(make_gate(GateKind::cp, i, j, spec.rotation(j - i)));
      sv.apply(make_gate(GateKind::h, i));
    }
  }
  std::vector<cplx> out(a.size());
  for (std::size_t y = 0; y < a.size(); ++y) out[y] = amp[wire_index(y, true)];
  return out;
}

}  // namespace qftplan
