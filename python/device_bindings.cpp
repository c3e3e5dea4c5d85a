// qftplan.Device and the ways to get one: a spec or YAML file, YAML text, or a lattice generator.

#include <fmt/format.h>
#include <pybind11/stl.h>

#include "bindings.hpp"
#include "qftplan/device/calibration_profile.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/device/device_summary.hpp"
#include "qftplan/device/device_yaml.hpp"
#include "qftplan/device/lattices.hpp"

namespace qftplan::python {

namespace {

std::shared_ptr<Device> share(Device d) { return std::make_shared<Device>(std::move(d)); }

// Lattices are built from their spec text, so that bad sizes give the command line's messages.
std::shared_ptr<Device> lattice(const std::string& spec) { return share(make_lattice(spec)); }

py::dict range_dict(const Range& r) {
  py::dict d;
  d["min"] = r.min;
  d["max"] = r.max;
  return d;
}

py::dict summary_dict(const DeviceSummary& s) {
  py::dict d;
  d["name"] = s.name;
  d["qubits"] = s.qubits;
  d["couplers"] = s.couplers;
  d["min_degree"] = s.min_degree;
  d["max_degree"] = s.max_degree;
  d["diameter"] = s.diameter;
  d["components"] = s.components;
  d["largest_component"] = s.largest_component;
  d["bipartite"] = s.bipartite;
  d["native_2q"] = s.native_2q;
  d["calibrated"] = s.calibrated;
  py::list out;
  for (const auto& p : s.out_of_service) {
    py::dict part;
    part["qubits"] = p.qubits;
    part["reason"] = p.reason;
    out.append(part);
  }
  d["out_of_service"] = out;
  if (s.calibrated) {
    d["error_1q"] = range_dict(s.error_1q);
    d["error_2q"] = range_dict(s.error_2q);
    d["error_readout"] = range_dict(s.error_readout);
    d["t1_us"] = range_dict(s.t1_us);
    d["t2_us"] = range_dict(s.t2_us);
    d["duration_1q_ns"] = range_dict(s.duration_1q_ns);
    d["duration_2q_ns"] = range_dict(s.duration_2q_ns);
  }
  return d;
}

}  // namespace

std::shared_ptr<const Device> device_arg(const py::object& device) {
  if (py::isinstance<Device>(device)) return device.cast<std::shared_ptr<Device>>();
  if (py::isinstance<py::str>(device) || py::hasattr(device, "__fspath__")) {
    const std::string text = py::str(py::module_::import("os").attr("fspath")(device));
    py::gil_scoped_release release;
    return share(load_device(text));
  }
  throw py::type_error("device must be a qftplan.Device, a built-in spec such as 'grid:4x4', or a YAML file path");
}

// A path argument (str or os.PathLike) as text.
std::string path_text(const py::object& path) { return py::str(py::module_::import("os").attr("fspath")(path)); }

// The device of `spec`, with the calibration profile in file `calibration` applied when given.
std::shared_ptr<Device> calibrated_device(const py::object& spec, const py::object& calibration) {
  auto dev = std::const_pointer_cast<Device>(device_arg(spec));
  if (calibration.is_none()) return dev;
  const std::string file = path_text(calibration);
  py::gil_scoped_release release;
  return share(with_calibration_profile(*dev, load_calibration_profile(file)));
}

void bind_device(py::module_& m) {
  py::class_<Device, std::shared_ptr<Device>>(m, "Device",
                                              "A qubit chip: qubits 0..n-1, couplers between pairs, calibration data.\n"
                                              "Device(spec) loads a built-in lattice ('line:N', 'ring:N', 'grid:RxC',\n"
                                              "'heavy-hex:RxC', 'full:N') or a YAML device file, like load_device.")
      .def(py::init(&calibrated_device), py::arg("spec"), py::kw_only(), py::arg("calibration") = py::none(),
           "calibration: a calibration profile file applied to the device (README \"Calibration profiles\").")
      .def(
          "with_calibration",
          [](const std::shared_ptr<Device>& d, const py::object& profile) { return calibrated_device(py::cast(d), profile); },
          py::arg("profile"),
          "A copy with the calibration profile in file `profile` applied: its values hold on every qubit and coupler.")
      .def(
          "usable",
          [](const Device& d, int q) {
            if (q < 0 || q >= d.qubit_count())
              throw py::index_error(fmt::format("qubit {} is not in 0..{}", q, d.qubit_count() - 1));
            return d.usable(q);
          },
          py::arg("qubit"), "False for a qubit out of service (disabled, or error_1q 1): no plan uses it.")
      .def_static(
          "from_yaml", [](const std::string& text, const std::string& source) { return share(parse_device_yaml(text, source)); },
          py::arg("text"), py::arg("source") = "<string>",
          "Parses a device from YAML text in qftplan's device format; `source` names it in error messages.")
      .def_property_readonly("name", &Device::name, "The device's name.")
      .def_property_readonly("qubit_count", &Device::qubit_count, "Number of qubits.")
      .def_property_readonly("coupler_count", &Device::coupler_count, "Number of couplers.")
      .def_property_readonly(
          "couplers",
          [](const Device& d) {
            py::list out;
            for (const auto& c : d.couplers()) out.append(py::make_tuple(c.a, c.b));
            return out;
          },
          "Couplers as (a, b) pairs with a < b, in file order (those out of service included).")
      .def_property_readonly(
          "native_2q", [](const Device& d) { return std::string(two_qubit_gate_name(d.native_2q())); },
          "The native two-qubit gate: 'cx' or 'cz'.")
      .def_property_readonly("calibrated", &Device::has_calibration, "True when the device carries calibration data.")
      .def(
          "neighbours",
          [](const Device& d, int q) {
            if (q < 0 || q >= d.qubit_count())
              throw py::index_error(fmt::format("qubit {} is not in 0..{}", q, d.qubit_count() - 1));
            const auto n = d.neighbours(q);
            return std::vector<int>(n.begin(), n.end());
          },
          py::arg("qubit"), "The qubits coupled to `qubit`, ascending.")
      .def("coupled", &Device::coupled, py::arg("a"), py::arg("b"), "True when qubits a and b share a coupler.")
      .def("to_yaml", &device_to_yaml, "The device in qftplan's YAML format (as `qftplan device SPEC` prints it).")
      .def(
          "summary", [](const Device& d) { return summary_dict(summarize(d)); },
          "Qubits, couplers, degrees, diameter, components and calibration ranges as a dict.")
      .def(
          "summary_text", [](const Device& d) { return format_summary(summarize(d)); },
          "The text `qftplan device SPEC --summary` prints.")
      .def("__len__", &Device::qubit_count)
      .def("__eq__", [](const Device& a, const Device& b) { return a == b; })
      .def("__repr__", [](const Device& d) {
        return fmt::format("<qftplan.Device '{}': {} qubits, {} couplers>", d.name(), d.qubit_count(), d.coupler_count());
      });

  m.def(
      "load_device", &calibrated_device, py::arg("spec"), py::kw_only(), py::arg("calibration") = py::none(),
      "A built-in lattice ('line:N', 'ring:N', 'grid:RxC', 'heavy-hex:RxC', 'full:N') or a YAML device file;\n"
      "calibration: a calibration profile file applied to it (as --calibration).");
  m.def(
      "device_from_yaml", [](const std::string& text, const std::string& source) { return share(parse_device_yaml(text, source)); },
      py::arg("text"), py::arg("source") = "<string>", "Parses a device from YAML text (same as Device.from_yaml).");
  m.def(
      "line", [](int n) { return lattice(fmt::format("line:{}", n)); }, py::arg("n"),
      "Qubits 0..n-1 in a row, couplers (i, i+1).");
  m.def(
      "ring", [](int n) { return lattice(fmt::format("ring:{}", n)); }, py::arg("n"), "A line closed into a cycle (n >= 3).");
  m.def(
      "grid", [](int rows, int cols) { return lattice(fmt::format("grid:{}x{}", rows, cols)); }, py::arg("rows"),
      py::arg("cols"), "A rows x cols grid; qubit r*cols + c at row r, column c.");
  m.def(
      "heavy_hex", [](int rows, int cols) { return lattice(fmt::format("heavy-hex:{}x{}", rows, cols)); },
      py::arg("rows"), py::arg("cols"),
      "The heavy-hexagon lattice of rows x cols hexagonal cells (numbering as in the README).");
  m.def(
      "full", [](int n) { return lattice(fmt::format("full:{}", n)); }, py::arg("n"), "n qubits, every pair coupled.");
}

}  // namespace qftplan::python
