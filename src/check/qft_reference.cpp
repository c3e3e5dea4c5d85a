// The references of the state-vector check: the exact QFT by a radix-2 FFT, the textbook approximate
// QFT simulated gate by gate, and the block construction from its description.

#include <algorithm>
#include <cmath>
#include <complex>
#include <numbers>
#include <stdexcept>
#include <vector>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/check/statevector.hpp"
#include "block_steps.hpp"

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

namespace {

// Reverses bits [low, low+size) of every index.
void reverse_range(std::vector<cplx>& a, int low, int size) {
  std::vector<cplx> out(a.size());
  for (std::size_t i = 0; i < a.size(); ++i) {
    std::size_t j = i;
    for (int t = 0; t < size; ++t) {
      const std::size_t bit = (i >> (low + t)) & 1;
      const int to = low + size - 1 - t;
      j = (j & ~(std::size_t{1} << to)) | (bit << to);
    }
    out[j] = a[i];
  }
  a = std::move(out);
}

// The QFT (eq. 5.2) of bits [low, low+size) of the index read as a number, the other bits fixed.
void range_qft(std::vector<cplx>& a, int low, int size, bool inverse) {
  const std::size_t dim = std::size_t{1} << size, mask = (dim - 1) << low;
  std::vector<cplx> part(dim);
  for (std::size_t rest = 0; rest < a.size(); ++rest) {
    if (rest & mask) continue;
    for (std::size_t v = 0; v < dim; ++v) part[v] = a[rest | (v << low)];
    part = exact_qft(std::move(part), inverse);
    for (std::size_t v = 0; v < dim; ++v) a[rest | (v << low)] = part[v];
  }
}

// The in-place transform of a bit range (the textbook circuit without its final swaps: the QFT, then
// the range's bits reversed; Nielsen & Chuang 2000, eq. 5.4 and fig. 5.1), or its inverse.
void in_place(std::vector<cplx>& a, int low, int size, bool inverse) {
  if (!inverse) {
    range_qft(a, low, size, false);
    reverse_range(a, low, size);
  } else {
    reverse_range(a, low, size);
    range_qft(a, low, size, true);
  }
}

// The block construction (arXiv:2505.00701) from its description, on the input value's bits: the
// in-place transforms of block_construction_steps, then the output bits in the order of eq. 5.2 (all bits
// reversed). The inverse: the same backwards.
std::vector<cplx> block_construction(const QftSpec& spec, std::vector<cplx> a) {
  const int n = spec.qubits;
  const std::vector<BlockStep> steps = block_construction_steps(n, *spec.block_length);
  if (!spec.inverse) {
    for (const BlockStep& s : steps) in_place(a, s.low, s.size, s.inverse);
    reverse_range(a, 0, n);
  } else {
    reverse_range(a, 0, n);
    for (auto it = steps.rbegin(); it != steps.rend(); ++it) in_place(a, it->low, it->size, !it->inverse);
  }
  return a;
}

}  // namespace

std::vector<BlockStep> block_construction_steps(int n, int m) {
  std::vector<std::pair<int, int>> blocks;  // (low bit, size)
  for (int low = 0; low < n; low += m) blocks.push_back({low, std::min(m, n - low)});
  const int k = static_cast<int>(blocks.size());
  std::vector<BlockStep> steps;
  for (int b = 1; b < k; b += 2) steps.push_back({blocks[b - 1].first, blocks[b - 1].second + blocks[b].second, false});
  for (int b = 1; b < k; b += 2) {
    steps.push_back({blocks[b].first, blocks[b].second, true});
    steps.push_back({blocks[b - 1].first, blocks[b - 1].second, true});
  }
  steps.push_back({blocks[0].first, blocks[0].second, false});
  for (int b = 2; b < k; b += 2) steps.push_back({blocks[b - 1].first, blocks[b - 1].second + blocks[b].second, false});
  if (k % 2 == 0 && k > 1) steps.push_back({blocks[k - 1].first, blocks[k - 1].second, false});
  return steps;
}

std::vector<cplx> reference_qft(const QftSpec& spec, const std::vector<cplx>& a) {
  const int n = spec.qubits;
  if (a.size() != (std::size_t{1} << n)) throw std::invalid_argument("reference_qft: wrong vector length");
  if (spec.block_length) return block_construction(spec, a);
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
