#include "qftplan/svg_chart.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include <fmt/format.h>

#include "qftplan/svg_markers.hpp"
#include "qftplan/svg_palette.hpp"

namespace qftplan {
namespace {

// Heckbert (1990), "nicenum": a number of the form 1, 2 or 5 times a power of ten near x, rounded
// to the nearest such number or taken as the next one up.
double nice_number(double x, bool round) {
  const double e = std::floor(std::log10(x));
  const double f = x / std::pow(10.0, e);
  double nf;
  if (round) nf = f < 1.5 ? 1 : f < 3 ? 2 : f < 7 ? 5 : 10;
  else nf = f <= 1 ? 1 : f <= 2 ? 2 : f <= 5 ? 5 : 10;
  return nf * std::pow(10.0, e);
}

const SvgFont kTickFont{11, "end", "#333333"};
const char* kAxisColour = "#4d4d4d";
const char* kGridColour = "#e3e3e3";

// Cuts a legend name to fit the legend's width (about 0.6 em per character at this size).
std::string fit_name(const std::string& name, std::size_t max_chars) {
  if (name.size() <= max_chars) return name;
  return name.substr(0, max_chars - 1) + "\u2026";
}

}  // namespace

AxisTicks nice_ticks(double lo, double hi, int target) {
  if (!std::isfinite(lo) || !std::isfinite(hi)) lo = 0, hi = 1;
  if (hi < lo) std::swap(lo, hi);
  if (hi - lo < 1e-12 * std::max(1.0, std::abs(hi))) lo -= 1, hi += 1;
  target = std::max(target, 2);
  const double range = nice_number(hi - lo, false);
  const double d = nice_number(range / (target - 1), true);
  AxisTicks t;
  t.step = d;
  t.lo = std::floor(lo / d) * d;
  t.hi = std::ceil(hi / d) * d;
  for (double v = t.lo; v < t.hi + 0.5 * d; v += d) t.values.push_back(std::abs(v) < 1e-9 * d ? 0.0 : v);
  return t;
}

AxisTicks decade_ticks(double lo, double hi, int target) {
  if (!std::isfinite(lo) || !std::isfinite(hi)) lo = -1, hi = 0;
  if (hi < lo) std::swap(lo, hi);
  double a = std::floor(lo), b = std::ceil(hi);
  if (a == b) a -= 1, b += 1;
  target = std::max(target, 2);
  double step = 1;
  while ((b - a) / step > target) step = nice_number(step * 1.5, false);
  step = std::max(1.0, std::round(step));
  AxisTicks t;
  t.step = step;
  t.lo = std::floor(a / step) * step;
  t.hi = std::ceil(b / step) * step;
  for (double v = t.lo; v <= t.hi + 1e-9; v += step) t.values.push_back(v);
  return t;
}

std::string format_tick(double value, double step) {
  const int decimals = step >= 1 ? 0 : static_cast<int>(std::ceil(-std::log10(step) - 1e-9));
  if (std::abs(value) < 1e-9 * step) value = 0;  // no "-0"
  return fmt::format("{:.{}f}", value, decimals);
}

std::string format_decade(int exponent) {
  if (exponent == 0) return "1";
  if (exponent == 1) return "10";
  if (exponent == -1) return "0.1";
  static const char* digits[] = {"\u2070", "\u00B9", "\u00B2", "\u00B3", "\u2074",
                                 "\u2075", "\u2076", "\u2077", "\u2078", "\u2079"};
  std::string s = "10";
  if (exponent < 0) s += "\u207B";
  for (const char c : std::to_string(std::abs(exponent))) s += digits[c - '0'];
  return s;
}

void draw_chart(SvgDocument& doc, const ChartSpec& chart, double x, double y, double w, double h) {
  const double legend_w = 250, left = 78, right = legend_w + 16, top = 34, bottom = 52;
  const double px = x + left, py = y + top, pw = std::max(40.0, w - left - right), ph = std::max(40.0, h - top - bottom);

  doc.begin_group({}, "chart");
  doc.text(x + left, y + 20, chart.title, SvgFont{15, "start", "#1a1a1a", true});

  // Data range over every series and the reference.
  double xmin = std::numeric_limits<double>::infinity(), xmax = -xmin, ymin = xmin, ymax = -xmin;
  auto cover = [&](const ChartSeries& s) {
    for (const auto& p : s.points) {
      if (!std::isfinite(p.x) || !std::isfinite(p.y)) continue;
      xmin = std::min(xmin, p.x), xmax = std::max(xmax, p.x);
      ymin = std::min(ymin, p.y), ymax = std::max(ymax, p.y);
    }
  };
  for (const auto& s : chart.series) cover(s);
  if (chart.reference) cover(*chart.reference);
  const bool empty = !std::isfinite(xmin);
  if (empty) xmin = 0, xmax = 1, ymin = chart.log_y ? -1 : 0, ymax = 1;
  if (!chart.log_y) ymin = std::min(ymin, 0.0);  // counts start at zero
  if (chart.x_span) xmin = std::min(xmin, chart.x_span->x), xmax = std::max(xmax, chart.x_span->y);

  const AxisTicks xt = nice_ticks(xmin, xmax, 8);
  const AxisTicks yt = chart.log_y ? decade_ticks(ymin, ymax, 8) : nice_ticks(ymin, ymax, 6);
  auto sx = [&](double v) { return px + (v - xt.lo) / (xt.hi - xt.lo) * pw; };
  auto sy = [&](double v) { return py + ph - (v - yt.lo) / (yt.hi - yt.lo) * ph; };

  // Grid and ticks.
  SvgPaint grid{"none", kGridColour, 1};
  SvgPaint axis{"none", kAxisColour, 1.2};
  for (const double v : yt.values) {
    doc.line(px, sy(v), px + pw, sy(v), grid);
    doc.line(px - 5, sy(v), px, sy(v), axis);
    const std::string label = chart.log_y ? format_decade(static_cast<int>(std::lround(v))) : format_tick(v, yt.step);
    SvgFont f = kTickFont;
    f.baseline = "middle";
    doc.text(px - 8, sy(v), label, f);
  }
  for (const double v : xt.values) {
    doc.line(sx(v), py, sx(v), py + ph, grid);
    doc.line(sx(v), py + ph, sx(v), py + ph + 5, axis);
    SvgFont f = kTickFont;
    f.anchor = "middle";
    doc.text(sx(v), py + ph + 19, format_tick(v, xt.step), f);
  }
  doc.line(px, py + ph, px + pw, py + ph, axis);
  doc.line(px, py, px, py + ph, axis);
  doc.text(px + pw / 2, y + h - 10, chart.x_label, SvgFont{12, "middle", "#1a1a1a"});
  SvgFont ylab{12, "middle", "#1a1a1a"};
  ylab.rotate = -90;
  doc.text(x + 18, py + ph / 2, chart.y_label, ylab);
  if (empty) doc.text(px + pw / 2, py + ph / 2, "no planned runs to show", SvgFont{13, "middle", "#777777"});

  // The reference first, so that series are drawn over it.
  if (chart.reference && !chart.reference->points.empty()) {
    std::vector<SvgPoint> pts;
    for (const auto& p : chart.reference->points) pts.push_back({sx(p.x), sy(p.y)});
    SvgPaint ref{"none", "#8c8c8c", 1.5, "5 4"};
    doc.polyline(pts, ref);
  }
  // Later series get smaller markers, so that points of series that coincide stay visible as
  // nested shapes.
  auto style = [&](std::size_t i) {
    return chart.series[i].style >= 0 ? static_cast<std::size_t>(chart.series[i].style) : i;
  };
  auto marker_size = [&](std::size_t i) { return std::max(5.0, 12.0 - 1.5 * static_cast<double>(i)); };
  for (std::size_t i = 0; i < chart.series.size(); ++i) {
    auto pts = chart.series[i].points;
    std::erase_if(pts, [](const SvgPoint& p) { return !std::isfinite(p.x) || !std::isfinite(p.y); });
    std::stable_sort(pts.begin(), pts.end(), [](const SvgPoint& a, const SvgPoint& b) { return a.x < b.x; });
    std::vector<SvgPoint> scaled;
    for (const auto& p : pts) scaled.push_back({sx(p.x), sy(p.y)});
    SvgPaint line{"none", series_colour(style(i)), 2, series_dash(style(i))};
    line.linejoin = "round";
    if (scaled.size() >= 2) doc.polyline(scaled, line);
    for (const auto& p : scaled) draw_marker(doc, series_marker(style(i)), p.x, p.y, marker_size(style(i)), series_colour(style(i)));
  }

  // Legend to the right of the plot: a line sample with the series' marker, then the name.
  const double lx = px + pw + 18;
  double ly = py + 6;
  const double row = chart.series.size() > 14 ? 14 : 18;
  const double font = chart.series.size() > 14 ? 10 : 11.5;
  const std::size_t max_chars = static_cast<std::size_t>((legend_w - 40) / (font * 0.6));
  for (std::size_t i = 0; i < chart.series.size(); ++i) {
    if (ly > y + h - 8) {
      doc.text(lx, ly, fmt::format("and {} more", chart.series.size() - i), SvgFont{font, "start", "#555555"});
      break;
    }
    SvgPaint line{"none", series_colour(style(i)), 2, series_dash(style(i))};
    doc.line(lx, ly, lx + 26, ly, line);
    draw_marker(doc, series_marker(style(i)), lx + 13, ly, 10, series_colour(style(i)));
    SvgFont f{font, "start", "#1a1a1a"};
    f.baseline = "middle";
    doc.text(lx + 34, ly, fit_name(chart.series[i].name, max_chars), f);
    ly += row;
  }
  if (chart.reference && ly <= y + h - 8) {
    doc.line(lx, ly, lx + 26, ly, SvgPaint{"none", "#8c8c8c", 1.5, "5 4"});
    SvgFont f{font, "start", "#555555"};
    f.baseline = "middle";
    doc.text(lx + 34, ly, fit_name(chart.reference->name, max_chars), f);
  }
  doc.end_group();
}

std::string render_chart_page(const std::string& heading, const std::string& subheading,
                              const std::vector<ChartSpec>& charts) {
  const double width = 980, chart_h = 380, head = 64;
  SvgDocument doc(width, head + chart_h * static_cast<double>(charts.size()) + 10, heading);
  doc.rect(0, 0, doc.width(), doc.height(), SvgPaint{"#ffffff"});
  doc.text(20, 30, heading, SvgFont{18, "start", "#1a1a1a", true});
  doc.text(20, 51, subheading, SvgFont{12, "start", "#555555"});
  for (std::size_t i = 0; i < charts.size(); ++i)
    draw_chart(doc, charts[i], 10, head + chart_h * static_cast<double>(i), width - 20, chart_h);
  return doc.str();
}

}  // namespace qftplan
