// The cover strategy: a cascade of walks on any connected set of qubits with a proved CX bound
// (cover_walk.cpp has the construction, its source and the proof), after Khadiev, Khadieva,
// Sagitov, Khasanov, "Quantum Circuit for Quantum Fourier Transform for Arbitrary Qubit
// Connectivity Graphs", arXiv:2510.09824, 2025.

#include <algorithm>

#include <fmt/format.h>

#include "cover_walk.hpp"
#include "qftplan/core/run_budget.hpp"
#include "strategies.hpp"

namespace qftplan {

namespace {

// Largest register: the gate list is held in memory (about 1.5 n^2 gates).
constexpr int kCoverMaxQubits = 2048;

// The cheapest cascade over the root candidates (ties: the first).
RoutedCircuit cheapest_cascade(const Device& device, const QftSpec& spec, const CoverRegion& region,
                               const PlanOptions& options) {
  RoutedCircuit best;
  long long best_cx = -1;
  const std::vector<int> chain(region.qubits.begin(), region.qubits.begin() + region.chain_length);
  for (int root : region.roots) {
    // Walks all the way, and walks that park off the chain and leave it to a chain network.
    std::vector<std::vector<int>> tails{{}};
    if (chain.size() >= 3) {
      tails.push_back(chain);
      if (root != chain.front()) std::reverse(tails.back().begin(), tails.back().end());
    }
    for (const auto& tail : tails) {
      long long cx = 0;
      RoutedCircuit c = build_cover_qft(device, spec, region.qubits, root, options.search.seed, options.budget, &cx, tail);
      if (best_cx < 0 || cx < best_cx) best = std::move(c), best_cx = cx;
    }
  }
  return best;
}

}  // namespace

PreparedPlan prepare_cover(const Device& device, const PlanOptions& options) {
  PreparedPlan plan = start_plan(device, options, "cover");
  refuse_block_construction(plan, options);
  if (options.placement)
    throw SettingError("placement", " pins a chain; the cover strategy chooses its own region");
  if (plan.spec.qubits > kCoverMaxQubits)
    throw PlanningError(fmt::format("the cover strategy plans registers of at most {} qubits", kCoverMaxQubits));
  const CoverRegion region = cover_region(device, plan.spec.qubits, options.search.seed, options.budget);
  if (options.auto_approx) {
    // Each degree is scored on the circuit it gives (the walks do not depend on the degree).
    CountSettings count = count_settings(options, gate_set_of(device.native_2q()));
    count.measure = false;
    choose_degree_by_counting(device, plan, count, [&](const QftSpec& s) {
      return make_gate_list_circuit(s, cheapest_cascade(device, s, region, options), "cover");
    });
  }
  RoutedCircuit circuit = cheapest_cascade(device, plan.spec, region, options);
  // The bound covers the cascade; SWAPs that restore the order are outside it (no bound claimed).
  if (options.end_order == EndOrder::same) {
    plan.end_swaps = restore_order(device, circuit.gates, circuit.maps);
  } else {
    plan.cx_bound = cover_cx_bound(plan.spec.qubits);
  }
  // The network: "cover", or "cover+NAME" when the chain network NAME finishes on the chain.
  std::string network = circuit.tail_network.empty() ? "cover" : "cover+" + circuit.tail_network;
  plan.circuit = make_gate_list_circuit(plan.spec, std::move(circuit), std::move(network));
  plan.maps = plan.circuit->maps();
  plan.placement.method = "cover";
  plan.placement.chains_scored = 0;
  return plan;
}

}  // namespace qftplan
