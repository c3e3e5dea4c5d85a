// Drawing a plan report: the report layer makes the plan again from the report's settings, and the
// drawing reads that plan (plan_drawing.cpp).

#include "qftplan/report/report_replan.hpp"
#include "qftplan/svg/plan_drawing.hpp"

namespace qftplan {

DrawnPlan drawn_plan_from_report(const Device& device, const nlohmann::json& report, const std::string& name) {
  const ReplannedReport r = replan_report(device, report, name);
  return drawn_plan(device, r.plan, r.report);
}

DrawnPlan read_drawn_plan(const Device& device, const std::string& path) {
  const ReplannedReport r = replan_report_file(device, path);
  return drawn_plan(device, r.plan, r.report);
}

}  // namespace qftplan
