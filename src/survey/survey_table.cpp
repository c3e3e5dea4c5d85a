#include "qftplan/survey/survey_table.hpp"

#include <algorithm>

#include <fmt/format.h>

namespace qftplan {
namespace {

struct Column {
  std::string title;
  bool right = true;   // numbers right-aligned, text left-aligned
};

// `networks`: the survey asks for a network other than auto, so every heading names the one asked.
std::string group_title(const SurveyRow& r, bool networks) {
  std::string approx = r.asked_approx == "none" ? "exact" : r.asked_approx == "auto" ? "degree auto" : "degree " + r.asked_approx;
  return fmt::format("{}  ({}, {}, strategy {}{})", r.series, r.inverse ? "inverse" : "forward", approx, r.asked_strategy,
                     networks ? ", network " + r.asked_network : std::string());
}

bool same_group(const SurveyRow& a, const SurveyRow& b) {
  return a.series == b.series && a.asked_strategy == b.asked_strategy && a.asked_network == b.asked_network &&
         a.asked_approx == b.asked_approx && a.inverse == b.inverse;
}

}  // namespace

std::string format_survey_table(const std::vector<SurveyRow>& rows, SurveyTiming timing) {
  std::vector<Column> cols = {{"n"},        {"device", false}, {"plan", false}, {"degree"},   {"swaps"},
                              {"blocks"},   {"/bound"},        {"depth_2q"},    {"/bound"},   {"cx"},
                              {"cx_depth"}, {"esp_total"}};
  if (timing == SurveyTiming::include) cols.push_back({"ms"});
  const std::size_t failed_from = 2;  // a failed run's reason starts in the "plan" column

  std::vector<std::vector<std::string>> cells;
  for (const auto& r : rows) {
    std::vector<std::string> c = {std::to_string(r.qubits), r.device};
    if (!r.ok) {
      c.push_back("failed: " + r.reason);
      cells.push_back(std::move(c));
      continue;
    }
    c.push_back((r.network == r.strategy ? r.strategy : r.strategy + "/" + r.network) +
                (r.cut_short ? " (time limit)" : ""));
    // The block construction is an approximation of its own (README "The log-depth block construction").
    c.push_back(r.block_length     ? fmt::format("blocks of {}", *r.block_length)
                : r.approx_degree ? std::to_string(*r.approx_degree)
                                  : std::string("exact"));
    c.push_back(std::to_string(r.swaps));
    c.push_back(std::to_string(r.blocks));
    c.push_back(r.blocks_ratio ? fmt::format("x{:.2f}", *r.blocks_ratio) : std::string("-"));
    c.push_back(std::to_string(r.depth_2q));
    c.push_back(r.depth_2q_ratio ? fmt::format("x{:.2f}", *r.depth_2q_ratio) : std::string("-"));
    c.push_back(std::to_string(r.cx_count));
    c.push_back(std::to_string(r.cx_depth));
    c.push_back(r.esp_total ? fmt::format("{:.3g}", *r.esp_total) : std::string("-"));
    if (timing == SurveyTiming::include) c.push_back(r.elapsed_ms ? fmt::format("{:.1f}", *r.elapsed_ms) : std::string("-"));
    cells.push_back(std::move(c));
  }
  std::vector<std::size_t> width(cols.size());
  for (std::size_t i = 0; i < cols.size(); ++i) width[i] = cols[i].title.size();
  for (const auto& c : cells)
    for (std::size_t i = 0; i < c.size(); ++i)
      if (!(c.size() == failed_from + 1 && i == failed_from)) width[i] = std::max(width[i], c[i].size());

  auto line = [&](const std::vector<std::string>& c) {
    std::string s = "  ";
    for (std::size_t i = 0; i < c.size(); ++i) {
      const bool last = i + 1 == c.size();
      if (i) s += "  ";
      if (last && (c.size() == failed_from + 1 || !cols[i].right)) s += c[i];  // no trailing padding
      else if (cols[i].right) s += fmt::format("{:>{}}", c[i], width[i]);
      else s += fmt::format("{:<{}}", c[i], width[i]);
    }
    return s + "\n";
  };
  std::vector<std::string> titles;
  for (const auto& c : cols) titles.push_back(c.title);

  const bool networks =
      std::any_of(rows.begin(), rows.end(), [](const SurveyRow& r) { return r.asked_network != "auto"; });
  std::string out;
  long long ok = 0;
  for (std::size_t i = 0; i < rows.size(); ++i) {
    if (i == 0 || !same_group(rows[i - 1], rows[i])) {
      if (i) out += "\n";
      out += group_title(rows[i], networks) + "\n";
      out += line(titles);
    }
    out += line(cells[i]);
    ok += rows[i].ok ? 1 : 0;
  }
  if (!rows.empty()) out += "\n";
  out += fmt::format("{} run{}: {} planned, {} failed\n", rows.size(), rows.size() == 1 ? "" : "s", ok,
                     static_cast<long long>(rows.size()) - ok);
  return out;
}

}  // namespace qftplan
