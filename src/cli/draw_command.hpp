#pragma once
// The "draw" command: draws a device as SVG, optionally with a plan on it.

#include <string>

namespace CLI {
class App;
}

namespace qftplan::cli {

/// The options of the draw command.
struct DrawArgs {
  std::string device;
  std::string calibration;  // --calibration FILE (empty: none)
  std::string plan;
  std::string svg;
};

/// Adds the draw command to `app`; parsing fills `a`.
CLI::App* add_draw_command(CLI::App& app, DrawArgs& a);

/// Runs the draw command; returns the exit status.
int run_draw_command(const DrawArgs& a);

}  // namespace qftplan::cli
