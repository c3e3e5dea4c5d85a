#pragma once
/// \file report.hpp
/// The plan report as JSON and as a human summary.

#include <string>

#include <nlohmann/json.hpp>

#include "qftplan/planners/plan.hpp"

namespace qftplan {

/// Version of the report's field set; bumped when a field changes meaning or is removed.
inline constexpr int kReportSchemaVersion = 1;

/// The report as a JSON object (field names and units in README "Report fields").
nlohmann::ordered_json report_to_json(const PlanReport& r);
/// Pretty-printed JSON text with a trailing newline.
std::string report_to_json_text(const PlanReport& r);
/// A short human-readable summary for the terminal.
std::string format_plan_summary(const PlanReport& r);
/// The choices made: chains considered with their ESP, and the degrees scored by --approx auto.
std::string format_plan_explanation(const PlanReport& r);

}  // namespace qftplan
