#include "qftplan/svg/svg_chart.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <set>
#include <tuple>

#include <fmt/format.h>

#include "qftplan/svg/svg_markers.hpp"
#include "qftplan/svg/svg_palette.hpp"

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
const char* kReferenceColour = "#8c8c8c";

// Margins of the plot inside a chart box, and the legend's measures.
constexpr double kLeft = 78, kTop = 34, kBottom = 52;
constexpr double kRightLegendW = 250;    // legend beside the plot
constexpr double kLegendFont = 11.5, kLegendRow = 18, kSample = 26, kSampleGap = 8;
// Width of a legend character: about 0.6 em in DejaVu Sans (its lowercase letters and digits run
// 0.3 to 0.7 em; common practice to estimate so), with a little to spare.
constexpr double kCharEm = 0.62;

// Characters of a UTF-8 string (continuation bytes not counted).
std::size_t char_count(const std::string& s) {
  return static_cast<std::size_t>(std::count_if(s.begin(), s.end(), [](char c) { return (static_cast<unsigned char>(c) & 0xC0) != 0x80; }));
}

// Cuts a legend name to at most max_chars characters (only names too long for a whole row are cut).
std::string fit_name(const std::string& name, std::size_t max_chars) {
  if (char_count(name) <= max_chars) return name;
  std::string out;
  std::size_t chars = 0;
  for (const char c : name) {
    const bool start = (static_cast<unsigned char>(c) & 0xC0) != 0x80;
    if (start && ++chars > max_chars - 1) break;
    out += c;
  }
  return out + "\u2026";
}

double text_width(const std::string& s, double font) { return static_cast<double>(char_count(s)) * font * kCharEm; }

// Where the legend goes: beside the plot while its entries fit there, else under the plot in as
// many columns as the width holds (column-major), the chart box growing by its height.
struct LegendLayout {
  bool below = false;
  std::size_t entries = 0, columns = 1, rows = 0;
  double column_w = kRightLegendW;
  double height = 0;        // extra height under the plot (0 beside it)
  std::size_t max_chars = 0;
};

std::vector<std::string> legend_names(const ChartSpec& c) {
  std::vector<std::string> names;
  for (const auto& s : c.series) names.push_back(s.name);
  if (c.reference && !c.reference->points.empty()) names.push_back(c.reference->name);
  return names;
}

LegendLayout legend_layout(const ChartSpec& c, double w, bool force_below = false) {
  LegendLayout L;
  const auto names = legend_names(c);
  L.entries = names.size();
  if (!c.legend && !force_below) return L;  // a panel: its group's legend names its series
  double widest = 0;
  for (const auto& n : names) widest = std::max(widest, text_width(n, kLegendFont));
  const double text_room = kRightLegendW - kSample - kSampleGap - 14;
  const double plot_h = kChartBaseHeight - kTop - kBottom;
  if (!force_below && static_cast<double>(L.entries) * kLegendRow <= plot_h - 6 && widest <= text_room) {
    L.rows = L.entries;
    L.max_chars = static_cast<std::size_t>(text_room / (kLegendFont * kCharEm));
    return L;
  }
  L.below = true;
  const double room = std::max(120.0, w - kLeft - 10);
  L.column_w = std::min(room, kSample + kSampleGap + widest + 22);
  L.columns = std::max<std::size_t>(1, static_cast<std::size_t>(room / L.column_w));
  L.rows = (L.entries + L.columns - 1) / L.columns;
  L.height = 10 + static_cast<double>(L.rows) * kLegendRow;
  L.max_chars = static_cast<std::size_t>((L.column_w - kSample - kSampleGap - 10) / (kLegendFont * kCharEm));
  return L;
}

