#include "qftplan/spine_layout.hpp"

#include <algorithm>

#include <fmt/format.h>

#include "qftplan/chain_search.hpp"
#include "qftplan/plan.hpp"

namespace qftplan {

SpineLayout make_spine_layout(const Device& device, int n, std::uint64_t seed, const RunBudget* budget) {
  SpineLayout out;
  ChainSearchOptions cso;
  cso.seed = seed;
  cso.budget = budget;
  // Ask for a chain through the whole largest component: the search returns the longest it finds.
  auto [comp, count] = device.components();
  std::vector<int> size(count, 0);
  for (int c : comp) ++size[c];
  const int largest = *std::max_element(size.begin(), size.end());
  out.spine = find_chain(device, largest, cso).longest;
  if (out.spine.empty()) out.spine.push_back(0);
  std::vector<bool> used(device.qubit_count(), false);
  for (int q : out.spine) used[q] = true;
  for (std::size_t a = 0; a < out.spine.size(); ++a) {
    const int c = out.spine[a];
    out.line.push_back(c);
    for (int t : device.neighbours(c)) {
      if (used[t]) continue;
      used[t] = true;
      out.line.push_back(t);
    }
  }
  if (static_cast<int>(out.line.size()) < n)
    throw PlanningError(fmt::format(
        "the spine strategy reaches {} qubits of {} (a chain of {} and the qubits one hop off it), fewer than {}",
        out.line.size(), device.name(), out.spine.size(), n));
  out.line.resize(n);
  // Consecutive line entries that are not coupled: a dangling qubit and whatever follows it, both
  // neighbours of the spine qubit they hang from (the nearest spine qubit before them on the line).
  int last_spine = -1;
  std::vector<bool> on_spine(device.qubit_count(), false);
  for (int q : out.spine) on_spine[q] = true;
  for (std::size_t p = 0; p + 1 < out.line.size(); ++p) {
    if (on_spine[out.line[p]]) last_spine = out.line[p];
    const int a = out.line[p], b = out.line[p + 1];
    if (!device.coupled(a, b)) out.detours.push_back({a, b, last_spine});
  }
  return out;
}

}  // namespace qftplan
