#include "qftplan/svg/plan_drawing.hpp"

#include <algorithm>
#include <fstream>
#include <sstream>

#include <fmt/format.h>

#include "qftplan/core/input_error.hpp"
#include "qftplan/networks/chain_qft.hpp"
#include "qftplan/networks/end_order.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/sinks/detour_sink.hpp"
#include "qftplan/sinks/native_gates.hpp"

namespace qftplan {

CouplerLoadSink::CouplerLoadSink(const Device& device, bool join_split_blocks)
    : dev_(device), loads_(static_cast<std::size_t>(device.coupler_count()), 0), join_(join_split_blocks) {}

void CouplerLoadSink::gate(const Gate& g) {
  if (!is_two_qubit(g.kind)) {
    last_cp_a_ = last_cp_b_ = -1;
    return;
  }
  const int a = std::min(g.q0, g.q1), b = std::max(g.q0, g.q1);
  // The logical gate set writes a fused block as cp then swap on the same pair: one block.
  const bool second_half = join_ && g.kind == GateKind::swap && a == last_cp_a_ && b == last_cp_b_;
  if (!second_half) {
    const int c = dev_.coupler_index(a, b);
    if (c >= 0) ++loads_[static_cast<std::size_t>(c)];
    ++total_;
  }
  if (g.kind == GateKind::cp) last_cp_a_ = a, last_cp_b_ = b;
  else last_cp_a_ = last_cp_b_ = -1;
}

namespace {

// Typed access to the fields of a plan report, with errors naming the report.
struct ReportFields {
  const nlohmann::json& j;
  const std::string& name;

