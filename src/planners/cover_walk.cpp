// The cover construction: the QFT on any connected set of qubits as a cascade of walks.
//
// Source: the cascade of walks follows Khadiev, Khadieva, Sagitov, Khasanov, "Quantum Circuit for
// Quantum Fourier Transform for Arbitrary Qubit Connectivity Graphs", arXiv:2510.09824, 2025: wire i
// (after its Hadamard) travels through the device, meeting every unfinished wire once, and stops on a
// qubit whose removal leaves the rest connected. Their covering paths and their bound
// (2n^2 - 2n - 2 CNOT) are theirs; the walk below (a fixed root, a path plus a forest chosen per
// stage, fusing each first meeting with the move, and excursions into the forest as exchanges that
// leave a parity behind, as in the parity networks of Klaver et al., arXiv:2408.10907, 2024) and the
// bound proved here (2n^2 - 3n, at or below theirs for every n >= 2) are ours.
//
// The construction. A root qubit s of the region never moves out of the register. Stage k (m wires
// still unfinished, all on `alive` qubits, a connected set): the wire on s is declared wire k (the
// numbering is fixed by simulation, so wire k is whichever wire the earlier walks left on s); it gets
// its Hadamard, then walks: a path s = p0, p1, ..., pd = t of alive qubits (d >= 1) and a forest F of
// the other alive qubits hanging from p0 .. p(d-1). At p_i it visits each forest child c: a forest
// leaf gets cp (the wire stays); an inner forest qubit gets an exchange: with the walking wire's bit
// w on u and c's bit x on c, cx c->u then cx u->c leave w ^ x on u and w on c; the meeting's phase
// theta w x = theta/2 w + theta/2 x - theta/2 (w ^ x) is three rz (the one-bit terms before the
// exchange, the parity's after it on u); c's children are visited from c (w stays plain there); then
// cx u->c, cx c->u give x back to c and w to u. Then cp_swap(p_i, p_{i+1}) meets p_{i+1}'s wire and
// steps on. The wire parks on t; t holds no forest child, so alive minus t stays connected (the path
// minus t plus F is a spanning tree of it), and the wire of p1 now sits on s for stage k+1. With two
// wires left a cp ends the job. Every pair (k, j > k) meets exactly once, in stage k: after the
// Hadamard of k and before that of j, so the circuit is the QFT (the structural checker proves each
// plan in the tests, and simulation against FFTW the small ones).
//
// The chain tail (ours). A walk costs about 3 CX per unfinished wire; a chain network on m wires about
// 2 per wire and stage (the parity network: m^2 - 1 in all). So a cascade may also park its walks off
// a chain of the region (a path from the root): each walk runs along the chain from the root to the
// point where an off-chain qubit t hangs, then down to t, and parks there (t farthest from the chain
// always parks: no other qubit's shortest path to the chain runs through it). When only the chain is
// alive the m wires on it are numbered k, k+1, ... in the order the chain network wants, and the
// network finishes: the textbook QFT's steps for wires k .. n-1 are the QFT of those m wires (the
// rotations depend on the distance only), so the circuit is still the QFT.
//
// The bound (ours). Stage cost, cp = 2 CX, cp_swap = 3 CX, exchange and its undoing 2 CX each: 3 per
// path step, 2 per forest leaf, 4 per inner forest qubit. With d path steps, L leaves and I inner
// qubits, d + L + I = m - 1 and the cost is 3d + 2L + 4I = 4(m - 1) - d - 2L <= 4m - 5, since d >= 1.
// The last pair costs 2. Total <= 2 + sum_{m=3..n} (4m - 5) = 2n^2 - 3n for n >= 2. A chain tail of m
// wires takes the place of the stages of m .. 1 wires, allowed 2m^2 - 3m; the network chosen costs at
// most the parity network's m^2 - 1 (choose_network keeps the fewest), and m^2 - 1 <= 2m^2 - 3m for
// m >= 3 (the strategy offers chains of 3 qubits or more). Dropped
// rotations (the approximate QFT) only turn a cp into nothing, a cp_swap into a swap (3 CX) and an
// exchange into one without its rz: no step costs more. The stage keeps the cheapest of a few
// candidate walks, so the bound holds whichever wins. On chips the greedy path takes most qubits and
// the forest is mostly leaves, so plans land far below this bound (README "Strategies" has the
// figures).

