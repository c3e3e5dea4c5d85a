#include "qftplan/networks/qft_network.hpp"

#include <algorithm>
#include <mutex>
#include <numeric>
#include <stdexcept>

#include "qftplan/core/input_error.hpp"
#include "qftplan/networks/parity_qft.hpp"

namespace qftplan {

using Kind = NetworkOp::Kind;

std::vector<int> QftNetwork::initial_positions() const {
  std::vector<int> pos(wires_);
  std::iota(pos.begin(), pos.end(), 0);
  return pos;
}

void QftNetwork::for_each_chunk(const std::function<void(std::span<const NetworkOp>)>& visit) const {
  std::vector<NetworkOp> ops;
  for (int c = 0; c < chunk_count(); ++c) {
    chunk(c, ops);
    visit(ops);
  }
}

std::vector<int> QftNetwork::final_positions() const {
  std::vector<int> pos = initial_positions();
  for_each_chunk([&pos](std::span<const NetworkOp> ops) {
    for (const auto& op : ops)
      if (op.kind == Kind::swap || op.kind == Kind::cp_swap) std::swap(pos[op.i], pos[op.j]);
  });
  return pos;
}

std::array<long long, 4> QftNetwork::step_counts() const {
  std::array<long long, 4> counts{};
  for_each_chunk([&counts](std::span<const NetworkOp> ops) {
    for (const auto& op : ops) ++counts[static_cast<int>(op.kind)];
  });
  return counts;
}

long long QftNetwork::block_count() const {
  const auto c = step_counts();
  return c[1] + c[2] + c[3];
}

long long QftNetwork::swap_count() const {
  const auto c = step_counts();
  return c[2] + c[3];
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

class ReversalNetwork : public QftNetwork {
 public:
  ReversalNetwork(int n, int d) : QftNetwork(n, d), layers_{0, n, d} {}
  std::string name() const override { return "reversal"; }
  int chunk_count() const override { return layers_.chunks(); }
  void chunk(int c, std::vector<NetworkOp>& out) const override {
    out.clear();
    layers_.chunk(c, out);
  }
  // Every pair of wires meets once and every block swaps: the register ends reversed.
  std::vector<int> final_positions() const override {
    std::vector<int> pos(wires_);
    for (int w = 0; w < wires_; ++w) pos[w] = wires_ - 1 - w;
    return pos;
  }
  // n Hadamards; every pair of wires meets once, fused when its distance is at most d (n - delta
  // pairs at distance delta), as a plain SWAP otherwise.
  std::array<long long, 4> step_counts() const override {
    const long long n = wires_;
    long long fused = 0;
    for (long long delta = 1; delta <= std::min<long long>(d_, n - 1); ++delta) fused += n - delta;
    return {n, 0, n * (n - 1) / 2 - fused, fused};
  }

 private:
  ReversalLayers layers_;
};

// The anchored network (ours): the first wire stays at the start of the chain and the reversal
// network of the other n-1 wires runs beside it. A wire of that network reaches the start, next to
// the anchor, exactly when it has met every wire before it, just before its Hadamard: it meets the
// anchor there with a plain controlled phase (2 CX) instead of a fused block. The position next to
// the anchor is idle at that layer, so the depth stays 2n-3 and the blocks n(n-1)/2, with n-1 SWAPs
// fewer than the reversal network; the register ends reversed but for the anchor.
class AnchoredNetwork final : public QftNetwork {
 public:
  AnchoredNetwork(int n, int d) : QftNetwork(n, d), rest_{1, n - 1, d} {}
  std::string name() const override { return "anchored"; }
  int chunk_count() const override { return wires_ >= 2 ? rest_.chunks() : 1; }
  void chunk(int c, std::vector<NetworkOp>& out) const override {
    out.clear();
    if (c == 0) out.push_back({Kind::h, 0, -1});
    if (wires_ < 2) return;
    std::vector<NetworkOp> rest;
    rest_.chunk(c, rest);
    for (const NetworkOp& op : rest) {
      // The anchor's rotation with wire w, kept when w <= d, right before w's Hadamard.
      if (op.kind == Kind::h && op.i <= d_) out.push_back({Kind::cp, 0, op.i});
      out.push_back(op);
    }
  }
  std::vector<int> final_positions() const override {
    std::vector<int> pos(wires_);
    for (int w = 0; w < wires_; ++w) pos[w] = w == 0 ? 0 : wires_ - w;
    return pos;
  }
  std::array<long long, 4> step_counts() const override {
    const long long n = wires_, m = n - 1;
    if (n < 2) return {n, 0, 0, 0};
    long long fused = 0;
    for (long long delta = 1; delta <= std::min<long long>(d_, m - 1); ++delta) fused += m - delta;
    return {n, std::min<long long>(d_, m), m * (m - 1) / 2 - fused, fused};
  }

 private:
  ReversalLayers rest_;
};

// The parity network: the reversal network's steps, rendered as parity steps (parity_qft.hpp).
class ParityNetwork final : public ReversalNetwork {
 public:
  using ReversalNetwork::ReversalNetwork;
  std::string name() const override { return "parity"; }
  Rendering rendering() const override { return Rendering::parity; }
};

// A network whose steps come from a simulation (leapfrog, insertion): streamed forwards without
// being kept, and kept (12 bytes a step) on the first call of chunk(), which needs random access (the
// inverse runs the chunks backwards). Chunk c holds the steps of wire c's turn.
class SimulatedNetwork : public QftNetwork {
 public:
  using Visit = std::function<void(std::span<const NetworkOp>)>;
  int chunk_count() const override { return wires_; }
  std::array<long long, 4> step_counts() const override { return counts_; }
  void chunk(int c, std::vector<NetworkOp>& out) const override {
    std::call_once(kept_, [this] {
      ops_.reserve(static_cast<std::size_t>(block_count() + wires_));
      start_.reserve(static_cast<std::size_t>(wires_) + 1);
      start_.push_back(0);
      simulate([this](std::span<const NetworkOp> ops) {
        ops_.insert(ops_.end(), ops.begin(), ops.end());
        start_.push_back(ops_.size());
      });
    });
    out.assign(ops_.begin() + static_cast<std::ptrdiff_t>(start_[c]),
               ops_.begin() + static_cast<std::ptrdiff_t>(start_[c + 1]));
  }
  void for_each_chunk(const Visit& visit) const override { simulate(visit); }

 protected:
  using QftNetwork::QftNetwork;
  // Runs the network; wire c's turn (chunk c) goes to `visit`, for c = 0 .. n-1 in order.
  virtual void simulate(const Visit& visit) const = 0;
  // Counts the steps by a dry run (for networks without a closed form).
  void count_by_simulation() {
    counts_ = {};
    simulate([this](std::span<const NetworkOp> ops) {
      for (const auto& op : ops) ++counts_[static_cast<int>(op.kind)];
    });
  }
  std::array<long long, 4> counts_{};  // steps of each kind, known when built

 private:
  mutable std::once_flag kept_;
  mutable std::vector<NetworkOp> ops_;
  mutable std::vector<std::size_t> start_;
};

// Leapfrog network (ours) for kept distance d < n-1. Wires start in order along the chain. Wire j,
// after its Hadamard, travels right until it has passed min(j+d, n-1): every wire it passes is either
// one it must meet (j < q <= j+d: fused rotation and SWAP) or one that has finished its own journey
// (plain SWAP). In the steady state the chain reads j, j-d, j+1, j-d+1, ..., j-1, j+d, j+d+1, ...:
// the traveller alternates between finished and needed wires, so each wire costs d fused blocks and
// at most d plain SWAPs, and consecutive travellers follow each other two steps apart (linear depth).
// Before wire j travels, every wire i < j has passed it with their rotation, so its Hadamard is in
// order; it passes j+1..j+d before their own Hadamards.
class LeapfrogNetwork final : public SimulatedNetwork {
 public:
  LeapfrogNetwork(int n, int d) : SimulatedNetwork(n, d) {
    if (d < 1) throw std::invalid_argument("leapfrog network needs d >= 1");
    // Wire j meets the min(d, n-1-j) wires after it (fused blocks) and leapfrogs
    // min(j, n-1-j, d, n-1-d) finished ones (plain SWAPs): the ramp-up at the start, the steady
    // state's d, and the run-out at the end. Found from the simulation and checked against it for
    // every n < 200 and every d (Streaming.LeapfrogCountsEqualItsSteps), so no dry run is needed.
    const long long cap = std::min(d, n - 1 - d);
    counts_[static_cast<int>(Kind::h)] = n;
    for (long long j = 0; j < n; ++j) {
      counts_[static_cast<int>(Kind::cp_swap)] += std::min<long long>(d, n - 1 - j);
      counts_[static_cast<int>(Kind::swap)] += std::min({j, n - 1 - j, cap});
    }
  }
  std::string name() const override { return "leapfrog"; }

 private:
  void simulate(const Visit& visit) const override {
    const int n = wires_, d = d_;
    std::vector<int> at(n), pos(n);  // at[p]: wire at chain position p
    for (int i = 0; i < n; ++i) at[i] = pos[i] = i;
    std::vector<NetworkOp> ops;
    ops.reserve(2 * static_cast<std::size_t>(d) + 1);
    for (int j = 0; j < n; ++j) {
      ops.clear();
      ops.push_back({Kind::h, j, -1});
      const int last = std::min(j + d, n - 1);
      bool passed_last = j == last;
      while (!passed_last) {
        const int p = pos[j];
        const int q = at[p + 1];
        const bool needed = q > j && q - j <= d;
        ops.push_back({needed ? Kind::cp_swap : Kind::swap, std::min(j, q), std::max(j, q)});
        std::swap(at[p], at[p + 1]);
        pos[at[p]] = p;
        pos[at[p + 1]] = p + 1;
        passed_last = q == last;
      }
      visit(std::span<const NetworkOp>(ops));
    }
  }
};

// Insertion network (ours) for kept distance d >= 2. Wires start in order along the chain; the wires
// that still owe a rotation to a later wire (the window: at most the d wires before the next one) sit
// together, the finished ones to their left. Wire c's turn: it walks left into the window from its
// right end, meeting each window wire as it passes (fused block), and meets the window's first wire
// with a plain controlled phase, so it lands second in the window; then its Hadamard. The window wire
// c-d finishes with that turn and must leave to the left: when it is not first, c meets it with a
// plain controlled phase where it stands, it steps left past the window wires before it (plain
// SWAPs), and c walks on. Why not pass every wire: a wire that crosses a later partner b must cross
// back (or be crossed by b+d, which b still has to meet), so every fused block costs a plain SWAP
// somewhere; meeting the first window wire and the finishing one in place saves two of them a turn.
// Measured (tests, README): per wire 6 CX at d = 2 (the leapfrog network: 12), 11.3 at d = 3 (18),
// 58 at d = 11 (66); two-qubit depth about 2n.
//
// The parity form (window_parity_qft.cpp) moves the finishing wire first: it steps left to the front of
// the window (plain SWAPs), then c passes every window wire but it and meets it in place, landing first
// in the window. Rendered on a chain of output differences, a SWAP costs 2 CX, a fused block 2 and a
// plain controlled phase 1 (and 2 to keep the chain), so about 4d CX a wire against the fused form's
// 3d + 3k (k: how far the finishing wire stands from the front).
class InsertionNetwork final : public SimulatedNetwork {
 public:
  InsertionNetwork(int n, int d, bool parity_form) : SimulatedNetwork(n, d), parity_form_(parity_form) {
    if (d < 2) throw std::invalid_argument("insertion network needs d >= 2");
    if (!parity_form || d > n - 1) {
      count_by_simulation();
      return;
    }
    // The parity form's window in closed form: turns 1 .. d-1 pass c-1 wires; turn d finds wire 0 at
    // the front; from turn d+1 on the finishing wire is last in the window (each turn lands first), so
    // it steps d-1 places and c passes d-1 wires; every turn from 1 on ends with one plain controlled
    // phase. Checked against the simulation for every n < 150 and d (Streaming.InsertionCountsEqualItsSteps).
    const long long N = n, D = d;
    counts_[static_cast<int>(Kind::h)] = N;
    counts_[static_cast<int>(Kind::cp)] = N - 1;
    counts_[static_cast<int>(Kind::cp_swap)] = (D - 1) * (D - 2) / 2 + (N - D) * (D - 1);
    counts_[static_cast<int>(Kind::swap)] = std::max(N - 1 - D, 0LL) * (D - 1);
  }
  std::string name() const override { return parity_form_ ? "parity-insertion" : "insertion"; }
  Rendering rendering() const override { return parity_form_ ? Rendering::window : Rendering::fused; }

 private:
  void simulate(const Visit& visit) const override {
    const int n = wires_, d = d_;
    std::vector<int> window;  // wires owing a later rotation, in chain order
    window.reserve(static_cast<std::size_t>(d) + 1);
    std::vector<NetworkOp> ops;
    ops.reserve(2 * static_cast<std::size_t>(d) + 2);
    auto meet = [&ops](Kind k, int a, int b) { ops.push_back({k, std::min(a, b), std::max(a, b)}); };
    for (int c = 0; c < n; ++c) {
      ops.clear();
      const int finishing = c - d;  // meets its last partner now, if any
      const auto at = std::find(window.begin(), window.end(), finishing);
      const int k = at == window.end() ? -1 : static_cast<int>(at - window.begin());
      const int size = static_cast<int>(window.size());
      if (k > 0 && parity_form_) {
        for (int x = k - 1; x >= 0; --x) meet(Kind::swap, window[x], finishing);
        window.erase(window.begin() + k);
        window.insert(window.begin(), finishing);
        for (int x = size - 1; x >= 1; --x) meet(Kind::cp_swap, window[x], c);
        meet(Kind::cp, finishing, c);
        window.front() = c;
      } else if (k <= 0) {
        for (int x = size - 1; x >= 1; --x) meet(Kind::cp_swap, window[x], c);
        if (size > 0) meet(Kind::cp, window[0], c);
        if (k == 0)
          window.front() = c;  // the finished wire stays left of c
        else
          window.insert(window.begin() + std::min(size, 1), c);
      } else {
        for (int x = size - 1; x > k; --x) meet(Kind::cp_swap, window[x], c);
        meet(Kind::cp, finishing, c);
        for (int x = k - 1; x >= 0; --x) meet(Kind::swap, window[x], finishing);
        for (int x = k - 1; x >= 1; --x) meet(Kind::cp_swap, window[x], c);
        meet(Kind::cp, window[0], c);
        window.erase(window.begin() + k);
        window.insert(window.begin() + 1, c);
      }
      ops.push_back({Kind::h, c, -1});
      visit(std::span<const NetworkOp>(ops));
    }
  }
  bool parity_form_;
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
std::unique_ptr<QftNetwork> make_leapfrog_network(int wires, int max_distance) {
  return std::make_unique<LeapfrogNetwork>(wires, max_distance);
}
std::unique_ptr<QftNetwork> make_insertion_network(int wires, int max_distance) {
  return std::make_unique<InsertionNetwork>(wires, max_distance, false);
}
std::unique_ptr<QftNetwork> make_parity_insertion_network(int wires, int max_distance) {
  return std::make_unique<InsertionNetwork>(wires, max_distance, true);
}
std::unique_ptr<QftNetwork> make_anchored_network(int wires, int max_distance) {
  return std::make_unique<AnchoredNetwork>(wires, max_distance);
}
std::unique_ptr<QftNetwork> make_parity_network(int wires, int max_distance) {
  return std::make_unique<ParityNetwork>(wires, max_distance);
}
std::unique_ptr<QftNetwork> make_adjacent_network(int wires) { return std::make_unique<AdjacentNetwork>(wires); }
std::unique_ptr<QftNetwork> make_hadamard_network(int wires) { return std::make_unique<HadamardNetwork>(wires); }

// The simulated networks' steps take 12 bytes each when kept (the inverse): past 2^25 steps (400 MB)
// the reversal network streams instead, which would otherwise exhaust memory on big registers with
// big degrees. Both take at most 2d + 2 steps a wire.
constexpr long long kMaxSimulatedSteps = 1LL << 25;
bool fits_simulated(int n, int d) { return 2LL * n * (d + 1) <= kMaxSimulatedSteps; }

long long network_native_cost(const QftNetwork& network) {
  const auto c = network.step_counts();
  const int k_cp = static_cast<int>(Kind::cp), k_swap = static_cast<int>(Kind::swap), k_fused = static_cast<int>(Kind::cp_swap);
  if (network.rendering() == QftNetwork::Rendering::window) return window_parity_cx(network);
  // The parity network: 2 CX per meeting and the closing ladder of n-1 CX.
  if (network.parity()) return 2 * (c[k_swap] + c[k_fused]) + std::max(network.wires() - 1, 0);
  return 2 * c[k_cp] + 3 * (c[k_swap] + c[k_fused]);
}

std::unique_ptr<QftNetwork> choose_network(const QftSpec& spec) {
  const int n = spec.qubits, d = spec.max_distance();
  // The block construction is its own unitary: only its network builds it.
  if (spec.block_length) return make_blockwise_network(n, *spec.block_length);
  if (n <= 2) return make_anchored_network(n, d);
  if (!spec.effectively_exact() && d == 0) return make_hadamard_network(n);
  if (!spec.effectively_exact() && d == 1) return make_adjacent_network(n);
  // Fewest native two-qubit gates wins (each carries a coupler's error, so this is what the ESP
  // weighs most). The reversal-based networks count in closed form; the simulated ones are built
  // (a dry run of O(n d) steps) only when they could win, their kept rotations taking 2 CX each at least.
  auto best = make_anchored_network(n, d);
  long long best_cost = network_native_cost(*best);
  auto consider = [&](std::unique_ptr<QftNetwork> net) {
    if (const long long c = network_native_cost(*net); c < best_cost) best = std::move(net), best_cost = c;
  };
  consider(make_parity_network(n, d));
  const long long kept = static_cast<long long>(d) * n - static_cast<long long>(d) * (d + 1) / 2;
  if (!spec.effectively_exact() && fits_simulated(n, d) && 2 * kept < best_cost) {
    // The fused insertion network wins only at small degrees (measured: up to d = 3; from d = 4 on
    // the parity form needs fewer CX at every size tried, a test checks n = 64 .. 1024, d <= 11), and
    // it counts by a dry run: not built beyond d = 6.
    if (d <= 6) consider(make_insertion_network(n, d));
    consider(make_parity_insertion_network(n, d));
    consider(make_leapfrog_network(n, d));
  }
  return best;
}

namespace {
constexpr std::array kNetworkChoices{NetworkChoice::automatic, NetworkChoice::reversal, NetworkChoice::anchored,
                                     NetworkChoice::leapfrog,  NetworkChoice::insertion, NetworkChoice::parity_insertion,
                                     NetworkChoice::parity,    NetworkChoice::blockwise};
}  // namespace

std::span<const NetworkChoice> network_choices() { return kNetworkChoices; }

const char* network_choice_name(NetworkChoice c) {
  switch (c) {
    case NetworkChoice::automatic: return "auto";
    case NetworkChoice::reversal: return "reversal";
    case NetworkChoice::anchored: return "anchored";
    case NetworkChoice::leapfrog: return "leapfrog";
    case NetworkChoice::insertion: return "insertion";
    case NetworkChoice::parity_insertion: return "parity-insertion";
    case NetworkChoice::parity: return "parity";
    case NetworkChoice::blockwise: return "blockwise";
  }
  return "?";
}

NetworkChoice parse_network_choice(const std::string& text) {
  std::string valid;
  for (NetworkChoice c : kNetworkChoices) {
    if (text == network_choice_name(c)) return c;
    valid += (valid.empty() ? "" : ", ") + std::string(network_choice_name(c));
  }
  throw InputError("unknown network '" + text + "' (valid: " + valid + ")");
}

std::unique_ptr<QftNetwork> choose_network(const QftSpec& spec, NetworkChoice choice) {
  const int n = spec.qubits, d = spec.max_distance();
  if (spec.block_length && choice != NetworkChoice::automatic && choice != NetworkChoice::blockwise)
    throw InputError(std::string("the ") + network_choice_name(choice) +
                     " network does not build the block construction; use --network blockwise");
  if (choice == NetworkChoice::blockwise && !spec.block_length)
    throw InputError("the blockwise network needs its block length: --approx M sets blocks of M qubits");
  if (choice == NetworkChoice::automatic || choice == NetworkChoice::blockwise || n <= 1) return choose_network(spec);
  // Reversal and parity are built as named at every degree: they end in order, which is why they
  // are asked for (and why `--end-order same` may pick them at degree 2).
  const bool in_order = choice == NetworkChoice::reversal || choice == NetworkChoice::parity;
  if (!in_order && !spec.effectively_exact() && d == 0) return make_hadamard_network(n);
  if (!in_order && !spec.effectively_exact() && d == 1) return make_adjacent_network(n);
  const bool simulated = choice == NetworkChoice::leapfrog || choice == NetworkChoice::insertion ||
                         choice == NetworkChoice::parity_insertion;
  if (simulated && spec.effectively_exact())
    throw InputError(std::string("the ") + network_choice_name(choice) +
                     " network is for the approximate QFT (degrees 3 .. n-1); use --approx or another --network");
  if (simulated && !fits_simulated(n, d))
    throw InputError(std::string("the ") + network_choice_name(choice) + " network of " + std::to_string(n) +
                     " qubits at degree " + std::to_string(d + 1) +
                     " is too big to keep (more than 2^25 steps); use a smaller degree or another --network");
  switch (choice) {
    case NetworkChoice::reversal: return make_reversal_network(n, d);
    case NetworkChoice::anchored: return make_anchored_network(n, d);
    case NetworkChoice::parity: return make_parity_network(n, d);
    case NetworkChoice::leapfrog: return make_leapfrog_network(n, d);
    case NetworkChoice::insertion: return make_insertion_network(n, d);
    case NetworkChoice::parity_insertion: return make_parity_insertion_network(n, d);
    case NetworkChoice::blockwise:
    case NetworkChoice::automatic: break;
  }
  return choose_network(spec);
}

}  // namespace qftplan
