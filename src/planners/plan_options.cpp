// The text parsers of planning settings and the checks every strategy shares.

#include <algorithm>
#include <cmath>

#include <fmt/format.h>

#include "qftplan/core/input_error.hpp"
#include "strategies.hpp"

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
    throw SettingError("approx", " expects 'none', 'auto' (plan and survey) or a whole degree M >= 1, got '" + text + "'");
  if (v < 1 || v > kMaxRegisterQubits)
    throw SettingError("approx", " " + text + " is outside 1 .. " + std::to_string(kMaxRegisterQubits));
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

Objective parse_objective(const std::string& text) {
  if (text == "esp") return Objective::esp;
  if (text == "depth") return Objective::depth;
  if (text == "duration") return Objective::duration;
  if (text == "cx") return Objective::cx;
  throw InputError("unknown objective '" + text + "' (valid: esp, depth, cx)");
}

const char* objective_name(Objective o) {
  switch (o) {
    case Objective::esp: return "esp";
    case Objective::depth: return "depth";
    case Objective::duration: return "duration";
    case Objective::cx: return "cx";
  }
  return "?";
}

Readout parse_readout(const std::string& text) {
  if (text == "unitary") return Readout::unitary;
  if (text == "semiclassical") return Readout::semiclassical;
  if (text == "auto") return Readout::automatic;
  throw SettingError("readout", " expects unitary, semiclassical or auto, got '" + text + "'");
}

const char* readout_name(Readout r) {
  switch (r) {
    case Readout::unitary: return "unitary";
    case Readout::semiclassical: return "semiclassical";
    case Readout::automatic: return "auto";
  }
  return "?";
}

PlanOptions plan_options(const PlanSettings& s) {
  PlanOptions opt;
  opt.spec.qubits = s.qubits;
  if (s.approx == "auto") opt.auto_approx = true;
  else opt.spec.approx_degree = parse_approx_degree(s.approx);
  opt.spec.inverse = s.inverse;
  if (s.gates) opt.gates = parse_gate_set(*s.gates);
  opt.placement = s.placement;
  opt.search.seed = s.seed;
  // The effort scales the work budgets of the chain and placement searches (not the time limit).
  if (!(s.effort >= 0.01 && s.effort <= 1000))
    throw SettingError("effort", fmt::format(" {} is outside 0.01 .. 1000", s.effort));
  opt.search.work_budget = static_cast<long long>(static_cast<double>(opt.search.work_budget) * s.effort);
  opt.placement_search.work_budget =
      std::max(1LL, static_cast<long long>(static_cast<double>(opt.placement_search.work_budget) * s.effort));
  opt.strategy = s.strategy;
  opt.objective = parse_objective(s.objective);
  opt.end_order = parse_end_order(s.end_order);
  opt.network = parse_network_choice(s.network);
  opt.measure = s.measure;
  opt.format = s.format;
  opt.peephole = s.peephole;
  opt.readout = parse_readout(s.readout);
  if (s.approx_error && !(*s.approx_error > 0 && *s.approx_error <= 2))
    throw SettingError("approx-error", fmt::format(" {} is outside (0, 2], the range of a distance between unitaries' columns",
                                                   *s.approx_error));
  opt.approx_error = s.approx_error;
  // The block construction takes its block length from --approx M (--approx auto: chosen).
  if (opt.network == NetworkChoice::blockwise) {
    if (s.approx == "none")
      throw SettingError("network", " blockwise needs its block length: --approx M builds blocks of M qubits, --approx auto "
                                    "chooses M");
    opt.spec.block_length = opt.spec.approx_degree;
    opt.spec.approx_degree.reset();
  }
  if (opt.approx_error && !opt.auto_approx && opt.network != NetworkChoice::blockwise)
    throw SettingError("approx-error", " applies to the block construction: give --network blockwise or --approx auto");
  // The semi-classical form measures as it goes: without a measurement it is not the transform.
  if (opt.readout == Readout::semiclassical && !opt.measure)
    throw SettingError("readout", " semiclassical needs a measured plan (--measure): the semi-classical transform "
                                  "measures every qubit as it goes and leaves no state behind");
  return opt;
}

void validate_spec(const Device& device, const QftSpec& spec) {
  if (spec.qubits < 1) throw SettingError("qubits", fmt::format(" must be at least 1, got {}", spec.qubits));
  if (spec.qubits > kMaxRegisterQubits)
    throw SettingError("qubits", fmt::format(" {} is more than the limit of {} qubits per register", spec.qubits,
                                 kMaxRegisterQubits));
  if (spec.qubits > device.usable_qubit_count()) {
    if (device.usable_qubit_count() == device.qubit_count())
      throw PlanningError(fmt::format("device {} has {} qubits, fewer than the {} requested", device.name(),
                                      device.qubit_count(), spec.qubits));
    throw PlanningError(fmt::format("device {} has {} qubits in service ({} out of service), fewer than the {} requested",
                                    device.name(), device.usable_qubit_count(),
                                    device.qubit_count() - device.usable_qubit_count(), spec.qubits));
  }
  if (spec.block_length && !spec.effectively_exact() && *spec.block_length > kMaxBlockwiseFigureLength)
    throw SettingError("approx", fmt::format(" {} as a block length: the block construction's error is computed for blocks of "
                                             "at most {} qubits (or of half the register or more, which is exact)",
                                             *spec.block_length, kMaxBlockwiseFigureLength));
  if (spec.approx_degree && *spec.approx_degree < 1)
    throw SettingError("approx", fmt::format(" must be at least 1 (1 keeps Hadamards only), got {}", *spec.approx_degree));
}

