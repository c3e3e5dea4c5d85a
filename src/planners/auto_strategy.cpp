// --strategy auto: every strategy that applies, compared by --objective on the figures of their
// circuits streamed through the counters.

#include <algorithm>
#include <tuple>

#include <fmt/format.h>

#include "qftplan/core/run_budget.hpp"
#include "strategies.hpp"

namespace qftplan {

namespace {

// Largest register on which --strategy auto also runs the router next to a structured strategy.
constexpr int kRoutedCompareLimit = 128;
// Beside a spine or cover plan (no chain holds the register), the router is compared only up to this
// size: on defective heavy-hexagon chips of 100 to 110 qubits it took 1.4 to 1.9 s for 4.5 to 5.5 x
// (N^2 - 1) CX against the spine's 1.3 to 1.8 x, and over the spread of bench/every_qubit_spread.cpp
// it never won above 30 qubits (measured, Release build).
constexpr int kRoutedBesideStructuredLimit = 64;

struct Candidate {
  PreparedPlan plan;
  std::size_t outcome;  // index in the outcomes
  bool eligible;        // may be chosen: a named network is never replaced by a strategy without one
};

// Why strategy `name` is not tried, or empty when it is.
std::string reason_to_skip(const StrategyInfo& s, const std::vector<Candidate>& prepared, const PlanOptions& options) {
  const std::string name = s.name;
  const bool chain_planned =
      std::any_of(prepared.begin(), prepared.end(), [](const Candidate& c) { return c.plan.strategy == "chain"; });
  // The spine is for registers no chain holds: when the chain strategy planned, it is not needed.
  if (name == "spine" && chain_planned) return "not needed: a chain holds the register";
  // The cover strategy's bound (about 3n^2 CX) is above a chain's n^2 - 1: beside a chain it is only compared on
  // registers the router would be compared on too (it costs O(n^2) memory to plan).
  if (name == "cover" && chain_planned && options.spec.qubits > kRoutedCompareLimit)
    return fmt::format("not tried: registers above {} qubits use the cover strategy only when no chain exists",
                       kRoutedCompareLimit);
  // The router costs O(n^2) SWAP decisions: as a comparison it runs only on registers of at most
  // kRoutedCompareLimit qubits; beyond that it runs only when nothing structured could plan.
  if (name == "routed" && !prepared.empty() && options.spec.qubits > kRoutedCompareLimit)
    return fmt::format("not tried: registers above {} qubits are routed only when no chain exists", kRoutedCompareLimit);
  const bool structured = std::any_of(prepared.begin(), prepared.end(), [](const Candidate& c) {
    return c.plan.strategy == "spine" || c.plan.strategy == "cover";
  });
  if (name == "routed" && structured && options.spec.qubits > kRoutedBesideStructuredLimit)
    return fmt::format("not tried: beside a spine or cover plan, registers above {} qubits are not routed",
                       kRoutedBesideStructuredLimit);
  return {};
}

}  // namespace

PreparedPlan prepare_auto(const Device& device, const PlanOptions& options) {
  std::vector<Candidate> prepared;
  std::vector<StrategyOutcome> outcomes;
  std::string first_error;
  bool timed_out = false;
  for (const auto& s : plan_strategies()) {
    if (std::string(s.name) == "auto") continue;
    StrategyOutcome o;
    o.strategy = s.name;
    o.reason = reason_to_skip(s, prepared, options);
    if (!o.reason.empty()) {
      outcomes.push_back(o);
      continue;
    }
    // Out of time (or interrupted): keep the best strategy so far rather than start another.
    if (!prepared.empty() && options.budget && options.budget->exhausted()) {
      o.reason = "not tried: the time limit ran out";
      outcomes.push_back(o);
      timed_out = true;
      continue;
    }
    try {
      PreparedPlan p = s.prepare(device, options);
      o.ok = true;
      o.network = p.circuit->network_name();
      prepared.push_back({std::move(p), outcomes.size(), s.runs_networks || options.network == NetworkChoice::automatic});
    } catch (const PlanningError& e) {
      o.reason = e.what();
      if (first_error.empty()) first_error = e.what();
    } catch (const TimeLimitReached& e) {
      // Out of time in this strategy: keep an earlier strategy's plan when there is one.
      if (prepared.empty()) throw;
      o.reason = std::string("cut short: ") + e.what();
      timed_out = true;
    } catch (const InputError& e) {
      // A pinned placement is an input only the chain strategy accepts; other errors are real.
      if (!options.placement) throw;
      o.reason = e.what();
      if (std::string(s.name) == "chain") throw;
    }
    outcomes.push_back(o);
  }
  throw_if_interrupted(options.budget);
  if (prepared.empty()) throw PlanningError(first_error.empty() ? "no strategy could plan this request" : first_error);
  // Several plans: stream each through the counters (no output) with the request's count settings and
  // keep the best by the objective; the figures are kept, so a report-only run does not stream the
  // chosen plan again. A single plan needs no comparison: execute_plan fills in its outcome.
  // A named network (--network) is honoured: strategies without chain networks are compared, never chosen.
  const auto first = std::find_if(prepared.begin(), prepared.end(), [](const Candidate& c) { return c.eligible; });
  if (first == prepared.end())
    throw PlanningError(fmt::format("no strategy that runs the {} network could plan this request ({})",
                                    network_choice_name(options.network),
                                    first_error.empty() ? "only strategies without chain networks could" : first_error));
  std::size_t pick = static_cast<std::size_t>(first - prepared.begin());
  if (prepared.size() > 1) {
    for (std::size_t i = 0; i < prepared.size(); ++i) {
      PreparedPlan& p = prepared[i].plan;
      const CountSettings settings = count_settings(options, p.gates);
      const auto f = std::make_shared<const CircuitFigures>(count_circuit(device, *p.circuit, settings, nullptr));
      StrategyOutcome& o = outcomes[prepared[i].outcome];
      fill_figures(o, *f);
      o.log_readout_success = plan_log_readout_success(p);
      p.counted = f;
      if (prepared[i].eligible && i != pick && better_by_objective(o, outcomes[prepared[pick].outcome], options.objective)) pick = i;
    }
  }
  PreparedPlan best = std::move(prepared[pick].plan);
  best.alternatives = outcomes;
  if (timed_out) best.cut_short += std::string(best.cut_short.empty() ? "" : ", ") + "the strategy comparison";
  return best;
}

}  // namespace qftplan