// A series line; light colours get a dark casing under it.
void series_line(SvgDocument& doc, const std::vector<SvgPoint>& pts, const std::string& colour, const std::string& dash) {
  if (pts.size() < 2) return;
  SvgPaint line{"none", colour, 2, dash};
  line.linejoin = "round";
  if (needs_outline(colour)) {
    SvgPaint casing = line;
    casing.stroke = kOutlineColour;
    casing.stroke_width = 3.3;
    doc.polyline(pts, casing);
  }
  doc.polyline(pts, line);
}

}  // namespace

AxisTicks nice_ticks(double lo, double hi, int target, bool whole) {
  if (!std::isfinite(lo) || !std::isfinite(hi)) lo = 0, hi = 1;
  if (hi < lo) std::swap(lo, hi);
  if (hi - lo < 1e-12 * std::max(1.0, std::abs(hi))) lo -= 1, hi += 1;
  target = std::max(target, 2);
  const double range = nice_number(hi - lo, false);
  // 1 is itself a nice number, so a whole-number axis keeps Heckbert's steps from 1 up.
  const double d = std::max(nice_number(range / (target - 1), true), whole ? 1.0 : 0.0);
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

std::string format_decade(int exponent, bool power_form) {
  if (!power_form) {
    if (exponent >= 0) return "1" + std::string(static_cast<std::size_t>(exponent), '0');
    return "0." + std::string(static_cast<std::size_t>(-exponent - 1), '0') + "1";
  }
  static const char* digits[] = {"\u2070", "\u00B9", "\u00B2", "\u00B3", "\u2074",
                                 "\u2075", "\u2076", "\u2077", "\u2078", "\u2079"};
  std::string s = "10";
  if (exponent < 0) s += "\u207B";
  for (const char c : std::to_string(std::abs(exponent))) s += digits[c - '0'];
  return s;
}

std::vector<std::string> decade_labels(const AxisTicks& ticks) {
  bool decimal = true;
  for (const double v : ticks.values) decimal = decimal && std::abs(v) <= 3 + 1e-9;
  std::vector<std::string> out;
  for (const double v : ticks.values) out.push_back(format_decade(static_cast<int>(std::lround(v)), !decimal));
  return out;
}

double chart_height(const ChartSpec& chart, double w) { return kChartBaseHeight + legend_layout(chart, w).height; }

namespace {

const SvgPaint kReferencePaint{"none", kReferenceColour, 1.5, "5 4"};

// The style index of series i: its own when it names one, else its position.
std::size_t series_style(const ChartSpec& chart, std::size_t i) {
  return chart.series[i].style >= 0 ? static_cast<std::size_t>(chart.series[i].style) : i;
}

// The data range over every series and the reference, widened to what the axes must show.
struct DataRange {
  double xmin = std::numeric_limits<double>::infinity(), xmax = -xmin, ymin = xmin, ymax = -xmin;
  bool empty = false;  // no finite point at all
};

DataRange data_range(const ChartSpec& chart) {
  DataRange r;
  auto cover = [&](const ChartSeries& s) {
    for (const auto& p : s.points) {
      if (!std::isfinite(p.x) || !std::isfinite(p.y)) continue;
      r.xmin = std::min(r.xmin, p.x), r.xmax = std::max(r.xmax, p.x);
      r.ymin = std::min(r.ymin, p.y), r.ymax = std::max(r.ymax, p.y);
    }
  };
  for (const auto& s : chart.series) cover(s);
  if (chart.reference) cover(*chart.reference);
  r.empty = !std::isfinite(r.xmin);
  if (r.empty) r.xmin = 0, r.xmax = 1, r.ymin = chart.log_y ? -1 : 0, r.ymax = 1;
  if (!chart.log_y) {
    r.ymin = std::min(r.ymin, 0.0);             // counts start at zero
    if (r.ymax <= r.ymin) r.ymax = r.ymin + 1;  // all zero: the axis runs 0..1, not below zero
  }
  if (chart.x_span) r.xmin = std::min(r.xmin, chart.x_span->x), r.xmax = std::max(r.xmax, chart.x_span->y);
  if (chart.y_span) r.ymin = std::min(r.ymin, chart.y_span->x), r.ymax = std::max(r.ymax, chart.y_span->y);
  return r;
}

// The plot inside a chart box in px, its axes, and the scales that take data to px.
struct Plot {
  double x = 0, y = 0;        // the chart box's top-left corner
  double base_h = 0;          // the box's height above a legend set under the plot
  double px = 0, py = 0, pw = 0, ph = 0;  // the plot's left, top, width and height
  AxisTicks xt, yt;
  bool empty = false;         // no data: the plot says so

  double sx(double v) const { return px + (v - xt.lo) / (xt.hi - xt.lo) * pw; }
  double sy(double v) const { return py + ph - (v - yt.lo) / (yt.hi - yt.lo) * ph; }
};

Plot plot_of(const ChartSpec& chart, const LegendLayout& legend, double x, double y, double w, double h) {
  Plot p;
  p.x = x, p.y = y;
  p.base_h = std::max(kTop + kBottom + 40, h - legend.height);
  const double right = legend.below || !chart.legend ? 24 : kRightLegendW + 16;
  p.px = x + kLeft, p.py = y + kTop, p.pw = std::max(40.0, w - kLeft - right), p.ph = std::max(40.0, p.base_h - kTop - kBottom);
  const DataRange r = data_range(chart);
  p.empty = r.empty;
  p.xt = nice_ticks(r.xmin, r.xmax, 8, chart.integer_x);
  p.yt = chart.log_y ? decade_ticks(r.ymin, r.ymax, 8) : nice_ticks(r.ymin, r.ymax, 6, chart.integer_y);
  return p;
}

// Grid and ticks (the labels of one axis share one style), the axes and their labels.
void draw_axes(SvgDocument& doc, const ChartSpec& chart, const Plot& p) {
  SvgPaint grid{"none", kGridColour, 1};
  SvgPaint axis{"none", kAxisColour, 1.2};
  const std::vector<std::string> ylabels = chart.log_y ? decade_labels(p.yt) : std::vector<std::string>{};
  doc.begin_group({}, "y-ticks");
  for (std::size_t i = 0; i < p.yt.values.size(); ++i) {
    const double v = p.yt.values[i];
    doc.line(p.px, p.sy(v), p.px + p.pw, p.sy(v), grid);
    doc.line(p.px - 5, p.sy(v), p.px, p.sy(v), axis);
    SvgFont f = kTickFont;
    f.middle = true;
    doc.text(p.px - 8, p.sy(v), chart.log_y ? ylabels[i] : format_tick(v, p.yt.step), f);
  }
  doc.end_group();
  doc.begin_group({}, "x-ticks");
  for (const double v : p.xt.values) {
    doc.line(p.sx(v), p.py, p.sx(v), p.py + p.ph, grid);
    doc.line(p.sx(v), p.py + p.ph, p.sx(v), p.py + p.ph + 5, axis);
    SvgFont f = kTickFont;
    f.anchor = "middle";
    doc.text(p.sx(v), p.py + p.ph + 19, format_tick(v, p.xt.step), f);
  }
  doc.end_group();
  doc.line(p.px, p.py + p.ph, p.px + p.pw, p.py + p.ph, axis);
  doc.line(p.px, p.py, p.px, p.py + p.ph, axis);
  doc.text(p.px + p.pw / 2, p.y + p.base_h - 10, chart.x_label, SvgFont{12, "middle", "#1a1a1a"});
  SvgFont ylab{12, "middle", "#1a1a1a"};
  ylab.rotate = -90;
  doc.text(p.x + 18, p.py + p.ph / 2, chart.y_label, ylab);
  if (p.empty) doc.text(p.px + p.pw / 2, p.py + p.ph / 2, "no planned runs to show", SvgFont{13, "middle", "#777777"});
}

// The reference line; a single point is a short level dash.
void draw_reference(SvgDocument& doc, const ChartSpec& chart, const Plot& p) {
  if (!chart.reference || chart.reference->points.empty()) return;
  std::vector<SvgPoint> pts;
  for (const auto& q : chart.reference->points)
    if (std::isfinite(q.x) && std::isfinite(q.y)) pts.push_back({p.sx(q.x), p.sy(q.y)});
  std::stable_sort(pts.begin(), pts.end(), [](const SvgPoint& a, const SvgPoint& b) { return a.x < b.x; });
  doc.begin_group({}, "reference");
  if (pts.size() == 1) doc.line(pts[0].x - 18, pts[0].y, pts[0].x + 18, pts[0].y, kReferencePaint);
  else if (pts.size() > 1) doc.polyline(pts, kReferencePaint);
  doc.end_group();
}

// A series' point in px, with the series and the data x it came from, and its marker's size.
struct Mark {
  std::size_t series;
  double data_x, x, y;
  double size = kChartMarkerSize;
};

// Every series' finite points as marks, each exactly at its own (x, y). Markers of different series
// at one x whose y are closer than a marker would hide each other: they are nested instead, the
// first series' marker largest and each later one a ring smaller, painted largest first, so that
// every one shows a rim of its own colour and shape around the next.
std::vector<Mark> place_marks(const ChartSpec& chart, const Plot& plot) {
  std::vector<Mark> marks;
  for (std::size_t i = 0; i < chart.series.size(); ++i) {
    auto pts = chart.series[i].points;
    std::erase_if(pts, [](const SvgPoint& p) { return !std::isfinite(p.x) || !std::isfinite(p.y); });
    std::stable_sort(pts.begin(), pts.end(), [](const SvgPoint& a, const SvgPoint& b) { return a.x < b.x; });
    for (const auto& p : pts) marks.push_back({i, p.x, plot.sx(p.x), plot.sy(p.y)});
  }
  std::sort(marks.begin(), marks.end(), [](const Mark& a, const Mark& b) {
    return std::tie(a.data_x, a.y, a.series) < std::tie(b.data_x, b.y, b.series);
  });
  for (std::size_t a = 0; a < marks.size();) {
    std::size_t b = a + 1;
    while (b < marks.size() && marks[b].data_x == marks[a].data_x && marks[b].y - marks[b - 1].y < kChartMarkerSize * 0.8) ++b;
    const std::size_t k = b - a;
    if (k > 1) {
      std::sort(marks.begin() + static_cast<long>(a), marks.begin() + static_cast<long>(b),
                [](const Mark& p, const Mark& q) { return p.series < q.series; });
      // Rings 2.5 px wide each side while they fit in a marker of 29 px; thinner beyond.
      const double ring = std::min(kChartMarkerRing, 20.0 / static_cast<double>(k - 1));
      for (std::size_t j = 0; j < k; ++j) marks[a + j].size = kChartMarkerSize + ring * static_cast<double>(k - 1 - j);
    }
    a = b;
  }
  // Painting order: larger markers under smaller ones, then the legend's order.
  std::stable_sort(marks.begin(), marks.end(), [](const Mark& p, const Mark& q) {
    return std::make_tuple(-p.size, p.series, p.data_x) < std::make_tuple(-q.size, q.series, q.data_x);
  });
  return marks;
}

// Lines through their own markers' centres (the exact data points); lines under every marker.
void draw_series(SvgDocument& doc, const ChartSpec& chart, const std::vector<Mark>& marks) {
  std::vector<std::vector<SvgPoint>> scaled(chart.series.size());
  std::vector<Mark> by_x = marks;
  std::stable_sort(by_x.begin(), by_x.end(), [](const Mark& p, const Mark& q) { return p.data_x < q.data_x; });
  for (const auto& m : by_x) scaled[m.series].push_back({m.x, m.y});
  doc.begin_group({}, "lines");
  for (std::size_t i = 0; i < chart.series.size(); ++i)
    series_line(doc, scaled[i], series_colour(series_style(chart, i)), series_dash(series_style(chart, i)));
  doc.end_group();
  doc.begin_group({}, "markers");
  for (const auto& m : marks) {
    const std::size_t style = series_style(chart, m.series);
    draw_marker(doc, series_marker(style), m.x, m.y, m.size, series_colour(style));
  }
  doc.end_group();
}

// Legend: every series (and the reference), a line sample with the series' marker, then the name;
// beside the plot, or under it in columns.
void draw_legend(SvgDocument& doc, const ChartSpec& chart, const LegendLayout& legend, const Plot& p) {
  doc.begin_group({}, "legend");
  const auto names = legend_names(chart);
  const double lx0 = legend.below ? p.px : p.px + p.pw + 18;
  const double ly0 = legend.below ? p.y + p.base_h + 4 : p.py + 6;
  SvgFont name_font{kLegendFont, "start", "#1a1a1a"};
  name_font.middle = true;
  for (std::size_t e = 0; e < names.size(); ++e) {
    const std::size_t col = e / std::max<std::size_t>(legend.rows, 1), row = e % std::max<std::size_t>(legend.rows, 1);
    const double lx = lx0 + static_cast<double>(col) * legend.column_w, ly = ly0 + static_cast<double>(row) * kLegendRow;
    if (e < chart.series.size()) {
      const std::size_t style = series_style(chart, e);
      const std::string colour = series_colour(style);
      series_line(doc, {{lx, ly}, {lx + kSample, ly}}, colour, series_dash(style));
      draw_marker(doc, series_marker(style), lx + kSample / 2, ly, kChartMarkerSize, colour);
      doc.text(lx + kSample + kSampleGap, ly, fit_name(names[e], legend.max_chars), name_font);
    } else {
      doc.line(lx, ly, lx + kSample, ly, kReferencePaint);
      SvgFont f = name_font;
      f.fill = "#555555";
      doc.text(lx + kSample + kSampleGap, ly, fit_name(names[e], legend.max_chars), f);
    }
  }
  doc.end_group();
}

}  // namespace

void draw_chart(SvgDocument& doc, const ChartSpec& chart, double x, double y, double w, double h) {
  const LegendLayout legend = legend_layout(chart, w);
  const Plot plot = plot_of(chart, legend, x, y, w, h);
  doc.begin_group({}, "chart");
  doc.text(x + kLeft, y + 20, chart.title, chart.legend ? SvgFont{15, "start", "#1a1a1a", true} : SvgFont{13, "start", "#1a1a1a", true});
  draw_axes(doc, chart, plot);
  // The reference first, so that series are drawn over it.
  draw_reference(doc, chart, plot);
  draw_series(doc, chart, place_marks(chart, plot));
  if (chart.legend) draw_legend(doc, chart, legend, plot);
  doc.end_group();
}

namespace {

// A page of stacked blocks under a heading: `height(i, w)` sizes block i for the content width w,
// `draw(doc, i, x, y, w, h)` draws it. The frame both chart pages share.
template <typename Height, typename Draw>
std::string render_page(const std::string& heading, const std::string& subheading, std::size_t blocks, Height height,
                        Draw draw) {
  // The subheading may hold several lines (separated by '\n'), each 15 px below the last.
  std::vector<std::string> sub_lines;
  for (std::size_t at = 0;;) {
    const std::size_t nl = subheading.find('\n', at);
    sub_lines.push_back(subheading.substr(at, nl == std::string::npos ? std::string::npos : nl - at));
    if (nl == std::string::npos) break;
    at = nl + 1;
  }
  const double width = 980, head = 64 + 15 * static_cast<double>(sub_lines.size() - 1);
  std::vector<double> heights;
  double total = head + 10;
  for (std::size_t i = 0; i < blocks; ++i) heights.push_back(height(i, width - 20)), total += heights.back();
  SvgDocument doc(width, total, heading);
  doc.rect(0, 0, doc.width(), doc.height(), SvgPaint{"#ffffff"});
  doc.text(20, 30, heading, SvgFont{18, "start", "#1a1a1a", true});
  for (std::size_t i = 0; i < sub_lines.size(); ++i)
    doc.text(20, 51 + 15 * static_cast<double>(i), sub_lines[i], SvgFont{12, "start", "#555555"});
  double y = head;
  for (std::size_t i = 0; i < blocks; ++i) {
    draw(doc, i, 10.0, y, width - 20, heights[i]);
    y += heights[i];
  }
  return doc.str();
}

}  // namespace

std::string render_chart_page(const std::string& heading, const std::string& subheading,
                              const std::vector<ChartSpec>& charts) {
  return render_page(
      heading, subheading, charts.size(), [&](std::size_t i, double w) { return chart_height(charts[i], w); },
      [&](SvgDocument& doc, std::size_t i, double x, double y, double w, double h) {
        draw_chart(doc, charts[i], x, y, w, h);
      });
}


namespace {

// Panels per row of a group: all of them up to three, two for four, else three.
std::size_t panel_columns(std::size_t panels) { return panels <= 3 ? std::max<std::size_t>(panels, 1) : panels == 4 ? 2 : 3; }

// The legend of a group: every series of its panels once (by style, in order of first appearance)
// and the first reference.
ChartSpec group_legend(const ChartGroup& group) {
  ChartSpec spec;
  std::set<std::size_t> seen;
  for (const auto& panel : group.panels) {
    for (std::size_t i = 0; i < panel.series.size(); ++i) {
      const std::size_t style = series_style(panel, i);
      if (!seen.insert(style).second) continue;
      spec.series.push_back({panel.series[i].name, {}, static_cast<int>(style)});
    }
    if (!spec.reference && panel.reference && !panel.reference->points.empty()) spec.reference = panel.reference;
  }
  return spec;
}

}  // namespace

double group_height(const ChartGroup& group, double w) {
  const std::size_t cols = panel_columns(group.panels.size());
  const std::size_t rows = (group.panels.size() + cols - 1) / cols;
  const double panel_h = group.panels.size() > 1 ? kPanelHeight : kChartBaseHeight;
  return kGroupHead + static_cast<double>(rows) * panel_h + legend_layout(group_legend(group), w, true).height + 12;
}

void draw_group(SvgDocument& doc, const ChartGroup& group, double x, double y, double w) {
  doc.begin_group({}, "chart-group");
  doc.text(x + 10, y + 22, group.title, SvgFont{15, "start", "#1a1a1a", true});
  const std::size_t cols = panel_columns(group.panels.size());
  const double panel_w = w / static_cast<double>(cols);
  const double panel_h = group.panels.size() > 1 ? kPanelHeight : kChartBaseHeight;
  for (std::size_t i = 0; i < group.panels.size(); ++i) {
    ChartSpec panel = group.panels[i];
    panel.legend = false;
    draw_chart(doc, panel, x + panel_w * static_cast<double>(i % cols), y + kGroupHead + panel_h * static_cast<double>(i / cols),
               panel_w, panel_h);
  }
  // The legend under the panels, as wide as the group.
  const ChartSpec legend_spec = group_legend(group);
  const LegendLayout legend = legend_layout(legend_spec, w, true);
  const std::size_t rows = (group.panels.size() + cols - 1) / cols;
  Plot p;
  p.x = x, p.y = y + kGroupHead, p.px = x + kLeft, p.base_h = static_cast<double>(rows) * panel_h;
  draw_legend(doc, legend_spec, legend, p);
  doc.end_group();
}

std::string render_group_page(const std::string& heading, const std::string& subheading, const std::vector<ChartGroup>& groups) {
  return render_page(
      heading, subheading, groups.size(), [&](std::size_t i, double w) { return group_height(groups[i], w); },
      [&](SvgDocument& doc, std::size_t i, double x, double y, double w, double) { draw_group(doc, groups[i], x, y, w); });
}

}  // namespace qftplan
