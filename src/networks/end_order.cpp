#include "qftplan/networks/end_order.hpp"

#include <algorithm>
#include <deque>
#include <stdexcept>

#include <fmt/format.h>

#include "qftplan/core/input_error.hpp"

namespace qftplan {

using Kind = NetworkOp::Kind;

EndOrder parse_end_order(const std::string& text) {
  if (text == "free") return EndOrder::free;
  if (text == "same") return EndOrder::same;
  throw InputError("unknown end order '" + text + "' (valid: free, same)");
}

const char* end_order_name(EndOrder order) { return order == EndOrder::same ? "same" : "free"; }

namespace {

long long merge_count(std::vector<long long>& v, std::vector<long long>& tmp, std::size_t lo, std::size_t hi) {
  if (hi - lo < 2) return 0;
  const std::size_t mid = lo + (hi - lo) / 2;
  long long inv = merge_count(v, tmp, lo, mid) + merge_count(v, tmp, mid, hi);
  std::size_t i = lo, j = mid, k = lo;
  while (i < mid && j < hi) {
    if (v[j] < v[i]) {
      inv += static_cast<long long>(mid - i);  // v[j] jumps every element left in the first half
      tmp[k++] = v[j++];
    } else {
      tmp[k++] = v[i++];
    }
  }
  while (i < mid) tmp[k++] = v[i++];
  while (j < hi) tmp[k++] = v[j++];
  std::copy(tmp.begin() + static_cast<std::ptrdiff_t>(lo), tmp.begin() + static_cast<std::ptrdiff_t>(hi),
            v.begin() + static_cast<std::ptrdiff_t>(lo));
  return inv;
}

}  // namespace

long long count_inversions(std::vector<long long> keys) {
  std::vector<long long> tmp(keys.size());
  return merge_count(keys, tmp, 0, keys.size());
}

std::vector<std::vector<int>> odd_even_sort_rounds(std::vector<long long> keys) {
  std::vector<std::vector<int>> rounds;
  long long left = count_inversions(keys);
  const int n = static_cast<int>(keys.size());
  // Only out-of-order neighbours are exchanged, so each exchange removes exactly one inversion;
  // stopping at zero inversions leaves no empty rounds at the end.
  for (int r = 0; left > 0; ++r) {
    std::vector<int> round;
    for (int p = r % 2; p + 1 < n; p += 2)
      if (keys[p] > keys[p + 1]) {
        std::swap(keys[p], keys[p + 1]);
        round.push_back(p);
        --left;
      }
    if (!round.empty()) rounds.push_back(std::move(round));
  }
  return rounds;
}

namespace {

// A network given by its steps in full, with chunk boundaries; made by with_order_restored.
class OrderRestoredNetwork final : public QftNetwork {
 public:
  OrderRestoredNetwork(std::string name, int wires, int d, std::vector<NetworkOp> ops, std::vector<std::size_t> start,
                       long long end_swaps)
      : QftNetwork(wires, d), name_(std::move(name)), ops_(std::move(ops)), start_(std::move(start)),
        end_swaps_(end_swaps) {}
  std::string name() const override { return name_; }
  int chunk_count() const override { return static_cast<int>(start_.size()) - 1; }
  void chunk(int c, std::vector<NetworkOp>& out) const override {
    out.assign(ops_.begin() + static_cast<std::ptrdiff_t>(start_[c]), ops_.begin() + static_cast<std::ptrdiff_t>(start_[c + 1]));
  }
  long long end_swaps() const { return end_swaps_; }