#include "cover_walk.hpp"

#include <algorithm>
#include <limits>
#include <random>

#include <fmt/format.h>

#include "qftplan/core/input_error.hpp"
#include "qftplan/core/run_budget.hpp"
#include "qftplan/networks/chain_qft.hpp"
#include "qftplan/networks/qft_network.hpp"
#include "qftplan/planners/chain_search.hpp"

namespace qftplan {

namespace {

// One gate of the walk on physical qubits, with the wires (slots: start indices in the region) it
// joins; the angle is filled in once every slot has its wire number.
struct Step {
  GateKind kind;
  int a, b;
  int token, partner;
  bool back = false;  // a parity_step that undoes the exchange into a forest qubit
};

// A stage's walk: the path and the forest parent's children (by physical qubit).
struct Walk {
  std::vector<int> path;
  long long cost = std::numeric_limits<long long>::max();
};

class Cascade {
 public:
  Cascade(const Device& dev, const std::vector<int>& region, int root, std::uint64_t seed, const RunBudget* budget)
      : dev_(dev), region_(region), root_(root), rng_(seed), budget_(budget) {
    const int N = dev.qubit_count();
    alive_.assign(N, 0);
    slot_at_.assign(N, -1);
    level_.assign(N, -1);
    children_.assign(N, {});
    mark_.assign(N, 0);
    parent_.assign(N, -1);
    depth_.assign(N, 0);
    for (int s = 0; s < static_cast<int>(region.size()); ++s) {
      alive_[region[s]] = 1;
      slot_at_[region[s]] = s;
    }
    pos_of_ = region;
  }

  // Runs every stage; returns the steps and fills wire_of_slot_.
  void run() {
    const int n = static_cast<int>(region_.size());
    wire_of_slot_.assign(n, -1);
    std::vector<int> previous;
    for (int k = 0, m = n; m >= 1; ++k, --m) {
      throw_if_exhausted(budget_, "the cover strategy's walks");
      const int token = slot_at_[root_];
      wire_of_slot_[token] = k;
      steps_.push_back({GateKind::h, root_, -1, token, -1});
      if (m == 1) break;
      if (m == 2) {
        int other = -1;
        for (int nb : dev_.neighbours(root_))
          if (alive_[nb]) other = nb;
        step(GateKind::cp, root_, other);
        wire_of_slot_[slot_at_[other]] = k + 1;
        steps_.push_back({GateKind::h, other, -1, slot_at_[other], -1});
        break;
      }
      previous = walk_stage(previous);
    }
  }

  // The cascade with a chain tail: stages as in run(), each parking its wire on a region qubit off
  // `chain` (a path of the region from the root, chain.front() == root), until only the chain is
  // alive; the m wires left are then numbered k, k+1, ..., wire k + w starting on
  // chain[tail_start[w]], for a chain network to finish the transform. Returns k (the stages run).
  int run_to_chain(const std::vector<int>& chain, const std::vector<int>& tail_start) {
    const int n = static_cast<int>(region_.size());
    wire_of_slot_.assign(n, -1);
    on_chain_.assign(dev_.qubit_count(), -1);
    for (int i = 0; i < static_cast<int>(chain.size()); ++i) on_chain_[chain[i]] = i;
    int k = 0;
    for (;; ++k) {
      throw_if_exhausted(budget_, "the cover strategy's walks");
      alive_count_ = 0;
      for (int q : region_) alive_count_ += alive_[q];
      if (alive_count_ == static_cast<long long>(chain.size())) break;
      const int token = slot_at_[root_];
      wire_of_slot_[token] = k;
      steps_.push_back({GateKind::h, root_, -1, token, -1});
      emit_walk(parking_walk(chain));
    }
    for (int w = 0; w < static_cast<int>(tail_start.size()); ++w)
      wire_of_slot_[slot_at_[chain[tail_start[w]]]] = k + w;
    return k;
  }

  std::vector<Step> steps_;
  std::vector<int> wire_of_slot_;
  std::vector<int> pos_of_;  // slot -> physical qubit now

 private:
  // Records a two-qubit step and moves the wires a swap moves (an exchange moves them as a swap
  // for what follows: the walking wire's value is on the far qubit, the other wire's returns when
  // the exchange is undone).
  void step(GateKind kind, int a, int b, bool back = false) {
    steps_.push_back({kind, a, b, slot_at_[a], slot_at_[b], back});
    if (kind == GateKind::cp) return;
    std::swap(slot_at_[a], slot_at_[b]);
    pos_of_[slot_at_[a]] = a;
    pos_of_[slot_at_[b]] = b;
  }

