#pragma once
/// \file bindings.hpp
/// The pieces of the Python module `qftplan`, one file each: errors, devices, plans, checks,
/// surveys, and the bridge from our JSON documents to Python objects.

#include <memory>
#include <optional>
#include <string>

#include <nlohmann/json.hpp>
#include <pybind11/pybind11.h>

#include "qftplan/device/device.hpp"

namespace qftplan::python {

namespace py = pybind11;

/// Registers qftplan.InputError (a ValueError) and qftplan.PlanningError (a RuntimeError) and the
/// translation of the library's exceptions into them.
void bind_errors(py::module_& m);
/// qftplan.Device, load_device, device_from_yaml and the lattice generators.
void bind_device(py::module_& m);
/// qftplan.plan and qftplan.Plan.
void bind_plan(py::module_& m);
/// qftplan.check, qftplan.check_file and qftplan.CheckResult.
void bind_check(py::module_& m);
/// qftplan.survey and qftplan.survey_csv.
void bind_survey(py::module_& m);

/// A JSON document as Python objects (dicts keep the document's key order).
py::object to_python(const nlohmann::ordered_json& j);

/// A device argument: a qftplan.Device, or text / a path-like naming a built-in spec or a YAML file.
std::shared_ptr<const Device> device_arg(const py::object& device);

/// An approximation argument as the command line's text: None -> "none", an int -> its digits, a
/// str as given. Other types raise TypeError.
std::string approx_text(const py::object& approx);

}  // namespace qftplan::python
