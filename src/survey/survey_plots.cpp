#include "qftplan/survey/survey_plots.hpp"

#include <algorithm>
#include <cmath>
#include <functional>
#include <map>
#include <numbers>
#include <set>

#include <fmt/format.h>

namespace qftplan {
namespace {

// The series name of a row: the device entry, plus whichever settings vary across the survey.
struct SeriesNamer {
  bool strategy = false, approx = false, direction = false;
  explicit SeriesNamer(const std::vector<SurveyRow>& rows) {
    std::set<std::string> s, a;
    std::set<bool> d;
    for (const auto& r : rows) s.insert(r.asked_strategy), a.insert(r.asked_approx), d.insert(r.inverse);
    strategy = s.size() > 1;
    approx = a.size() > 1;
    direction = d.size() > 1;
  }
  std::string operator()(const SurveyRow& r) const {
    std::string name = r.series;
    if (approx) name += r.asked_approx == "none" ? ", exact" : ", degree " + r.asked_approx;
    if (direction) name += r.inverse ? ", inverse" : ", forward";
    if (strategy) name += ", " + r.asked_strategy;
    return name;
  }
};

// Series in order of first appearance (the survey's order), each with its rows' points. A series
// keeps its style (colour and marker) in every chart, even where other series have no points.
std::vector<ChartSeries> collect(const std::vector<SurveyRow>& rows, const SeriesNamer& namer,
                                 const std::function<std::optional<double>(const SurveyRow&)>& value) {
  std::vector<ChartSeries> out;
  std::map<std::string, std::size_t> at;
  for (const auto& r : rows) {
    const std::string name = namer(r);
    auto [it, fresh] = at.try_emplace(name, out.size());
    if (fresh) out.push_back({name, {}, static_cast<int>(out.size())});
    if (!r.ok) continue;
    if (const auto v = value(r)) out[it->second].points.push_back({static_cast<double>(r.qubits), *v});
  }
  std::erase_if(out, [](const ChartSeries& s) { return s.points.empty(); });
  return out;
}

}  // namespace

std::vector<ChartSpec> survey_charts(const std::vector<SurveyRow>& rows) {
  const SeriesNamer namer(rows);
  std::vector<ChartSpec> charts;

  ChartSpec swaps;
  swaps.title = "SWAPs against register size";
  swaps.x_label = "register size n (qubits)";
  swaps.y_label = "SWAPs (count, fused included)";
  swaps.integer_y = true;
  swaps.series = collect(rows, namer, [](const SurveyRow& r) { return std::optional<double>(r.swaps); });
  charts.push_back(std::move(swaps));

  ChartSpec depth;
  depth.title = "Two-qubit depth against register size";
  depth.x_label = "register size n (qubits)";
  depth.y_label = "two-qubit depth (layers)";
  depth.integer_y = true;
  depth.series = collect(rows, namer, [](const SurveyRow& r) { return std::optional<double>(r.depth_2q); });
  // The lower bound as a reference line, when every run of a size has the same bound.
  std::map<int, std::set<long long>> bounds;
  for (const auto& r : rows)
    if (r.ok) bounds[r.qubits].insert(r.lower_bound_depth_2q);
  bool consistent = !bounds.empty();
  for (const auto& [n, b] : bounds) consistent = consistent && b.size() == 1;
  if (consistent) {
    ChartSeries ref{"lower bound (n-1)", {}};
    for (const auto& [n, b] : bounds) ref.points.push_back({static_cast<double>(n), static_cast<double>(*b.begin())});
    depth.reference = std::move(ref);
  }
  charts.push_back(std::move(depth));

  const bool calibrated = std::any_of(rows.begin(), rows.end(), [](const SurveyRow& r) { return r.ok && r.log_esp; });
  if (calibrated) {
    ChartSpec esp;
    esp.title = "Estimated success probability against register size";
    esp.x_label = "register size n (qubits)";
    esp.y_label = "ESP (probability, log scale)";
    esp.log_y = true;
    // log10 from the natural log, which stays finite where the probability underflows.
    esp.series = collect(rows, namer, [](const SurveyRow& r) -> std::optional<double> {
      if (!r.log_esp) return std::nullopt;
      return *r.log_esp / std::numbers::ln10;
    });
    charts.push_back(std::move(esp));
  }
  // One x range for every chart, so that stacked charts line up.
  double lo = 0, hi = 0;
  bool any = false;
  for (const auto& r : rows)
    if (r.ok) {
      lo = any ? std::min(lo, static_cast<double>(r.qubits)) : r.qubits;
      hi = any ? std::max(hi, static_cast<double>(r.qubits)) : r.qubits;
      any = true;
    }
  // Register sizes are whole numbers: whole ticks only, and a single size gets the sizes either side.
  for (auto& c : charts) {
    c.integer_x = true;
    if (any) c.x_span = SvgPoint{lo, hi};
  }
  return charts;
}

std::string survey_svg(const std::vector<SurveyRow>& rows) {
  long long ok = 0;
  std::set<std::string> series;
  for (const auto& r : rows) ok += r.ok ? 1 : 0, series.insert(r.series);
  const std::string id = rows.empty() ? std::string() : rows.front().survey;
  const std::string sub = fmt::format("{} runs, {} planned, {} failed; {} device entr{}{}", rows.size(), ok,
                                      static_cast<long long>(rows.size()) - ok, series.size(),
                                      series.size() == 1 ? "y" : "ies", id.empty() ? "" : "; survey " + id);
  return render_chart_page("QFT survey", sub, survey_charts(rows));
}

}  // namespace qftplan