bool uniform_errors(const Device& device) {
  // Only the parts in service: no plan uses the others.
  const int first_c = first_usable_coupler(device), first_q = first_usable_qubit(device);
  const auto c0 = first_c >= 0 ? device.coupler_calibration(first_c) : CouplerCalibration{};
  for (int c = first_c + 1; first_c >= 0 && c < device.coupler_count(); ++c) {
    if (!device.coupler_usable(c)) continue;
    const auto cc = device.coupler_calibration(c);
    if (cc.error != c0.error || cc.duration_ns != c0.duration_ns) return false;
  }
  if (first_q < 0) return true;
  const auto q0 = device.qubit_calibration(first_q);
  for (int q = first_q + 1; q < device.qubit_count(); ++q) {
    if (!device.usable(q)) continue;
    const auto c = device.qubit_calibration(q);
    if (c.error_1q != q0.error_1q || c.duration_1q_ns != q0.duration_1q_ns || c.error_readout != q0.error_readout ||
        c.t1_us != q0.t1_us || c.t2_us != q0.t2_us)
      return false;
  }
  return true;
}

int first_usable_qubit(const Device& device) {
  for (int q = 0; q < device.qubit_count(); ++q)
    if (device.usable(q)) return q;
  return -1;
}

int first_usable_coupler(const Device& device) {
  for (int c = 0; c < device.coupler_count(); ++c)
    if (device.coupler_usable(c)) return c;
  return -1;
}

PreparedPlan start_plan(const Device& device, const PlanOptions& options, const char* strategy) {
  PreparedPlan plan;
  plan.spec = options.spec;
  if (options.auto_approx) plan.spec.approx_degree.reset();
  validate_spec(device, plan.spec);
  // A degree that keeps every rotation (M >= n) is the exact transform, and is reported as such.
  plan.spec.approx_degree = effective_degree(plan.spec.qubits, plan.spec.approx_degree);
  plan.strategy = strategy;
  plan.gates = options.gates.value_or(gate_set_of(device.native_2q()));
  return plan;
}

void refuse_block_construction(const PreparedPlan& plan, const PlanOptions& options) {
  if (plan.spec.block_length || options.network == NetworkChoice::blockwise)
    throw PlanningError(fmt::format("the {} strategy builds its own circuit; the block construction runs as a chain network "
                                    "(chain or spine strategy)",
                                    plan.strategy));
}

CountSettings count_settings(const PlanOptions& options, GateSet gates) {
  CountSettings c;
  c.gates = gates;
  c.measure = options.measure;
  c.format = options.format;
  c.budget = options.budget;
  c.peephole = options.peephole;
  return c;
}

bool better_by_objective(const StrategyOutcome& a, const StrategyOutcome& b, Objective objective) {
  // Scores within 1e-12 (relative) are a tie, as in the degree choice: on a device without errors every
  // plan has esp_total 1, and a readout success of 1 - 1e-13 is no reason to take 20 times the CX.
  if (objective == Objective::esp) {
    const double sa = plan_log_score(a.log_esp_total, a.log_readout_success);
    const double sb = plan_log_score(b.log_esp_total, b.log_readout_success);
    if (std::abs(sa - sb) <= 1e-12) return std::make_pair(a.cx_count, a.cx_depth) < std::make_pair(b.cx_count, b.cx_depth);
  }
  auto key = [objective](const StrategyOutcome& x) {
    switch (objective) {
      case Objective::esp:
        return std::make_tuple(-plan_log_score(x.log_esp_total, x.log_readout_success), double(x.cx_count),
                               double(x.cx_depth));
      case Objective::depth: return std::make_tuple(double(x.cx_depth), double(x.cx_count), -x.log_esp_total);
      case Objective::duration: return std::make_tuple(x.duration_ns, double(x.cx_count), -x.log_esp_total);
      case Objective::cx: return std::make_tuple(double(x.cx_count), double(x.cx_depth), -x.log_esp_total);
    }
    return std::make_tuple(0.0, 0.0, 0.0);
  };
  return key(a) < key(b);
}

void fill_figures(StrategyOutcome& o, const CircuitFigures& f) {
  o.cx_count = f.cx_count;
  o.depth_2q = f.depth_2q;
  o.cx_depth = f.cx_depth;
  o.swaps = f.swaps;
  o.log_esp = f.noise.log_esp;
  o.log_esp_total = f.noise.log_esp_total;
  o.duration_ns = f.noise.duration_ns;
}

void note_cut_short(PreparedPlan& plan, const std::string& what) {
  if (plan.cut_short.find(what) == std::string::npos) plan.cut_short += (plan.cut_short.empty() ? "" : ", ") + what;
}

}  // namespace qftplan
