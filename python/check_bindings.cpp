// qftplan.check and qftplan.check_file: does an OpenQASM circuit implement a given QFT on a device?
// The same reading of the maps and the same messages as `qftplan check`.

#include <fmt/format.h>
#include <pybind11/stl.h>

#include "bindings.hpp"
#include "qftplan/check/qft_checker.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/qasm/qasm_program.hpp"

namespace qftplan::python {

namespace {

// A verdict with the name of what was checked, to print it as `qftplan check` does.
struct Verdict {
  CheckResult result;
  std::string source;
};

std::optional<std::vector<int>> map_arg(const py::object& v, const char* option) {
  if (v.is_none()) return std::nullopt;
  if (py::isinstance<py::str>(v)) return parse_id_list(v.cast<std::string>(), option);
  return v.cast<std::vector<int>>();
}

Verdict check_program(const QasmProgram& prog, const std::string& source, const py::object& device, int qubits,
                      const py::object& approx, bool inverse, const py::object& initial, const py::object& final_,
                      std::optional<int> block_length) {
  const auto dev = device_arg(device);
  CheckRequest req;
  req.spec.qubits = qubits;
  const std::string approx_str = approx_text(approx);
  // `check` takes a degree or none (an automatic choice names no transform to check against).
  req.spec.approx_degree = parse_approx_degree(approx_str);
  if (block_length) {
    if (req.spec.approx_degree) throw SettingError("block_length", " and approx name two different transforms");
    if (*block_length < 1) throw SettingError("block_length", " must be at least 1");
    req.spec.block_length = block_length;
  }
  req.spec.inverse = inverse;
  if (qubits < 1) throw SettingError("qubits", " must be at least 1");
  if (auto m = map_arg(initial, "initial")) req.placement = *m;
  else if (prog.placement) req.placement = *prog.placement;
  else throw InputError(source, 0, 0, "no '// placement:' header comment; give initial=");
  if (auto m = map_arg(final_, "final")) req.final_placement = *m;
  else if (prog.final_placement) req.final_placement = *prog.final_placement;
  else throw InputError(source, 0, 0, "no '// final_placement:' header comment; give final=");
  for (const auto* v : {&req.placement, &req.final_placement})
    if (static_cast<int>(v->size()) != qubits)
      throw InputError(fmt::format("a qubit map lists {} qubits but qubits is {}", v->size(), qubits));
  Verdict out{{}, source};
  py::gil_scoped_release release;
  out.result = check_qft_circuit(*dev, prog, req);
  return out;
}

const char* const kCheckDoc =
    "Decides whether the circuit implements the QFT of `qubits` qubits on `device`, like `qftplan check`:\n"
    "  approx    'none' or an int degree M (the approximate QFT of degree M)\n"
    "  block_length  M: the block construction with blocks of M (plan(network='blockwise'))\n"
    "  inverse   expect the inverse QFT\n"
    "  initial   placement (list of ints or 'a,b,c'); default: the '// placement:' header comment\n"
    "  final     final placement; default: the '// final_placement:' header comment\n"
    "Returns a CheckResult: true when proved; .outcome is 'proved', 'wrong' or 'cannot prove'. Unreadable\n"
    "input raises InputError with file:line:column.";

// Docstrings live as long as the module (pybind11 keeps the pointer).
const std::string kCheckTextDoc = std::string("Checks OpenQASM 2 or 3 text (`source` names it in messages).\n") + kCheckDoc;
const std::string kCheckFileDoc = std::string("Checks an OpenQASM 2 or 3 file.\n") + kCheckDoc;

}  // namespace

void bind_check(py::module_& m) {
  py::class_<Verdict>(m, "CheckResult",
                      "The verdict of check(): true when the circuit is correct. str() is the line `qftplan check`\n"
                      "prints ('source: message', or 'source:line: message' for a wrong circuit).")
      .def_property_readonly("ok", [](const Verdict& v) { return v.result.ok; }, "The circuit implements the QFT.")
      .def_property_readonly("message", [](const Verdict& v) { return v.result.message; },
                             "What was proved, or why the circuit is wrong.")
      .def_property_readonly(
          "line", [](const Verdict& v) -> py::object { return v.result.line > 0 ? py::object(py::int_(v.result.line)) : py::object(py::none()); },
          "The first offending line (None when correct or not tied to a line).")
      .def_property_readonly("structural_proved", [](const Verdict& v) { return v.result.structural_proved; },
                             "The structural proof ran and passed.")
      .def_property_readonly("simulated", [](const Verdict& v) { return v.result.simulated; },
                             "The state-vector comparison ran and passed.")
      .def_property_readonly("outcome", [](const Verdict& v) { return std::string(outcome_name(v.result.outcome)); },
                             "'proved', 'wrong' (with a counterexample or a certain structural fact) or 'cannot prove'.")
      .def_property_readonly("exhaustive", [](const Verdict& v) { return v.result.exhaustive; },
                             "The simulation covered every basis input.")
      .def_property_readonly("inconclusive", [](const Verdict& v) { return v.result.inconclusive; },
                             "The structural proof lost track (not a refutation); simulation may still have decided.")
      .def_property_readonly(
          "lost_track_line",
          [](const Verdict& v) -> py::object {
            return v.result.lost_track_line > 0 ? py::object(py::int_(v.result.lost_track_line)) : py::object(py::none());
          },
          "Where the structural proof lost track (None when it did not, or not at a line).")
      .def_property_readonly(
          "lost_track_reason",
          [](const Verdict& v) -> py::object {
            return v.result.lost_track_reason.empty() ? py::object(py::none()) : py::object(py::str(v.result.lost_track_reason));
          },
          "Why the structural proof lost track (None when it did not).")
      .def("__bool__", [](const Verdict& v) { return v.result.ok; })
      .def("__str__",
           [](const Verdict& v) {
             return v.result.ok ? v.source + ": " + v.result.message
                                : format_input_error(v.source, v.result.line, 0, v.result.message);
           })
      .def("__repr__", [](const Verdict& v) {
        return fmt::format("<qftplan.CheckResult outcome='{}' line={}>", outcome_name(v.result.outcome), v.result.line);
      });

  m.def(
      "check",
      [](const std::string& circuit, const py::object& device, int qubits, const py::object& approx, bool inverse,
         const py::object& initial, const py::object& final_, const std::string& source, std::optional<int> block_length) {
        const QasmProgram prog = parse_qasm(circuit, source);
        return check_program(prog, source, device, qubits, approx, inverse, initial, final_, block_length);
      },
      py::arg("circuit"), py::arg("device"), py::arg("qubits"), py::kw_only(), py::arg("approx") = "none",
      py::arg("inverse") = false, py::arg("initial") = py::none(), py::arg("final") = py::none(),
      py::arg("source") = "<string>", py::arg("block_length") = py::none(),
      kCheckTextDoc.c_str());
  m.def(
      "check_file",
      [](const py::object& path, const py::object& device, int qubits, const py::object& approx, bool inverse,
         const py::object& initial, const py::object& final_, std::optional<int> block_length) {
        const std::string file = py::str(py::module_::import("os").attr("fspath")(path));
        const QasmProgram prog = load_qasm_file(file);
        return check_program(prog, file, device, qubits, approx, inverse, initial, final_, block_length);
      },
      py::arg("path"), py::arg("device"), py::arg("qubits"), py::kw_only(), py::arg("approx") = "none",
      py::arg("inverse") = false, py::arg("initial") = py::none(), py::arg("final") = py::none(),
      py::arg("block_length") = py::none(), kCheckFileDoc.c_str());
}

}  // namespace qftplan::python
