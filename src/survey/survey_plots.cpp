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

std::string approx_words(const std::string& asked) {
  return asked == "none" ? "exact" : asked == "auto" ? "degree auto" : "degree " + asked;
}

// Items in order of first appearance.
std::vector<std::string> in_order(const std::vector<SurveyRow>& rows, const std::function<std::string(const SurveyRow&)>& key) {
  std::vector<std::string> out;
  std::set<std::string> seen;
  for (const auto& r : rows)
    if (seen.insert(key(r)).second) out.push_back(key(r));
  return out;
}

std::size_t position(const std::vector<std::string>& items, const std::string& item) {
  return static_cast<std::size_t>(std::find(items.begin(), items.end(), item) - items.begin());
}

// How rows become panels and series. Usually a panel per setting (the strategy, degree and
// direction asked, named by whichever vary) and a series per device entry. When the survey asks for
// several networks, the networks and degrees are compared in one panel instead: a series per
// (network, degree asked), coloured by network and marked by degree, and a panel per device entry
// (when there are several), strategy and direction.
struct ChartLayout {
  bool strategy = false, approx = false, direction = false, entries = false;
  bool compare = false;                       // series per (network, degree)
  std::vector<std::string> networks, degrees;  // asked, in the survey's order (compare)
  std::vector<std::string> series;             // series keys in order

  explicit ChartLayout(const std::vector<SurveyRow>& rows) {
    std::set<std::string> s, a, e, w;
    std::set<bool> d;
    for (const auto& r : rows)
      s.insert(r.asked_strategy), a.insert(r.asked_approx), d.insert(r.inverse), e.insert(r.series),
          w.insert(r.asked_network);
    strategy = s.size() > 1;
    approx = a.size() > 1;
    direction = d.size() > 1;
    entries = e.size() > 1;
    compare = w.size() > 1;
    networks = in_order(rows, [](const SurveyRow& r) { return r.asked_network; });
    degrees = in_order(rows, [](const SurveyRow& r) { return r.asked_approx; });
    series = in_order(rows, [this](const SurveyRow& r) { return series_key(r); });
  }
  std::string panel(const SurveyRow& r) const {
    std::vector<std::string> parts;
    if (compare && entries) parts.push_back(r.series);
    if (direction) parts.push_back(r.inverse ? "inverse" : "forward");
    if (approx && !compare) parts.push_back(approx_words(r.asked_approx));
    if (strategy) parts.push_back(r.asked_strategy + " strategy");
    std::string name;
    for (const auto& p : parts) name += (name.empty() ? "" : ", ") + p;
    return name;
  }
  // The legend text; distinct rows settings give distinct keys, so no two series merge.
  std::string series_key(const SurveyRow& r) const {
    return compare ? "network " + r.asked_network + ", " + approx_words(r.asked_approx) : r.series;
  }
  // A style per series, the same in every panel and group. Compared networks keep one colour each
  // and degrees one marker and dash pattern each (styles i + 8 j: colour i, dash j; svg_palette.cpp),
  // while both lists fit the eight colours; otherwise the series' position.
  int style(const std::string& key, const SurveyRow& r) const {
    constexpr std::size_t kColours = 8;
    if (compare && networks.size() <= kColours && degrees.size() <= kColours)
      return static_cast<int>(position(networks, r.asked_network) + kColours * position(degrees, r.asked_approx));
    return static_cast<int>(position(series, key));
  }
};

using Figure = std::function<std::optional<double>(const SurveyRow&)>;

// One quantity as a group: a panel per setting (in the survey's order), in each a series per key
// with a point per planned run. A series keeps its style (colour and marker) in every panel and
// group, even where it has no points. The panels share both axes.
ChartGroup quantity_group(const std::vector<SurveyRow>& rows, const ChartLayout& layout, const ChartSpec& axes,
                          const std::string& title, const Figure& figure) {
  const auto settings = in_order(rows, [&](const SurveyRow& r) { return layout.panel(r); });
  // Each row's panel and series, named once.
  std::vector<std::string> row_panel, row_series;
  for (const auto& r : rows) row_panel.push_back(layout.panel(r)), row_series.push_back(layout.series_key(r));
  ChartGroup group;
  group.title = title;
  double lo = 0, hi = 0;
  bool any = false;
  for (const auto& setting : settings) {
    ChartSpec panel = axes;
    panel.title = setting;
    for (const auto& key : layout.series) {
      ChartSeries s{key, {}, -1};
      for (std::size_t i = 0; i < rows.size(); ++i) {
        const SurveyRow& r = rows[i];
        if (row_series[i] != key || row_panel[i] != setting) continue;
        s.style = layout.style(key, r);
        if (!r.ok) continue;
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
  const ChartLayout layout(rows);
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
  groups.push_back(quantity_group(rows, layout, counts, "CX count (native two-qubit gates) against register size",
                                  [](const SurveyRow& r) { return std::optional<double>(r.cx_count); }));
  ChartSpec depth = axes;
  depth.y_label = "native two-qubit depth (layers)";
  depth.integer_y = true;
  groups.push_back(quantity_group(rows, layout, depth, "Native two-qubit depth against register size",
                                  [](const SurveyRow& r) { return std::optional<double>(r.cx_depth); }));
  const bool calibrated =
      std::any_of(rows.begin(), rows.end(), [](const SurveyRow& r) { return r.ok && r.log_esp_total; });
  if (calibrated) {
    ChartSpec esp = axes;
    esp.y_label = "esp_total (probability, log scale)";
    esp.log_y = true;
    // log10 from the natural log, which stays finite where the probability underflows.
    groups.push_back(quantity_group(rows, layout, esp,
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
  std::string sub = fmt::format("{} runs, {} planned, {} failed; {} device entr{}{}", rows.size(), ok,
                                static_cast<long long>(rows.size()) - ok, series.size(),
                                series.size() == 1 ? "y" : "ies", id.empty() ? "" : "; survey " + id);
  // A compared setting without a single planned run has no series: say so rather than drop it unseen.
  const ChartLayout layout(rows);
  if (layout.compare) {
    std::vector<std::string> missing;
    for (const auto& key : layout.series)
      if (std::none_of(rows.begin(), rows.end(), [&](const SurveyRow& r) { return r.ok && layout.series_key(r) == key; }))
        missing.push_back(key);
    // On lines of their own, each short enough for the page (about 130 characters of the 12 px font).
    std::string line = "not planned, so not drawn:";
    for (std::size_t i = 0; i < missing.size(); ++i) {
      const std::string item = " " + missing[i] + (i + 1 < missing.size() ? ";" : "");
      if (line.size() + item.size() > 130) sub += "\n" + line, line = " ";
      line += item;
    }
    if (!missing.empty()) sub += "\n" + line;
  }
  return render_group_page("QFT survey", sub, survey_charts(rows));
}

}  // namespace qftplan
