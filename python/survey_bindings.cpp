// qftplan.survey and qftplan.survey_csv: many plans over devices, sizes and settings, through the
// survey engine the command line uses (survey_request / survey_run / survey_output), so rows match.

#include <algorithm>
#include <functional>

#include <fmt/format.h>
#include <pybind11/stl.h>

#include "bindings.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/survey/survey_output.hpp"
#include "qftplan/survey/survey_request.hpp"
#include "qftplan/survey/survey_run.hpp"

namespace qftplan::python {

namespace {

// A list argument as the command line's comma-separated text, so the same parser (and messages) apply.
std::string joined(const py::object& v, const std::function<std::string(const py::object&)>& item) {
  if (py::isinstance<py::str>(v) || !py::isinstance<py::sequence>(v)) return item(v);
  std::string out;
  for (const auto& x : v) {
    if (!out.empty()) out += ',';
    out += item(py::reinterpret_borrow<py::object>(x));
  }
  return out;
}

std::string int_text(const py::object& v) {
  if (py::isinstance<py::str>(v)) return v.cast<std::string>();
  if (py::isinstance<py::int_>(v) && !py::isinstance<py::bool_>(v)) return std::to_string(v.cast<long long>());
  throw py::type_error("qubits must be an int, a list of ints, or text such as '4:12:2'");
}

std::string str_text(const py::object& v) {
  if (!py::isinstance<py::str>(v)) throw py::type_error("strategy must be a name or a list of names");
  return v.cast<std::string>();
}

std::string network_text(const py::object& v) {
  if (!py::isinstance<py::str>(v)) throw py::type_error("network must be a name or a list of names");
  return v.cast<std::string>();
}

SurveyDeviceEntry entry_arg(const py::object& d, const std::optional<CalibrationProfile>& calibration) {
  if (py::isinstance<Device>(d)) {
    SurveyDeviceEntry e;
    auto dev = d.cast<std::shared_ptr<Device>>();
    e.text = e.label = dev->name();
    e.device = calibration ? std::make_shared<const Device>(with_calibration_profile(*dev, *calibration)) : dev;
    return e;
  }
  if (py::isinstance<py::str>(d) || py::hasattr(d, "__fspath__"))
    return make_survey_entry(py::str(py::module_::import("os").attr("fspath")(d)), calibration);
  throw py::type_error("each device must be a qftplan.Device, a spec ('grid:4x4', 'grid:*') or a YAML path");
}

std::vector<bool> directions_arg(const py::object& inverse) {
  if (py::isinstance<py::bool_>(inverse)) return {inverse.cast<bool>()};
  if (py::isinstance<py::str>(inverse) && inverse.cast<std::string>() == "both") return {false, true};
  if (py::isinstance<py::sequence>(inverse) && !py::isinstance<py::str>(inverse)) {
    std::vector<bool> out;
    for (const auto& x : inverse) out.push_back(x.cast<bool>());
    if (!out.empty()) return out;
  }
  throw py::type_error("inverse must be True, False, 'both' or a list of bools");
}

std::vector<SurveyRow> run(const py::object& devices, const py::object& qubits, const py::object& approx,
                           const py::object& inverse, const py::object& strategy, const py::object& network,
                           std::uint64_t seed, std::optional<int> jobs_arg,
                           const py::object& calibration, bool measure, const std::string& readout) {
  SurveyRequest req;
  if (!calibration.is_none())
    req.calibration = load_calibration_profile(py::str(py::module_::import("os").attr("fspath")(calibration)));
  if (py::isinstance<py::str>(devices) || py::isinstance<Device>(devices) || py::hasattr(devices, "__fspath__")) {
    req.devices.push_back(entry_arg(devices, req.calibration));
  } else {
    for (const auto& d : devices) req.devices.push_back(entry_arg(py::reinterpret_borrow<py::object>(d), req.calibration));
  }
  if (req.devices.empty()) throw InputError("a survey needs at least one device");
  req.sizes = parse_size_list(joined(qubits, int_text));
  req.approx = parse_approx_list(joined(approx, approx_text));
  req.directions = directions_arg(inverse);
  req.strategies = parse_name_list(joined(strategy, str_text), "strategy");
  // The same check and message as `qftplan survey`.
  check_strategy_names(req.strategies);
  req.networks = parse_name_list(joined(network, network_text), "network");
  check_network_names(req.networks);
  req.seed = seed;
  req.measure = measure;
  req.readout = readout;
  // Like the command line: every core unless told otherwise.
  const int jobs = jobs_arg.value_or(default_survey_jobs());
  if (jobs < 1) throw InputError(fmt::format("jobs must be at least 1, got {}", jobs));
  py::gil_scoped_release release;
  const auto cases = expand_survey(req);
  return run_survey(req, cases, static_cast<long long>(cases.size()), jobs);
}

SurveyTiming timing_arg(bool timing) { return timing ? SurveyTiming::include : SurveyTiming::omit; }

}  // namespace

void bind_survey(py::module_& m) {
  const char* args_doc =
      "  devices   a device or a list: qftplan.Device, built-in specs, YAML paths, or fitted families such as\n"
      "            'grid:*' (the smallest near-square member that holds each size)\n"
      "  qubits    an int, a list of ints, or the command line's text ('4:12:2,16')\n"
      "  approx    'none', an int, 'auto', or a list of them\n"
      "  inverse   False, True, 'both', or a list of bools\n"
      "  strategy  a strategy name or a list of names\n"
      "  network   a chain network name ('auto', 'insertion', ... as plan's network) or a list of names\n"
      "  seed      seed of every randomised search; jobs: worker threads (None: every core)\n"
      "  timing    include the wall-time column elapsed_ms (off: reproducible output)\n"
      "  calibration  a calibration profile file applied to every device (as --calibration)\n"
      "  measure   every run ends in a measurement; readout: 'unitary', 'semiclassical' or 'auto' (as plan)\n"
      "Cases run in the command line's order (device, strategy, network, approx, direction, size); a case that\n"
      "cannot be planned is a row with status 'failed' and its reason.";
  static const std::string survey_doc = std::string("Runs a survey and returns its rows as dicts (the JSON-lines fields).\n") + args_doc;
  static const std::string csv_doc = std::string("Runs a survey and returns the CSV text (RFC 4180) the command line writes.\n") + args_doc;
  m.def(
      "survey",
      [](const py::object& devices, const py::object& qubits, const py::object& approx, const py::object& inverse,
         const py::object& strategy, std::uint64_t seed, std::optional<int> jobs, bool timing,
         const py::object& calibration, bool measure, const std::string& readout, const py::object& network) {
        const auto rows = run(devices, qubits, approx, inverse, strategy, network, seed, jobs, calibration, measure, readout);
        py::list out;
        for (const auto& r : rows) out.append(to_python(survey_row_to_json(r, timing_arg(timing))));
        return out;
      },
      py::arg("devices"), py::arg("qubits"), py::kw_only(), py::arg("approx") = "none", py::arg("inverse") = false,
      py::arg("strategy") = "auto", py::arg("seed") = 1, py::arg("jobs") = py::none(), py::arg("timing") = false,
      py::arg("calibration") = py::none(), py::arg("measure") = false, py::arg("readout") = "auto", py::arg("network") = "auto", survey_doc.c_str());
  m.def(
      "survey_csv",
      [](const py::object& devices, const py::object& qubits, const py::object& approx, const py::object& inverse,
         const py::object& strategy, std::uint64_t seed, std::optional<int> jobs, bool timing,
         const py::object& calibration, bool measure, const std::string& readout, const py::object& network) {
        const auto rows = run(devices, qubits, approx, inverse, strategy, network, seed, jobs, calibration, measure, readout);
        return survey_csv(rows, timing_arg(timing));
      },
      py::arg("devices"), py::arg("qubits"), py::kw_only(), py::arg("approx") = "none", py::arg("inverse") = false,
      py::arg("strategy") = "auto", py::arg("seed") = 1, py::arg("jobs") = py::none(), py::arg("timing") = false,
      py::arg("calibration") = py::none(), py::arg("measure") = false, py::arg("readout") = "auto", py::arg("network") = "auto", csv_doc.c_str());
}

}  // namespace qftplan::python