  // A maximal greedy path from `start` (alive qubits), extending `prefix` (which begins at the root):
  // the next qubit is the free neighbour with the fewest free neighbours (Warnsdorff's rule), ties
  // at random. Maximal, so its end has no free neighbour and removing it keeps the rest connected.
  std::vector<int> greedy_path(std::vector<int> path, bool random_ties) {
    ++stamp_;
    for (int q : path) mark_[q] = stamp_;
    while (true) {
      const int cur = path.back();
      int best = -1, best_free = 0, ties = 0;
      for (int nb : dev_.neighbours(cur)) {
        if (!alive_[nb] || mark_[nb] == stamp_) continue;
        int free = 0;
        for (int x : dev_.neighbours(nb)) free += alive_[x] && mark_[x] != stamp_;
        if (best < 0 || free < best_free) {
          best = nb, best_free = free, ties = 1;
        } else if (free == best_free && random_ties && std::uniform_int_distribution<int>(0, ties++)(rng_) == 0) {
          best = nb;
        }
      }
      if (best < 0) return path;
      mark_[best] = stamp_;
      path.push_back(best);
    }
  }

  // Breadth-first search over the alive qubits from `sources` (depth 0): fills parent_ (towards the
  // sources, -1 on them) and depth_; returns the qubits reached in order (the farthest level last).
  std::vector<int> alive_bfs(const std::vector<int>& sources) {
    ++stamp_;
    std::vector<int> order;
    for (int q : sources) mark_[q] = stamp_, depth_[q] = 0, parent_[q] = -1, order.push_back(q);
    for (std::size_t h = 0; h < order.size(); ++h)
      for (int nb : dev_.neighbours(order[h]))
        if (alive_[nb] && mark_[nb] != stamp_) {
          mark_[nb] = stamp_;
          parent_[nb] = order[h];
          depth_[nb] = depth_[order[h]] + 1;
          order.push_back(nb);
        }
    return order;
  }

  int alive_degree(int q) const {
    int k = 0;
    for (int nb : dev_.neighbours(q)) k += alive_[nb];
    return k;
  }

  // A shortest path from the root to an alive qubit farthest from it (ties: the one with the fewest
  // alive neighbours, so a pendant stretch loses its tip). The farthest qubit lies on no other
  // qubit's shortest path to the root, so removing it keeps the rest connected: it can park.
  std::vector<int> deepest_path() {
    const std::vector<int> order = alive_bfs({root_});
    // The breadth-first order ends with the farthest level.
    int far = order.back();
    for (auto it = order.rbegin(); it != order.rend() && depth_[*it] == depth_[far]; ++it)
      if (alive_degree(*it) < alive_degree(far)) far = *it;
    std::vector<int> path;
    for (int v = far; v >= 0; v = parent_[v]) path.push_back(v);
    std::reverse(path.begin(), path.end());
    return path;
  }

  // The forest of the alive qubits off `path`, hanging from path[0 .. d-1] by breadth-first levels;
  // a qubit two or more levels out prefers a parent that already has children (fewer inner qubits,
  // each of which costs an exchange and its undoing). Returns the stage's CX cost, or max() when
  // some qubit is reachable only through the path's end (then the end cannot park).
  long long build_forest(const std::vector<int>& path) {
    for (int q : touched_) children_[q].clear(), level_[q] = -1;
    touched_.clear();
    const int t = path.back();
    std::vector<int> order;
    for (std::size_t i = 0; i + 1 < path.size(); ++i) level_[path[i]] = 0, order.push_back(path[i]);
    level_[t] = 0;
    for (int q : path) touched_.push_back(q);
    std::vector<int> parent_of;
    for (std::size_t h = 0; h < order.size(); ++h)
      for (int nb : dev_.neighbours(order[h]))
        if (alive_[nb] && level_[nb] < 0) {
          level_[nb] = level_[order[h]] + 1;
          order.push_back(nb);
          touched_.push_back(nb);
        }
    long long cost = 3 * static_cast<long long>(path.size() - 1);
    long long reached = static_cast<long long>(path.size());
    for (int v : order) {
      if (level_[v] == 0) continue;
      ++reached;
      int parent = -1;
      for (int nb : dev_.neighbours(v))
        if (alive_[nb] && nb != t && level_[nb] == level_[v] - 1 && (parent < 0 || !children_[nb].empty())) {
          parent = nb;
          if (!children_[nb].empty()) break;
        }
      children_[parent].push_back(v);
    }
    if (reached != alive_count_) return std::numeric_limits<long long>::max();
    for (int v : order)
      if (level_[v] > 0) cost += children_[v].empty() ? 2 : 4;
    return cost;
  }

