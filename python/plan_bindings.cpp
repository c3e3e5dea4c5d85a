// qftplan.plan and qftplan.Plan: one planned QFT with its report and its OpenQASM text, made with
// the same options `qftplan plan` sets for the same flags.

#include <chrono>

#include <fmt/format.h>
#include <pybind11/stl.h>

#include "bindings.hpp"
#include "qftplan/core/atomic_file.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/core/run_budget.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/qasm/qasm_writer.hpp"
#include "qftplan/report/circuit_header.hpp"
#include "qftplan/report/report.hpp"

namespace qftplan::python {

namespace {

QasmVersion version_arg(const py::object& format) {
  if (py::isinstance<py::int_>(format)) {
    const int v = format.cast<int>();
    if (v == 2) return QasmVersion::v2;
    if (v == 3) return QasmVersion::v3;
  }
  if (py::isinstance<py::str>(format)) return parse_qasm_version(format.cast<std::string>());
  throw InputError("format must be 'qasm3', 'qasm2', 3 or 2, got " + py::repr(format).cast<std::string>());
}

std::optional<std::vector<int>> placement_arg(const py::object& placement) {
  if (placement.is_none()) return std::nullopt;
  if (py::isinstance<py::str>(placement)) return parse_id_list(placement.cast<std::string>(), "placement");
  return placement.cast<std::vector<int>>();
}

// One plan, kept with everything needed to emit it again (gate_list).
struct Plan {
  std::shared_ptr<const Device> device;
  PlanOptions options;                       // budget cleared after planning
  std::shared_ptr<const PreparedPlan> prepared;
  PlanReport report;
  QasmVersion version = QasmVersion::v3;
  std::optional<std::string> qasm;
};

Plan make_plan(const py::object& device, int qubits, const py::object& approx, bool inverse, const py::object& gates,
               const py::object& placement, std::uint64_t seed, bool measure, const std::string& end_order,
               const std::string& strategy, const std::string& objective, const py::object& format, bool circuit,
               std::optional<double> time_limit, const std::string& network, bool peephole,
               const std::string& readout, std::optional<double> approx_error) {
  const auto t0 = std::chrono::steady_clock::now();
  Plan p;
  p.device = device_arg(device);
  // The same settings `qftplan plan` takes, turned into options by the one builder.
  PlanSettings settings;
  settings.qubits = qubits;
  settings.approx = approx_text(approx);
  settings.inverse = inverse;
  if (!gates.is_none()) settings.gates = gates.cast<std::string>();
  settings.placement = placement_arg(placement);
  settings.seed = seed;
  settings.strategy = strategy;
  settings.objective = objective;
  settings.network = network;
  settings.end_order = end_order;
  settings.measure = measure;
  settings.peephole = peephole;
  settings.readout = readout;
  settings.approx_error = approx_error;
  p.version = version_arg(format);
  settings.format = p.version;
  p.options = plan_options(settings);
  PlanOptions& opt = p.options;
  if (time_limit && !(*time_limit > 0))
    throw InputError(fmt::format("time_limit expects a positive number of seconds, got '{}'", *time_limit));
  {
    py::gil_scoped_release release;
    const RunBudget budget(time_limit, nullptr, BudgetClock::from_environment());
    opt.budget = &budget;
    auto prepared = std::make_shared<PreparedPlan>(prepare_plan(*p.device, opt));
    StringOutput text;
    std::unique_ptr<QasmWriter> writer;
    if (circuit) writer = std::make_unique<QasmWriter>(p.version, circuit_header(*p.device, opt, *prepared), text);
    p.report = execute_plan(*p.device, opt, *prepared, writer.get());
    if (writer) {
      p.report.output_bytes = writer->bytes();
      p.qasm = text.text();
    }
    opt.budget = nullptr;
    p.prepared = std::move(prepared);
  }
  p.report.elapsed_ms = std::chrono::duration<double, std::milli>(std::chrono::steady_clock::now() - t0).count();
  if (!p.prepared->cut_short.empty()) {
    const std::string warning =
        fmt::format("the time limit of {} s ran out during {}; the plan is the best found so far", *time_limit,
                    p.prepared->cut_short);
    if (PyErr_WarnEx(PyExc_RuntimeWarning, warning.c_str(), 1) != 0) throw py::error_already_set();
  }
  return p;
}

py::object gate_tuple(const Gate& g) {
  py::tuple qubits = is_two_qubit(g.kind) ? py::make_tuple(g.q0, g.q1) : py::make_tuple(g.q0);
  py::object param = py::none();
  if (g.kind == GateKind::measure) param = py::int_(g.q1);
  // A conditioned phase: (angle, bit) (name 'p_if').
  else if (g.kind == GateKind::p_if) param = py::make_tuple(g.angle.radians(), g.q1);
  else if (has_angle(g.kind)) param = py::float_(g.angle.radians());
  return py::make_tuple(std::string(gate_name(g.kind)), qubits, param);
}

}  // namespace

std::string approx_text(const py::object& approx) {
  if (approx.is_none()) return "none";
  if (py::isinstance<py::bool_>(approx)) throw py::type_error("approx must be 'none', 'auto' or an int degree, not a bool");
  if (py::isinstance<py::int_>(approx)) return std::to_string(approx.cast<long long>());
  if (py::isinstance<py::str>(approx)) return approx.cast<std::string>();
  throw py::type_error("approx must be 'none', 'auto', None or an int degree");
}

void bind_plan(py::module_& m) {
  py::class_<Plan>(m, "Plan",
                   "A planned QFT. `report` is the JSON report as a dict (README 'Report fields'), `qasm` the\n"
                   "OpenQASM text (None when planned with circuit=False), `placement[k]` / `final_placement[k]`\n"
                   "the physical qubit holding input bit k at the start / output bit k at the end.")
      .def_property_readonly(
          "report", [](const Plan& p) { return to_python(report_to_json(p.report)); },
          "The report as a dict: the fields and values `qftplan plan --report` writes.")
      .def_property_readonly("qasm", [](const Plan& p) { return p.qasm; }, "The OpenQASM text, or None.")
      .def_property_readonly(
          "format", [](const Plan& p) { return p.version == QasmVersion::v2 ? "qasm2" : "qasm3"; },
          "'qasm3' or 'qasm2'.")
      .def_property_readonly("placement", [](const Plan& p) { return p.report.placement; },
                             "placement[k]: the physical qubit holding input bit k (weight 2^k) at the start.")
      .def_property_readonly("final_placement", [](const Plan& p) { return p.report.final_placement; },
                             "final_placement[k]: the physical qubit holding output bit k at the end.")
      .def_property_readonly("device", [](const Plan& p) { return std::const_pointer_cast<Device>(p.device); },
                             "The device planned on.")
      .def_property_readonly(
          "cut_short",
          [](const Plan& p) -> py::object {
            return p.prepared->cut_short.empty() ? py::none() : py::object(py::str(p.prepared->cut_short));
          },
          "None, or which searches the time limit cut short (the plan is then the best found so far).")
      .def(
          "gate_list",
          [](const Plan& p) {
            VectorSink sink;
            {
              py::gil_scoped_release release;
              execute_plan(*p.device, p.options, *p.prepared, &sink);
            }
            py::list out;
            for (const auto& g : sink.gates) out.append(gate_tuple(g));
            return out;
          },
          "The emitted circuit as (name, qubits, parameter) tuples in the chosen gate set, the gates the\n"
          "OpenQASM text holds: name as in OpenQASM ('h', 'cp', 'swap', 'cx', 'rz', ...), qubits a tuple of\n"
          "physical qubits, parameter the angle in radians (rz, p, cp), the bit (measure), (angle, bit) for\n"
          "a phase conditioned on a bit ('p_if') or None. The text\n"
          "keeps angles exact; these floats are rounded.")
      .def("summary", [](const Plan& p) { return format_plan_summary(p.report); },
           "The summary `qftplan plan` prints when it writes no file.")
      .def("explanation", [](const Plan& p) { return format_plan_explanation(p.report); },
           "What `--explain` prints: the chains considered and the degrees scored.")
      .def("__repr__", [](const Plan& p) {
        return fmt::format("<qftplan.Plan {} qubits on '{}': {} ({}), {} cx>", p.report.qubits, p.report.device,
                           p.report.strategy, p.report.network, p.report.cx_count);
      });

  m.def("plan", &make_plan, py::arg("device"), py::arg("qubits"), py::kw_only(), py::arg("approx") = "none",
        py::arg("inverse") = false, py::arg("gates") = py::none(), py::arg("placement") = py::none(),
        py::arg("seed") = 1, py::arg("measure") = false, py::arg("end_order") = "free", py::arg("strategy") = "auto",
        py::arg("objective") = "esp", py::arg("format") = "qasm3", py::arg("circuit") = true,
        py::arg("time_limit") = py::none(), py::arg("network") = "auto", py::arg("peephole") = true,
        py::arg("readout") = "auto", py::arg("approx_error") = py::none(),
        "Plans a QFT of `qubits` qubits on `device` (a Device, a spec such as 'grid:4x4' or a YAML path),\n"
        "like `qftplan plan`:\n"
        "  approx      'none' (exact), an int degree M, or 'auto'\n"
        "  inverse     plan the inverse QFT\n"
        "  gates       'logical', 'cx' or 'cz' (None: the device's native gate)\n"
        "  placement   physical qubit of each input bit: a list of ints or 'a,b,c'\n"
        "  seed        seed of every randomised search\n"
        "  measure     end with a measurement of every register qubit\n"
        "  readout     with measure: 'unitary', 'semiclassical' (mid-circuit measurements, conditioned\n"
        "              phases) or 'auto' (the higher esp_total where the device offers feed-forward)\n"
        "  end_order   'free' or 'same' (output bit k ends on the qubit that held input bit k)\n"
        "  strategy    a planning strategy name ('auto', 'chain', ...)\n"
        "  objective   what strategy 'auto' optimises: 'esp' (esp_total), 'depth' (native two-qubit depth),\n"
        "              'duration' (schedule length, ns) or 'cx' (native two-qubit gates)\n"
        "  network     chain network: 'auto', 'reversal', 'anchored', 'leapfrog', 'insertion',\n"
        "              'parity-insertion', 'parity' or 'blockwise' (the block construction, blocks of `approx`)\n"
        "  approx_error  the normalised Frobenius distance accepted from the block construction\n"
        "              (`approx` 'auto' then considers it; the report counts columns beyond it)\n"
        "  format      'qasm3' or 'qasm2' (or 3, 2) for the text\n"
        "  circuit     False: report only, no text kept (for very large registers)\n"
        "  time_limit  seconds; when it runs out the best plan so far is returned with a RuntimeWarning\n"
        "  peephole    False: the native gates as decomposed, without the peephole pass\n"
        "Returns a Plan. Raises InputError for bad arguments, PlanningError when it cannot be planned.");
}

}  // namespace qftplan::python
