#include "qftplan/qft_network.hpp"

#include <algorithm>
#include <numeric>
#include <stdexcept>

namespace qftplan {

using Kind = NetworkOp::Kind;

std::vector<int> QftNetwork::initial_positions() const {
  std::vector<int> pos(wires_);
  std::iota(pos.begin(), pos.end(), 0);
  return pos;
}

std::vector<int> QftNetwork::final_positions() const {
  std::vector<int> pos = initial_positions();
  std::vector<NetworkOp> ops;
  for (int c = 0; c < chunk_count(); ++c) {
    chunk(c, ops);
    for (const auto& op : ops)
      if (op.kind == Kind::swap || op.kind == Kind::cp_swap) std::swap(pos[op.i], pos[op.j]);
  }
  return pos;
}

long long QftNetwork::block_count() const {
  long long n = 0;
  std::vector<NetworkOp> ops;
  for (int c = 0; c < chunk_count(); ++c) {
    chunk(c, ops);
    for (const auto& op : ops) n += op.kind != Kind::h;
  }
  return n;
}

long long QftNetwork::swap_count() const {
  long long n = 0;
  std::vector<NetworkOp> ops;
  for (int c = 0; c < chunk_count(); ++c) {
    chunk(c, ops);
    for (const auto& op : ops) n += op.kind == Kind::swap || op.kind == Kind::cp_swap;
  }
  return n;
}

namespace {

// The reversal network on wires [first, first+size), as a sequence of layers. Wire first+a (a-th
// to be processed) meets first+b (a < b) in layer a+b-1; its Hadamard comes after its last meeting
// with a smaller wire (layer 2a-2) and before its first with a larger one (layer 2a). Chunk t < L
// holds the Hadamard due before layer t, then layer t; the last chunk holds the last Hadamard.
struct ReversalLayers {
  int first;
  int size;
  int d;  // kept distance
  int layers() const { return size >= 2 ? 2 * size - 3 : 0; }
  int chunks() const { return layers() + 1; }
  void chunk(int t, std::vector<NetworkOp>& out) const {
    const int L = layers();
    if (t == L) {
      out.push_back({Kind::h, first + size - 1, -1});
      return;
    }
    if (t == 0) out.push_back({Kind::h, first, -1});
    if (t % 2 == 1) out.push_back({Kind::h, first + (t + 1) / 2, -1});
    for (int a = std::max(0, t + 2 - size); 2 * a <= t; ++a) {
      const int b = t + 1 - a;
      if (b <= a || b >= size) continue;
      out.push_back({b - a <= d ? Kind::cp_swap : Kind::swap, first + a, first + b});
    }
  }
};

class ReversalNetwork final : public QftNetwork {
 public:
  ReversalNetwork(int n, int d) : QftNetwork(n, d), layers_{0, n, d} {}
  std::string name() const override { return "reversal"; }
  int chunk_count() const override { return layers_.chunks(); }
  void chunk(int c, std::vector<NetworkOp>& out) const override {
    out.clear();
    layers_.chunk(c, out);
  }

