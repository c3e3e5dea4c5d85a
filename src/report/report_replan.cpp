#include "qftplan/report/report_replan.hpp"

#include <algorithm>
#include <fstream>
#include <sstream>

#include <fmt/format.h>

#include "qftplan/core/input_error.hpp"

namespace qftplan {

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

// The transform the report describes, checked against the device.
QftSpec spec_of(const ReportFields& f, const Device& device) {
  const std::string dev_name = f.text("device");
  if (dev_name != device.name())
    f.fail(fmt::format("the report is of a plan on device '{}', not on '{}'", dev_name, device.name()));
  const long long n = f.integer("qubits");
  if (n < 1 || n > device.qubit_count()) f.fail(fmt::format("field 'qubits' is {}, outside 1..{}", n, device.qubit_count()));
  QftSpec spec;
  spec.qubits = static_cast<int>(n);
  if (const auto& d = f.at("approx_degree"); !d.is_null()) {
    if (!d.is_number_integer() || d.get<long long>() < 1) f.fail("field 'approx_degree' must be null or a degree >= 1");
    spec.approx_degree = d.get<int>();
  }
  // The block construction (reports from before it have no such field).
  if (const auto it = f.j.find("block_length"); it != f.j.end() && !it->is_null()) {
    if (!it->is_number_integer() || it->get<long long>() < 1) f.fail("field 'block_length' must be null or a length >= 1");
    spec.block_length = it->get<int>();
    spec.approx_degree.reset();
  }
  const auto& inv = f.at("inverse");
  if (!inv.is_boolean()) f.fail("field 'inverse' must be true or false");
  spec.inverse = inv.get<bool>();
  return spec;
}

}  // namespace

ReplannedReport replan_report(const Device& device, const nlohmann::json& report, const std::string& name) {
  const ReportFields f{report, name};
  if (!report.is_object()) f.fail("not a plan report: expected a JSON object");
  ReplannedReport out;
  PlanOptions& opt = out.options;
  opt.spec = spec_of(f, device);
  const long long n = opt.spec.qubits;
  const std::string strategy = f.text("strategy");
  const std::string network = f.text("network");
  const auto placement = f.ids("placement", device.qubit_count());
  const auto final_placement = f.ids("final_placement", device.qubit_count());
  if (static_cast<long long>(placement.size()) != n || static_cast<long long>(final_placement.size()) != n)
    f.fail(fmt::format("fields 'placement' and 'final_placement' must list {} qubits", n));

  // Re-plan with the report's settings. A strategy that takes a placement is pinned to the report's;
  // the others choose their own start, which is deterministic for the report's seed. A network the
  // planner can be asked for by name is asked for (it may have been named with --network).
  opt.strategy = strategy;
  if (const auto it = report.find("seed"); it != report.end()) {
    if (!it->is_number_unsigned()) f.fail("field 'seed' must be a non-negative integer");
    opt.search.seed = it->get<std::uint64_t>();
    opt.routing.seed = opt.search.seed;
  }
  for (NetworkChoice c : network_choices())
    if (c != NetworkChoice::automatic && network == network_choice_name(c)) opt.network = c;
  if (const auto it = report.find("end_order"); it != report.end()) {
    if (!it->is_string()) f.fail("field 'end_order' must be text");
    opt.end_order = parse_end_order(it->get<std::string>());
  }
  try {
    if (find_strategy(strategy).takes_placement) opt.placement = placement;
    out.plan = prepare_plan(device, opt);
    out.report = execute_plan(device, opt, out.plan, nullptr);
  } catch (const std::exception& e) {
    f.fail(fmt::format("cannot re-plan the report's settings on {}: {}", device.name(), e.what()));
  }
  const PlanReport& r = out.report;
  if (r.placement != placement || r.final_placement != final_placement || r.network != network)
    f.fail(fmt::format("re-planning gives another plan than the report's ({} network, placement {}); was the report "
                       "made with another --seed or other options?",
                       r.network, fmt::join(r.placement, ",")));
  return out;
}

ReplannedReport replan_report_file(const Device& device, const std::string& path) {
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
  return replan_report(device, j, path);
}

}  // namespace qftplan
