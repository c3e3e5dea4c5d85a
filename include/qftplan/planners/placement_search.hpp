#pragma once
/// \file placement_search.hpp
/// Choosing the chain (and its orientation) with the highest ESP for a given network.

#include <cstdint>
#include <span>
#include <vector>

#include "qftplan/core/qft_spec.hpp"
#include "qftplan/device/device.hpp"
#include "qftplan/networks/qft_network.hpp"

namespace qftplan {

class RunBudget;

/// How many error-carrying native gates the network puts on each chain position and edge.
struct ChainLoads {
  std::vector<double> edge_2q;  ///< native two-qubit gates between positions p and p+1
  std::vector<double> pos_1q;   ///< h/x/sx gates at position p
  /// Idle time of position p on the ASAP schedule with the device's typical gate times (empty: not
  /// estimated), and whether every position is measured at the end.
  std::vector<double> pos_idle_ns;
  bool measured = false;
};

/// Counts the loads by a dry run of the network through the native decomposition. The dry run of a
/// big network is long, so it polls `budget` and throws TimeLimitReached or Interrupted.
ChainLoads chain_loads(const QftSpec& spec, const QftNetwork& network, TwoQubitGate native,
                       const RunBudget* budget = nullptr);

/// chain_loads plus the idle time of each position, scheduled with `device`'s default gate times
/// (its per-coupler and per-qubit times may differ; the estimate ignores that), and the readouts when
/// `measured`: chain_log_esp then scores esp_total.
ChainLoads chain_loads_with_idling(const Device& device, const QftSpec& spec, const QftNetwork& network,
                                   bool measured, const RunBudget* budget = nullptr);

/// ln(ESP) of the planned circuit on `chain`: exactly the noise model's esp (gates) for plain loads.
/// For loads with idling, ln esp_total where the idling term is its lower bound
/// -t (1/(4 T1) + 1/(2 T2)) per position (by the AM-GM inequality, ln((1 + a + 2b)/4) >= ln(a b^2)/4),
/// with t the position's total idle time.
double chain_log_esp(const Device& device, const ChainLoads& loads, std::span<const int> chain);

/// The same ln(ESP) on a device whose qubits all share one error_1q and whose couplers all share
/// one error (any chain then scores alike): from the network's step counts, without a dry run.
double uniform_log_esp(const Device& device, const QftNetwork& network, TwoQubitGate native);

/// Settings of the placement search.
struct PlacementSearchOptions {
  std::uint64_t seed = 1;
  long long work_budget = 20'000'000;  ///< path extensions (exhaustive search) or beam steps
  int keep = 5;                         ///< how many of the best chains to report
  const RunBudget* budget = nullptr;    ///< time limit / interruption, polled in the loops (null: none)
};

/// One chain considered.
struct ScoredChain {
  std::vector<int> chain;
  double log_esp = 0;  ///< ln esp_total of the plan on this chain (the search's score until rescored exactly)
};

/// Outcome of the search.
struct PlacementChoice {
  std::vector<ScoredChain> best;  ///< best first; empty when no chain of n qubits was found
  bool exhaustive = false;        ///< every chain of n qubits was examined (branch and bound)
  long long chains_scored = 0;    ///< complete chains scored
  long long work = 0;
  bool time_out = false;          ///< the RunBudget stopped the search; `best` is the best seen so far
};

/// Finds the chain of loads.pos_1q.size() qubits with the highest ESP. First an exhaustive
/// depth-first enumeration of simple paths with branch and bound (every term of ln ESP is <= 0, so
/// a partial path's score bounds all its extensions) within the budget; when the budget runs out,
/// a beam search over positions (width chosen to fit the budget), seeded by `fallback` (a chain
/// from the chain finder) so the result is never worse than it. Deterministic.
PlacementChoice best_chain(const Device& device, const ChainLoads& loads, const std::vector<int>& fallback,
                           const PlacementSearchOptions& options = {});

}  // namespace qftplan
