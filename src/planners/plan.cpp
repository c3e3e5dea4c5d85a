#include "qftplan/planners/plan.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <limits>

#include <fmt/format.h>

#include "qftplan/core/approximation.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/core/run_budget.hpp"
#include "qftplan/planners/spine_layout.hpp"
#include "qftplan/sinks/circuit_metrics.hpp"
#include "qftplan/sinks/detour_sink.hpp"

namespace qftplan {

std::optional<int> parse_approx_degree(const std::string& text) {
  if (text == "none") return std::nullopt;
  std::size_t used = 0;
  int v = 0;
  try {
    v = std::stoi(text, &used);
  } catch (const std::exception&) {
    used = 0;
  }
  if (used != text.size() || text.empty())
    throw InputError("--approx expects 'none', 'auto' (plan and survey) or a whole degree M >= 1, got '" + text + "'");
  if (v < 1 || v > kMaxRegisterQubits)
    throw InputError("--approx " + text + " is outside 1 .. " + std::to_string(kMaxRegisterQubits));
  return v;
}

std::vector<int> parse_id_list(const std::string& text, const std::string& what) {
  std::vector<int> out;
  std::size_t i = 0;
  while (i <= text.size()) {
    const std::size_t j = text.find(',', i);
    const std::string part = text.substr(i, j == std::string::npos ? std::string::npos : j - i);
    std::size_t used = 0;
    long long v = -1;
    try {
      v = std::stoll(part, &used);
    } catch (const std::exception&) {
      used = 0;
    }
    if (part.empty() || used != part.size() || v < 0 || v > kMaxDeviceQubits)
      throw InputError(fmt::format("{}: '{}' is not a qubit id (expected comma-separated non-negative integers)", what, part));
    out.push_back(static_cast<int>(v));
    if (j == std::string::npos) break;
    i = j + 1;
  }
  return out;
}

namespace {

void validate_spec(const Device& device, const QftSpec& spec) {
  if (spec.qubits < 1) throw InputError(fmt::format("--qubits must be at least 1, got {}", spec.qubits));
  if (spec.qubits > kMaxRegisterQubits)
    throw InputError(fmt::format("--qubits {} is more than the limit of {} qubits per register", spec.qubits,
                                 kMaxRegisterQubits));
  if (spec.qubits > device.qubit_count())
    throw PlanningError(fmt::format("device {} has {} qubits, fewer than the {} requested", device.name(),
                                    device.qubit_count(), spec.qubits));
  if (spec.approx_degree && *spec.approx_degree < 1)
    throw InputError(fmt::format("--approx must be at least 1 (1 keeps Hadamards only), got {}", *spec.approx_degree));
}

// The chain that puts input bit k on pinned[k] at the start of the (possibly inverse) network.
std::vector<int> chain_from_pin(const Device& device, const QftSpec& spec, const QftNetwork& net,
                                const std::vector<int>& pinned) {
  const int n = spec.qubits;
  if (static_cast<int>(pinned.size()) != n)
    throw InputError(fmt::format("--placement lists {} qubits but the register has {}", pinned.size(), n));
  std::vector<bool> seen(device.qubit_count(), false);
  for (int q : pinned) {
    if (q < 0 || q >= device.qubit_count())
      throw InputError(fmt::format("--placement names qubit {}, but {} has qubits 0..{}", q, device.name(),
                                   device.qubit_count() - 1));
    if (seen[q]) throw InputError(fmt::format("--placement names qubit {} twice", q));
    seen[q] = true;
  }
  const auto start = spec.inverse ? net.final_positions() : net.initial_positions();
  std::vector<int> chain(n);
  for (int k = 0; k < n; ++k) chain[start[spec.input_wire(k)]] = pinned[k];
  if (!is_chain(device, chain)) {
    for (int p = 0; p + 1 < n; ++p)
      if (!device.coupled(chain[p], chain[p + 1]))
        throw InputError(fmt::format(
            "--placement is not a chain for the chain strategy: this network needs qubits {} and {} coupled "
            "(chain order {})",
            chain[p], chain[p + 1], fmt::join(chain, ",")));
  }
  return chain;
}

}  // namespace

namespace {

// True when every coupler has the same two-qubit error and every qubit the same one-qubit error:
// then all chains of a network have the same ESP and there is nothing to choose.
bool uniform_errors(const Device& device) {
  for (int c = 1; c < device.coupler_count(); ++c)
    if (device.coupler_calibration(c).error != device.coupler_calibration(0).error) return false;
  for (int q = 1; q < device.qubit_count(); ++q)
    if (device.qubit_calibration(q).error_1q != device.qubit_calibration(0).error_1q) return false;
  return true;
}

// Largest network (in blocks) whose ESP we evaluate by a dry run during --approx auto.
constexpr long long kMaxScoredBlocks = 4'000'000;

DegreeCandidate score_degree(const Device& device, bool uniform, const QftSpec& base, std::optional<int> degree,
                             const std::vector<int>& chain, EndOrder end_order, NetworkChoice network,
                             const RunBudget* budget = nullptr) {
  QftSpec spec = base;
  spec.approx_degree = degree;
  const auto net = choose_network(spec, end_order, network);
  DegreeCandidate c;
  c.degree = degree;
  // Uniform errors: the ESP follows from the numbers of gates (no dry run of the whole network).
  c.log_esp = uniform ? uniform_log_esp(device, *net, device.native_2q())
                      : chain_log_esp(device, chain_loads(spec, *net, device.native_2q(), budget), chain);
  c.error_bound = approx_error_bound(spec.qubits, degree);
  c.fidelity_bound = approx_fidelity_lower_bound(c.error_bound);
  c.score = std::exp(c.log_esp) * c.fidelity_bound;
  c.native_2q = network_native_cost(*net);
  return c;
}

// Scores degrees 1, 2, ... until the fidelity bound is 1 to within 1e-12 (more rotations then only
// add gates), plus the exact transform when small enough to score, and keeps the best score.
// Near-ties (within 1e-12 relative) go to the fewest native two-qubit gates, then to the larger
// degree (exact last): a degree that saves no gate is no reason to approximate (the parity network
// needs the same CX at every degree from 3 on).
DegreeChoice choose_degree(const Device& device, const QftSpec& base, const std::vector<int>& chain,
                           EndOrder end_order, NetworkChoice network, const RunBudget* budget = nullptr,
                           bool* cut = nullptr) {
  DegreeChoice out;
  const int n = base.qubits;
  const bool uniform = uniform_errors(device);
  try {
    for (int m = 1; m < n; ++m) {
      out.considered.push_back(score_degree(device, uniform, base, m, chain, end_order, network, budget));
      if (out.considered.back().fidelity_bound >= 1.0 - 1e-12) break;
    }
    if (static_cast<long long>(n) * (n - 1) / 2 <= kMaxScoredBlocks || out.considered.empty())
      out.considered.push_back(score_degree(device, uniform, base, std::nullopt, chain, end_order, network, budget));
  } catch (const TimeLimitReached&) {
    // Out of time: choose among the degrees scored so far (exact when none was).
    if (cut) *cut = true;
    if (out.considered.empty()) return out;
  }
  double best = -1;
  for (const auto& c : out.considered) best = std::max(best, c.score);
  const DegreeCandidate* pick = nullptr;
  for (const auto& c : out.considered)  // increasing degree, exact last
    if (c.score >= best * (1.0 - 1e-12) && (!pick || c.native_2q <= pick->native_2q)) pick = &c;
  out.chosen = pick->degree;
  return out;
}

}  // namespace

static PreparedPlan prepare_chain(const Device& device, const PlanOptions& options) {
  PreparedPlan plan;
  plan.spec = options.spec;
  if (options.auto_approx) plan.spec.approx_degree.reset();
  validate_spec(device, plan.spec);
  plan.strategy = "chain";
  plan.gates = options.gates.value_or(gate_set_of(device.native_2q()));
  const int n = plan.spec.qubits;

  // A first chain: pinned, or found by the chain finder.
  std::vector<int> chain;
  if (options.placement) {
    // The pin is of input bits; which chain that is depends on the network, so for --approx auto
    // we re-derive it once the degree is known.
    chain = chain_from_pin(device, plan.spec, *choose_network(plan.spec, options.end_order, options.network), *options.placement);
    plan.placement.method = "pinned";
  } else {
    ChainSearchOptions cso = options.search;
    if (!cso.budget) cso.budget = options.budget;
    const auto found = find_chain(device, n, cso);
    plan.search_work = found.work;
    throw_if_interrupted(options.budget);
    if (found.chain.empty() && found.time_out) {
      throw TimeLimitReached(fmt::format(
          "the time limit ran out before a chain of {} qubits was found in {} (longest so far: {} qubits)", n,
          device.name(), found.longest.size()));
    }
    if (found.chain.empty()) {
      throw PlanningError(fmt::format(
          "no chain of {} qubits found in {} (longest found: {} qubits{}); a chain strategy needs one",
          n, device.name(), found.longest.size(), found.budget_exhausted ? ", search budget exhausted" : ""));
    }
    chain = found.chain;
    plan.placement.method = "first-found";
  }
  const bool choose_chain = !options.placement && options.calibration_aware && device.has_calibration() &&
                            !uniform_errors(device) && n >= 2;
  // Searches cut short by the time limit keep their best so far and are named in plan.cut_short.
  const auto note_cut = [&plan](const std::string& what) {
    if (plan.cut_short.find(what) == std::string::npos) plan.cut_short += (plan.cut_short.empty() ? "" : ", ") + what;
  };
  // Degree and chain depend on each other; two rounds settle them in practice.
  for (int round = 0; round < 2; ++round) {
    if (options.auto_approx) {
      bool cut = false;
      plan.degree_choice = choose_degree(device, plan.spec, chain, options.end_order, options.network, options.budget, &cut);
      if (cut) note_cut("the approximation-degree scoring");
      plan.spec.approx_degree = plan.degree_choice->chosen;
      if (options.placement)
        chain = chain_from_pin(device, plan.spec, *choose_network(plan.spec, options.end_order, options.network), *options.placement);
    }
    if (!choose_chain || !plan.cut_short.empty()) break;
    const auto net = choose_network(plan.spec, options.end_order, options.network);
    ChainLoads loads;
    try {
      loads = chain_loads(plan.spec, *net, device.native_2q(), options.budget);
    } catch (const TimeLimitReached&) {
      note_cut("the placement search");
      break;
    }
    PlacementSearchOptions pso = options.placement_search;
    pso.seed = options.search.seed;
    if (!pso.budget) pso.budget = options.budget;
    const auto choice = best_chain(device, loads, chain, pso);
    throw_if_interrupted(options.budget);
    if (choice.time_out) note_cut("the placement search");
    plan.placement.method = choice.time_out ? "time-limited" : choice.exhaustive ? "exhaustive" : "beam";
    plan.placement.chains_scored = choice.chains_scored;
    plan.placement.best = choice.best;
    const bool changed = !choice.best.empty() && choice.best.front().chain != chain;
    if (!choice.best.empty()) chain = choice.best.front().chain;
    if (!options.auto_approx || !changed) break;
  }
  throw_if_interrupted(options.budget);
  if (plan.placement.best.empty()) {
    // One chain, not chosen by score: its ESP is the plan's own, which execute_plan measures while
    // streaming (a dry run here would stream the whole network once more).
    plan.placement.best.push_back({chain, std::numeric_limits<double>::quiet_NaN()});
    plan.placement.chains_scored = 1;
  }
  plan.network = choose_network(plan.spec, options.end_order, options.network);
  plan.end_swaps = end_swap_count(*plan.network);
  plan.chain = chain;
  plan.maps = chain_maps(plan.spec, *plan.network, plan.chain);
  return plan;
}

Objective parse_objective(const std::string& text) {
  if (text == "esp") return Objective::esp;
  if (text == "depth") return Objective::depth;
  if (text == "cx") return Objective::cx;
  throw InputError("unknown objective '" + text + "' (valid: esp, depth, cx)");
}

const char* objective_name(Objective o) {
  switch (o) {
    case Objective::esp: return "esp";
    case Objective::depth: return "depth";
    case Objective::cx: return "cx";
  }
  return "?";
}

namespace {

// ln ESP of a routed circuit: its gates through the native decomposition into the noise model.
double routed_log_esp(const Device& device, const RoutedCircuit& c) {
  NoiseSink noise(device, c.maps.placement);
  NativeDecomposer dec(device.native_2q(), noise);
  for (const auto& g : c.gates) dec.gate(g);
  return noise.figures().log_esp;
}

}  // namespace

static PreparedPlan prepare_routed(const Device& device, const PlanOptions& options) {
  PreparedPlan plan;
  plan.spec = options.spec;
  if (options.auto_approx) plan.spec.approx_degree.reset();
  validate_spec(device, plan.spec);
  if (options.placement)
    throw InputError("--placement pins a chain; the routed strategy chooses its own starting region");
  plan.strategy = "routed";
  plan.gates = options.gates.value_or(gate_set_of(device.native_2q()));
  RoutingOptions ro = options.routing;
  ro.seed = options.search.seed;
  if (!ro.budget) ro.budget = options.budget;
  if (options.auto_approx) {
    // Score each degree by routing it (as for the chain strategy, stop once the fidelity bound is 1
    // within 1e-12; the exact transform is always scored).
    DegreeChoice choice;
    std::vector<std::optional<int>> degrees;
    for (int m = 1; m < plan.spec.qubits; ++m) {
      degrees.push_back(m);
      if (approx_fidelity_lower_bound(approx_error_bound(plan.spec.qubits, m)) >= 1.0 - 1e-12) break;
    }
    degrees.push_back(std::nullopt);
    double best = -1;
    for (const auto& m : degrees) {
      QftSpec s = plan.spec;
      s.approx_degree = m;
      DegreeCandidate c;
      c.degree = m;
      c.log_esp = routed_log_esp(device, route_qft(device, s, ro));
      c.error_bound = approx_error_bound(s.qubits, m);
      c.fidelity_bound = approx_fidelity_lower_bound(c.error_bound);
      c.score = std::exp(c.log_esp) * c.fidelity_bound;
      best = std::max(best, c.score);
      choice.considered.push_back(c);
    }
    for (const auto& c : choice.considered)
      if (c.score >= best * (1.0 - 1e-12)) {
        choice.chosen = c.degree;
        break;
      }
    plan.spec.approx_degree = choice.chosen;
    plan.degree_choice = choice;
  }
  plan.routed = route_qft(device, plan.spec, ro);
  if (options.end_order == EndOrder::same) plan.end_swaps = restore_order(device, plan.routed->gates, plan.routed->maps);
  plan.maps = plan.routed->maps;
  plan.placement.method = "routed";
  plan.placement.chains_scored = 0;
  return plan;
}

static PreparedPlan prepare_auto(const Device& device, const PlanOptions& options);

// Largest register on which --strategy auto also runs the router next to a structured strategy.
constexpr int kRoutedCompareLimit = 128;

// The spine strategy: a main chain plus the qubits dangling one hop off it, read as one virtual line
// (each dangling qubit right after the chain qubit it hangs from); the chain networks run on that
// line, and a gate between line neighbours that are not coupled steps through the chain qubit both
// hang from (swap, gate, swap). For registers that do not fit on one chain: heavy-hexagon lattices
// (the setting of Gao, Jin, Guo, Chen and Zhang, arXiv:2402.09705, 2024) and defective chips.
// One spine plan for a fixed degree on a given layout.
static PreparedPlan spine_plan(const Device& device, const PlanOptions& options, const SpineLayout& layout,
                               const QftSpec& spec) {
  PreparedPlan plan;
  plan.spec = spec;
  plan.strategy = "spine";
  plan.gates = options.gates.value_or(gate_set_of(device.native_2q()));
  // The end order restores along the virtual line; its SWAPs between uncoupled neighbours take the
  // same detours as every other gate.
  plan.network = choose_network(plan.spec, options.end_order, options.network);
  plan.end_swaps = end_swap_count(*plan.network);
  plan.chain = layout.line;
  plan.detours = layout.detours;
  plan.maps = chain_maps(plan.spec, *plan.network, plan.chain);
  plan.placement.method = "spine";
  return plan;
}

static PreparedPlan prepare_spine(const Device& device, const PlanOptions& options) {
  QftSpec spec = options.spec;
  if (options.auto_approx) spec.approx_degree.reset();
  validate_spec(device, spec);
  if (options.placement) throw InputError("--placement pins a chain; the spine strategy chooses its own line");
  const SpineLayout layout = make_spine_layout(device, spec.qubits, options.search.seed, options.budget);
  throw_if_interrupted(options.budget);
  if (layout.detours.empty() || static_cast<int>(layout.spine.size()) >= spec.qubits)
    throw PlanningError("the register fits on one chain: the chain strategy covers it");
  if (!options.auto_approx) return spine_plan(device, options, layout, spec);
  // Score each degree by planning it on the spine (same rule as the other strategies).
  DegreeChoice choice;
  std::vector<std::optional<int>> degrees;
  for (int m = 1; m < spec.qubits; ++m) {
    degrees.push_back(m);
    if (approx_fidelity_lower_bound(approx_error_bound(spec.qubits, m)) >= 1.0 - 1e-12) break;
  }
  degrees.push_back(std::nullopt);
  double best = -1;
  PlanOptions fixed = options;
  fixed.auto_approx = false;
  for (const auto& m : degrees) {
    QftSpec s = spec;
    s.approx_degree = m;
    fixed.spec = s;
    const auto p = spine_plan(device, fixed, layout, s);
    DegreeCandidate c;
    c.degree = m;
    c.log_esp = execute_plan(device, fixed, p, nullptr).noise.log_esp;
    c.error_bound = approx_error_bound(s.qubits, m);
    c.fidelity_bound = approx_fidelity_lower_bound(c.error_bound);
    c.score = std::exp(c.log_esp) * c.fidelity_bound;
    best = std::max(best, c.score);
    choice.considered.push_back(c);
  }
  for (const auto& c : choice.considered)
    if (c.score >= best * (1.0 - 1e-12)) {
      choice.chosen = c.degree;
      break;
    }
  spec.approx_degree = choice.chosen;
  PreparedPlan plan = spine_plan(device, options, layout, spec);
  plan.degree_choice = choice;
  return plan;
}

const std::vector<StrategyInfo>& plan_strategies() {
  static const std::vector<StrategyInfo> table{
      {"auto", "try every strategy that applies and keep the best by --objective", &prepare_auto},
      {"chain", "a chain of n qubits carrying one of the networks of --network (needs a simple path of n qubits)",
       &prepare_chain},
      {"spine", "a main chain plus the qubits dangling off it as one line (heavy-hexagon, defective chips)",
       &prepare_spine},
      {"routed", "SWAP routing with look-ahead on any connected device; also the in-house baseline", &prepare_routed},
  };
  return table;
}

namespace {

// Lexicographic comparison by the objective (ties broken by the other figures).
bool better(const StrategyOutcome& a, const StrategyOutcome& b, Objective o) {
  auto key = [o](const StrategyOutcome& x) {
    switch (o) {
      case Objective::esp: return std::make_tuple(-x.log_esp, double(x.cx_count), double(x.depth_2q));
      case Objective::depth: return std::make_tuple(double(x.depth_2q), double(x.cx_count), -x.log_esp);
      case Objective::cx: return std::make_tuple(double(x.cx_count), double(x.depth_2q), -x.log_esp);
    }
    return std::make_tuple(0.0, 0.0, 0.0);
  };
  return key(a) < key(b);
}

}  // namespace

static PreparedPlan prepare_auto(const Device& device, const PlanOptions& options) {
  struct Candidate {
    PreparedPlan plan;
    std::size_t outcome;  // index in `outcomes`
  };
  std::vector<Candidate> prepared;
  std::vector<StrategyOutcome> outcomes;
  std::string first_error;
  bool timed_out = false;
  const auto planned = [&prepared](const char* name) {
    return std::any_of(prepared.begin(), prepared.end(), [name](const Candidate& c) { return c.plan.strategy == name; });
  };
  for (const auto& s : plan_strategies()) {
    if (std::string(s.name) == "auto") continue;
    StrategyOutcome o;
    o.strategy = s.name;
    // The spine is for registers no chain holds: when the chain strategy planned, it is not needed.
    if (std::string(s.name) == "spine" && planned("chain")) {
      o.reason = "not needed: a chain holds the register";
      outcomes.push_back(o);
      continue;
    }
    // The router costs O(n^2) SWAP decisions: as a comparison it runs only on registers of at most
    // kRoutedCompareLimit qubits; beyond that it runs only when nothing structured could plan.
    if (std::string(s.name) == "routed" && !prepared.empty() && options.spec.qubits > kRoutedCompareLimit) {
      o.reason = fmt::format("not tried: registers above {} qubits are routed only when no chain exists",
                             kRoutedCompareLimit);
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
      o.network = p.routed ? "routed" : p.network->name();
      prepared.push_back({std::move(p), outcomes.size()});
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
  // Several plans: stream each through the counters (no output) and keep the best by the objective;
  // the figures are kept, so a report-only run does not stream the chosen plan again. A single plan
  // needs no comparison: execute_plan fills in its outcome.
  std::size_t pick = 0;
  if (prepared.size() > 1) {
    for (std::size_t i = 0; i < prepared.size(); ++i) {
      const PlanReport r = execute_plan(device, options, prepared[i].plan, nullptr);
      StrategyOutcome& o = outcomes[prepared[i].outcome];
      o.cx_count = r.cx_count;
      o.depth_2q = r.depth_2q;
      o.swaps = r.swaps;
      o.log_esp = r.noise.log_esp;
      prepared[i].plan.evaluated = std::make_shared<const PlanReport>(r);
      if (i > 0 && better(o, outcomes[prepared[pick].outcome], options.objective)) pick = i;
    }
  }
  PreparedPlan best = std::move(prepared[pick].plan);
  best.alternatives = outcomes;
  if (timed_out) best.cut_short += std::string(best.cut_short.empty() ? "" : ", ") + "the strategy comparison";
  return best;
}

PreparedPlan prepare_plan(const Device& device, const PlanOptions& options) {
  for (const auto& s : plan_strategies())
    if (options.strategy == s.name) {
      PreparedPlan p = s.prepare(device, options);
      throw_if_interrupted(options.budget);
      // A search that stopped at the deadline without saying so (it kept its best so far) still
      // means the time limit decided: report it, so the command line exits 3.
      if (p.cut_short.empty() && options.budget && options.budget->stop_reason() == StopReason::time_limit)
        p.cut_short = "the searches";
      return p;
    }
  std::string names;
  for (const auto& s : plan_strategies()) names += std::string(names.empty() ? "" : ", ") + s.name;
  throw InputError("unknown strategy '" + options.strategy + "' (valid: " + names + ")");
}

// The chosen strategy's row of the comparison gets the report's own figures (the same plan), also
// when it was the only strategy that could plan and so was never streamed for a comparison.
static void fill_chosen_outcome(PlanReport& r) {
  for (auto& o : r.alternatives)
    if (o.ok && o.strategy == r.strategy) {
      o.cx_count = r.cx_count;
      o.depth_2q = r.depth_2q;
      o.swaps = r.swaps;
      o.log_esp = r.noise.log_esp;
    }
}

PlanReport execute_plan(const Device& device, const PlanOptions& options, const PreparedPlan& plan, GateSink* output) {
  const auto t0 = std::chrono::steady_clock::now();
  if (!output && plan.evaluated) {
    // --strategy auto already streamed this plan through the counters while choosing it.
    PlanReport r = *plan.evaluated;
    r.alternatives = plan.alternatives;
    fill_chosen_outcome(r);
    return r;
  }
  const int D = device.qubit_count();
  const TwoQubitGate native_gate = device.native_2q();
  const bool emitted_is_native = plan.gates == gate_set_of(native_gate);

  // Sinks: the fused stream feeds the logical counters (which also count the depth the blocks
  // would have unfused) and, replayed as native programs, the native counters and the noise model
  // (the native gates themselves are made only for a writer of them). The emitted circuit is the
  // native one when the gate set is native, so then those counters serve both; otherwise a second
  // path rewrites the stream into the emitted gate set.
  MetricsSink logical(D, /*unfused_depth=*/true), native(D);
  std::optional<MetricsSink> emitted_counter;
  if (!emitted_is_native) emitted_counter.emplace(D);
  NoiseSink noise(device, plan.maps.placement);
  NativeReplay to_native(native_gate, native, noise);
  std::vector<GateSink*> emitted_targets;
  if (emitted_counter) emitted_targets.push_back(&*emitted_counter);
  if (output) emitted_targets.push_back(output);
  std::unique_ptr<GateSink> emit_path, swap_expander;
  TeeSink emitted_tee(emitted_targets);
  if (emitted_is_native) {
    if (output) emit_path = std::make_unique<NativeDecomposer>(native_gate, emitted_tee);
  } else if (plan.gates == GateSet::logical) {
    if (options.swap_as_cx) {
      swap_expander = std::make_unique<SwapExpander>(emitted_tee);
      emit_path = std::make_unique<FusedBlockSplitter>(*swap_expander);
    } else {
      emit_path = std::make_unique<FusedBlockSplitter>(emitted_tee);
    }
  } else {
    emit_path = std::make_unique<NativeDecomposer>(plan.gates == GateSet::cz ? TwoQubitGate::cz : TwoQubitGate::cx,
                                                   emitted_tee);
  }
  MetricsSink& emitted = emitted_counter ? *emitted_counter : native;
  std::vector<GateSink*> top{&logical, &to_native};
  if (emit_path) top.push_back(emit_path.get());
  // Ctrl-C stops a long stream (every 4096 gates; the deadline is not checked: this is no search).
  InterruptCheckSink interrupt(options.budget, nullptr);
  if (options.budget) top.push_back(&interrupt);
  TeeSink all(top);

  if (plan.routed) {
    for (const auto& g : plan.routed->gates) all.gate(g);
  } else if (!plan.detours.empty()) {
    DetourSink detour(all);
    for (const auto& [a, b, via] : plan.detours) detour.add(a, b, via);
    emit_chain_qft(plan.spec, *plan.network, plan.chain, detour);
  } else {
    emit_chain_qft(plan.spec, *plan.network, plan.chain, all);
  }
  if (options.measure)
    for (int k = 0; k < plan.spec.qubits; ++k)
      all.gate(make_gate(GateKind::measure, plan.maps.final_placement[k], k));
  all.finish();

  PlanReport r;
  r.qubits = plan.spec.qubits;
  r.device = device.name();
  r.device_qubits = D;
  r.strategy = plan.strategy;
  r.network = plan.routed ? "routed" : plan.network->name();
  r.approx_degree = plan.spec.approx_degree;
  r.inverse = plan.spec.inverse;
  r.gates = gate_set_name(plan.gates);
  r.native_2q = two_qubit_gate_name(native_gate);
  r.placement = plan.maps.placement;
  r.final_placement = plan.maps.final_placement;
  r.chain = plan.routed ? plan.routed->region : plan.chain;
  r.two_qubit_blocks = logical.two_qubit_count();
  r.swaps = logical.count(GateKind::swap) + logical.count(GateKind::cp_swap);
  // The parity network has no controlled-phase gates: each kept rotation is the parity phase of
  // one meeting (parity_qft.hpp).
  const bool parity = !plan.routed && plan.network->parity();
  r.rotations = parity ? plan.spec.kept_rotations() : logical.rotations();
  r.depth_2q = logical.depth_2q();
  r.depth = emitted.depth();
  r.cx_count = native.two_qubit_count();
  r.cx_depth = native.depth_2q();
  r.gate_counts = emitted.counts_by_name();
  // OpenQASM 2 (qelib1.inc) spells the phase gates cu1 and u1: count them by the names in the file.
  if (options.swap_as_cx)
    for (const auto& [from, to] : {std::pair<std::string, std::string>{"cp", "cu1"}, {"p", "u1"}})
      if (auto it = r.gate_counts.find(from); it != r.gate_counts.end()) {
        r.gate_counts[to] += it->second;
        r.gate_counts.erase(it);
      }
  r.noise = noise.figures();
  r.calibrated = device.has_calibration();
  r.measured = options.measure;
  r.approx_error_bound = approx_error_bound(plan.spec.qubits, plan.spec.approx_degree);
  r.degree_choice = plan.degree_choice;
  r.placement_choice = plan.placement;
  // A chain the time limit left unscored gets the ESP just measured (the same quantity).
  if (!r.placement_choice.best.empty() && std::isnan(r.placement_choice.best.front().log_esp))
    r.placement_choice.best.front().log_esp = r.noise.log_esp;
  r.depth_2q_unfused = logical.depth_2q_unfused();
  // Lower bounds (ours). Blocks: every kept controlled phase needs a two-qubit gate of its own, and
  // a block carries at most one. Depth: the Hadamard of wire j waits for the rotation between wires
  // j-1 and j, which waits for the Hadamard of wire j-1, so the rotations (0,1), (1,2), ..., (n-2,n-1)
  // form a chain of n-1 two-qubit gates that must run one after another (when d >= 1).
  r.lower_bound_blocks = plan.spec.kept_rotations();
  r.lower_bound_depth_2q = plan.spec.qubits >= 2 && plan.spec.max_distance() >= 1 ? plan.spec.qubits - 1 : 0;
  r.alternatives = plan.alternatives;
  fill_chosen_outcome(r);
  r.end_order = end_order_name(options.end_order);
  r.end_swaps = plan.end_swaps;
  r.seed = options.search.seed;
  r.elapsed_ms = std::chrono::duration<double, std::milli>(std::chrono::steady_clock::now() - t0).count();
  return r;
}

PlanReport plan_qft(const Device& device, const PlanOptions& options) {
  const auto t0 = std::chrono::steady_clock::now();
  const auto plan = prepare_plan(device, options);
  auto r = execute_plan(device, options, plan, nullptr);
  r.elapsed_ms = std::chrono::duration<double, std::milli>(std::chrono::steady_clock::now() - t0).count();
  return r;
}

}  // namespace qftplan