 private:
  std::string name_;
  std::vector<NetworkOp> ops_;
  std::vector<std::size_t> start_;
  long long end_swaps_;
};

bool is_swap(Kind k) { return k == Kind::swap || k == Kind::cp_swap; }

// The merge of a SWAP into the step (or gate) just before it on the same two qubits:
// cp then swap is one fused block; cp_swap then swap leaves the cp; swap then swap is nothing.
// Returns false for a step that cannot absorb a SWAP.
template <class K>
bool absorb_swap(K& kind, bool& dead, K cp, K cp_swap, K swap) {
  if (kind == cp) kind = cp_swap;
  else if (kind == cp_swap) kind = cp;
  else if (kind == swap) dead = true;
  else return false;
  return true;
}

}  // namespace

namespace {

// Keys of a network's end: keys[p] is the position the wire ending at position p must reach.
std::vector<long long> end_keys(const QftNetwork& net) {
  const int n = net.wires();
  const auto end = net.final_positions();
  std::vector<long long> keys(n);
  for (int w = 0; w < n; ++w) keys[end[w]] = n - 1 - w;
  return keys;
}

long long step_cost(Kind k) { return k == Kind::cp ? 2 : is_swap(k) ? 3 : 0; }

// A network's steps after the restoring SWAPs that can merge into them have done so.
struct MergedSteps {
  std::vector<NetworkOp> ops;
  std::vector<std::size_t> chunk_of;  // chunk index of each step
  std::vector<char> dead;             // removed by a merge
  std::vector<int> at;                // wire at each position afterwards
  std::vector<long long> keys;        // target position of the wire at each position afterwards
  long long merged = 0;               // SWAPs merged
  long long cost = 0;                 // native two-qubit gates of the remaining steps
};

// First every out-of-order neighbour pair whose last steps are one step on both wires: the SWAP
// merges into that step (saving gates), and a merge may expose another. Each merge removes one
// inversion, like any exchange of an out-of-order neighbour pair, so the total stays minimal.
MergedSteps merge_restoring_swaps(const QftNetwork& inner) {
  const int n = inner.wires();
  MergedSteps m;
  m.keys = end_keys(inner);
  std::vector<NetworkOp> buf;
  for (int c = 0; c < inner.chunk_count(); ++c) {
    inner.chunk(c, buf);
    for (const auto& op : buf) {
      m.ops.push_back(op);
      m.chunk_of.push_back(static_cast<std::size_t>(c));
      m.cost += step_cost(op.kind);
    }
  }
  m.dead.assign(m.ops.size(), 0);
  std::vector<std::vector<std::size_t>> last(n);  // steps touching each wire, in order
  for (std::size_t x = 0; x < m.ops.size(); ++x) {
    last[m.ops[x].i].push_back(x);
    if (m.ops[x].j >= 0) last[m.ops[x].j].push_back(x);
  }
  const auto end = inner.final_positions();
  m.at.resize(n);
  for (int w = 0; w < n; ++w) m.at[end[w]] = w;
  for (bool changed = true; changed;) {
    changed = false;
    for (int p = 0; p + 1 < n; ++p) {
      const int a = m.at[p], b = m.at[p + 1];
      if (m.keys[p] <= m.keys[p + 1] || last[a].empty() || last[b].empty() || last[a].back() != last[b].back()) continue;
      const std::size_t x = last[a].back();
      const Kind before = m.ops[x].kind;
      bool gone = false;
      if (!absorb_swap(m.ops[x].kind, gone, Kind::cp, Kind::cp_swap, Kind::swap)) continue;
      m.cost += (gone ? 0 : step_cost(m.ops[x].kind)) - step_cost(before);
      if (gone) {
        m.dead[x] = 1;
        last[a].pop_back();
        last[b].pop_back();
      }
      std::swap(m.at[p], m.at[p + 1]);
      std::swap(m.keys[p], m.keys[p + 1]);
      ++m.merged;
      changed = true;
    }
  }
  return m;
}

// Native two-qubit gates of with_order_restored(inner), without building it (the appended rounds are
// plain SWAPs, one per inversion left).
long long restored_cost(const QftNetwork& inner) {
  if (count_inversions(end_keys(inner)) == 0) return network_native_cost(inner);
  const MergedSteps m = merge_restoring_swaps(inner);
  return m.cost + 3 * count_inversions(m.keys);
}

}  // namespace

std::unique_ptr<QftNetwork> with_order_restored(std::unique_ptr<QftNetwork> inner) {
  if (count_inversions(end_keys(*inner)) == 0) return inner;
  MergedSteps m = merge_restoring_swaps(*inner);
  // The inner chunks (merged steps changed in place, removed ones left out), then one per round.
  std::vector<NetworkOp> out;
  std::vector<std::size_t> start{0};
  std::size_t current = 0;
  for (std::size_t x = 0; x < m.ops.size(); ++x) {
    for (; current < m.chunk_of[x]; ++current) start.push_back(out.size());
    if (!m.dead[x]) out.push_back(m.ops[x]);
  }
  for (; current < static_cast<std::size_t>(inner->chunk_count()); ++current) start.push_back(out.size());
  // Later rounds can never merge: a merge needs the pair's last step to be on both wires, and the
  // first phase took every such out-of-order pair; sorting never swaps a pair twice.
  long long end_swaps = m.merged;
  for (const auto& round : odd_even_sort_rounds(m.keys)) {
    for (int p : round) {
      const int a = m.at[p], b = m.at[p + 1];
      out.push_back({Kind::swap, std::min(a, b), std::max(a, b)});
      std::swap(m.at[p], m.at[p + 1]);
      ++end_swaps;
    }
    start.push_back(out.size());
  }
  return std::make_unique<OrderRestoredNetwork>(inner->name(), inner->wires(), inner->max_distance(), std::move(out),
                                                std::move(start), end_swaps);
}

long long end_swap_count(const QftNetwork& network) {
  const auto* r = dynamic_cast<const OrderRestoredNetwork*>(&network);
  return r ? r->end_swaps() : 0;
}

std::unique_ptr<QftNetwork> choose_network(const QftSpec& spec, EndOrder order, NetworkChoice choice) {
  auto base = choose_network(spec, choice);
  if (order == EndOrder::free || count_inversions(end_keys(*base)) == 0) return base;
  // Restoring SWAPs are appended as steps, which only the fused renderings carry as they are (the
  // parity network ends in order). The automatic choice then starts from the fused networks.
  if (base->rendering() == QftNetwork::Rendering::window) {
    if (choice != NetworkChoice::automatic)
      throw InputError(std::string("the ") + network_choice_name(choice) +
                       " network cannot end in order; use --end-order free or another --network");
    base = choose_network(spec, NetworkChoice::insertion);
  }
  // A network asked for by name keeps its name, and the block construction is a unitary of its own:
  // restore its order.
  if (choice != NetworkChoice::automatic || spec.block_length) return with_order_restored(std::move(base));
  // The reversal network reverses the chain, which is exactly the order `same` asks for, and so does
  // the parity network on its meetings. Compare costs first: building the restored network holds
  // all its O(n^2) SWAPs.
  std::unique_ptr<QftNetwork> in_order = make_reversal_network(spec.qubits, spec.max_distance());
  if (auto parity = make_parity_network(spec.qubits, spec.max_distance());
      network_native_cost(*parity) < network_native_cost(*in_order))
    in_order = std::move(parity);
  if (restored_cost(*base) < network_native_cost(*in_order)) return with_order_restored(std::move(base));
  return in_order;
}

namespace {

// Breadth-first shortest path from `s` to a vertex satisfying `goal`, through vertices with
// alive[v]; returns the path s .. goal, or empty.
template <class Goal>
std::vector<int> alive_path(const Device& device, const std::vector<char>& alive, int s, Goal goal,
                            std::vector<int>& parent) {
  std::deque<int> queue{s};
  std::vector<int> seen{s};
  parent[s] = s;
  int found = -1;
  while (!queue.empty() && found < 0) {
    const int u = queue.front();
    queue.pop_front();
    if (u != s && goal(u)) {
      found = u;
      break;
    }
    for (int w : device.neighbours(u))
      if (alive[w] && parent[w] < 0) {
        parent[w] = u;
        seen.push_back(w);
        queue.push_back(w);
      }
  }
  std::vector<int> path;
  for (int v = found; v >= 0 && v != s; v = parent[v]) path.push_back(v);
  if (found >= 0) path.push_back(s);
  std::reverse(path.begin(), path.end());
  for (int v : seen) parent[v] = -1;
  return path;
}

}  // namespace

std::vector<std::pair<int, int>> route_permutation(const Device& device, const std::vector<int>& from,
                                                   const std::vector<int>& to) {
  if (from.size() != to.size()) throw std::invalid_argument("route_permutation: maps of different sizes");
  std::vector<std::pair<int, int>> swaps;
  if (from == to || from.empty()) return swaps;
  const int D = device.qubit_count();
  // A breadth-first tree from to[0], pruned to the paths that reach the qubits involved.
  std::vector<int> parent(D, -1), depth(D, -1);
  std::deque<int> queue{to[0]};
  depth[to[0]] = 0;
  parent[to[0]] = to[0];
  while (!queue.empty()) {
    const int u = queue.front();
    queue.pop_front();
    for (int w : device.neighbours(u))
      if (depth[w] < 0) {
        depth[w] = depth[u] + 1;
        parent[w] = u;
        queue.push_back(w);
      }
  }
  std::vector<char> in_tree(D, 0);
  std::vector<int> tree;
  for (const auto* list : {&from, &to})
    for (int q : *list) {
      if (depth[q] < 0)
        throw PlanningError(fmt::format("cannot restore the order: qubits {} and {} are not connected", to[0], q));
      for (int v = q; !in_tree[v]; v = parent[v]) {
        in_tree[v] = 1;
        tree.push_back(v);
        if (v == parent[v]) break;
      }
    }
  // Deepest first: every vertex is then a leaf of what remains, so the rest stays connected.
  std::stable_sort(tree.begin(), tree.end(), [&](int a, int b) { return depth[a] > depth[b]; });

  std::vector<int> token(D, -1), due(D, -1);
  std::vector<int> where(from);
  for (std::size_t k = 0; k < from.size(); ++k) {
    token[from[k]] = static_cast<int>(k);
    due[to[k]] = static_cast<int>(k);
  }
  std::vector<int> scratch(D, -1);
  auto swap_along = [&](const std::vector<int>& path) {
    for (std::size_t i = 0; i + 1 < path.size(); ++i) {
      const int u = path[i], w = path[i + 1];
      swaps.emplace_back(u, w);
      std::swap(token[u], token[w]);
      if (token[u] >= 0) where[token[u]] = u;
      if (token[w] >= 0) where[token[w]] = w;
    }
  };
  for (int v : tree) {
    const int k = due[v];
    if (k >= 0) {
      if (where[k] != v) swap_along(alive_path(device, in_tree, where[k], [v](int u) { return u == v; }, scratch));
    } else if (token[v] >= 0) {
      // Nothing is due here but a register bit sits here: pull in the nearest free content.
      auto path = alive_path(device, in_tree, v, [&](int u) { return token[u] < 0; }, scratch);
      std::reverse(path.begin(), path.end());
      swap_along(path);
    }
    in_tree[v] = 0;
  }
  return swaps;
}

long long restore_order(const Device& device, std::vector<Gate>& gates, QubitMaps& maps) {
  const auto swaps = route_permutation(device, maps.final_placement, maps.placement);
  if (swaps.empty()) return 0;
  std::vector<std::vector<std::size_t>> last(device.qubit_count());
  std::vector<char> dead(gates.size(), 0);
  auto touch = [&](std::size_t x) {
    const Gate& g = gates[x];
    last[g.q0].push_back(x);
    if (is_two_qubit(g.kind)) last[g.q1].push_back(x);
  };
  for (std::size_t x = 0; x < gates.size(); ++x)
    if (gates[x].kind != GateKind::measure) touch(x);
  for (const auto& [a, b] : swaps) {
    if (!last[a].empty() && !last[b].empty() && last[a].back() == last[b].back()) {
      const std::size_t x = last[a].back();
      bool gone = false;
      if (absorb_swap(gates[x].kind, gone, GateKind::cp, GateKind::cp_swap, GateKind::swap)) {
        if (gone) {
          dead[x] = 1;
          last[a].pop_back();
          last[b].pop_back();
        }
        continue;
      }
    }
    gates.push_back(make_gate(GateKind::swap, a, b));
    dead.push_back(0);
    touch(gates.size() - 1);
  }
  std::size_t kept = 0;
  for (std::size_t x = 0; x < gates.size(); ++x)
    if (!dead[x]) gates[kept++] = gates[x];
  gates.resize(kept);
  maps.final_placement = maps.placement;
  return static_cast<long long>(swaps.size());
}

}  // namespace qftplan