  // Emits the visit of forest qubit c from u (the walking wire is on u): a leaf by a controlled
  // phase; an inner qubit by an exchange (parity_step: cx c->u, cx u->c leaves w^x on u and w on c,
  // the meeting's phase goes on the parity), its children from c, and the exchange undone (cx u->c,
  // cx c->u gives back x on c and w on u): 4 CX where a cp_swap and a swap back take 6.
  void visit(int c, int u) {
    if (children_[c].empty()) {
      step(GateKind::cp, u, c);
      return;
    }
    step(GateKind::parity_step, u, c);
    const std::vector<int> kids = children_[c];
    for (int g : kids) visit(g, c);
    step(GateKind::parity_step, c, u, true);
  }

  // A stage's walk towards the chain tail: along the chain from the root to where an off-chain
  // qubit t hangs (by a shortest path of off-chain qubits), then to t, where the wire parks. The
  // candidates for t: the off-chain qubits farthest from the chain (one of them can always park:
  // no other qubit's shortest path to the chain runs through it) and those with one alive
  // neighbour, the ones hanging farthest along the chain first (the chain beyond the walk's turn
  // hangs from it as forest, 4 CX per inner qubit); the cheapest by build_forest, which refuses a t
  // whose removal would cut the alive qubits apart. m >= chain size + 1 >= 3 qubits are alive.
  std::vector<int> parking_walk(const std::vector<int>& chain) {
    const std::vector<int> order = alive_bfs(chain);
    const int far = depth_[order.back()];
    auto attach = [&](int q) {
      while (on_chain_[q] < 0) q = parent_[q];
      return on_chain_[q];
    };
    std::vector<std::pair<int, int>> cands;  // (-attachment index, qubit)
    for (int q : order)
      if (on_chain_[q] < 0 && (depth_[q] == far || alive_degree(q) == 1)) cands.push_back({-attach(q), q});
    std::sort(cands.begin(), cands.end());
    constexpr std::size_t kCandidates = 12;
    if (cands.size() > kCandidates) {
      // Keep a farthest one among those tried.
      const auto f = std::find_if(cands.begin(), cands.end(), [&](const auto& c) { return depth_[c.second] == far; });
      if (f - cands.begin() >= static_cast<std::ptrdiff_t>(kCandidates)) std::iter_swap(f, cands.begin() + kCandidates - 1);
      cands.resize(kCandidates);
    }
    std::vector<int> best;
    long long best_cost = std::numeric_limits<long long>::max();
    for (auto [neg_a, t] : cands) {
      std::vector<int> path(chain.begin(), chain.begin() + (-neg_a) + 1), branch;
      for (int q = t; on_chain_[q] < 0; q = parent_[q]) branch.push_back(q);
      path.insert(path.end(), branch.rbegin(), branch.rend());
      if (const long long c = build_forest(path); c < best_cost) best_cost = c, best = std::move(path);
    }
    if (best.empty())
      throw PlanningError("the cover strategy found no walk to the chain (internal error: a farthest qubit always parks)");
    return best;
  }

  // One stage with m >= 3 alive qubits: the cheapest of a few candidate walks (the last stage's path
  // without its end, extended; greedy paths with and without random ties), emitted. Returns its path.
  std::vector<int> walk_stage(const std::vector<int>& previous) {
    alive_count_ = 0;
    for (int q : region_) alive_count_ += alive_[q];
    std::vector<std::vector<int>> candidates;
    if (previous.size() >= 3) candidates.push_back(greedy_path({previous.begin(), previous.end() - 1}, false));
    candidates.push_back(greedy_path({root_}, false));
    for (int r = 0; r < 2; ++r) candidates.push_back(greedy_path({root_}, true));
    candidates.push_back(deepest_path());
    std::size_t best = 0;
    long long best_cost = std::numeric_limits<long long>::max();
    for (std::size_t i = 0; i < candidates.size(); ++i) {
      const long long c = build_forest(candidates[i]);
      if (c < best_cost) best_cost = c, best = i;
    }
    if (best_cost == std::numeric_limits<long long>::max())
      throw PlanningError("the cover strategy found no walk (internal error: a maximal path always parks)");
    emit_walk(candidates[best]);
    return candidates[best];
  }

