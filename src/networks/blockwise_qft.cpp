#include "qftplan/networks/blockwise_qft.hpp"

#include <algorithm>
#include <stdexcept>

#include "qftplan/core/angle.hpp"

namespace qftplan {

namespace {

struct Block {
  int low;   // first bit
  int size;  // bits
};

std::vector<Block> blocks_of(int n, int m) {
  std::vector<Block> out;
  for (int low = 0; low < n; low += m) out.push_back({low, std::min(m, n - low)});
  return out;
}

// The forward gates of the construction on chain positions 0..n-1 (gate qubits are positions).
class Builder {
 public:
  Builder(int n, int m) : n_(n), m_(m), wire_at_(n), pos_(n) {
    for (int p = 0; p < n; ++p) wire_at_[p] = pos_[p] = p;
  }

  void run() {
    const auto blocks = blocks_of(n_, m_);
    const int k = static_cast<int>(blocks.size());
    // A: pairs (2i+1, 2i), each one QFT.
    for (int b = 1; b < k; b += 2) span(blocks[b - 1], blocks[b], false);
    // B: the inverse of each block of those pairs: the two-block network below, backwards.
    for (int b = 1; b < k; b += 2) span(blocks[b - 1], blocks[b], true);
    // C: block 0 alone, pairs (2i+2, 2i+1), and the top block alone when it was paired in A.
    single(blocks[0]);
    for (int b = 2; b < k; b += 2) span(blocks[b - 1], blocks[b], false);
    if (k % 2 == 0 && k > 1) single(blocks[k - 1]);
  }

  std::vector<Gate> gates;
  const std::vector<int>& positions() const { return pos_; }

 private:
  // Processing indices of a run of bits [low, low+size): n-1-(low+size-1) .. n-1-low.
  int first_index(const Block& b) const { return n_ - b.low - b.size; }

  // The reversal layering (Fowler, Devitt and Hollenberg, Quantum Inf. Comput. 4, 237, 2004) on the
  // wires w[0..s) that sit in order on consecutive positions: w[a] meets w[b] (a < b) in layer a+b-1,
  // its Hadamard after layer 2a-2. `same(a, b)` says whether the pair is rotated (cp_swap) or only
  // crosses (swap); angle pi/2^(group distance). Returns the gates on positions.
  template <class Same, class Dist>
  std::vector<Gate> layering(const std::vector<int>& w, Same same, Dist dist) {
    const int s = static_cast<int>(w.size());
    std::vector<Gate> out;
    auto h = [&](int a) { out.push_back(make_gate(GateKind::h, pos_[w[a]])); };
    if (s == 1) {
      h(0);
      return out;
    }
    const int layers = 2 * s - 3;
    for (int t = 0; t <= layers; ++t) {
      if (t == layers) {
        h(s - 1);
        break;
      }
      if (t == 0) h(0);
      if (t % 2 == 1) h((t + 1) / 2);
      for (int a = std::max(0, t + 2 - s); 2 * a <= t; ++a) {
        const int b = t + 1 - a;
        if (b <= a || b >= s) continue;
        const int pa = pos_[w[a]], pb = pos_[w[b]];
        if (same(a, b))
          out.push_back(make_gate(GateKind::cp_swap, pa, pb, Angle::pi_over_pow2(static_cast<std::uint32_t>(dist(a, b)))));
        else
          out.push_back(make_gate(GateKind::swap, pa, pb));
        std::swap(pos_[w[a]], pos_[w[b]]);
        std::swap(wire_at_[pa], wire_at_[pb]);
      }
    }
    return out;
  }

  // The wires of a span of positions [p, p+s), in position order.
  std::vector<int> wires_on(int p, int s) const {
    std::vector<int> w(s);
    for (int t = 0; t < s; ++t) w[t] = wire_at_[p + t];
    return w;
  }

  void single(const Block& blk) {
    const int p = first_index(blk);
    auto w = wires_on(p, blk.size);
    auto g = layering(w, [](int, int) { return true; }, [](int a, int b) { return b - a; });
    gates.insert(gates.end(), g.begin(), g.end());
  }

