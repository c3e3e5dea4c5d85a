#include "qftplan/survey/survey_progress.hpp"

#include <unistd.h>

#include <cmath>

#include <fmt/format.h>

namespace qftplan {

bool is_terminal(int fd) { return ::isatty(fd) == 1; }

namespace {

std::string duration_text(double s) {
  if (s < 1) return "under 1 s";
  if (s < 100) return fmt::format("{:.0f} s", std::ceil(s));
  if (s < 6000) return fmt::format("{:.0f} min", std::ceil(s / 60));
  const long long minutes = static_cast<long long>(std::ceil(s / 60));
  return fmt::format("{} h {:02} min", minutes / 60, minutes % 60);
}

}  // namespace

std::string format_survey_progress(long long done, long long total, double elapsed_seconds) {
  std::string s = fmt::format("survey {}/{} runs", done, total);
  if (done > 0 && elapsed_seconds > 0) {
    const double rate = done / elapsed_seconds;
    s += fmt::format(", {:.3g} runs/s", rate);
    if (done < total) s += ", about " + duration_text((total - done) / rate) + " left";
  }
  return s;
}

SurveyProgress::SurveyProgress(std::FILE* out, bool enabled)
    : out_(out), enabled_(enabled), start_(std::chrono::steady_clock::now()), last_(start_) {}

void SurveyProgress::update(long long done, long long total) {
  if (!enabled_) return;
  const auto now = std::chrono::steady_clock::now();
  if (drawn_ && done < total && now - last_ < std::chrono::milliseconds(200)) return;
  last_ = now;
  const std::string text = format_survey_progress(done, total, std::chrono::duration<double>(now - start_).count());
  // Pad over the end of a longer previous line.
  const std::size_t pad = width_ > text.size() ? width_ - text.size() : 0;
  std::fprintf(out_, "\r%s%*s", text.c_str(), static_cast<int>(pad), "");
  std::fflush(out_);
  width_ = std::max(width_, text.size());
  drawn_ = true;
}

void SurveyProgress::finish() {
  if (!enabled_ || !drawn_) return;
  std::fprintf(out_, "\r%*s\r", static_cast<int>(width_), "");
  std::fflush(out_);
  drawn_ = false;
}

}  // namespace qftplan
