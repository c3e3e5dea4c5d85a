#pragma once
/// \file survey_table.hpp
/// The survey's rows as a plain aligned table for the terminal.

#include <string>
#include <vector>

#include "qftplan/survey/survey_output.hpp"
#include "qftplan/survey/survey_run.hpp"

namespace qftplan {

/// A table with one heading line per group of rows (same series, strategy, network, approximation setting and
/// direction) and one line per run under it; failed runs show their reason. Ends with a count line.
/// With SurveyTiming::omit the wall-time column is left out (for reproducible text).
std::string format_survey_table(const std::vector<SurveyRow>& rows, SurveyTiming timing);

}  // namespace qftplan