  [[noreturn]] void fail(const std::string& message) const { throw InputError(name, 0, 0, message); }
  const nlohmann::json& at(const char* key) const {
    const auto it = j.find(key);
    if (it == j.end()) fail(fmt::format("not a plan report: missing field '{}' (write one with qftplan plan --report)", key));
    return *it;
  }
  std::string text(const char* key) const {
    const auto& v = at(key);
    if (!v.is_string()) fail(fmt::format("field '{}' must be text", key));
    return v.get<std::string>();
  }
  long long integer(const char* key) const {
    const auto& v = at(key);
    if (!v.is_number_integer()) fail(fmt::format("field '{}' must be a whole number", key));
    return v.get<long long>();
  }
  std::vector<int> ids(const char* key, int device_qubits) const {
    const auto& v = at(key);
    if (!v.is_array()) fail(fmt::format("field '{}' must be an array of qubit ids", key));
    std::vector<int> out;
    for (const auto& x : v) {
      if (!x.is_number_integer() || x.get<long long>() < 0 || x.get<long long>() >= device_qubits)
        fail(fmt::format("field '{}' holds {}, not a qubit id of the device (0..{})", key, x.dump(), device_qubits - 1));
      out.push_back(x.get<int>());
    }
    return out;
  }
};

std::string describe_spec(int n, const std::optional<int>& degree, bool inverse) {
  return fmt::format("{} on {} qubit{}, {}", inverse ? "inverse QFT" : "QFT", n, n == 1 ? "" : "s",
                     degree ? fmt::format("approximate of degree {}", *degree) : std::string("exact"));
}

}  // namespace

DrawnPlan drawn_plan_from_report(const Device& device, const nlohmann::json& report, const std::string& name) {
  const ReportFields f{report, name};
  if (!report.is_object()) f.fail("not a plan report: expected a JSON object");
  const std::string dev_name = f.text("device");
  if (dev_name != device.name())
    f.fail(fmt::format("the report is of a plan on device '{}', not on '{}'", dev_name, device.name()));
  const long long n = f.integer("qubits");
  if (n < 1 || n > device.qubit_count()) f.fail(fmt::format("field 'qubits' is {}, outside 1..{}", n, device.qubit_count()));
  std::optional<int> degree;
  if (const auto& d = f.at("approx_degree"); !d.is_null()) {
    if (!d.is_number_integer() || d.get<long long>() < 1) f.fail("field 'approx_degree' must be null or a degree >= 1");
    degree = d.get<int>();
  }
  const auto& inv = f.at("inverse");
  if (!inv.is_boolean()) f.fail("field 'inverse' must be true or false");
  const std::string strategy = f.text("strategy");
  const std::string network = f.text("network");
  const auto placement = f.ids("placement", device.qubit_count());
  const auto final_placement = f.ids("final_placement", device.qubit_count());
  if (static_cast<long long>(placement.size()) != n || static_cast<long long>(final_placement.size()) != n)
    f.fail(fmt::format("fields 'placement' and 'final_placement' must list {} qubits", n));

  // Re-plan with the report's settings. A chain plan is pinned to the report's placement; other
  // strategies choose their own start, which is deterministic for the report's seed. A network the
  // planner can be asked for by name is asked for (it may have been named with --network).
  PlanOptions opt;
  opt.spec.qubits = static_cast<int>(n);
  opt.spec.approx_degree = degree;
  opt.spec.inverse = inv.get<bool>();
  opt.strategy = strategy;
  if (strategy == "chain") opt.placement = placement;
  if (const auto it = report.find("seed"); it != report.end()) {
    if (!it->is_number_unsigned()) f.fail("field 'seed' must be a non-negative integer");
    opt.search.seed = it->get<std::uint64_t>();
    opt.routing.seed = opt.search.seed;
  }
  if (network == "reversal" || network == "anchored" || network == "leapfrog" || network == "parity")
    opt.network = parse_network_choice(network);
  if (const auto it = report.find("end_order"); it != report.end()) {
    if (!it->is_string()) f.fail("field 'end_order' must be text");
    opt.end_order = parse_end_order(it->get<std::string>());
  }
  // Blocks are counted on the planner's own stream, where every block is one gate (a fused cp+SWAP,
  // a parity step, a detour's SWAPs): the chain network through the spine's detours, or the routed
  // gate list.
  CouplerLoadSink loads(device, false);
  PlanReport r;
  bool routed = false;
  std::vector<std::array<int, 3>> plan_detours;
  try {
    const PreparedPlan plan = prepare_plan(device, opt);
    routed = plan.routed.has_value();
    plan_detours = plan.detours;
    r = execute_plan(device, opt, plan, nullptr);
    if (routed) {
      for (const auto& g : plan.routed->gates) loads.gate(g);
    } else if (plan.detours.empty()) {
      emit_chain_qft(plan.spec, *plan.network, plan.chain, loads);
    } else {
      DetourSink detour(loads);
      for (const auto& [a, b, via] : plan.detours) detour.add(a, b, via);
      emit_chain_qft(plan.spec, *plan.network, plan.chain, detour);
      detour.finish();
    }
  } catch (const std::exception& e) {
    f.fail(fmt::format("cannot re-plan the report's settings on {}: {}", device.name(), e.what()));
  }
  if (r.placement != placement || r.final_placement != final_placement || r.network != network)
    f.fail(fmt::format("re-planning gives another plan than the report's ({} network, placement {}); was the report "
                       "made with another --seed or other options?",
                       r.network, fmt::join(r.placement, ",")));

  DrawnPlan out;
  out.title = describe_spec(static_cast<int>(n), degree, opt.spec.inverse);
  out.method = r.network == strategy ? fmt::format("{} strategy", strategy)
                                     : fmt::format("{} strategy, {} network", strategy, r.network);
  out.strategy = r.strategy;
  out.chain = routed ? std::vector<int>{} : r.chain;
  out.detours = plan_detours;
  out.placement = placement;
  out.final_placement = final_placement;
  out.coupler_blocks = loads.loads();
  out.blocks = r.two_qubit_blocks;
  return out;
}

DrawnPlan read_drawn_plan(const Device& device, const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path, 0, 0, "cannot open the plan report");
  std::ostringstream s;
  s << in.rdbuf();
  const std::string text = s.str();
  nlohmann::json j;
  try {
    j = nlohmann::json::parse(text);
  } catch (const nlohmann::json::parse_error& e) {
    // Turn the byte offset into a line and column.
    const std::size_t at = std::min<std::size_t>(e.byte > 0 ? e.byte - 1 : 0, text.size());
    int line = 1, col = 1;
    for (std::size_t i = 0; i < at; ++i) {
      if (text[i] == '\n') ++line, col = 1;
      else ++col;
    }
    throw InputError(path, line, col, "not valid JSON (expected the report of qftplan plan --report)");
  }
  return drawn_plan_from_report(device, j, path);
}

ChainBand chain_band(const Device& device, const DrawnPlan& plan) {
  ChainBand band;
  if (plan.strategy == "routed" || plan.chain.size() < 2) return band;
  std::vector<bool> dangling(static_cast<std::size_t>(device.qubit_count()), false);
  for (const auto& [a, b, via] : plan.detours)
    if (a >= 0 && a < device.qubit_count()) dangling[a] = true;
  std::vector<bool> taken(static_cast<std::size_t>(device.coupler_count()), false);
  auto add = [&](int a, int b) {
    const int c = a >= 0 && b >= 0 ? device.coupler_index(std::min(a, b), std::max(a, b)) : -1;
    if (c < 0 || taken[c]) return;
    taken[c] = true;
    (dangling[a] || dangling[b] ? band.hops : band.main).push_back(c);
  };
  for (std::size_t p = 0; p + 1 < plan.chain.size(); ++p)
    if (device.coupled(plan.chain[p], plan.chain[p + 1])) add(plan.chain[p], plan.chain[p + 1]);
  // A gate between uncoupled line neighbours steps through the spine qubit both hang from.
  for (const auto& [a, b, via] : plan.detours) add(a, via), add(via, b);
  std::sort(band.main.begin(), band.main.end());
  std::sort(band.hops.begin(), band.hops.end());
  return band;
}

}  // namespace qftplan
