#include "qftplan/networks/blockwise_qft.hpp"

#include <algorithm>
#include <stdexcept>

#include "qftplan/core/angle.hpp"
#include "qftplan/networks/chain_qft.hpp"
#include "qftplan/networks/qft_network.hpp"

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

// The forward steps of the construction on wires (processing indices) 0..n-1, wire p starting at chain
// position p.
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

  std::vector<NetworkOp> ops;
  const std::vector<int>& positions() const { return pos_; }

 private:
  // Processing indices of a run of bits [low, low+size): n-1-(low+size-1) .. n-1-low.
  int first_index(const Block& b) const { return n_ - b.low - b.size; }

  // The reversal layering (Fowler, Devitt and Hollenberg, Quantum Inf. Comput. 4, 237, 2004) on the
  // wires w[0..s), ascending processing indices on consecutive positions: w[a] meets w[b] (a < b) in layer
  // a+b-1, its Hadamard after layer 2a-2. `same(a, b)` says whether the pair is rotated (cp_swap, angle
  // pi/2^(b-a), which is the wires' processing distance) or only crosses (swap).
  template <class Same>
  std::vector<NetworkOp> layering(const std::vector<int>& w, Same same) {
    const int s = static_cast<int>(w.size());
    std::vector<NetworkOp> out;
    auto h = [&](int a) { out.emplace_back(NetworkOp::Kind::h, w[a]); };
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
        if (w[b] - w[a] != b - a) throw std::logic_error("blockwise: wires of a block transform not consecutive");
        const int pa = pos_[w[a]], pb = pos_[w[b]];
        out.emplace_back(same(a, b) ? NetworkOp::Kind::cp_swap : NetworkOp::Kind::swap, w[a], w[b]);
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

  void append(const std::vector<NetworkOp>& g) { ops.insert(ops.end(), g.begin(), g.end()); }

  void single(const Block& blk) { append(layering(wires_on(first_index(blk), blk.size), [](int, int) { return true; })); }

  // Low and high blocks of a pair, adjacent, high bits first on the chain. Forward: the QFT of the
  // pair. Read-back (B): each block's own inverse QFT, found as the two-block network run backwards.
  void span(const Block& lo, const Block& hi, bool read_back) {
    const int p = first_index(hi), s = lo.size + hi.size, split = hi.size;
    if (!read_back) {
      append(layering(wires_on(p, s), [](int, int) { return true; }));
      return;
    }
    // The span is reversed now (layer A). The two-block network runs from the span in order to the
    // span reversed; build it from the order it would start in, then emit it backwards, marked undo.
    std::vector<int> start(s);
    for (int t = 0; t < s; ++t) start[t] = wire_at_[p + s - 1 - t];
    const auto saved_pos = pos_;
    for (int t = 0; t < s; ++t) {
      pos_[start[t]] = p + t;
      wire_at_[p + t] = start[t];
    }
    auto g = layering(start, [split](int a, int b) { return (a < split) == (b < split); });
    // The layering ends with the span reversed, as layer A left it.
    for (int t = 0; t < s; ++t)
      if (pos_[start[t]] != saved_pos[start[t]]) throw std::logic_error("blockwise: read-back layout mismatch");
    for (int t = 0; t < s; ++t) {
      pos_[start[t]] = p + t;
      wire_at_[p + t] = start[t];
    }
    for (auto it = g.rbegin(); it != g.rend(); ++it) {
      NetworkOp x = *it;
      x.undo = true;
      ops.push_back(x);
    }
  }

  int n_, m_;
  std::vector<int> wire_at_;  // processing index at each position
  std::vector<int> pos_;      // position of each processing index
};

// The construction's steps, kept (O(n m) of them), in chunks of about a thousand.
class BlockwiseNetwork final : public QftNetwork {
 public:
  BlockwiseNetwork(int n, int m) : QftNetwork(n, std::max(0, std::min(n - 1, 2 * m - 1))) {
    Builder b(n, m);
    b.run();
    ops_ = std::move(b.ops);
    final_ = b.positions();
  }
  std::string name() const override { return "blockwise"; }
  int chunk_count() const override { return static_cast<int>((ops_.size() + kChunk - 1) / kChunk); }
  void chunk(int c, std::vector<NetworkOp>& out) const override {
    const std::size_t a = static_cast<std::size_t>(c) * kChunk, b = std::min(ops_.size(), a + kChunk);
    out.assign(ops_.begin() + static_cast<std::ptrdiff_t>(a), ops_.begin() + static_cast<std::ptrdiff_t>(b));
  }
  std::vector<int> final_positions() const override { return final_; }

 private:
  static constexpr std::size_t kChunk = 1024;
  std::vector<NetworkOp> ops_;
  std::vector<int> final_;
};

}  // namespace

std::unique_ptr<QftNetwork> make_blockwise_network(int wires, int block_length) {
  if (wires < 1 || block_length < 1) throw std::invalid_argument("blockwise: need n >= 1 and m >= 1");
  return std::make_unique<BlockwiseNetwork>(wires, block_length);
}

std::vector<int> emit_blockwise_qft(int n, int m, bool inverse, std::span<const int> chain, GateSink& sink) {
  if (static_cast<int>(chain.size()) != n) throw std::invalid_argument("blockwise: chain and register sizes differ");
  const auto net = make_blockwise_network(n, m);
  QftSpec spec;
  spec.qubits = n;
  spec.block_length = m;
  spec.inverse = inverse;
  emit_chain_qft(spec, *net, chain, sink);
  return net->final_positions();
}

int blockwise_two_qubit_depth(int n, int m) {
  const auto net = make_blockwise_network(n, m);
  std::vector<int> level(n, 0);
  int depth = 0;
  net->for_each_chunk([&](std::span<const NetworkOp> ops) {
    for (const NetworkOp& op : ops) {
      if (op.kind == NetworkOp::Kind::h) continue;
      const int l = std::max(level[op.i], level[op.j]) + 1;
      level[op.i] = level[op.j] = l;
      depth = std::max(depth, l);
    }
  });
  return depth;
}

}  // namespace qftplan
