// The "draw" command (issue 6): a device as SVG, couplers shaded by error; with --plan the chain,
// placements and blocks per coupler.

#include "draw_command.hpp"

#include <optional>

#include <CLI/CLI.hpp>

#include "cli_common.hpp"
#include "cli_options.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/svg/plan_drawing.hpp"

namespace qftplan::cli {

CLI::App* add_draw_command(CLI::App& app, DrawArgs& a) {
  auto* draw = app.add_subcommand("draw", "draw a device as SVG: couplers shaded by error; with --plan the chain, placements and blocks per coupler");
  draw->add_option("device", a.device, "built-in spec or YAML file")->required();
  add_calibration_option(draw, a.calibration);
  draw->add_option("--plan", a.plan, "a plan report of this device (qftplan plan --report FILE)");
  draw->add_option("--svg", a.svg, "write the drawing to FILE ('-' for standard output)")->required();
  return draw;
}

int run_draw_command(const DrawArgs& a) {
  const Device dev = load_device(a.device, a.calibration);
  std::optional<DrawnPlan> plan;
  if (!a.plan.empty()) plan = read_drawn_plan(dev, a.plan);
  OutputSet out;
  out.add(a.svg, draw_device_svg(dev, plan ? &*plan : nullptr));
  out.write_all();
  return 0;
}

}  // namespace qftplan::cli
