#pragma once
// The "survey" and "merge" commands (issue 6): plan many combinations, or merge the shards of a
// survey, into a table, CSV, JSON lines and charts.

#include <cstdint>
#include <string>
#include <vector>

namespace CLI {
class App;
}

namespace qftplan::cli {

/// Options shared by survey and merge: what to write and how.
struct SurveyOutputArgs {
  std::string csv;
  std::string jsonl;
  std::string svg;
  bool no_timing = false;
  bool quiet = false;
};

/// The options of the survey command.
struct SurveyArgs {
  std::vector<std::string> devices;
  std::string calibration;  // --calibration FILE (empty: none)
  std::string qubits;
  std::string approx = "none";
  std::string direction;
  bool inverse = false;
  std::string strategy = "auto";
  std::string network = "auto";  // --network LIST
  bool measure = false;
  std::string readout = "auto";
  int jobs = 0;
  std::uint64_t seed = 1;
  std::string shard;
  std::string time_limit;
  bool no_progress = false;
  SurveyOutputArgs out;
};

/// The options of the merge command.
struct MergeArgs {
  std::vector<std::string> files;
  bool allow_missing = false;
  SurveyOutputArgs out;
};

/// Adds the survey command to `app`; parsing fills `a`.
CLI::App* add_survey_command(CLI::App& app, SurveyArgs& a);

/// Runs the survey command; returns the exit status.
int run_survey_command(const SurveyArgs& a);

/// Adds the merge command to `app`; parsing fills `a`.
CLI::App* add_merge_command(CLI::App& app, MergeArgs& a);

/// Runs the merge command; returns the exit status.
int run_merge_command(const MergeArgs& a);

}  // namespace qftplan::cli
