// Our JSON documents (plan reports, survey rows) handed to Python as dicts and lists.

#include "bindings.hpp"

namespace qftplan::python {

py::object to_python(const nlohmann::ordered_json& j) {
  // Through Python's own JSON reader: the text is what `--report` writes (numbers round-trip
  // exactly), and dicts keep the report's field order. The function object is kept for the life of
  // the process (released, so no destructor runs after the interpreter has finished).
  static const py::handle loads = py::object(py::module_::import("json").attr("loads")).release();
  return loads(py::str(j.dump()));
}

}  // namespace qftplan::python
