#pragma once
// The "plan" command: plans a QFT on a device and writes OpenQASM and/or a JSON report.

#include <cstdint>
#include <optional>
#include <string>

namespace CLI {
class App;
}

namespace qftplan::cli {

/// The options of the plan command.
struct PlanArgs {
  std::string device;
  std::string calibration;  // --calibration FILE (empty: none)
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
  bool no_peephole = false;
  bool explain = false;
  bool quiet = false;
  std::string time_limit;
  double effort = 1;
  std::string strategy = "auto";
  std::string objective = "esp";
  std::string end_order = "free";
  std::string network = "auto";
  std::string readout = "auto";
  std::optional<double> approx_error;  // --approx-error EPS
  bool placement_given = false;  // --placement was on the command line (even empty)
};

/// Adds the plan command to `app`; parsing fills `a`.
CLI::App* add_plan_command(CLI::App& app, PlanArgs& a);

/// Runs the plan command; returns the exit status (kExitTimeLimit when the time limit cut a search short).
int run_plan(const PlanArgs& a);

}  // namespace qftplan::cli
