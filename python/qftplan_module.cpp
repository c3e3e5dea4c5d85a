// The Python module `qftplan`: the library's planning, checking and survey functions for scripts
// and notebooks. Each part is bound in its own file (see bindings.hpp).

#include <pybind11/pybind11.h>

#include "bindings.hpp"
#include "qftplan/report/report.hpp"
#include "qftplan/survey/survey_output.hpp"

PYBIND11_MODULE(qftplan, m) {
  using namespace qftplan::python;
  m.doc() =
      "qftplan: plan quantum Fourier transforms on qubit chips with nearest-neighbour couplers.\n\n"
      "load_device / Device and the lattice generators (line, ring, grid, heavy_hex, full) give devices;\n"
      "plan(...) returns a Plan with its report (a dict, the fields of `qftplan plan --report`) and its\n"
      "OpenQASM text; check(...) proves that a circuit implements a QFT on a device; survey(...) runs\n"
      "many plans. Bad input raises qftplan.InputError (a ValueError) with the command line's message\n"
      "'file:line:column: message'; a request that cannot be planned raises qftplan.PlanningError.";
  m.attr("__version__") = QFTPLAN_VERSION_STRING;
  m.attr("REPORT_SCHEMA_VERSION") = qftplan::kReportSchemaVersion;
  m.attr("SURVEY_ROW_SCHEMA_VERSION") = qftplan::kSurveyRowSchemaVersion;
  bind_errors(m);
  bind_device(m);
  bind_plan(m);
  bind_check(m);
  bind_survey(m);
}
