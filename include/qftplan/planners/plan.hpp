#pragma once
/// \file plan.hpp
/// Planning a QFT on a device: choose where the register goes, stream the circuit through
/// counters (and an optional output), and report what it costs.

#include <array>
#include <cstdint>
#include <map>
#include <memory>
#include <optional>
#include <stdexcept>
#include <string>
#include <vector>

#include "qftplan/core/approximation.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/core/qft_spec.hpp"
#include "qftplan/device/device.hpp"
#include "qftplan/networks/chain_qft.hpp"
#include "qftplan/networks/end_order.hpp"
#include "qftplan/networks/qft_network.hpp"
#include "qftplan/planners/chain_search.hpp"
#include "qftplan/planners/circuit_figures.hpp"
#include "qftplan/planners/planned_circuit.hpp"
#include "qftplan/planners/placement_search.hpp"
#include "qftplan/planners/routed_planner.hpp"
#include "qftplan/qasm/qasm_writer.hpp"
#include "qftplan/sinks/native_gates.hpp"
#include "qftplan/sinks/noise_model.hpp"

namespace qftplan {

class RunBudget;

/// What `--strategy auto` optimises when it compares strategies: esp_total (highest), native two-qubit
/// depth (cx_depth, lowest), schedule length in ns (duration_ns, lowest) or native two-qubit gates.
enum class Objective { esp, depth, duration, cx };
/// Parses "esp", "depth", "duration", "cx"; InputError listing them otherwise.
Objective parse_objective(const std::string& text);
const char* objective_name(Objective o);

/// How a measured plan reads its register out: the unitary transform then measurement, the
/// semi-classical transform (mid-circuit measurements and phases conditioned on their outcomes,
/// Griffiths and Niu 1996), or the one of higher esp_total where the device offers feed-forward.
enum class Readout { unitary, semiclassical, automatic };
/// Parses "unitary", "semiclassical", "auto"; SettingError naming `readout` otherwise.
Readout parse_readout(const std::string& text);
const char* readout_name(Readout r);

/// What the user asked for.
struct PlanOptions {
  QftSpec spec;
  std::optional<GateSet> gates;                  ///< emitted gate set; default: the device's native gate
  std::optional<std::vector<int>> placement;     ///< pinned: physical qubit of input bit k
  bool measure = false;                          ///< end with a measurement of every register qubit
  QasmVersion format = QasmVersion::v3;          ///< the emitted gates are counted as a file of this format spells them
  ChainSearchOptions search;                     ///< seed and budget of the chain search
  bool auto_approx = false;                      ///< choose the degree (spec.approx_degree is ignored)
  bool calibration_aware = true;                 ///< pick the chain of highest ESP when calibrated
  PlacementSearchOptions placement_search;       ///< budget of that choice
  const RunBudget* budget = nullptr;             ///< time limit / interruption of every search (null: none)
  std::string strategy = "auto";                 ///< a name from plan_strategies()
  Objective objective = Objective::esp;          ///< what --strategy auto maximises or minimises
  RoutingOptions routing;                        ///< settings of the routed strategy
  EndOrder end_order = EndOrder::free;           ///< same: SWAPs at the end make final_placement == placement
  NetworkChoice network = NetworkChoice::automatic;  ///< chain network of the chain and spine strategies
  bool peephole = true;                          ///< the peephole pass on native output (sinks/peephole.hpp)
  Readout readout = Readout::automatic;          ///< with `measure`: unitary, semi-classical or the better
  /// --approx-error: the largest normalised Frobenius distance to the QFT the user accepts from the block
  /// construction (consent for --approx auto to consider it), and the column distance beyond which the
  /// report counts an input as badly served. Absent: the block construction only when named.
  std::optional<double> approx_error;
  /// The column distance the report counts inputs beyond (approx_error, else kDefaultColumnThreshold).
  double column_threshold() const { return approx_error.value_or(kDefaultColumnThreshold); }
};

/// The settings of one plan as the front ends (command line, Python, surveys, fuzzers, benchmarks) take
/// them: text where a user types text. plan_options() turns them into PlanOptions, the one place that
/// does.
struct PlanSettings {
  int qubits = 0;
  std::string approx = "none";                   ///< "none", "auto" or a whole degree M
  bool inverse = false;
  std::optional<std::string> gates;              ///< "logical", "cx", "cz"; absent: the device's native gate
  std::optional<std::vector<int>> placement;     ///< pinned: physical qubit of input bit k
  std::uint64_t seed = 1;                        ///< seed of every randomised search
  bool measure = false;
  double effort = 1;                             ///< scales the work budgets of the searches (0.01 .. 1000)
  std::string strategy = "auto";
  std::string objective = "esp";
  std::string end_order = "free";
  std::string network = "auto";
  QasmVersion format = QasmVersion::v3;
  bool peephole = true;                          ///< the peephole pass on native output (off: the gates as decomposed)
  std::string readout = "auto";                  ///< "unitary", "semiclassical" or "auto" (measured plans)
  std::optional<double> approx_error;            ///< --approx-error EPS (PlanOptions::approx_error)
};

/// PlanOptions for `settings`; InputError naming the setting for a value out of range or unknown.
PlanOptions plan_options(const PlanSettings& settings);

/// One approximation degree considered by the automatic choice.
struct DegreeCandidate {
  std::optional<int> degree;     ///< absent: exact (or the block construction)
  std::optional<int> block_length;  ///< the block construction with blocks of this length (--approx-error, --network blockwise)
  double log_esp = 0;            ///< ln esp_total of the planned circuit with this degree
  ApproxFigures approx;          ///< distance, bound, readout success and infidelity of this degree
  double fidelity_bound = 1;     ///< lower bound on the state fidelity to the exact QFT (from the distance, else the bound)
  double log_score = 0;          ///< ln score (finite when score underflows): degree_score
  double score = 1;              ///< esp_total x readout_success
  long long native_2q = 0;       ///< native two-qubit gates of the network (network_native_cost)
};

/// How the degree was chosen (--approx auto).
struct DegreeChoice {
  std::optional<int> chosen;                ///< the degree chosen (absent: exact, or the block construction)
  std::optional<int> chosen_block_length;   ///< the block construction was chosen, with blocks of this length
  std::vector<DegreeCandidate> considered;  ///< every degree scored, in increasing order, exact last
};

/// How the chain was chosen.
struct PlacementReport {
  std::string method;                  ///< "pinned", "first-found", "exhaustive", "beam"
  long long chains_scored = 0;
  std::vector<ScoredChain> best;       ///< best first (ESP before idling)
};

/// One strategy tried by --strategy auto, with its figures (or why it failed).
struct StrategyOutcome {
  std::string strategy;
  std::string network;
  bool ok = false;
  std::string reason;        ///< why it could not plan, when !ok
  long long cx_count = 0;
  long long depth_2q = 0;
  long long cx_depth = 0;    ///< native two-qubit depth
  long long swaps = 0;
  double log_esp = 0;        ///< ln esp (gates)
  double log_esp_total = 0;  ///< ln esp_total (gates x idling x readout)
  double log_readout_success = 0;  ///< ln readout_success of the strategy's degree (0 when exact)
  double duration_ns = 0;
};

/// The two readout forms of a measured plan as compared (--readout): each one's esp_total, when planned.
struct ReadoutChoice {
  std::string chosen;                          ///< "unitary" or "semiclassical"
  std::string reason;                          ///< why (pinned, the higher esp_total, the other not offered)
  std::optional<double> unitary_log_esp_total;        ///< ln esp_total of the unitary plan
  std::optional<double> semiclassical_log_esp_total;  ///< ln esp_total of the semi-classical plan
  std::string unitary_note;                    ///< why the unitary form was not planned (when absent)
  std::string semiclassical_note;              ///< why the semi-classical form was not planned (when absent)
};

/// Decisions made before any gate is emitted: the strategy's circuit and how it was chosen.
struct PreparedPlan {
  std::string strategy;                  ///< registry name of the planner ("chain")
  std::shared_ptr<const PlannedCircuit> circuit;  ///< the planned circuit (maps, network name, gates)
  QubitMaps maps;                        ///< circuit->maps()
  GateSet gates = GateSet::cx;
  long long search_work = 0;             ///< neighbour inspections spent finding the chain
  QftSpec spec;                          ///< the spec planned (degree filled in by --approx auto)
  std::optional<DegreeChoice> degree_choice;
  PlacementReport placement;
  /// Empty when every search finished; else which searches the time limit cut short: the plan is
  /// the best found so far and the command line warns and exits with status 3.
  std::string cut_short;
  std::vector<StrategyOutcome> alternatives;  ///< every strategy --strategy auto tried
  long long end_swaps = 0;               ///< SWAPs added by --end-order same (merged ones included)
  /// Figures already counted while choosing (--strategy auto), with the request's count settings:
  /// a run without output reports them instead of streaming the circuit again.
  std::shared_ptr<const CircuitFigures> counted;
  /// The strategy's proved bound on the circuit's native two-qubit gates (cp 2, swap and cp_swap 3);
  /// absent when the strategy proves none.
  std::optional<long long> cx_bound;
  std::optional<ReadoutChoice> readout;  ///< measured plans: the readout forms compared
};

/// Figures of a planned circuit (the JSON report; README "Report fields" documents each).
struct PlanReport {
  int qubits = 0;
  std::string device;
  int device_qubits = 0;
  std::string strategy;
  std::string network;
  std::optional<int> approx_degree;
  std::optional<int> block_length;     ///< blocks of the block construction (--network blockwise); absent otherwise
  bool inverse = false;
  std::string gates;
  std::string native_2q;
  std::vector<int> placement;
  std::vector<int> final_placement;
  std::vector<int> chain;
  long long two_qubit_blocks = 0;
  long long swaps = 0;
  long long rotations = 0;             ///< controlled phases kept
  long long depth_2q = 0;
  long long depth = 0;
  long long cx_count = 0;
  long long cx_depth = 0;
  std::map<std::string, long long> gate_counts;
  std::optional<long long> peephole_removed;  ///< gates the peephole pass removed from the written circuit; absent: no pass
  long long output_bytes = 0;
  double elapsed_ms = 0;
  NoiseFigures noise;
  bool calibrated = false;
  bool measured = false;
  double approx_error_bound = 0;      ///< approx_error_bound (0 when exact, never above 2)
  ApproxFigures approx;               ///< every figure of the degree (approx_figures)
  std::optional<DegreeChoice> degree_choice;
  PlacementReport placement_choice;
  long long depth_2q_unfused = 0;      ///< two-qubit depth counting a fused block as cp then swap
  long long lower_bound_blocks = 0;    ///< kept rotations: each needs its own two-qubit gate
  long long lower_bound_depth_2q = 0;  ///< n-1 (see plan.cpp for the derivation)
  std::vector<StrategyOutcome> alternatives;
  std::string end_order = "free";      ///< end-order policy: "free" or "same"
  long long end_swaps = 0;             ///< SWAPs added to restore the order (in swaps and cx_count too)
  std::uint64_t seed = 1;              ///< --seed of the searches (re-planning with it gives this plan)
  std::optional<long long> cx_bound;   ///< the strategy's proved bound on cx_count (absent: none)
  std::optional<double> cx_bound_ratio;  ///< cx_count / cx_bound (absent with the bound or when it is 0)
  std::optional<ReadoutChoice> readout;  ///< measured plans: the readout forms compared
};

/// A planning strategy: its name (as given to --strategy), a one-line description, and its entry.
struct StrategyInfo {
  const char* name;
  const char* description;
  PreparedPlan (*prepare)(const Device& device, const PlanOptions& options);
  bool takes_placement;  ///< accepts a pinned placement (PlanOptions::placement)
  bool runs_networks;    ///< carries one of the chain networks (PlanOptions::network applies)
};

/// Every strategy, "auto" first. The same table drives dispatch, --help, the Python module and the
/// one "unknown strategy" error.
const std::vector<StrategyInfo>& plan_strategies();

/// The strategy named `name`; InputError "unknown strategy 'NAME' (valid: ...)" otherwise.
const StrategyInfo& find_strategy(const std::string& name);

/// Validates the request and decides the placement. Throws InputError for invalid pins and
/// PlanningError when the device cannot hold the register.
PreparedPlan prepare_plan(const Device& device, const PlanOptions& options);

/// Streams the circuit through the counters and, when given, `output` (in the chosen gate set),
/// and fills the report. `elapsed_ms` covers only this call; callers add the preparation time.
PlanReport execute_plan(const Device& device, const PlanOptions& options, const PreparedPlan& plan, GateSink* output);

/// Both steps; no output.
PlanReport plan_qft(const Device& device, const PlanOptions& options);

/// Parses "a,b,c" into qubit ids; InputError on malformed text.
std::vector<int> parse_id_list(const std::string& text, const std::string& what);

/// Parses an approximation degree as `--approx` takes it: "none" (nullopt) or a whole M in
/// 1 .. kMaxRegisterQubits; InputError with the command line's message otherwise. ("auto" is the
/// caller's to handle.)
std::optional<int> parse_approx_degree(const std::string& text);

}  // namespace qftplan
