#pragma once
// What the strategy files share (private to src/planners): the checks every strategy makes, the one
// degree scorer. Each strategy's entry is declared where it is registered (strategy_registry.cpp).

#include <functional>
#include <optional>

#include "qftplan/planners/plan.hpp"

namespace qftplan {

/// Throws InputError / PlanningError when `spec` cannot be planned on `device` at all.
void validate_spec(const Device& device, const QftSpec& spec);

/// The lowest qubit in service, or -1 when there is none.
int first_usable_qubit(const Device& device);
/// The lowest coupler (index into couplers()) in service, or -1 when there is none.
int first_usable_coupler(const Device& device);

/// True when every coupler in service has the same two-qubit error and gate time and every qubit the same
/// one-qubit error, gate time, readout error, T1 and T2 (parts out of service left out): then all chains of a network have the same
/// esp_total and there is nothing to choose.
bool uniform_errors(const Device& device);

/// A new plan of `strategy` for `options` before any decision: the spec (degree cleared for
/// --approx auto, validated) and the emitted gate set.
PreparedPlan start_plan(const Device& device, const PlanOptions& options, const char* strategy);
/// PlanningError for a strategy that builds its own circuit (cover, routed) when the plan asks for the
/// block construction, which only the chain networks build.
void refuse_block_construction(const PreparedPlan& plan, const PlanOptions& options);

/// The settings of a count of a circuit planned with `options`, emitted in `gates` (every count made while
/// planning and reporting is built here, so that all of them see the same measurement, format and pass).
CountSettings count_settings(const PlanOptions& options, GateSet gates);

/// Whether figures `a` beat `b` by `objective`: the one comparison of every choice made by the objective
/// (strategies, chain networks). Lexicographic: esp_total (higher), native two-qubit depth, schedule
/// duration or native two-qubit gates (lower) first, ties broken by the other figures.
bool better_by_objective(const StrategyOutcome& a, const StrategyOutcome& b, Objective objective);

/// The comparison figures of `outcome` from a circuit's counted figures.
void fill_figures(StrategyOutcome& outcome, const CircuitFigures& figures);

/// Records that the time limit cut `what` short (once).
void note_cut_short(PreparedPlan& plan, const std::string& what);

/// What one approximation degree costs, as the strategy measured it.
struct DegreeCost {
  double log_esp = 0;        ///< ln esp_total of the planned circuit with this degree
  long long native_2q = 0;   ///< its native two-qubit gates
};

/// The score of a plan (the one place it is computed; degrees, and strategies under --objective esp):
/// ln(esp_total x readout_success).
double plan_log_score(double log_esp_total, double log_readout_success);
/// ln readout_success of the plan's degree (from its degree choice when it made one).
double plan_log_readout_success(const PreparedPlan& plan);

/// The one degree choice of every strategy (--approx auto). Scores degrees 1, 2, ... of an n-qubit
/// register with `cost` until the readout success is 1 to within 1e-12 (more rotations then only add
/// gates), then the exact transform when `score_exact` (or when nothing was scored), and keeps the
/// best score esp_total x readout success (plan_log_score). Near-ties (within 1e-12 relative) go to
/// the fewest native two-qubit gates, then to the larger degree (exact last): a degree that saves no
/// gate is no reason to approximate. When `cost` runs out of time, chooses among the degrees scored so
/// far and sets `*cut` (the exact transform when none was).
DegreeChoice choose_degree(int n, bool score_exact, const std::function<DegreeCost(std::optional<int>)>& cost,
                           bool* cut);

/// The block construction's candidates for --approx auto, appended to `choice` (block lengths m = 1, 2,
/// ... up to 16 or the first exact one, each with figures from a small sample above 16 qubits): with
/// `max_error` (--approx-error) only the shortest whose normalised Frobenius distance is at most
/// max_error; without, every length until the readout success is 1 to within 1e-9 or three lengths in a
/// row score below the best so far. Then the best
/// score of all candidates is chosen again (near-ties to the fewest native two-qubit gates; a degree
/// before a block length). Returns false when no block length meets max_error.
bool consider_block_lengths(int n, std::optional<double> max_error, double threshold,
                            const std::function<DegreeCost(int)>& cost, DegreeChoice& choice, bool* cut);

/// choose_degree for a strategy that builds its whole circuit per degree: `make(spec)` gives the circuit,
/// scored by streaming it through the counters with `settings` (its gate set: the device's native one). Sets
/// plan.degree_choice and plan.spec's degree, and notes a cut.
void choose_degree_by_counting(const Device& device, PreparedPlan& plan, const CountSettings& settings,
                               const std::function<std::shared_ptr<const PlannedCircuit>(const QftSpec&)>& make);

}  // namespace qftplan
