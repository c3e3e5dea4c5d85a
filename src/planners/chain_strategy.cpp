// The chain strategy: a simple path of n qubits carrying one of the chain networks, the path chosen
// by ESP on calibrated devices (placement_search.hpp) and the degree by the one degree choice.

#include <cmath>
#include <limits>

#include <fmt/format.h>

#include "qftplan/core/run_budget.hpp"
#include "strategies.hpp"

namespace qftplan {

namespace {

// The chain that puts input bit k on pinned[k] at the start of the (possibly inverse) network.
std::vector<int> chain_from_pin(const Device& device, const QftSpec& spec, const QftNetwork& net,
                                const std::vector<int>& pinned) {
  const int n = spec.qubits;
  if (static_cast<int>(pinned.size()) != n)
    throw SettingError("placement", fmt::format(" lists {} qubits but the register has {}", pinned.size(), n));
  std::vector<bool> seen(device.qubit_count(), false);
  for (int q : pinned) {
    if (q < 0 || q >= device.qubit_count())
      throw SettingError("placement", fmt::format(" names qubit {}, but {} has qubits 0..{}", q, device.name(),
                                   device.qubit_count() - 1));
    if (seen[q]) throw SettingError("placement", fmt::format(" names qubit {} twice", q));
    seen[q] = true;
  }
  const auto start = spec.inverse ? net.final_positions() : net.initial_positions();
  std::vector<int> chain(n);
  for (int k = 0; k < n; ++k) chain[start[spec.input_wire(k)]] = pinned[k];
  if (!is_chain(device, chain)) {
    for (int p = 0; p + 1 < n; ++p)
      if (!device.coupled(chain[p], chain[p + 1]))
        throw SettingError("placement", fmt::format(" is not a chain for the chain strategy: this network needs qubits {} and {} coupled "
            "(chain order {})",
            chain[p], chain[p + 1], fmt::join(chain, ",")));
  }
  return chain;
}

// Said after the device's name when parts out of service narrow the search.
std::string in_service_note(const Device& device) {
  return device.has_parts_out_of_service() ? " among the parts in service" : "";
}

// Largest network (in blocks) whose ESP we evaluate by a dry run during --approx auto.
constexpr long long kMaxScoredBlocks = 4'000'000;
// Largest network (in blocks) whose esp_total is counted exactly (a full stream through the noise
// model) for each degree and for each of the best chains; above it the scores are the placement
// search's (gates exact, idling by its lower bound).
constexpr long long kMaxCountedBlocks = 500'000;

// Largest network (in blocks) on which --network auto counts every chain network (per degree too).
constexpr long long kMaxNetworkScoredBlocks = 50'000;

long long blocks_of(int n) { return static_cast<long long>(n) * (n - 1) / 2; }

// ln esp_total of the plan on `chain`, counted exactly by the noise model.
double counted_log_esp_total(const Device& device, const QftSpec& spec, const PlanOptions& options,
                             const std::vector<int>& chain) {
  const auto circuit = make_line_circuit(spec, choose_network(spec, options.end_order, options.network), chain);
  const CountSettings settings = count_settings(options, gate_set_of(device.native_2q()));
  return count_circuit(device, *circuit, settings, nullptr).noise.log_esp_total;
}

// --network auto: of the chain networks that apply, the best on `chain` by the objective, each counted
// exactly (small registers only; above, and with a pinned placement, whose chain depends on the
// network, the fewest native two-qubit gates as choose_network() decides).
NetworkChoice network_by_objective(const Device& device, const QftSpec& spec, const PlanOptions& options,
                                   const std::vector<int>& chain) {
  if (options.network != NetworkChoice::automatic || options.placement || blocks_of(spec.qubits) > kMaxNetworkScoredBlocks ||
      spec.qubits < 3)
    return options.network;
  const CountSettings settings = count_settings(options, gate_set_of(device.native_2q()));
  NetworkChoice best = NetworkChoice::automatic;
  StrategyOutcome best_figures;
  for (NetworkChoice c : network_choices()) {
    if (c == NetworkChoice::reversal) continue;  // never better than the anchored network
    std::shared_ptr<const QftNetwork> net;
    try {
      net = choose_network(spec, options.end_order, c);
    } catch (const InputError&) {
      continue;  // a network that does not apply to this spec (leapfrog or insertion for the exact QFT)
    }
    StrategyOutcome o;
    fill_figures(o, count_circuit(device, *make_line_circuit(spec, std::move(net), chain), settings, nullptr));
    // The automatic choice comes first and keeps ties.
    if (c == NetworkChoice::automatic || better_by_objective(o, best_figures, options.objective)) {
      best = c;
      best_figures = o;
    }
  }
  return best;
}

// The degree choice on a chain: esp_total counted exactly on small registers, each degree with the network
// --network auto would choose for it; above that, uniform errors give the ESP from the numbers of gates (no
// dry run of the whole network), and otherwise the network's loads on the chain score it.
DegreeCost chain_cost(const Device& device, const QftSpec& spec, const std::vector<int>& chain, const PlanOptions& options,
                      bool uniform) {
  const int n = spec.qubits;
  PlanOptions chosen = options;
  chosen.network = network_by_objective(device, spec, options, chain);
  const auto net = choose_network(spec, options.end_order, chosen.network);
  DegreeCost c;
  if (blocks_of(n) <= kMaxCountedBlocks)
    c.log_esp = counted_log_esp_total(device, spec, chosen, chain);
  else
    c.log_esp = uniform ? uniform_log_esp(device, *net, device.native_2q())
                        : chain_log_esp(device, chain_loads_with_idling(device, spec, *net, options.measure, options.budget),
                                        chain);
  c.native_2q = network_native_cost(*net);
  return c;
}

DegreeChoice choose_chain_degree(const Device& device, const QftSpec& base, const std::vector<int>& chain,
                                 const PlanOptions& options, bool* cut) {
  const bool uniform = uniform_errors(device);
  const int n = base.qubits;
  const auto block_cost = [&](int m) {
    QftSpec spec = base;
    spec.block_length = m;
    return chain_cost(device, spec, chain, options, uniform);
  };
  if (options.network == NetworkChoice::blockwise) {
    // --network blockwise --approx auto: the block lengths only.
    DegreeChoice choice;
    if (!consider_block_lengths(n, options.approx_error, options.column_threshold(), block_cost, choice, cut))
      throw PlanningError(fmt::format("no block length up to 16 brings the block construction on {} qubits within "
                                      "--approx-error {} (normalised Frobenius distance)",
                                      n, *options.approx_error));
    return choice;
  }
  const auto cost = [&](std::optional<int> degree) {
    QftSpec spec = base;
    spec.approx_degree = degree;
    return chain_cost(device, spec, chain, options, uniform);
  };
  DegreeChoice choice = choose_degree(n, static_cast<long long>(n) * (n - 1) / 2 <= kMaxScoredBlocks, cost, cut);
  // With the user's consent (--approx-error EPS) the block construction competes too, at the shortest block
  // length that meets EPS.
  if (options.approx_error && options.network == NetworkChoice::automatic)
    consider_block_lengths(n, options.approx_error, options.column_threshold(), block_cost, choice, cut);
  return choice;
}

// A first chain: found by the chain finder (TimeLimitReached / PlanningError when there is none).
std::vector<int> first_chain(const Device& device, const PlanOptions& options, PreparedPlan& plan) {
  const int n = plan.spec.qubits;
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
  if (found.chain.empty() && found.proved_none) {
    throw PlanningError(fmt::format(
        "no chain of {} qubits exists in {}{} (proved by a complete search; longest found: {} qubits); a chain "
        "strategy needs one",
        n, device.name(), in_service_note(device), found.longest.size()));
  }
  if (found.chain.empty()) {
    throw PlanningError(fmt::format(
        "no chain of {} qubits found in {}{} within the search budget (longest found: {} qubits; --effort raises "
        "the budget); a chain strategy needs one",
        n, device.name(), in_service_note(device), found.longest.size()));
  }
  plan.placement.method = "first-found";
  return found.chain;
}

// The chain of highest ESP for the plan's network (placement_search.hpp); false when cut short.
bool choose_chain(const Device& device, const PlanOptions& options, PreparedPlan& plan, std::vector<int>& chain,
                  bool& changed) {
  const auto net = choose_network(plan.spec, options.end_order, options.network);
  ChainLoads loads;
  try {
    loads = chain_loads_with_idling(device, plan.spec, *net, options.measure, options.budget);
  } catch (const TimeLimitReached&) {
    note_cut_short(plan, "the placement search");
    return false;
  }
  PlacementSearchOptions pso = options.placement_search;
  pso.seed = options.search.seed;
  if (!pso.budget) pso.budget = options.budget;
  const auto choice = best_chain(device, loads, chain, pso);
  throw_if_interrupted(options.budget);
  if (choice.time_out) note_cut_short(plan, "the placement search");
  plan.placement.method = choice.time_out ? "time-limited" : choice.exhaustive ? "exhaustive" : "beam";
  plan.placement.chains_scored = choice.chains_scored;
  plan.placement.best = choice.best;
  // The search scores idling by a lower bound: the best few are counted exactly and ordered again.
  if (blocks_of(plan.spec.qubits) <= kMaxCountedBlocks && !choice.time_out) {
    try {
      for (auto& c : plan.placement.best) c.log_esp = counted_log_esp_total(device, plan.spec, options, c.chain);
      std::stable_sort(plan.placement.best.begin(), plan.placement.best.end(),
                       [](const ScoredChain& a, const ScoredChain& b) { return a.log_esp > b.log_esp; });
    } catch (const TimeLimitReached&) {
      note_cut_short(plan, "the placement search");
    }
  }
  changed = !plan.placement.best.empty() && plan.placement.best.front().chain != chain;
  if (!plan.placement.best.empty()) chain = plan.placement.best.front().chain;
  return true;
}

}  // namespace

PreparedPlan prepare_chain(const Device& device, const PlanOptions& options) {
  PreparedPlan plan = start_plan(device, options, "chain");
  const int n = plan.spec.qubits;
  const auto pinned_chain = [&] {
    // The pin is of input bits; which chain that is depends on the network, so for --approx auto it
    // is derived again once the degree is known.
    return chain_from_pin(device, plan.spec, *choose_network(plan.spec, options.end_order, options.network),
                          *options.placement);
  };
  std::vector<int> chain;
  if (options.placement) {
    chain = pinned_chain();
    plan.placement.method = "pinned";
  } else {
    chain = first_chain(device, options, plan);
  }
  const bool by_esp = !options.placement && options.calibration_aware && device.has_calibration() &&
                      !uniform_errors(device) && n >= 2;
  // Degree, network and chain depend on each other; two rounds settle them in practice. The chain is
  // placed for the network chosen on the chain before it.
  PlanOptions chosen = options;
  for (int round = 0; round < 2; ++round) {
    if (options.auto_approx) {
      bool cut = false;
      plan.spec.approx_degree.reset();
      plan.spec.block_length.reset();
      plan.degree_choice = choose_chain_degree(device, plan.spec, chain, options, &cut);
      if (cut) note_cut_short(plan, "the approximation-degree scoring");
      plan.spec.approx_degree = plan.degree_choice->chosen;
      plan.spec.block_length = plan.degree_choice->chosen_block_length;
      if (options.placement) chain = pinned_chain();
    }
    const NetworkChoice before = chosen.network;
    chosen.network = network_by_objective(device, plan.spec, options, chain);
    if (!by_esp || !plan.cut_short.empty()) break;
    bool changed = false;
    if (!choose_chain(device, chosen, plan, chain, changed)) break;
    if ((!options.auto_approx || !changed) && (round > 0 || chosen.network == before)) break;
  }
  throw_if_interrupted(options.budget);
  if (plan.placement.best.empty()) {
    // One chain, not chosen by score: its ESP is the plan's own, which execute_plan measures while
    // streaming (a dry run here would stream the whole network once more).
    plan.placement.best.push_back({chain, std::numeric_limits<double>::quiet_NaN()});
    plan.placement.chains_scored = 1;
  }
  std::shared_ptr<const QftNetwork> network =
      choose_network(plan.spec, options.end_order, network_by_objective(device, plan.spec, options, chain));
  plan.end_swaps = end_swap_count(*network);
  plan.circuit = make_line_circuit(plan.spec, std::move(network), chain);
  plan.maps = plan.circuit->maps();
  return plan;
}

}  // namespace qftplan
