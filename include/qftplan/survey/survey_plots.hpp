#pragma once
/// \file survey_plots.hpp
/// The charts of a survey: CX count (native two-qubit gates) and native two-qubit depth against
/// register size, and ESP against register size (log scale) when any device carries calibration.
/// Each quantity is a group of panels, one per setting (the strategy, degree and direction asked,
/// when the survey varies them) sharing both axes, with a series per device entry. A survey of several
/// networks compares them in one panel instead: a series per (network, degree asked), coloured by
/// network, and a panel per device entry, strategy and direction.

#include <string>
#include <vector>

#include "qftplan/survey/survey_run.hpp"
#include "qftplan/svg/svg_chart.hpp"

namespace qftplan {

/// The chart groups for `rows` (failed runs are left out; they have no figures): one panel per
/// setting in every group, in the survey's order.
std::vector<ChartGroup> survey_charts(const std::vector<SurveyRow>& rows);

/// The whole SVG page of a survey's charts.
std::string survey_svg(const std::vector<SurveyRow>& rows);

}  // namespace qftplan
