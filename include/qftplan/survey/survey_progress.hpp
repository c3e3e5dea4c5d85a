#pragma once
/// \file survey_progress.hpp
/// The progress line of a long survey, drawn on standard error only when it is a terminal.

#include <chrono>
#include <cstdio>
#include <string>

namespace qftplan {

/// True when the file descriptor is a terminal.
bool is_terminal(int fd);

/// The text of a progress line: done/total, runs per second and the time left at that rate.
std::string format_survey_progress(long long done, long long total, double elapsed_seconds);

/// Redraws one line in place (carriage return), at most five times a second and once at the end;
/// does nothing when disabled. finish() erases the line so the table starts on a clean line.
class SurveyProgress {
 public:
  /// Draws on `out` when `enabled` (callers pass is_terminal of its descriptor).
  SurveyProgress(std::FILE* out, bool enabled);
  /// Reports `done` of `total` runs finished.
  void update(long long done, long long total);
  /// Erases the line (when anything was drawn).
  void finish();
  /// True when the line is drawn at all.
  bool enabled() const { return enabled_; }

 private:
  std::FILE* out_;
  bool enabled_;
  bool drawn_ = false;
  std::size_t width_ = 0;
  std::chrono::steady_clock::time_point start_, last_;
};

}  // namespace qftplan