 private:
  ReversalLayers layers_;
};

// Banded network (ours). Bands B_k = [k d, (k+1) d). Chunks, in order:
//   reversal of B_0 (layer by layer);
//   for each k: band B_k crosses B_{k+1} (one chunk per travelling wire), crosses back (one chunk
//   per wire), then B_{k+1} is reversed internally (layer by layer).
// Before B_k crosses, it sits reversed (largest wire leftmost) directly left of B_{k+1}, which is
// in ascending order; crossing keeps both internal orders, so after crossing back the picture is
// the same and B_{k+1} can be reversed in place. Every pair at distance <= d meets: inside a band
// in its reversal, across neighbouring bands in the first crossing (bands further apart are more
// than d apart). Order: wire y of B_{k+1} gets its Hadamard in the reversal of B_{k+1}, after all
// its rotations with B_k (first crossing) and with smaller wires of its own band (reversal order).
class BandedNetwork final : public QftNetwork {
 public:
  BandedNetwork(int n, int d) : QftNetwork(n, d) {
    if (d < 1) throw std::invalid_argument("banded network needs d >= 1");
    bands_ = (n + d - 1) / d;
    for (int k = 0; k < bands_; ++k) {
      const ReversalLayers rev{k * d, band_size(k), d};
      if (k > 0) {
        const int prev = band_size(k - 1);
        for (int t = 0; t < prev; ++t) table_.push_back({Phase::cross, k - 1, t});
        for (int t = 0; t < prev; ++t) table_.push_back({Phase::back, k - 1, t});
      }
      for (int t = 0; t < rev.chunks(); ++t) table_.push_back({Phase::reverse, k, t});
    }
  }
  std::string name() const override { return "banded"; }
  int chunk_count() const override { return static_cast<int>(table_.size()); }
  void chunk(int c, std::vector<NetworkOp>& out) const override {
    out.clear();
    const auto& e = table_[c];
    const int lo = e.band * d_;
    if (e.phase == Phase::reverse) {
      ReversalLayers{lo, band_size(e.band), d_}.chunk(e.step, out);
      return;
    }
    const int next_lo = lo + d_, next_size = band_size(e.band + 1);
    if (e.phase == Phase::cross) {
      // B_k is reversed, so its rightmost wire is its smallest: wire lo + step travels next, right
      // across B_{k+1} in ascending order.
      const int x = lo + e.step;
      for (int y = next_lo; y < next_lo + next_size; ++y)
        out.push_back({y - x <= d_ ? Kind::cp_swap : Kind::swap, x, y});
    } else {
      // Back again: the leftmost wire of B_k (now its largest remaining) travels left across B_{k+1}.
      const int x = lo + band_size(e.band) - 1 - e.step;
      for (int y = next_lo + next_size - 1; y >= next_lo; --y) out.push_back({Kind::swap, x, y});
    }
  }

 private:
  enum class Phase : unsigned char { reverse, cross, back };
  struct Entry {
    Phase phase;
    int band;
    int step;
  };
  int band_size(int k) const { return std::min(d_, wires_ - k * d_); }
  int bands_ = 0;
  std::vector<Entry> table_;
};

class AdjacentNetwork final : public QftNetwork {
 public:
  explicit AdjacentNetwork(int n) : QftNetwork(n, 1) {}
  std::string name() const override { return "adjacent"; }
  int chunk_count() const override { return wires_; }
  void chunk(int c, std::vector<NetworkOp>& out) const override {
    out.clear();
    if (c > 0) out.push_back({Kind::cp, c - 1, c});
    out.push_back({Kind::h, c, -1});
  }
};

class HadamardNetwork final : public QftNetwork {
 public:
  explicit HadamardNetwork(int n) : QftNetwork(n, 0) {}
  std::string name() const override { return "hadamard-only"; }
  int chunk_count() const override { return wires_; }
  void chunk(int c, std::vector<NetworkOp>& out) const override {
    out.clear();
    out.push_back({Kind::h, c, -1});
  }
};

}  // namespace

std::unique_ptr<QftNetwork> make_reversal_network(int wires, int max_distance) {
  return std::make_unique<ReversalNetwork>(wires, max_distance);
}
std::unique_ptr<QftNetwork> make_banded_network(int wires, int max_distance) {
  return std::make_unique<BandedNetwork>(wires, max_distance);
}
std::unique_ptr<QftNetwork> make_adjacent_network(int wires) { return std::make_unique<AdjacentNetwork>(wires); }
std::unique_ptr<QftNetwork> make_hadamard_network(int wires) { return std::make_unique<HadamardNetwork>(wires); }

std::unique_ptr<QftNetwork> choose_network(const QftSpec& spec) {
  const int n = spec.qubits, d = spec.max_distance();
  if (spec.effectively_exact() || n <= 2) return make_reversal_network(n, d);
  if (d == 0) return make_hadamard_network(n);
  if (d == 1) return make_adjacent_network(n);
  // Blocks of the banded network in closed form: reversals sum b(b-1)/2, crossings 2 b_k b_{k+1}.
  long long banded = 0;
  const int bands = (n + d - 1) / d;
  for (int k = 0; k < bands; ++k) {
    const long long b = std::min(d, n - k * d);
    banded += b * (b - 1) / 2;
    if (k + 1 < bands) banded += 2 * b * std::min(d, n - (k + 1) * d);
  }
  const long long reversal = static_cast<long long>(n) * (n - 1) / 2;
  if (banded < reversal) return make_banded_network(n, d);
  return make_reversal_network(n, d);
}

}  // namespace qftplan
