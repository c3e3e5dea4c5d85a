#include "qftplan/survey/survey_merge.hpp"

#include <algorithm>
#include <map>

#include <fmt/format.h>

#include "qftplan/core/input_error.hpp"

namespace qftplan {

std::vector<SurveyRow> merge_survey_parts(const std::vector<SurveyPart>& parts, bool allow_missing) {
  std::map<long long, std::pair<SurveyRow, std::string>> by_index;
  const SurveyRow* first = nullptr;
  std::string first_file;
  for (const auto& part : parts) {
    for (const auto& row : part.rows) {
      if (!first) {
        first = &row;
        first_file = part.name;
      } else if (row.survey != first->survey || row.of != first->of) {
        throw InputError(part.name, 0, 0,
                         fmt::format("row {} belongs to survey {} of {} runs, but {} holds survey {} of {} runs; "
                                     "merge only shards of one survey",
                                     row.index, row.survey, row.of, first_file, first->survey, first->of));
      }
      const auto [it, inserted] = by_index.try_emplace(row.index, row, part.name);
      if (!inserted) {
        // The same shard given twice is harmless; two different results for one case are not.
        SurveyRow a = it->second.first, b = row;
        a.elapsed_ms.reset();
        b.elapsed_ms.reset();
        if (a != b)
          throw InputError(part.name, 0, 0,
                           fmt::format("row {} differs from the row of the same index in {}", row.index,
                                       it->second.second));
      }
    }
  }
  std::vector<SurveyRow> rows;
  rows.reserve(by_index.size());
  for (auto& [index, value] : by_index) rows.push_back(std::move(value.first));
  if (first && !allow_missing && static_cast<long long>(rows.size()) != first->of) {
    std::vector<long long> missing;
    long long expected = 0;
    for (const auto& r : rows) {
      for (; expected < r.index && missing.size() < 8; ++expected) missing.push_back(expected);
      expected = r.index + 1;
    }
    for (; expected < first->of && missing.size() < 8; ++expected) missing.push_back(expected);
    throw InputError(fmt::format("the survey has {} runs but the files hold {}; missing rows include {} "
                                 "(is a shard left out? --allow-missing merges what is there)",
                                 first->of, rows.size(), fmt::join(missing, ", ")));
  }
  return rows;
}

}  // namespace qftplan
