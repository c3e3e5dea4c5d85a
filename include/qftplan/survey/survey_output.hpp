#pragma once
/// \file survey_output.hpp
/// Survey rows as CSV (RFC 4180) and as JSON lines, and JSON lines read back for `merge`.

#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "qftplan/survey/survey_run.hpp"

namespace qftplan {

/// Version of the JSON-lines row's field set (schemas/survey-row.schema.json); bumped when a field
/// changes meaning or is removed.
inline constexpr int kSurveyRowSchemaVersion = 1;

/// Whether outputs carry the wall-time column (off for byte-reproducible files: --no-timing).
enum class SurveyTiming { include, omit };

/// The CSV column names, in order (README "Surveys" documents each).
std::vector<std::string> survey_csv_columns(SurveyTiming timing);

/// A CSV document: a header line, then one line per row; fields quoted as RFC 4180 requires
/// (Shafranovich, RFC 4180, 2005, section 2). Absent values are empty fields.
std::string survey_csv(const std::vector<SurveyRow>& rows, SurveyTiming timing);

/// One row as a JSON object (absent values are null).
nlohmann::ordered_json survey_row_to_json(const SurveyRow& row, SurveyTiming timing);

/// JSON lines: one compact object per row, each ending with a newline.
std::string survey_jsonl(const std::vector<SurveyRow>& rows, SurveyTiming timing);

/// Reads the rows of a JSON-lines file written by survey_jsonl. Blank lines are skipped; malformed
/// lines and missing or mistyped fields throw InputError(file, line, column, message).
std::vector<SurveyRow> read_survey_jsonl(const std::string& path);

/// The same from text in memory (`name` is used in error messages).
std::vector<SurveyRow> parse_survey_jsonl(const std::string& text, const std::string& name);

}  // namespace qftplan
