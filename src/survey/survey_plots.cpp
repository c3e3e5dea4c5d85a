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

// The setting of a row (the strategy, degree and direction asked), named by whichever of them vary
// across the survey; "" when none does.
struct SettingNamer {
  bool strategy = false, approx = false, direction = false;
  explicit SettingNamer(const std::vector<SurveyRow>& rows) {
    std::set<std::string> s, a;
    std::set<bool> d;
    for (const auto& r : rows) s.insert(r.asked_strategy), a.insert(r.asked_approx), d.insert(r.inverse);
    strategy = s.size() > 1;
    approx = a.size() > 1;
    direction = d.size() > 1;
  }
  std::string operator()(const SurveyRow& r) const {
    std::vector<std::string> parts;
    if (direction) parts.push_back(r.inverse ? "inverse" : "forward");
    if (approx) parts.push_back(r.asked_approx == "none" ? "exact" : r.asked_approx == "auto" ? "degree auto" : "degree " + r.asked_approx);
    if (strategy) parts.push_back(r.asked_strategy + " strategy");
    std::string name;
    for (const auto& p : parts) name += (name.empty() ? "" : ", ") + p;
    return name;
  }
};

// Items in order of first appearance.
std::vector<std::string> in_order(const std::vector<SurveyRow>& rows, const std::function<std::string(const SurveyRow&)>& key) {
  std::vector<std::string> out;
  std::set<std::string> seen;
  for (const auto& r : rows)
    if (seen.insert(key(r)).second) out.push_back(key(r));
  return out;
}

using Figure = std::function<std::optional<double>(const SurveyRow&)>;

// One quantity as a group: a panel per setting (in the survey's order), in each a series per
// device entry with a point per planned run. An entry keeps its style (colour and marker) in every
// panel and group, even where it has no points. The panels share both axes.
ChartGroup quantity_group(const std::vector<SurveyRow>& rows, const SettingNamer& namer, const ChartSpec& axes,
                          const std::string& title, const Figure& figure) {
  const auto entries = in_order(rows, [](const SurveyRow& r) { return r.series; });
  const auto settings = in_order(rows, namer);
  ChartGroup group;
  group.title = title;
  double lo = 0, hi = 0;
  bool any = false;
  for (const auto& setting : settings) {
    ChartSpec panel = axes;
    panel.title = setting;
    for (std::size_t e = 0; e < entries.size(); ++e) {
      ChartSeries s{entries[e], {}, static_cast<int>(e)};
      for (const auto& r : rows) {
        if (!r.ok || r.series != entries[e] || namer(r) != setting) continue;
        if (const auto v = figure(r)) {
          s.points.push_back({static_cast<double>(r.qubits), *v});
          lo = any ? std::min(lo, *v) : *v, hi = any ? std::max(hi, *v) : *v, any = true;
        }
      }
      if (!s.points.empty()) panel.series.push_back(std::move(s));
    }
    group.panels.push_back(std::move(panel));
  }
  if (any)
    for (auto& p : group.panels) p.y_span = SvgPoint{lo, hi};
  return group;
}

}  // namespace

std::vector<ChartGroup> survey_charts(const std::vector<SurveyRow>& rows) {
  const SettingNamer namer(rows);
  ChartSpec axes;
  axes.x_label = "register size n (qubits)";
  // Register sizes are whole numbers: whole ticks only, and a single size gets the sizes either side;
  // one x range for every panel, so that they line up.
  axes.integer_x = true;
  bool any = false;
  double lo = 0, hi = 0;
  for (const auto& r : rows)
    if (r.ok) {
      lo = any ? std::min(lo, static_cast<double>(r.qubits)) : r.qubits;
      hi = any ? std::max(hi, static_cast<double>(r.qubits)) : r.qubits;
      any = true;
    }
  if (any) axes.x_span = SvgPoint{lo, hi};

  std::vector<ChartGroup> groups;
  ChartSpec counts = axes;
  counts.y_label = "native two-qubit gates (count)";
  counts.integer_y = true;
  groups.push_back(quantity_group(rows, namer, counts, "CX count (native two-qubit gates) against register size",
                                  [](const SurveyRow& r) { return std::optional<double>(r.cx_count); }));
  ChartSpec depth = axes;
  depth.y_label = "native two-qubit depth (layers)";
  depth.integer_y = true;
  groups.push_back(quantity_group(rows, namer, depth, "Native two-qubit depth against register size",
                                  [](const SurveyRow& r) { return std::optional<double>(r.cx_depth); }));
  const bool calibrated =
      std::any_of(rows.begin(), rows.end(), [](const SurveyRow& r) { return r.ok && r.log_esp_total; });
  if (calibrated) {
    ChartSpec esp = axes;
    esp.y_label = "esp_total (probability, log scale)";
    esp.log_y = true;
    // log10 from the natural log, which stays finite where the probability underflows.
    groups.push_back(quantity_group(rows, namer, esp,
                                    "Estimated success probability (gates x idling x readout) against register size",
                                    [](const SurveyRow& r) -> std::optional<double> {
                                      if (!r.log_esp_total) return std::nullopt;
                                      return *r.log_esp_total / std::numbers::ln10;
                                    }));
  }
  return groups;
}

std::string survey_svg(const std::vector<SurveyRow>& rows) {
  long long ok = 0;
  std::set<std::string> series;
  for (const auto& r : rows) ok += r.ok ? 1 : 0, series.insert(r.series);
  const std::string id = rows.empty() ? std::string() : rows.front().survey;
  const std::string sub = fmt::format("{} runs, {} planned, {} failed; {} device entr{}{}", rows.size(), ok,
                                      static_cast<long long>(rows.size()) - ok, series.size(),
                                      series.size() == 1 ? "y" : "ies", id.empty() ? "" : "; survey " + id);
  return render_group_page("QFT survey", sub, survey_charts(rows));
}

}  // namespace qftplan
