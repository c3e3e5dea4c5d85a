#pragma once
/// \file survey_plots.hpp
/// The charts of a survey: SWAP count and two-qubit depth against register size, and ESP against
/// register size (log scale) when any device carries calibration; one series per device entry
/// (and per setting, when a survey varies the strategy, degree or direction).

#include <string>
#include <vector>

#include "qftplan/survey/survey_run.hpp"
#include "qftplan/svg/svg_chart.hpp"

namespace qftplan {

/// The charts for `rows` (failed runs are left out; they have no figures).
std::vector<ChartSpec> survey_charts(const std::vector<SurveyRow>& rows);

/// The whole SVG page of a survey's charts.
std::string survey_svg(const std::vector<SurveyRow>& rows);

}  // namespace qftplan
