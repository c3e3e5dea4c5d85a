// The qftplan command line: parses options, calls the library, prints. The only file that knows
// about CLI11.

#include <chrono>
#include <cstdio>
#include <iostream>
#include <memory>
#include <optional>
#include <string>

#include <CLI/CLI.hpp>
#include <fmt/format.h>

#include "qftplan/atomic_file.hpp"
#include "qftplan/device_source.hpp"
#include "qftplan/device_summary.hpp"
#include "qftplan/device_yaml.hpp"
#include "qftplan/input_error.hpp"
#include "qftplan/plan.hpp"
#include "qftplan/qasm_program.hpp"
#include "qftplan/qasm_writer.hpp"
#include "qftplan/qft_checker.hpp"
#include "qftplan/report.hpp"

namespace {

using namespace qftplan;

constexpr int kExitFailed = 1;   // check found the circuit wrong, or the request cannot be planned
constexpr int kExitBadInput = 2;

std::optional<int> parse_approx(const std::string& text) {
  if (text == "none") return std::nullopt;
  std::size_t used = 0;
  int v = 0;
  try {
    v = std::stoi(text, &used);
  } catch (const std::exception&) {
    used = 0;
  }
  if (used != text.size() || text.empty() || v < 1)
    throw InputError("--approx expects 'none' or a degree M >= 1, got '" + text + "'");
  return v;
}

// An output destination: "-" is standard output; anything else a file written atomically.
struct Destination {
  std::unique_ptr<AtomicFile> file;
  StdoutOutput out;
  TextOutput& sink() { return file ? static_cast<TextOutput&>(*file) : out; }
  explicit Destination(const std::string& path) {
    if (path != "-") file = std::make_unique<AtomicFile>(path);
  }
  void commit() {
    if (file) file->commit();
  }
};

struct DeviceArgs {
  std::string device;
  bool summary = false;
};

int run_device(const DeviceArgs& a) {
  const Device dev = load_device(a.device);
  if (a.summary) std::fputs(format_summary(summarize(dev)).c_str(), stdout);
  else std::fputs(device_to_yaml(dev).c_str(), stdout);
  return 0;
}

struct PlanArgs {
  std::string device;
  int qubits = 0;
  std::string approx = "none";
  bool inverse = false;
  std::string gates;
  std::string placement;
  std::string format = "qasm3";
  std::string output;
  std::string report;
  std::uint64_t seed = 1;
  bool measure = false;
  bool explain = false;
};

int run_plan(const PlanArgs& a) {
  const auto t0 = std::chrono::steady_clock::now();
  const Device dev = load_device(a.device);
  PlanOptions opt;
  opt.spec.qubits = a.qubits;
  if (a.approx == "auto") opt.auto_approx = true;
  else opt.spec.approx_degree = parse_approx(a.approx);
  opt.spec.inverse = a.inverse;
  if (!a.gates.empty()) opt.gates = parse_gate_set(a.gates);
  if (!a.placement.empty()) opt.placement = parse_id_list(a.placement, "--placement");
  opt.search.seed = a.seed;
  opt.measure = a.measure;
  const QasmVersion version = parse_qasm_version(a.format);
  opt.swap_as_cx = version == QasmVersion::v2;

  const PreparedPlan plan = prepare_plan(dev, opt);
  std::optional<Destination> circuit_dest, report_dest;
  if (!a.output.empty()) circuit_dest.emplace(a.output);
  if (!a.report.empty()) report_dest.emplace(a.report);

  std::unique_ptr<QasmWriter> writer;
  if (circuit_dest) {
    CircuitHeader h;
    h.device_name = dev.name();
    h.device_qubits = dev.qubit_count();
    h.strategy = fmt::format("{} ({} network)", plan.strategy, plan.network->name());
    h.spec = plan.spec;
    h.placement = plan.maps.placement;
    h.final_placement = plan.maps.final_placement;
    h.measured_bits = opt.measure ? opt.spec.qubits : 0;
    writer = std::make_unique<QasmWriter>(version, h, circuit_dest->sink());
  }
  PlanReport r = execute_plan(dev, opt, plan, writer.get());
  r.elapsed_ms = std::chrono::duration<double, std::milli>(std::chrono::steady_clock::now() - t0).count();
  if (writer) r.output_bytes = writer->bytes();
  if (report_dest) report_dest->sink().write(report_to_json_text(r));
  // Commit only when everything succeeded, so a failure leaves no partial file behind.
  if (circuit_dest) circuit_dest->commit();
  if (report_dest) report_dest->commit();
  if (!circuit_dest && !report_dest) std::fputs(format_plan_summary(r).c_str(), stdout);
  if (a.explain) std::fputs(format_plan_explanation(r).c_str(), a.output == "-" || a.report == "-" ? stderr : stdout);
  return 0;
}

struct CheckArgs {
  std::string file;
  std::string device;
  int qubits = 0;
  std::string approx = "none";
  bool inverse = false;
  std::string initial;
  std::string final_;
};

int run_check(const CheckArgs& a) {
  const Device dev = load_device(a.device);
  const QasmProgram prog = load_qasm_file(a.file);
  CheckRequest req;
  req.spec.qubits = a.qubits;
  req.spec.approx_degree = parse_approx(a.approx);
  req.spec.inverse = a.inverse;
  if (a.qubits < 1) throw InputError("--qubits must be at least 1");
  if (!a.initial.empty()) req.placement = parse_id_list(a.initial, "--initial");
  else if (prog.placement) req.placement = *prog.placement;
  else throw InputError(a.file, 0, 0, "no '// placement:' header comment; give --initial");
  if (!a.final_.empty()) req.final_placement = parse_id_list(a.final_, "--final");
  else if (prog.final_placement) req.final_placement = *prog.final_placement;
  else throw InputError(a.file, 0, 0, "no '// final_placement:' header comment; give --final");
  for (const auto* v : {&req.placement, &req.final_placement})
    if (static_cast<int>(v->size()) != a.qubits)
      throw InputError(fmt::format("a qubit map lists {} qubits but --qubits is {}", v->size(), a.qubits));
  const CheckResult res = check_qft_circuit(dev, prog, req);
  if (!res.ok) {
    std::fprintf(stderr, "%s\n", format_input_error(a.file, res.line, 0, res.message).c_str());
    return kExitFailed;
  }
  std::printf("%s: %s\n", a.file.c_str(), res.message.c_str());
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  CLI::App app{"qftplan: plan quantum Fourier transforms on qubit chips with nearest-neighbour couplers"};
  app.require_subcommand(1);
  app.set_version_flag("--version", "qftplan " QFTPLAN_VERSION_STRING);

  DeviceArgs da;
  auto* device = app.add_subcommand("device", "print a device (built-in spec or YAML file) as YAML, or its summary");
  device->add_option("device", da.device, "built-in spec (line:N, ring:N, grid:RxC, heavy-hex:RxC, full:N) or YAML file")
      ->required();
  device->add_flag("--summary", da.summary, "print qubits, couplers, degrees, diameter, components, calibration ranges");

  PlanArgs pa;
  auto* plan = app.add_subcommand("plan", "plan a QFT on a device and write OpenQASM and/or a JSON report");
  plan->add_option("--device", pa.device, "built-in spec or YAML file")->required();
  plan->add_option("--qubits,-n", pa.qubits, "register size n")->required();
  plan->add_option("--approx", pa.approx, "approximation degree: none (exact), M (keep rotations R_k, k <= M) or auto (best ESP x fidelity)")
      ->capture_default_str();
  plan->add_flag("--inverse", pa.inverse, "plan the inverse QFT");
  plan->add_option("--gates", pa.gates, "emitted gate set: logical, cx or cz (default: the device's native_2q)");
  plan->add_option("--placement", pa.placement, "pin the physical qubit of each input bit: a,b,c,...");
  plan->add_option("--format", pa.format, "circuit format: qasm3 or qasm2")->capture_default_str();
  plan->add_option("--output,-o", pa.output, "write the circuit to FILE ('-' for standard output)");
  plan->add_option("--report", pa.report, "write the JSON report to FILE ('-' for standard output)");
  plan->add_option("--seed", pa.seed, "seed of every randomised search")->capture_default_str();
  plan->add_flag("--measure", pa.measure, "end with a measurement of every register qubit");
  plan->add_flag("--explain", pa.explain, "print the chains considered and the degrees scored");

  CheckArgs ca;
  auto* check = app.add_subcommand("check", "prove that an OpenQASM file implements a QFT on a device");
  check->add_option("file", ca.file, "OpenQASM 2 or 3 file")->required();
  check->add_option("--device", ca.device, "built-in spec or YAML file")->required();
  check->add_option("--qubits,-n", ca.qubits, "register size n")->required();
  check->add_option("--approx", ca.approx, "approximation degree: none or M")->capture_default_str();
  check->add_flag("--inverse", ca.inverse, "expect the inverse QFT");
  check->add_option("--initial", ca.initial, "placement (default: the file's '// placement:' comment)");
  check->add_option("--final", ca.final_, "final placement (default: the file's '// final_placement:' comment)");

  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    const int rc = app.exit(e);
    return rc == 0 ? 0 : kExitBadInput;
  }
  try {
    if (device->parsed()) return run_device(da);
    if (plan->parsed()) return run_plan(pa);
    if (check->parsed()) return run_check(ca);
  } catch (const InputError& e) {
    std::fprintf(stderr, "qftplan: %s\n", e.what());
    return kExitBadInput;
  } catch (const PlanningError& e) {
    std::fprintf(stderr, "qftplan: %s\n", e.what());
    return kExitFailed;
  } catch (const std::exception& e) {
    std::fprintf(stderr, "qftplan: %s\n", e.what());
    return kExitBadInput;
  }
  return 0;
}
