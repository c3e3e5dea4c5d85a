#include "qftplan/svg/plan_drawing.hpp"

#include <algorithm>

#include <fmt/format.h>

#include "qftplan/core/input_error.hpp"
#include "qftplan/planners/plan.hpp"

namespace qftplan {

CouplerLoadSink::CouplerLoadSink(const Device& device, bool join_split_blocks)
    : dev_(device), loads_(static_cast<std::size_t>(device.coupler_count()), 0), join_(join_split_blocks) {}

void CouplerLoadSink::gate(const Gate& g) {
  if (!is_two_qubit(g.kind)) {
    last_cp_a_ = last_cp_b_ = -1;
    return;
  }
  const int a = std::min(g.q0, g.q1), b = std::max(g.q0, g.q1);
  // The logical gate set writes a fused block as cp then swap on the same pair: one block.
  const bool second_half = join_ && g.kind == GateKind::swap && a == last_cp_a_ && b == last_cp_b_;
  if (!second_half) {
    const int c = dev_.coupler_index(a, b);
    if (c >= 0) ++loads_[static_cast<std::size_t>(c)];
    ++total_;
  }
  if (g.kind == GateKind::cp) last_cp_a_ = a, last_cp_b_ = b;
  else last_cp_a_ = last_cp_b_ = -1;
}

namespace {

std::string describe_spec(int n, const std::optional<int>& degree, bool inverse) {
  return fmt::format("{} on {} qubit{}, {}", inverse ? "inverse QFT" : "QFT", n, n == 1 ? "" : "s",
                     degree ? fmt::format("approximate of degree {}", *degree) : std::string("exact"));
}

}  // namespace

DrawnPlan drawn_plan(const Device& device, const PreparedPlan& plan, const PlanReport& report) {
  // Blocks are counted on the planner's own stream, where every block is one gate (a fused cp+SWAP,
  // a parity step, a detour's SWAPs).
  CouplerLoadSink loads(device, false);
  plan.circuit->emit(loads);
  loads.finish();
  const PlannedCircuit& c = *plan.circuit;
  DrawnPlan out;
  out.title = describe_spec(plan.spec.qubits, plan.spec.approx_degree, plan.spec.inverse);
  out.method = report.network == report.strategy
                   ? fmt::format("{} strategy", report.strategy)
                   : fmt::format("{} strategy, {} network", report.strategy, report.network);
  out.strategy = report.strategy;
  if (c.region_is_line()) out.chain = c.region();
  out.detours = c.detours();
  out.placement = report.placement;
  out.final_placement = report.final_placement;
  out.coupler_blocks = loads.loads();
  out.blocks = report.two_qubit_blocks;
  return out;
}

ChainBand chain_band(const Device& device, const DrawnPlan& plan) {
  ChainBand band;
  if (plan.chain.size() < 2) return band;  // a routed plan has no line
  std::vector<bool> dangling(static_cast<std::size_t>(device.qubit_count()), false);
  for (const Detour& d : plan.detours)
    if (d.a >= 0 && d.a < device.qubit_count()) dangling[d.a] = true;
  std::vector<bool> taken(static_cast<std::size_t>(device.coupler_count()), false);
  auto add = [&](int a, int b) {
    const int c = a >= 0 && b >= 0 ? device.coupler_index(std::min(a, b), std::max(a, b)) : -1;
    if (c < 0 || taken[c]) return;
    taken[c] = true;
    (dangling[a] || dangling[b] ? band.hops : band.main).push_back(c);
  };
  for (std::size_t p = 0; p + 1 < plan.chain.size(); ++p)
    if (device.coupled(plan.chain[p], plan.chain[p + 1])) add(plan.chain[p], plan.chain[p + 1]);
  // A gate between uncoupled line neighbours steps along its detour path.
  for (const Detour& d : plan.detours) {
    int from = d.a;
    for (int v : d.via) add(from, v), from = v;
    add(from, d.b);
  }
  std::sort(band.main.begin(), band.main.end());
  std::sort(band.hops.begin(), band.hops.end());
  return band;
}

}  // namespace qftplan