  // Emits the walk along `path` (its forest built again) and retires the path's end.
  void emit_walk(const std::vector<int>& path) {
    build_forest(path);
    for (std::size_t i = 0; i + 1 < path.size(); ++i) {
      const std::vector<int> kids = children_[path[i]];
      for (int c : kids) visit(c, path[i]);
      step(GateKind::cp_swap, path[i], path[i + 1]);
    }
    alive_[path.back()] = 0;
  }

  const Device& dev_;
  std::vector<int> region_;
  int root_;
  std::mt19937_64 rng_;
  const RunBudget* budget_;
  std::vector<char> alive_;
  std::vector<int> slot_at_, level_, mark_, touched_, parent_, depth_, on_chain_;
  std::vector<std::vector<int>> children_;
  int stamp_ = 0;
  long long alive_count_ = 0;
};

}  // namespace

CoverRegion cover_region(const Device& dev, int n, std::uint64_t seed, const RunBudget* budget) {
  ChainSearchOptions cso;
  cso.seed = seed;
  cso.budget = budget;
  cso.work_budget = 5'000'000;
  const auto found = find_chain(dev, n, cso);
  std::vector<int> chain = found.chain.empty() ? found.longest : found.chain;
  // No chain at all (no component holds n qubits): grow from the first qubit in service, which then
  // reports how short its component falls.
  for (int q = 0; chain.empty() && q < dev.qubit_count(); ++q)
    if (dev.usable(q)) chain.push_back(q);
  if (static_cast<int>(chain.size()) > n) chain.resize(n);
  CoverRegion out;
  out.roots.push_back(chain.front());
  if (chain.size() > 1) out.roots.push_back(chain.back());
  // The rest nearest first: the walks are cheapest when the forest off the long path is shallow.
  std::vector<char> in(dev.qubit_count(), 0);
  for (int q : chain) in[q] = 1;
  out.qubits = chain;
  out.chain_length = static_cast<int>(chain.size());
  for (std::size_t h = 0; h < out.qubits.size() && static_cast<int>(out.qubits.size()) < n; ++h)
    for (int nb : dev.neighbours(out.qubits[h]))
      if (!in[nb] && static_cast<int>(out.qubits.size()) < n) {
        in[nb] = 1;
        out.qubits.push_back(nb);
      }
  if (static_cast<int>(out.qubits.size()) < n)
    throw PlanningError(fmt::format("the component of {} holding the register has only {} qubits, fewer than {}",
                                    dev.name(), out.qubits.size(), n));
  return out;
}

RoutedCircuit build_cover_qft(const Device& device, const QftSpec& spec, const std::vector<int>& region, int root,
                              std::uint64_t seed, const RunBudget* budget, long long* cx_cost,
                              const std::vector<int>& tail_chain) {
  const int n = spec.qubits;
  Cascade cascade(device, region, root, seed, budget);
  // The chain tail: the transform of the wires left on the chain, as a chain network (forward here;
  // the inverse is emitted by the network itself below).
  QftSpec tail_spec = spec;
  tail_spec.qubits = static_cast<int>(tail_chain.size());
  tail_spec.inverse = false;
  std::unique_ptr<QftNetwork> tail;
  int stages = n;
  if (!tail_chain.empty()) {
    if (tail_chain.front() != root) throw std::invalid_argument("the cover's chain tail must start at its root");
    tail = choose_network(tail_spec);
    stages = cascade.run_to_chain(tail_chain, tail->initial_positions());
  } else {
    cascade.run();
  }
  RoutedCircuit c;
  c.region = region;
  long long cx = 0;
  const int max_dist = spec.max_distance();
  for (const Step& s : cascade.steps_) {
    if (s.kind == GateKind::h) {
      c.gates.push_back(make_gate(GateKind::h, s.a));
      continue;
    }
    if (s.kind == GateKind::swap) {
      c.gates.push_back(make_gate(GateKind::swap, s.a, s.b));
      cx += 3;
      continue;
    }
    if (s.kind == GateKind::parity_step && s.back) {
      c.gates.push_back(make_gate(GateKind::parity_step, s.a, s.b));
      cx += 2;
      continue;
    }
    // The walking wire has the lower number: its partner is unfinished.
    const int dist = cascade.wire_of_slot_[s.partner] - cascade.wire_of_slot_[s.token];
    const bool kept = dist <= max_dist;
    if (s.kind == GateKind::parity_step) {
      // The meeting's phase theta w x = theta/2 w + theta/2 x - theta/2 (w ^ x): the one-bit terms
      // on b (x) and a (w) before the exchange, the parity's on a after it.
      if (kept) {
        ++c.exchange_rotations;
        const Angle half = spec.rotation(dist).half();
        c.gates.push_back(make_gate(GateKind::rz, s.b, -1, half));
        c.gates.push_back(make_gate(GateKind::rz, s.a, -1, half));
        c.gates.push_back(make_gate(GateKind::parity_step, s.a, s.b, -half));
      } else {
        c.gates.push_back(make_gate(GateKind::parity_step, s.a, s.b));
      }
      cx += 2;
      continue;
    }
    if (s.kind == GateKind::cp) {
      if (kept) c.gates.push_back(make_gate(GateKind::cp, s.a, s.b, spec.rotation(dist))), cx += 2;
    } else {
      c.gates.push_back(kept ? make_gate(GateKind::cp_swap, s.a, s.b, spec.rotation(dist))
                             : make_gate(GateKind::swap, s.a, s.b));
      cx += 3;
    }
  }
  std::vector<int> slot_of_wire(n);
  for (int s = 0; s < n; ++s) slot_of_wire[cascade.wire_of_slot_[s]] = s;
  c.maps.placement.resize(n);
  c.maps.final_placement.resize(n);
  for (int k = 0; k < n; ++k) {
    // Forward: input bit k starts on processing index n-1-k, output bit k ends on index k.
    c.maps.placement[k] = region[slot_of_wire[n - 1 - k]];
    c.maps.final_placement[k] = cascade.pos_of_[slot_of_wire[k]];
  }
  std::vector<Gate> tail_gates;
  if (tail) {
    // Wires stages.. n-1 are the tail's 0 .. m-1 (the rotations depend on the distance only), so
    // the tail's output bit j is the register's output bit stages + j.
    const QubitMaps tail_maps = chain_maps(tail_spec, *tail, tail_chain);
    for (int j = 0; j < tail_spec.qubits; ++j) c.maps.final_placement[stages + j] = tail_maps.final_placement[j];
    tail_spec.inverse = spec.inverse;
    VectorSink sink;
    emit_chain_qft(tail_spec, *tail, tail_chain, sink);
    tail_gates = std::move(sink.gates);
    cx += network_native_cost(*tail);
    c.tail_network = tail->name();
    if (tail->parity()) c.exchange_rotations += tail_spec.kept_rotations();
  }
  if (spec.inverse) {
    // The inverse: the forward circuit backwards with negated angles (rotation() already negated
    // them), so the order and the maps turn around; an exchange parity_step(a, b, t) (cx b->a,
    // cx a->b, rz(t) a) turns into rz(t) a then parity_step(b, a, 0), its inverse with t negated.
    // The inverse tail comes first.
    std::vector<Gate> backwards = std::move(tail_gates);
    backwards.reserve(backwards.size() + c.gates.size());
    for (auto it = c.gates.rbegin(); it != c.gates.rend(); ++it) {
      if (it->kind != GateKind::parity_step) {
        backwards.push_back(*it);
        continue;
      }
      if (!it->angle.is_zero()) backwards.push_back(make_gate(GateKind::rz, it->q0, -1, it->angle));
      backwards.push_back(make_gate(GateKind::parity_step, it->q1, it->q0));
    }
    c.gates = std::move(backwards);
    std::swap(c.maps.placement, c.maps.final_placement);
  } else {
    c.gates.insert(c.gates.end(), tail_gates.begin(), tail_gates.end());
  }
  if (cx_cost) *cx_cost = cx;
  return c;
}

long long cover_cx_bound(int n) {
  if (n <= 1) return 0;
  const long long m = n;
  return 2 * m * m - 3 * m;
}

}  // namespace qftplan
