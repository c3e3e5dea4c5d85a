// The semi-classical readout of a measured plan (--readout): the placement of the semi-classical
// transform, and the one choice between it and the unitary plan.

#include <algorithm>
#include <cmath>
#include <numeric>

#include <fmt/format.h>

#include "qftplan/core/run_budget.hpp"
#include "strategies.hpp"

namespace qftplan {

namespace {

// Why `device` cannot run the semi-classical form of an n-qubit register, or empty.
std::string feed_forward_missing(const Device& device, int n, const std::optional<std::vector<int>>& pinned) {
  if (pinned) {
    for (int q : *pinned)
      if (q >= 0 && q < device.qubit_count() && !device.qubit_calibration(q).feed_forward_ns)
        return fmt::format("qubit {} of the pinned placement has no feed_forward_ns: the device offers no feed-forward "
                           "from it",
                           q);
    return {};
  }
  // Only qubits in service count (a qubit out of service is never planned on).
  int offered = 0;
  for (int q = 0; q < device.qubit_count(); ++q)
    offered += device.usable(q) && device.qubit_calibration(q).feed_forward_ns ? 1 : 0;
  if (offered == 0)
    return fmt::format("device {} offers no feed-forward (its calibration gives no feed_forward_ns)", device.name());
  if (offered < n)
    return fmt::format("device {} offers feed-forward from {} qubit{} in service (feed_forward_ns), fewer than the {} "
                       "requested",
                       device.name(), offered, offered == 1 ? "" : "s", n);
  return {};
}

// The placement of the semi-classical form (ours, a simple score). No coupler is needed, so any n
// qubits with feed-forward will do. A qubit's score is what it costs as the average register qubit:
// ln(1 - error_readout) + ln(1 - error_1q) + (n - 1)/2 x ln F(step), where F is the idle channel's
// no-error probability (noise_model.hpp) and step = duration_1q_ns + duration_readout_ns +
// feed_forward_ns, the time one round of the schedule takes (a qubit processed in round k waits about
// k rounds). The n best are kept; the longest-lived of them (the highest ln F(step)) is processed
// last, since it waits longest. Ties go to the lower qubit id (deterministic).
std::vector<int> semiclassical_placement(const Device& device, int n) {
  struct Scored {
    int q;
    double score, per_round;
  };
  std::vector<Scored> all;
  for (int q = 0; q < device.qubit_count(); ++q) {
    const QubitCalibration c = device.qubit_calibration(q);
    if (!c.feed_forward_ns || !device.usable(q)) continue;
    const double step = c.duration_1q_ns + c.duration_readout_ns + *c.feed_forward_ns;
    const double per_round = log_idle_fidelity(step, c.t1_us, c.t2_us);
    all.push_back({q, std::log1p(-c.error_readout) + std::log1p(-c.error_1q) + 0.5 * (n - 1) * per_round, per_round});
  }
  std::stable_sort(all.begin(), all.end(), [](const Scored& a, const Scored& b) { return a.score > b.score; });
  all.resize(static_cast<std::size_t>(n));
  // Round k works on input bit n-1-k, so the qubit of input bit 0 waits longest: the longest-lived.
  std::stable_sort(all.begin(), all.end(), [](const Scored& a, const Scored& b) { return a.per_round > b.per_round; });
  std::vector<int> placement;
  for (const Scored& s : all) placement.push_back(s.q);
  return placement;
}

}  // namespace

PreparedPlan prepare_semiclassical(const Device& device, const PlanOptions& options) {
  PreparedPlan plan = start_plan(device, options, "semiclassical");
  if (auto why = feed_forward_missing(device, plan.spec.qubits, options.placement); !why.empty())
    throw PlanningError("the semi-classical readout cannot run: " + why);
  std::vector<int> placement;
  if (options.placement) {
    placement = *options.placement;
    if (static_cast<int>(placement.size()) != plan.spec.qubits)
      throw SettingError("placement", fmt::format(" lists {} qubits for a {}-qubit register", placement.size(),
                                                  plan.spec.qubits));
    std::vector<char> used(static_cast<std::size_t>(device.qubit_count()), 0);
    for (int q : placement) {
      if (q < 0 || q >= device.qubit_count())
        throw SettingError("placement", fmt::format(": qubit {} is outside the device (0..{})", q, device.qubit_count() - 1));
      if (used[static_cast<std::size_t>(q)]++) throw SettingError("placement", fmt::format(": qubit {} is listed twice", q));
    }
    plan.placement.method = "pinned";
  } else {
    placement = semiclassical_placement(device, plan.spec.qubits);
    plan.placement.method = "best readout and lifetimes";
  }
  const auto make = [&placement](const QftSpec& s) { return make_semiclassical_circuit(s, placement); };
  if (options.auto_approx) {
    CountSettings count = count_settings(options, gate_set_of(device.native_2q()));
    count.measure = true;
    choose_degree_by_counting(device, plan, count, make);
  }
  plan.circuit = make(plan.spec);
  plan.maps = plan.circuit->maps();
  return plan;
}

namespace {

double counted_log_esp_total(const Device& device, const PlanOptions& options, PreparedPlan& plan) {
  if (!plan.counted) {
    CountSettings count = count_settings(options, plan.gates);
    count.measure = true;
    plan.counted = std::make_shared<const CircuitFigures>(count_circuit(device, *plan.circuit, count, nullptr));
  }
  return plan.counted->noise.log_esp_total;
}

}  // namespace

PreparedPlan prepare_measured(const Device& device, const PlanOptions& options,
                              PreparedPlan (*unitary)(const Device&, const PlanOptions&)) {
  ReadoutChoice choice;
  // The unitary form only, for `reason`.
  const auto unitary_only = [&](const char* reason, const char* semiclassical_note) {
    PreparedPlan p = unitary(device, options);
    choice.chosen = "unitary";
    choice.reason = reason;
    choice.semiclassical_note = semiclassical_note;
    p.readout = choice;
    return p;
  };
  if (options.readout == Readout::unitary) return unitary_only("pinned by --readout unitary", "not planned (--readout unitary)");
  // The block construction is a unitary circuit of its own; the semi-classical form measures the
  // textbook transform.
  if (options.spec.block_length) {
    if (options.readout == Readout::semiclassical)
      throw SettingError("readout", " semiclassical measures the textbook transform as it goes; the block construction "
                                    "(--network blockwise) has no such form");
    return unitary_only("the block construction has no semi-classical form", "not planned (--network blockwise)");
  }
  if (options.readout == Readout::semiclassical) {
    // A named strategy plans a unitary circuit: it is never replaced silently.
    if (options.strategy != "auto")
      throw SettingError("readout", fmt::format(" semiclassical plans no two-qubit gate, so the {} strategy has nothing to "
                                                "do; leave the strategy to auto",
                                                options.strategy));
    PreparedPlan p = prepare_semiclassical(device, options);
    choice.chosen = "semiclassical";
    choice.reason = "pinned by --readout semiclassical";
    choice.unitary_note = "not planned (--readout semiclassical)";
    choice.semiclassical_log_esp_total = counted_log_esp_total(device, options, p);
    p.readout = choice;
    return p;
  }
  // auto: the unitary plan, and the semi-classical one where the device offers feed-forward; the
  // higher score wins (ties to the unitary form, which needs no feed-forward).
  const std::string missing = feed_forward_missing(device, options.spec.qubits, options.placement);
  std::optional<PreparedPlan> u;
  try {
    u = unitary(device, options);
  } catch (const PlanningError& e) {
    if (!missing.empty()) throw;
    choice.unitary_note = std::string("cannot plan: ") + e.what();
  }
  if (!missing.empty()) {
    choice.chosen = "unitary";
    choice.reason = "the semi-classical form needs feed-forward";
    choice.semiclassical_note = missing;
    u->readout = choice;
    return std::move(*u);
  }
  PreparedPlan s = prepare_semiclassical(device, options);
  choice.semiclassical_log_esp_total = counted_log_esp_total(device, options, s);
  if (u) choice.unitary_log_esp_total = counted_log_esp_total(device, options, *u);
  throw_if_interrupted(options.budget);
  // The one score of every choice (plan_log_score): esp_total, times the readout success of the plan's
  // degree, which differs only when --approx auto chose different degrees for the two forms.
  const bool semi = !u || plan_log_score(*choice.semiclassical_log_esp_total, plan_log_readout_success(s)) >
                              plan_log_score(*choice.unitary_log_esp_total, plan_log_readout_success(*u));
  choice.chosen = semi ? "semiclassical" : "unitary";
  choice.reason = !u ? "the unitary form cannot be planned" : "the higher esp_total";
  PreparedPlan& chosen = semi ? s : *u;
  chosen.readout = choice;
  return std::move(chosen);
}

}  // namespace qftplan
