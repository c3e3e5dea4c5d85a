// qftplan.InputError and qftplan.PlanningError: the library's two kinds of failure as Python
// exceptions, carrying the library's message text with settings named as this module's arguments.

#include <algorithm>
#include <exception>

#include "bindings.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/core/run_budget.hpp"
#include "qftplan/planners/plan.hpp"

namespace qftplan::python {

namespace {

// Owned for the life of the process (module objects are never unloaded), so never released.
PyObject* g_input_error = nullptr;
PyObject* g_planning_error = nullptr;

py::object or_none(const std::string& s) { return s.empty() ? py::none() : py::object(py::str(s)); }
py::object or_none(int v) { return v > 0 ? py::object(py::int_(v)) : py::none(); }

}  // namespace

void bind_errors(py::module_& m) {
  g_input_error = PyErr_NewExceptionWithDoc(
      "qftplan.InputError",
      "Bad input: a device file, circuit file, spec or argument value. str(e) is the command line's\n"
      "message ('file:line:column: message', unknown parts left out); the attributes file, line and\n"
      "column (None when unknown) and message (without the position) give the parts.",
      PyExc_ValueError, nullptr);
  g_planning_error = PyErr_NewExceptionWithDoc(
      "qftplan.PlanningError",
      "A well-formed request that cannot be planned on this device (the command line's exit status 1),\n"
      "for example no chain of n qubits.",
      PyExc_RuntimeError, nullptr);
  if (!g_input_error || !g_planning_error) throw py::error_already_set();
  m.attr("InputError") = py::handle(g_input_error);
  m.attr("PlanningError") = py::handle(g_planning_error);

  py::register_exception_translator([](std::exception_ptr p) {
    try {
      if (p) std::rethrow_exception(p);
    } catch (const InputError& e) {
      py::object type = py::reinterpret_borrow<py::object>(g_input_error);
      // A setting's name is worded as this module's keyword argument (time-limit -> time_limit).
      const auto* setting = dynamic_cast<const SettingError*>(&e);
      const std::string text = setting ? setting->worded([](std::string_view name) {
        std::string arg(name);
        std::replace(arg.begin(), arg.end(), '-', '_');
        return arg;
      })
                                       : std::string(e.what());
      py::object exc = type(py::str(text));
      exc.attr("file") = or_none(e.file());
      exc.attr("line") = or_none(e.line());
      exc.attr("column") = or_none(e.column());
      exc.attr("message") = py::str(setting ? text : e.message());
      PyErr_SetObject(g_input_error, exc.ptr());
    } catch (const PlanningError& e) {
      PyErr_SetString(g_planning_error, e.what());
    } catch (const TimeLimitReached& e) {
      // Out of time before any plan existed: the request could not be planned in the time given.
      PyErr_SetString(g_planning_error, e.what());
    }
  });
}

}  // namespace qftplan::python