  // Low and high blocks of a pair, adjacent, high bits first on the chain. Forward: the QFT of the
  // pair. Read-back (B): each block's own inverse QFT, found as the two-block network run backwards.
  void span(const Block& lo, const Block& hi, bool read_back) {
    const int p = first_index(hi), s = lo.size + hi.size, split = hi.size;
    if (!read_back) {
      auto w = wires_on(p, s);
      auto g = layering(w, [](int, int) { return true; }, [](int a, int b) { return b - a; });
      gates.insert(gates.end(), g.begin(), g.end());
      return;
    }
    // The span is reversed now (layer A). The two-block network runs from the span in order to the
    // span reversed; build it from the order it would start in, then emit it backwards, negated.
    std::vector<int> start(s);
    for (int t = 0; t < s; ++t) start[t] = wire_at_[p + s - 1 - t];
    // Put the wires back in order for the dry build, remembering the reversed layout.
    const auto saved_pos = pos_;
    const auto saved_at = wire_at_;
    for (int t = 0; t < s; ++t) {
      pos_[start[t]] = p + t;
      wire_at_[p + t] = start[t];
    }
    auto g = layering(
        start, [split](int a, int b) { return (a < split) == (b < split); },
        [](int a, int b) { return b - a; });
    // The layering ends with the span reversed, as layer A left it.
    for (int t = 0; t < s; ++t)
      if (pos_[start[t]] != saved_pos[start[t]]) throw std::logic_error("blockwise: read-back layout mismatch");
    for (int t = 0; t < s; ++t) {
      pos_[start[t]] = p + t;
      wire_at_[p + t] = start[t];
    }
    (void)saved_at;
    for (auto it = g.rbegin(); it != g.rend(); ++it) {
      Gate x = *it;
      if (has_angle(x.kind)) x.angle = -x.angle;
      gates.push_back(x);
    }
  }

  int n_, m_;
  std::vector<int> wire_at_;  // processing index at each position
  std::vector<int> pos_;      // position of each processing index
};

}  // namespace

std::vector<BlockTransform> blockwise_schedule(int n, int m) {
  if (n < 1 || m < 1) throw std::invalid_argument("blockwise: need n >= 1 and m >= 1");
  const auto blocks = blocks_of(n, m);
  const int k = static_cast<int>(blocks.size());
  std::vector<BlockTransform> out;
  for (int b = 1; b < k; b += 2) out.push_back({blocks[b - 1].low, blocks[b - 1].size + blocks[b].size, false});
  for (int b = 1; b < k; b += 2) {
    out.push_back({blocks[b].low, blocks[b].size, true});
    out.push_back({blocks[b - 1].low, blocks[b - 1].size, true});
  }
  out.push_back({blocks[0].low, blocks[0].size, false});
  for (int b = 2; b < k; b += 2) out.push_back({blocks[b - 1].low, blocks[b - 1].size + blocks[b].size, false});
  if (k % 2 == 0 && k > 1) out.push_back({blocks[k - 1].low, blocks[k - 1].size, false});
  return out;
}

std::vector<int> emit_blockwise_qft(int n, int m, bool inverse, std::span<const int> chain, GateSink& sink) {
  if (static_cast<int>(chain.size()) != n) throw std::invalid_argument("blockwise: chain and register sizes differ");
  if (n < 1 || m < 1) throw std::invalid_argument("blockwise: need n >= 1 and m >= 1");
  Builder b(n, m);
  b.run();
  GateRun out(sink);
  auto put = [&](Gate g) {
    g.q0 = chain[g.q0];
    if (g.q1 >= 0) g.q1 = chain[g.q1];
    if (inverse && has_angle(g.kind)) g.angle = -g.angle;
    out.put(g);
    out.flush_if_full();
  };
  if (!inverse)
    for (const Gate& g : b.gates) put(g);
  else
    for (auto it = b.gates.rbegin(); it != b.gates.rend(); ++it) put(*it);
  out.flush();
  return b.positions();
}

int blockwise_two_qubit_depth(int n, int m) {
  Builder b(n, m);
  b.run();
  std::vector<int> level(n, 0);
  int depth = 0;
  for (const Gate& g : b.gates) {
    if (!is_two_qubit(g.kind)) continue;
    const int l = std::max(level[g.q0], level[g.q1]) + 1;
    level[g.q0] = level[g.q1] = l;
    depth = std::max(depth, l);
  }
  return depth;
}

}  // namespace qftplan
