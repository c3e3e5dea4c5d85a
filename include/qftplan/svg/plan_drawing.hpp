#pragma once
/// \file plan_drawing.hpp
/// A picture of a device and, optionally, of a plan on it: the coupling graph at its positions,
/// couplers shaded by their two-qubit error, the plan's chain, where each input bit starts and each
/// output bit ends, and how many two-qubit blocks each coupler carries.

#include <array>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "qftplan/core/gate.hpp"
#include "qftplan/device/device.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/svg/device_drawing.hpp"  // draw_device_svg, declared there

namespace qftplan {

/// What a drawing shows of a plan.
struct DrawnPlan {
  std::string title;                      ///< such as "QFT on 12 qubits, exact"
  std::string method;                     ///< such as "chain strategy, reversal network"
  std::string strategy;                   ///< the report's strategy (chain, spine, routed)
  std::vector<int> chain;                 ///< the report's chain (a spine plan's virtual line; unused when routed)
  std::vector<Detour> detours;  ///< spine plans: the paths joining line neighbours a, b that are not coupled
  std::vector<int> placement;             ///< physical qubit holding input bit k at the start
  std::vector<int> final_placement;       ///< physical qubit holding output bit k at the end
  std::vector<long long> coupler_blocks;  ///< two-qubit blocks on each coupler, indexed like couplers()
  long long blocks = 0;                   ///< the report's two_qubit_blocks
};

/// Counts two-qubit blocks per coupler in a stream of logical gates (h, cp, swap, cp_swap). With
/// `join_split_blocks`, a cp immediately followed by a swap on the same pair counts once (how the
/// logical gate set writes a fused block).
class CouplerLoadSink final : public GateSink {
 public:
  /// Counts on the couplers of `device`.
  CouplerLoadSink(const Device& device, bool join_split_blocks);
  /// Adds a block to the gate's coupler when the gate is a two-qubit block.
  void gate(const Gate& g) override;
  /// Blocks per coupler, indexed like Device::couplers().
  const std::vector<long long>& loads() const { return loads_; }
  /// Blocks counted in all.
  long long total() const { return total_; }

 private:
  const Device& dev_;
  std::vector<long long> loads_;
  long long total_ = 0;
  bool join_;
  int last_cp_a_ = -1, last_cp_b_ = -1;   // the previous gate, when it was a cp
};

/// The couplers under a plan's band: the chain's (consecutive chain qubits that are coupled) or a
/// spine's main chain, and a spine's hops out to its dangling qubits. Empty for routed plans.
struct ChainBand {
  std::vector<int> main;   ///< coupler indices along the chain or the spine's main chain
  std::vector<int> hops;   ///< coupler indices from the main chain to a dangling qubit (spine plans)
};

/// The band of `plan` on `device`: consecutive chain entries that are coupled, and for each detour
/// (a, b, via) the couplers a-via and via-b the line steps through; couplers touching a dangling
/// qubit (the a of a detour) are hops. Every coupler carrying blocks of a chain or spine plan is in it.
ChainBand chain_band(const Device& device, const DrawnPlan& plan);

/// What a drawing shows of `plan`, whose figures are `report`: its circuit streamed into a
/// CouplerLoadSink (the planner's own blocks), its line and detours, and its maps. The drawing reads
/// a plan; it never makes one.
DrawnPlan drawn_plan(const Device& device, const PreparedPlan& plan, const PlanReport& report);

/// The drawing of a report's plan: the plan made again from the report (report_replan.hpp), then
/// drawn_plan. InputError (naming `name`) as replan_report gives it.
DrawnPlan drawn_plan_from_report(const Device& device, const nlohmann::json& report, const std::string& name);

/// The same, reading the report from a file.
DrawnPlan read_drawn_plan(const Device& device, const std::string& path);

}  // namespace qftplan
