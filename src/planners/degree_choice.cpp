// The one approximation-degree choice (--approx auto) shared by every strategy.

#include <algorithm>
#include <cmath>

#include "qftplan/core/approximation.hpp"
#include "qftplan/core/run_budget.hpp"
#include "strategies.hpp"

namespace qftplan {

// The one scoring of a plan (of a degree, and of a strategy under --objective esp): ln(esp_total x readout_success), the probability that the noisy circuit
// runs without a fault and, run without fault, phase estimation reads the exact answer (the readout
// success averages over the 2^n basis-state phases). The two are treated as independent.
double plan_log_score(double log_esp_total, double log_readout_success) { return log_esp_total + log_readout_success; }

double plan_log_readout_success(const PreparedPlan& plan) {
  if (plan.degree_choice)
    for (const auto& c : plan.degree_choice->considered)
      if (c.degree == plan.spec.approx_degree && c.block_length == plan.spec.block_length) return c.approx.log_readout_success;
  return spec_figures(plan.spec, false).log_readout_success;
}

namespace {

// The best score of the candidates (near-ties within 1e-12 to the fewest native two-qubit gates, then
// to the later candidate: a larger degree, exact, a block length).
void pick_best(DegreeChoice& out) {
  double best = -INFINITY;
  for (const auto& c : out.considered) best = std::max(best, c.log_score);
  const DegreeCandidate* pick = nullptr;
  for (const auto& c : out.considered)
    if (c.log_score >= best - 1e-12 && (!pick || c.native_2q <= pick->native_2q)) pick = &c;
  out.chosen = pick->degree;
  out.chosen_block_length = pick->block_length;
}

}  // namespace

DegreeChoice choose_degree(int n, bool score_exact, const std::function<DegreeCost(std::optional<int>)>& cost,
                           bool* cut) {
  DegreeChoice out;
  const auto score = [&](std::optional<int> degree) {
    const DegreeCost m = cost(degree);
    DegreeCandidate c;
    c.degree = degree;
    c.log_esp = m.log_esp;
    c.native_2q = m.native_2q;
    c.approx = approx_figures(n, degree);
    c.fidelity_bound = approx_fidelity_lower_bound(c.approx.distance.value_or(c.approx.error_bound));
    c.log_score = plan_log_score(c.log_esp, c.approx.log_readout_success);
    c.score = std::exp(c.log_score);
    out.considered.push_back(c);
  };
  try {
    for (int m = 1; m < n; ++m) {
      score(m);
      // Higher degrees only add rotations once the readout is right to within 1e-12.
      if (out.considered.back().approx.readout_success >= 1.0 - 1e-12) break;
    }
    if (score_exact || out.considered.empty()) score(std::nullopt);
  } catch (const TimeLimitReached&) {
    // Out of time: choose among the degrees scored so far (exact when none was).
    if (cut) *cut = true;
    if (out.considered.empty()) return out;
  }
  pick_best(out);
  return out;
}

// Longest block scored by --approx auto, and the sampling work of each candidate's figures: every
// length costs (n/m) 2^m a sampled input, so the scan stays within seconds at 4096 qubits. A longer
// block can still be asked for by --approx M.
constexpr int kMaxAutoBlockLength = 16;
constexpr double kAutoFigureWork = 2e6;

bool consider_block_lengths(int n, std::optional<double> max_error, double threshold,
                            const std::function<DegreeCost(int)>& cost, DegreeChoice& choice, bool* cut) {
  bool met = !max_error;
  try {
    double previous = -INFINITY;
    int falls = 0;
    for (int m = 1; m <= kMaxAutoBlockLength; ++m) {
      QftSpec spec;
      spec.qubits = n;
      spec.block_length = m;
      DegreeCandidate c;
      c.block_length = m;
      c.approx = spec_figures(spec, false, max_error.value_or(threshold), kAutoFigureWork);
      const double frobenius = c.approx.blockwise ? c.approx.blockwise->frobenius : 0.0;
      if (max_error && frobenius > *max_error && !spec.effectively_exact()) continue;
      const DegreeCost d = cost(m);
      c.log_esp = d.log_esp;
      c.native_2q = d.native_2q;
      // Every column within the distance bound 2 of a unitary's; the fidelity bound of the textbook
      // degrees does not apply to a construction exact on some inputs and far on others.
      c.fidelity_bound = spec.effectively_exact() ? 1.0 : 0.0;
      c.log_score = plan_log_score(c.log_esp, c.approx.log_readout_success);
      c.score = std::exp(c.log_score);
      choice.considered.push_back(c);
      if (max_error || spec.effectively_exact()) {
        met = true;
        break;
      }
      if (c.approx.readout_success >= 1.0 - 1e-9) break;
      falls = c.log_score < previous ? falls + 1 : 0;
      if (falls >= 3) break;
      previous = std::max(previous, c.log_score);
    }
  } catch (const TimeLimitReached&) {
    if (cut) *cut = true;
  }
  if (!choice.considered.empty()) pick_best(choice);
  return met;
}

void choose_degree_by_counting(const Device& device, PreparedPlan& plan, const CountSettings& settings,
                               const std::function<std::shared_ptr<const PlannedCircuit>(const QftSpec&)>& make) {
  const auto cost = [&](std::optional<int> degree) {
    QftSpec s = plan.spec;
    s.approx_degree = degree;
    const CircuitFigures f = count_circuit(device, *make(s), settings, nullptr);
    return DegreeCost{f.noise.log_esp_total, f.cx_count};
  };
  bool cut = false;
  plan.degree_choice = choose_degree(plan.spec.qubits, true, cost, &cut);
  if (cut) note_cut_short(plan, "the approximation-degree scoring");
  plan.spec.approx_degree = plan.degree_choice->chosen;
}

}  // namespace qftplan
