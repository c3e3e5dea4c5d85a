#pragma once
/// \file report_replan.hpp
/// A plan made again from its report (the JSON of `qftplan plan --report`): the report's settings are
/// read back, the plan is prepared and executed with them, and its maps must equal the report's.

#include <string>

#include <nlohmann/json.hpp>

#include "qftplan/device/device.hpp"
#include "qftplan/planners/plan.hpp"

namespace qftplan {

/// A plan re-made from a report.
struct ReplannedReport {
  PlanOptions options;   ///< the settings read from the report
  PreparedPlan plan;     ///< the plan they give
  PlanReport report;     ///< its figures (no output streamed)
};

/// Re-plans the report `report` of a plan on `device` with the report's settings (its placement
/// pinned where the strategy takes one; the other strategies are deterministic for the report's
/// seed) and checks that the maps and network equal the report's. InputError naming `name` on
/// malformed JSON fields, another device, or a plan that cannot be reproduced.
ReplannedReport replan_report(const Device& device, const nlohmann::json& report, const std::string& name);

/// The same, reading the report from the file `path` (InputError with line and column for bad JSON).
ReplannedReport replan_report_file(const Device& device, const std::string& path);

}  // namespace qftplan
