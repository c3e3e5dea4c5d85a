#include "line_polish.hpp"

#include <algorithm>

#include "qftplan/core/run_budget.hpp"

namespace qftplan {

// Why local moves: the spine layout reads every tree hanging off the chain depth first, so leaving a
// deep branch costs one long detour (6k - 4 CX a gate for k qubits between), while a detour of one
// qubit between, fused, costs 2. Moving a qubit or a short run next to a qubit it is coupled to turns
// long detours into short ones; measured on defective heavy-hexagon chips whose longest chain holds
// under two thirds of the qubits (README "Strategies"). The moves are those of the classic local search
// for tours: relocating a short run (Or, "Traveling salesman-type combinatorial problems and their
// relation to the logistics of regional blood banking", PhD thesis, Northwestern University, 1976) and
// reversing a stretch (Croes, "A method for solving traveling-salesman problems", Oper. Res. 6, 791,
// 1958), under our cost.

LineDistances::LineDistances(const Device& device, const std::vector<int>& line)
    : size_(line.size()), index_(static_cast<std::size_t>(device.qubit_count()), -1),
      dist_(line.size() * line.size(), static_cast<std::uint16_t>(kFar)) {
  for (std::size_t i = 0; i < line.size(); ++i) index_[static_cast<std::size_t>(line[i])] = static_cast<int>(i);
  std::vector<int> queue;
  for (std::size_t s = 0; s < line.size(); ++s) {
    std::uint16_t* row = &dist_[s * size_];
    row[s] = 0;
    queue.assign(1, line[s]);
    for (std::size_t h = 0; h < queue.size(); ++h) {
      const int q = queue[h];
      const auto dq = row[static_cast<std::size_t>(index_[static_cast<std::size_t>(q)])];
      for (int w : device.neighbours(q)) {
        const int iw = index_[static_cast<std::size_t>(w)];
        if (iw < 0 || row[static_cast<std::size_t>(iw)] != kFar) continue;
        row[static_cast<std::size_t>(iw)] = static_cast<std::uint16_t>(dq + 1);
        queue.push_back(w);
      }
    }
  }
}

namespace {

// Line pairs evaluated before the moves stop: bounds the polish by work, not time (deterministic), at
// about a second on this 2-core machine; lines of 200 qubits settle far below it (measured: random
// graphs of 1,000 qubits took 6 s without the cap).
constexpr long long kPolishWork = 60'000'000;

// Whether the pair at p (d hops apart, d >= 2) can start its detour with a SWAP on a coupled line pair:
// 1 from line[p]'s side, 2 from line[p + 1]'s side, 0 when neither.
int fusable_side(const Device& device, const LineDistances& dist, const std::vector<int>& line, std::size_t p, int d) {
  const int a = line[p], b = line[p + 1];
  if (p >= 1 && device.coupled(line[p - 1], a) && dist(line[p - 1], b) == d - 1) return 1;
  if (p + 2 < line.size() && device.coupled(line[p + 2], b) && dist(a, line[p + 2]) == d - 1) return 2;
  return 0;
}

// The qubits strictly between `from` and `to` on a shortest path through line qubits, appended to `via`.
std::vector<int> shortest_via(const Device& device, const LineDistances& dist, int from, int to,
                              std::vector<int> via = {}) {
  for (int cur = from; dist(cur, to) > 1;) {
    for (int w : device.neighbours(cur))
      if (dist.contains(w) && dist(w, to) == dist(cur, to) - 1) {
        cur = w;
        break;
      }
    via.push_back(cur);
  }
  return via;
}

}  // namespace

long long line_cost(const Device& device, const LineDistances& dist, const std::vector<int>& line, bool fused) {
  const auto n = static_cast<long long>(line.size());
  long long total = 0;
  for (std::size_t p = 0; p + 1 < line.size(); ++p) {
    const int d = dist(line[p], line[p + 1]);
    if (d >= LineDistances::kFar) return -1;
    if (d == 1) continue;
    const long long per_gate = 6LL * (d - 1) - (fused && fusable_side(device, dist, line, p, d) != 0 ? 4 : 0);
    total += per_gate * (n - static_cast<long long>(p));
  }
  return total;
}

std::vector<int> polish_line(const Device& device, const LineDistances& dist, std::vector<int> line, bool fused,
                             BudgetPoll& poll) {
  const std::size_t n = line.size();
  long long cost = line_cost(device, dist, line, fused);
  if (cost <= 0) return line;
  std::vector<int> position(static_cast<std::size_t>(device.qubit_count()), -1), trial, run;
  auto place = [&] {
    for (std::size_t i = 0; i < n; ++i) position[static_cast<std::size_t>(line[i])] = static_cast<int>(i);
  };
  place();
  long long work = 0;
  auto spent = [&] { return work > kPolishWork || poll.stop(); };
  // Keeps `trial` when it is cheaper.
  auto try_line = [&]() {
    work += static_cast<long long>(n);
    const long long c = line_cost(device, dist, trial, fused);
    if (c < 0 || c >= cost) return false;
    cost = c;
    line.swap(trial);
    place();
    return true;
  };
  // The run line[lo..hi] moved beside qubit y (after it or before it), reversed or not.
  auto move_run = [&](std::size_t lo, std::size_t hi, int y, bool after, bool reversed) {
    run.assign(line.begin() + static_cast<long>(lo), line.begin() + static_cast<long>(hi) + 1);
    if (reversed) std::reverse(run.begin(), run.end());
    trial.clear();
    for (std::size_t k = 0; k < n; ++k) {
      if (k >= lo && k <= hi) continue;
      if (line[k] == y && !after) trial.insert(trial.end(), run.begin(), run.end());
      trial.push_back(line[k]);
      if (line[k] == y && after) trial.insert(trial.end(), run.begin(), run.end());
    }
    return try_line();
  };
  // The qubits of the line at most two hops from x (coupled ones first); the moves put x beside one.
  std::vector<int> near;
  auto near_of = [&](int x) {
    near.clear();
    for (int y : device.neighbours(x))
      if (position[static_cast<std::size_t>(y)] >= 0) near.push_back(y);
    const std::size_t coupled = near.size();
    for (std::size_t k = 0; k < coupled; ++k)
      for (int z : device.neighbours(near[k]))
        if (z != x && position[static_cast<std::size_t>(z)] >= 0 && std::find(near.begin(), near.end(), z) == near.end())
          near.push_back(z);
  };
  // Lengths of the runs tried from x: one to three qubits and the whole coupled stretch of the line
  // that x starts (forward) or ends (backward).
  auto run_lengths = [&](std::size_t i, bool forward) {
    std::size_t whole = 1;
    if (forward)
      while (i + whole < n && device.coupled(line[i + whole - 1], line[i + whole])) ++whole;
    else
      while (whole <= i && device.coupled(line[i - whole], line[i - whole + 1])) ++whole;
    std::vector<std::size_t> lengths{1, 2, 3};
    if (whole > 3) lengths.push_back(whole);
    return lengths;
  };
  // One improving move at an end x of an uncoupled pair, or false.
  auto improve_at = [&](int x) {
    const auto i = static_cast<std::size_t>(position[static_cast<std::size_t>(x)]);
    near_of(x);
    for (int y : near) {
      const auto j = static_cast<std::size_t>(position[static_cast<std::size_t>(y)]);
      if (j + 1 == i || i + 1 == j) continue;
      // x first in the run: after y as it is, before y reversed; x last: the other way round.
      for (std::size_t s : run_lengths(i, true))
        if (i + s <= n && (j < i || j >= i + s) &&
            (move_run(i, i + s - 1, y, true, false) || move_run(i, i + s - 1, y, false, true)))
          return true;
      for (std::size_t s : run_lengths(i, false))
        if (i + 1 >= s && (j > i || j + s <= i) &&
            (move_run(i + 1 - s, i, y, false, false) || move_run(i + 1 - s, i, y, true, true)))
          return true;
      trial = line;
      if (j > i + 1)
        std::reverse(trial.begin() + static_cast<long>(i) + 1, trial.begin() + static_cast<long>(j) + 1);
      else
        std::reverse(trial.begin() + static_cast<long>(j), trial.begin() + static_cast<long>(i));
      if (try_line()) return true;
    }
    return false;
  };
  for (bool improved = true; improved && !spent();) {
    improved = false;
    for (std::size_t p = 0; p + 1 < n && !spent(); ++p) {
      if (device.coupled(line[p], line[p + 1])) continue;
      if (improve_at(line[p]) || improve_at(line[p + 1])) improved = true;
    }
  }
  return line;
}

std::vector<Detour> line_detours_by_distance(const Device& device, const LineDistances& dist,
                                             const std::vector<int>& line, bool fused) {
  std::vector<Detour> out;
  for (std::size_t p = 0; p + 1 < line.size(); ++p) {
    const int a = line[p], b = line[p + 1], d = dist(a, b);
    if (d <= 1) continue;
    const int side = fused ? fusable_side(device, dist, line, p, d) : 0;
    // The end that steps aside first moves onto its other line neighbour, when that fuses.
    if (side == 1)
      out.push_back(Detour{a, b, shortest_via(device, dist, line[p - 1], b, {line[p - 1]})});
    else if (side == 2)
      out.push_back(Detour{b, a, shortest_via(device, dist, line[p + 2], a, {line[p + 2]})});
    else
      out.push_back(Detour{a, b, shortest_via(device, dist, a, b)});
  }
  return out;
}

}  // namespace qftplan
