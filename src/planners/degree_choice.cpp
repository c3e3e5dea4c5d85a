// The one approximation-degree choice (--approx auto) shared by every strategy.

#include <algorithm>
#include <cmath>

#include "qftplan/core/approximation.hpp"
#include "qftplan/core/run_budget.hpp"
#include "strategies.hpp"

namespace qftplan {

DegreeChoice choose_degree(int n, bool score_exact, const std::function<DegreeCost(std::optional<int>)>& cost,
                           bool* cut) {
  DegreeChoice out;
  const auto score = [&](std::optional<int> degree) {
    const DegreeCost m = cost(degree);
    DegreeCandidate c;
    c.degree = degree;
    c.log_esp = m.log_esp;
    c.native_2q = m.native_2q;
    c.error_bound = approx_error_bound(n, degree);
    c.fidelity_bound = approx_fidelity_lower_bound(c.error_bound);
    c.score = std::exp(c.log_esp) * c.fidelity_bound;
    out.considered.push_back(c);
  };
  try {
    for (int m = 1; m < n; ++m) {
      score(m);
      if (out.considered.back().fidelity_bound >= 1.0 - 1e-12) break;
    }
    if (score_exact || out.considered.empty()) score(std::nullopt);
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
