#pragma once
/// \file survey_merge.hpp
/// Putting the rows of survey shards back together into the rows of one run.

#include <string>
#include <utility>
#include <vector>

#include "qftplan/survey/survey_run.hpp"

namespace qftplan {

/// The rows read from one file, with the file's name for error messages.
struct SurveyPart {
  std::string name;              ///< the file, for messages
  std::vector<SurveyRow> rows;   ///< its rows, as read
};

/// Merges shards into the rows of the whole survey, ordered by index. Every row must carry the same
/// survey fingerprint and total; an index found twice must hold the same figures (wall time aside).
/// Unless `allow_missing`, every index 0..of-1 must be present. Throws InputError naming the file.
std::vector<SurveyRow> merge_survey_parts(const std::vector<SurveyPart>& parts, bool allow_missing);

}  // namespace qftplan
