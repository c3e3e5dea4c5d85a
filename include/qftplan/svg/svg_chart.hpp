#pragma once
/// \file svg_chart.hpp
/// Line charts in SVG: axes with ticks at nice numbers, labelled axes with units, one line with
/// markers per series, a legend, and an optional logarithmic value axis.

#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "qftplan/svg/svg_document.hpp"

namespace qftplan {

/// One series: its name in the legend and its points (drawn in order of x).
struct ChartSeries {
  std::string name;                       ///< legend text
  std::vector<SvgPoint> points;           ///< (x, y) in data units
  int style = -1;                         ///< colour, marker and dash index; -1: the series' position
};

/// What one chart shows.
struct ChartSpec {
  std::string title;                      ///< shown above the chart
  std::string x_label;                    ///< with the unit, such as "register size (qubits)"
  std::string y_label;                    ///< with the unit
  bool log_y = false;                     ///< y values are log10 of the quantity; ticks at powers of ten
  std::vector<ChartSeries> series;        ///< drawn in order, legend in order
  std::optional<ChartSeries> reference;   ///< drawn grey and dashed, without markers (such as a bound)
  std::optional<SvgPoint> x_span;         ///< x range to cover (x = low, y = high), so stacked charts align
  bool integer_x = false;                 ///< x values are whole numbers (register sizes): whole ticks only
  bool integer_y = false;                 ///< y values are whole numbers (counts): whole ticks only
  std::optional<SvgPoint> y_span;         ///< y range to cover (x = low, y = high), so panels share an axis
  bool legend = true;                     ///< draw its own legend (panels of a group share the group's)
};

/// Small multiples: one quantity in several panels (one per setting) that share both axes, under
/// one title, with one legend under them for the series of every panel.
struct ChartGroup {
  std::string title;                      ///< shown above the panels
  std::vector<ChartSpec> panels;          ///< each with its own title (the setting), drawn in rows
};

/// Height of a chart box without its legend, in px.
inline constexpr double kChartBaseHeight = 380;
/// Size of every series marker, in px (the same for all series, so that none shrinks away).
inline constexpr double kChartMarkerSize = 9;
/// Width of each ring by which a marker grows when it lies under markers of later series at the
/// same point, in px (so that each shows a rim).
inline constexpr double kChartMarkerRing = 5;
/// Height of one panel of a group of several, in px.
inline constexpr double kPanelHeight = 300;
/// Height of a group's title above its panels, in px.
inline constexpr double kGroupHead = 32;
/// Series told apart by colour and marker shape together (8 colours times 8 shapes).
inline constexpr std::size_t kDistinctSeries = 64;

/// Tick positions of an axis: the covered range and the values between, `step` apart.
struct AxisTicks {
  double lo = 0;               ///< start of the axis
  double hi = 1;               ///< end of the axis
  double step = 1;             ///< distance between ticks
  std::vector<double> values;  ///< tick values, lo to hi
};

/// Ticks at "nice" numbers (1, 2 or 5 times a power of ten) covering [lo, hi] with about
/// `target` ticks: the loose labelling of Heckbert ("Nice numbers for graph labels", Graphics Gems,
/// 1990). A degenerate range is widened by one unit each way. With `whole`, the step is at least 1
/// (ticks on whole numbers only).
AxisTicks nice_ticks(double lo, double hi, int target, bool whole = false);

/// Ticks for a log10 axis over exponents [lo, hi]: whole exponents with a step of 1, 2, 5, 10, ...
/// decades, so that there are at most about `target` of them.
AxisTicks decade_ticks(double lo, double hi, int target);

/// The text of a linear tick value, with as many decimals as the step needs.
std::string format_tick(double value, double step);

/// The text of a decade tick, as a decimal ("0.01", "1", "100") or as 10 with a superscript
/// exponent ("10⁻⁶", "10⁰").
std::string format_decade(int exponent, bool power_form);

/// The labels of an axis's decade ticks, all in one style: decimals when every exponent lies in
/// -3..3, else every label in the power form.
std::vector<std::string> decade_labels(const AxisTicks& ticks);

/// Height of the box draw_chart needs for `chart` at width `w`: kChartBaseHeight, plus the legend
/// when it goes under the plot (more entries, or longer names, than fit beside it).
double chart_height(const ChartSpec& chart, double w);

/// Draws a chart (title, axes, grid, series, legend listing every series unless `legend` is off)
/// into the box at (x, y) of size w x h (h as chart_height gives). Every marker sits exactly at its
/// point; markers of different series that would cover each other are nested (the earlier series'
/// one larger, painted first), so that each stays visible.
void draw_chart(SvgDocument& doc, const ChartSpec& chart, double x, double y, double w, double h);

/// Height of the box draw_group needs for `group` at width `w`: the title, rows of panels (one
/// row of kChartBaseHeight for a single panel, else rows of kPanelHeight, up to three panels a row)
/// and the legend.
double group_height(const ChartGroup& group, double w);

/// Draws a group (title, panels, one legend) into the box at (x, y) of width w and group_height.
void draw_group(SvgDocument& doc, const ChartGroup& group, double x, double y, double w);

/// A page of chart groups stacked vertically under a heading and a subheading (lines separated by a newline), as a whole SVG document.
std::string render_group_page(const std::string& heading, const std::string& subheading, const std::vector<ChartGroup>& groups);

/// A page of charts stacked vertically under a heading, as a whole SVG document.
std::string render_chart_page(const std::string& heading, const std::string& subheading,
                              const std::vector<ChartSpec>& charts);

}  // namespace qftplan
