// The SVG writer, tick placement, palette and survey charts.

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <map>
#include <regex>
#include <set>
#include <sstream>
#include <tuple>

#include <fmt/format.h>

#include "qftplan/survey/survey_plots.hpp"
#include "qftplan/svg/svg_chart.hpp"
#include "qftplan/svg/svg_document.hpp"
#include "qftplan/svg/svg_markers.hpp"
#include "qftplan/svg/svg_palette.hpp"
#include "svg_probe.hpp"
#include "test_support.hpp"

namespace qftplan {
namespace {

// A small well-formedness check of XML 1.0 (W3C, Extensible Markup Language 1.0, 2008): every
// start tag closed in order, attribute values quoted, no bare '&' or '<' in text.
bool well_formed(const std::string& xml, std::string& why) {
  std::vector<std::string> open;
  std::size_t i = 0;
  const std::regex entity("^&(amp|lt|gt|quot|apos|#[0-9]+|#x[0-9a-fA-F]+);");
  while (i < xml.size()) {
    if (xml[i] == '&') {
      std::smatch m;
      const std::string rest = xml.substr(i, 12);
      if (!std::regex_search(rest, m, entity)) return why = "bare & at " + std::to_string(i), false;
      i += m.length(0);
      continue;
    }
    if (xml[i] != '<') {
      ++i;
      continue;
    }
    if (xml.compare(i, 4, "<!--") == 0) {
      const auto end = xml.find("-->", i + 4);
      if (end == std::string::npos) return why = "unclosed comment", false;
      i = end + 3;
      continue;
    }
    if (xml.compare(i, 2, "<?") == 0) {
      const auto end = xml.find("?>", i);
      if (end == std::string::npos) return why = "unclosed declaration", false;
      i = end + 2;
      continue;
    }
    const auto end = xml.find('>', i);
    if (end == std::string::npos) return why = "unclosed tag", false;
    std::string tag = xml.substr(i + 1, end - i - 1);
    i = end + 1;
    if (tag.starts_with("/")) {
      if (open.empty() || open.back() != tag.substr(1)) return why = "mismatched </" + tag.substr(1) + ">", false;
      open.pop_back();
      continue;
    }
    const bool self_closing = tag.ends_with("/");
    if (self_closing) tag.pop_back();
    static const std::regex tag_re(R"(^([A-Za-z][\w:-]*)(\s+[\w:-]+="[^"<]*")*\s*$)");
    if (!std::regex_match(tag, tag_re)) return why = "malformed tag <" + tag + ">", false;
    if (!self_closing) open.push_back(tag.substr(0, tag.find_first_of(" \t\n")));
  }
  if (!open.empty()) return why = "unclosed <" + open.back() + ">", false;
  return true;
}

TEST(SvgDocument, EscapesAndCloses) {
  SvgDocument doc(100, 50, "a <title> & more");
  doc.begin_group("g1");
  doc.text(1, 2, "x < y & \"z\"", SvgFont{});
  doc.rect(0, 0, 10.126, 3, SvgPaint{"#fff", "#000", 1.5, "2 2"});
  doc.comment("a -- b");
  const std::string s = doc.str();  // the open group is closed by str()
  std::string why;
  EXPECT_TRUE(well_formed(s, why)) << why << "\n" << s;
  EXPECT_NE(s.find("x &lt; y &amp; &quot;z&quot;"), std::string::npos);
  EXPECT_NE(s.find("width=\"10.13\""), std::string::npos);
  EXPECT_EQ(svg_number(-0.001), "0");
  EXPECT_EQ(svg_number(2.5), "2.5");
  EXPECT_EQ(svg_number(3.0), "3");
}

// Heckbert, "Nice numbers for graph labels" (Graphics Gems, 1990): steps of 1, 2 or 5 times a power
// of ten, the range extended to whole steps.
TEST(SvgChart, NiceTicksFollowHeckbert) {
  const auto a = nice_ticks(0, 97, 5);
  EXPECT_DOUBLE_EQ(a.step, 20);
  EXPECT_EQ(a.values, (std::vector<double>{0, 20, 40, 60, 80, 100}));
  const auto b = nice_ticks(4, 64, 8);
  EXPECT_DOUBLE_EQ(b.step, 10);
  EXPECT_DOUBLE_EQ(b.lo, 0);
  EXPECT_DOUBLE_EQ(b.hi, 70);
  const auto c = nice_ticks(0.013, 0.071, 6);
  EXPECT_DOUBLE_EQ(c.step, 0.02);
  for (double v : nice_ticks(3, 3, 5).values) EXPECT_TRUE(std::isfinite(v));  // degenerate range widened
  for (const auto& t : {a, b, c}) {
    const double m = t.step / std::pow(10.0, std::floor(std::log10(t.step)));
    EXPECT_TRUE(std::abs(m - 1) < 1e-9 || std::abs(m - 2) < 1e-9 || std::abs(m - 5) < 1e-9) << t.step;
  }
  EXPECT_EQ(format_tick(0.30000000000000004, 0.1), "0.3");
  EXPECT_EQ(format_tick(-1e-17, 0.1), "0.0");
  const auto d = decade_ticks(-27.3, 0, 8);
  EXPECT_LE(d.values.size(), 9u);
  EXPECT_LE(d.lo, -27.3);
  EXPECT_GE(d.hi, 0);
  EXPECT_EQ(format_decade(-6, true), "10\u207B\u2076");
  EXPECT_EQ(format_decade(0, false), "1");
}

// Okabe and Ito, "Color Universal Design" (2002): the eight colours, as published.
TEST(SvgPalette, OkabeItoColoursAndDistinctStyles) {
  const std::vector<std::string> published = {"#000000", "#E69F00", "#56B4E9", "#009E73",
                                              "#F0E442", "#0072B2", "#D55E00", "#CC79A7"};
  auto ours = okabe_ito_colours();
  std::sort(ours.begin(), ours.end());
  auto want = published;
  std::sort(want.begin(), want.end());
  EXPECT_EQ(ours, want);
  // The first kDistinctSeries (64) series differ in (colour, marker) alone: every pair of the eight
  // colours and eight shapes once.
  std::set<std::pair<std::string, int>> styles;
  for (std::size_t i = 0; i < kDistinctSeries; ++i) styles.insert({series_colour(i), static_cast<int>(series_marker(i))});
  EXPECT_EQ(styles.size(), kDistinctSeries);
  EXPECT_EQ(kDistinctSeries, okabe_ito_colours().size() * kMarkerShapeCount);
  // The ramp gets darker (common practice: the sum of channels as a rough lightness).
  auto lightness = [](const std::string& c) {
    return std::stoi(c.substr(1, 2), nullptr, 16) + std::stoi(c.substr(3, 2), nullptr, 16) + std::stoi(c.substr(5, 2), nullptr, 16);
  };
  for (int i = 0; i < 10; ++i) EXPECT_GT(lightness(ramp_colour(i / 10.0)), lightness(ramp_colour((i + 1) / 10.0)));
}

SurveyRow row(const std::string& series, int n, long long swaps, std::optional<double> log_esp) {
  SurveyRow r;
  r.series = series;
  r.device = series;
  r.qubits = n;
  r.ok = true;
  r.swaps = swaps;
  r.cx_count = 2 * swaps;
  r.cx_depth = 2 * n;
  r.depth_2q = 2 * n - 3;
  r.lower_bound_depth_2q = n - 1;
  r.asked_approx = "none";
  r.asked_strategy = "auto";
  r.log_esp = log_esp;
  if (log_esp) r.esp = std::exp(*log_esp);
  r.log_esp_total = log_esp;
  if (log_esp) r.esp_total = std::exp(*log_esp);
  return r;
}

TEST(SurveyCharts, SeriesPerDeviceAndEspOnlyWhenCalibrated) {
  std::vector<SurveyRow> rows = {row("line:*", 4, 6, std::nullopt), row("line:*", 8, 28, std::nullopt),
                                 row("chip & <co>", 4, 6, -0.1), row("chip & <co>", 8, 28, -800.0)};
  rows.push_back(row("chip & <co>", 12, 0, std::nullopt));
  rows.back().ok = false;  // failed runs have no point
  const auto charts = survey_charts(rows);
  ASSERT_EQ(charts.size(), 3u);
  ASSERT_EQ(charts[0].panels.size(), 1u);  // one setting: one panel
  EXPECT_EQ(charts[0].panels[0].series.size(), 2u);
  EXPECT_EQ(charts[0].panels[0].series[1].points.size(), 2u);
  EXPECT_EQ(charts[0].panels[0].series[1].points[1].y, 2.0 * 28);  // the rows' cx_count
  EXPECT_EQ(charts[1].panels[0].series[1].points[1].y, 2.0 * 8);   // the rows' cx_depth
  const auto& esp = charts[2].panels.at(0);
  ASSERT_EQ(esp.series.size(), 1u);         // ESP: only the calibrated device
  EXPECT_EQ(esp.series[0].style, 1);          // keeps its colour from the other charts
  EXPECT_TRUE(esp.log_y);
  EXPECT_NEAR(esp.series[0].points[1].y, -800.0 / std::log(10.0), 1e-9);  // below double's range as esp
  const std::string svg = survey_svg(rows);
  std::string why;
  EXPECT_TRUE(well_formed(svg, why)) << why;
  EXPECT_NE(svg.find("chip &amp; &lt;co&gt;"), std::string::npos);

  rows.erase(rows.begin() + 2, rows.end());
  EXPECT_EQ(survey_charts(rows).size(), 2u);  // nothing calibrated: no ESP chart
}

// The survey's chart file rendered by an independent SVG renderer (librsvg's rsvg-convert), when
// installed: it must draw without error into a PNG of the declared size.
TEST(SurveyCharts, RenderedByRsvg) {
  if (!std::filesystem::exists("/usr/bin/rsvg-convert")) GTEST_SKIP() << "rsvg-convert not installed";
  const auto dir = testing::temp_dir();
  const auto svg = dir / "c.svg", png = dir / "c.png";
  testing::write_file(svg, survey_svg({row("a", 4, 6, -0.2), row("a", 8, 28, -1.5), row("b", 4, 7, -0.3)}));
  ASSERT_EQ(std::system(("/usr/bin/rsvg-convert -o '" + png.string() + "' '" + svg.string() + "' 2>/dev/null").c_str()), 0);
  const std::string bytes = testing::read_file(png);
  ASSERT_GT(bytes.size(), 24u);
  EXPECT_EQ(bytes.substr(1, 3), "PNG");  // PNG signature (ISO/IEC 15948, section 5.2)
  auto be32 = [&](std::size_t at) {
    return (static_cast<unsigned char>(bytes[at]) << 24) | (static_cast<unsigned char>(bytes[at + 1]) << 16) |
           (static_cast<unsigned char>(bytes[at + 2]) << 8) | static_cast<unsigned char>(bytes[at + 3]);
  };
  EXPECT_EQ(be32(16), 980u);  // IHDR width
  std::filesystem::remove_all(dir);
}

// ---- Helpers that read back what the writer drew ----------------------------------------------

// The contents of every group opened with `open_tag` (groups of ours hold no nested groups).
std::vector<std::string> groups(const std::string& svg, const std::string& open_tag) {
  std::vector<std::string> out;
  for (std::size_t at = svg.find(open_tag); at != std::string::npos; at = svg.find(open_tag, at + 1)) {
    const std::size_t start = at + open_tag.size(), end = svg.find("</g>", start);
    out.push_back(svg.substr(start, end - start));
  }
  return out;
}

using testing::attr;
using testing::elements;
using testing::text_of;

// Rows for a survey of `devices` series at the given sizes.
std::vector<SurveyRow> survey_rows(const std::vector<std::string>& names, const std::vector<int>& sizes) {
  std::vector<SurveyRow> rows;
  for (std::size_t d = 0; d < names.size(); ++d)
    for (const int n : sizes) rows.push_back(row(names[d], n, static_cast<long long>(n * (n - 1) / 2 + d), -0.01 * n * (d + 1)));
  return rows;
}

// WCAG 2.1 (W3C, Web Content Accessibility Guidelines 2.1, 2018), definitions "relative luminance"
// and "contrast ratio", written out again here: sRGB channels linearised with the 0.03928 threshold,
// weights 0.2126, 0.7152, 0.0722; ratio (L1 + 0.05) / (L2 + 0.05).
double wcag_luminance(int r, int g, int b) {
  auto lin = [](int c) {
    const double s = c / 255.0;
    return s <= 0.03928 ? s / 12.92 : std::pow((s + 0.055) / 1.055, 2.4);
  };
  return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
}

TEST(SvgPalette, LightColoursGetAnOutlineByTheWcagContrast) {
  // The formula's fixed points (WCAG 2.1: black on white is 21:1, a colour on itself 1:1).
  EXPECT_NEAR(contrast_ratio("#000000", "#FFFFFF"), 21.0, 1e-12);
  EXPECT_NEAR(contrast_ratio("#0072B2", "#0072B2"), 1.0, 1e-12);
  EXPECT_NEAR(relative_luminance("#FFFFFF"), 1.0, 1e-12);
  for (const auto& c : okabe_ito_colours()) {
    const int r = std::stoi(c.substr(1, 2), nullptr, 16), g = std::stoi(c.substr(3, 2), nullptr, 16),
              b = std::stoi(c.substr(5, 2), nullptr, 16);
    const double ratio = (1.0 + 0.05) / (wcag_luminance(r, g, b) + 0.05);  // against white, L = 1
    EXPECT_NEAR(contrast_ratio(c, "#FFFFFF"), ratio, 1e-9) << c;
    // WCAG 2.1 success criterion 1.4.11 (non-text contrast): graphical objects need 3:1.
    EXPECT_EQ(needs_outline(c), ratio < 3.0) << c << " " << ratio;
  }
  // Okabe-Ito yellow on white is about 1.3:1, far below 3:1; the outline is well above it.
  EXPECT_LT(contrast_ratio("#F0E442", "#FFFFFF"), 1.4);
  EXPECT_TRUE(needs_outline("#F0E442"));
  EXPECT_GE(contrast_ratio(kOutlineColour, "#FFFFFF"), 3.0);
  EXPECT_GE(contrast_ratio(kOutlineColour, "#F0E442"), 3.0);
  // The palette keeps its order: yellow is still the eighth series colour.
  EXPECT_EQ(series_colour(7), "#F0E442");

  // In a chart, the yellow series' line has a dark casing under it and its markers a dark rim.
  ChartSpec c;
  c.series.push_back({"yellow", {{1, 1}, {2, 3}}, 7});
  SvgDocument doc(900, kChartBaseHeight, "t");
  draw_chart(doc, c, 0, 0, 900, kChartBaseHeight);
  const std::string svg = doc.str();
  const auto lines = groups(svg, "<g class=\"lines\">");
  ASSERT_EQ(lines.size(), 1u);
  const auto polys = elements(lines[0], "polyline");
  ASSERT_EQ(polys.size(), 2u);
  EXPECT_NE(polys[0].find(std::string("stroke=\"") + kOutlineColour + "\""), std::string::npos);
  EXPECT_NE(polys[1].find("stroke=\"#F0E442\""), std::string::npos);
  const auto marks = groups(svg, "<g class=\"markers\">");
  ASSERT_EQ(marks.size(), 1u);
  for (const auto& e : elements(marks[0], "polygon"))
    EXPECT_NE(e.find(std::string("stroke=\"") + kOutlineColour + "\""), std::string::npos) << e;
}

// Register sizes are whole numbers: ticks on whole numbers only, also for a survey of one size
// (whose axis is widened to the sizes either side), so no tick reads "11.2".
TEST(SvgChart, WholeTicksForRegisterSizes) {
  const auto t = nice_ticks(12, 12, 8, true);
  EXPECT_EQ(t.values, (std::vector<double>{11, 12, 13}));
  EXPECT_DOUBLE_EQ(nice_ticks(4, 8, 8, true).step, 1);
  EXPECT_DOUBLE_EQ(nice_ticks(12, 12, 8, false).step, 0.2);  // without the rule: 11.0, 11.2, ...
  for (const auto& rows : {survey_rows({"a", "b"}, {12}), survey_rows({"a"}, {4, 5, 6, 7, 8})}) {
    const std::string svg = survey_svg(rows);
    const auto xt = groups(svg, "<g class=\"x-ticks\">");
    ASSERT_EQ(xt.size(), 3u);
    for (const auto& g : xt) {
      const auto labels = elements(g, "text");
      ASSERT_GE(labels.size(), 3u);
      for (const auto& l : labels) EXPECT_TRUE(std::regex_match(text_of(l), std::regex("[0-9]+"))) << text_of(l);
    }
    // Counts are whole numbers as well.
    for (const auto& g : groups(svg, "<g class=\"y-ticks\">"))
      for (const auto& l : elements(g, "text"))
        EXPECT_TRUE(std::regex_match(text_of(l), std::regex("[0-9]+|10[^0-9].*|1|0\\.[0-9]+"))) << text_of(l);
  }
}

// What the legend names is drawn: a bound known at one register size only is a short level dash.
TEST(SvgChart, ReferenceOfOnePointIsDrawn) {
  ChartSpec c;
  c.series.push_back({"a", {{12, 30}}, 0});
  c.reference = ChartSeries{"lower bound (n-1)", {{12, 11}}};
  SvgDocument doc(900, kChartBaseHeight, "t");
  draw_chart(doc, c, 0, 0, 900, kChartBaseHeight);
  const std::string svg = doc.str();
  const auto ref = groups(svg, "<g class=\"reference\">");
  ASSERT_EQ(ref.size(), 1u);
  const auto dash = elements(ref[0], "line");
  ASSERT_EQ(dash.size(), 1u);
  EXPECT_GT(attr(dash[0], "x2") - attr(dash[0], "x1"), 20);
  EXPECT_NE(svg.find(">lower bound (n-1)</text>"), std::string::npos);
}

// One notation for every label of a log axis (common practice): decimals for a few decades, else
// powers of ten throughout, never a mix such as "1", "0.1", "10⁻²".
TEST(SvgChart, DecadeLabelsShareOneStyle) {
  EXPECT_EQ(decade_labels(decade_ticks(-2, 0, 8)), (std::vector<std::string>{"0.01", "0.1", "1"}));
  const auto wide = decade_labels(decade_ticks(-9.5, 0, 8));
  ASSERT_GE(wide.size(), 3u);
  for (const auto& l : wide) EXPECT_TRUE(l.starts_with("10") && l.size() > 2) << l;
  EXPECT_EQ(wide.back(), "10\u2070");
  EXPECT_EQ(format_decade(3, false), "1000");
  EXPECT_EQ(format_decade(-3, false), "0.001");
  EXPECT_EQ(format_decade(-12, true), "10\u207B\u00B9\u00B2");
  // The ESP chart of a survey whose ESP spans many decades.
  std::vector<SurveyRow> rows = {row("a", 4, 6, -0.1), row("a", 40, 600, -40.0)};
  const auto yt = groups(survey_svg(rows), "<g class=\"y-ticks\">");
  ASSERT_EQ(yt.size(), 3u);
  int powers = 0, decimals = 0;
  for (const auto& l : elements(yt[2], "text")) (text_of(l).starts_with("10\xE2") ? powers : decimals) += 1;  // 10, then a superscript
  EXPECT_GT(powers, 0);
  EXPECT_EQ(decimals, 0);
}

// Many series: every one is named in the legend (in columns under the plot, the chart growing),
// (colour, marker) pairs stay distinct, and markers keep one legible size.
TEST(SurveyCharts, LegendListsEverySeries) {
  std::vector<std::string> names;
  for (int i = 0; i < 42; ++i) names.push_back(fmt::format("device-{:02}, degree auto, routed", i));
  const auto rows = survey_rows(names, {6, 12, 18});
  const std::string svg = survey_svg(rows);
  std::string why;
  EXPECT_TRUE(well_formed(svg, why)) << why;
  const auto legends = groups(svg, "<g class=\"legend\">");
  ASSERT_EQ(legends.size(), 3u);
  const double height = attr(elements(svg, "svg")[0], "height");
  EXPECT_GT(height, 64 + 3 * kChartBaseHeight + 10);  // grown for the legends
  for (const auto& legend : legends) {
    std::set<std::string> shown;
    std::set<std::pair<double, double>> at;
    for (const auto& t : elements(legend, "text")) {
      shown.insert(text_of(t));
      at.insert({attr(t, "x"), attr(t, "y")});
      EXPECT_LT(attr(t, "y"), height);
    }
    for (const auto& n : names) EXPECT_TRUE(shown.count(n)) << n;
    EXPECT_EQ(at.size(), elements(legend, "text").size());  // no two entries in one place
    EXPECT_EQ(legend.find("more<"), std::string::npos);
  }
  // Markers: circles of radius at least 4 px, polygons at least 8 px across, in every series.
  for (const auto& m : groups(svg, "<g class=\"markers\">")) {
    for (const auto& c : elements(m, "circle")) EXPECT_GE(attr(c, "r"), 4) << c;
    for (const auto& p : elements(m, "polygon")) {
      std::smatch pts;
      ASSERT_TRUE(std::regex_search(p, pts, std::regex("points=\"([^\"]*)\"")));
      std::vector<double> xs;
      const std::string list = pts[1];
      const std::regex x_re("(-?[0-9.]+),");
      for (auto it = std::sregex_iterator(list.begin(), list.end(), x_re); it != std::sregex_iterator(); ++it)
        xs.push_back(std::stod((*it)[1]));
      EXPECT_GE(*std::max_element(xs.begin(), xs.end()) - *std::min_element(xs.begin(), xs.end()), 8) << p;
    }
  }
}

// Series with the same figures: their markers sit at the same point, nested (the earlier series'
// larger and painted first), so the later one does not hide the earlier.
TEST(SurveyCharts, CoincidingPointsStayVisible) {
  ChartSpec c;
  c.series.push_back({"first", {{4, 10}, {8, 20}}, 0});    // style 0: a circle
  c.series.push_back({"second", {{4, 10}, {8, 20}}, 15});  // style 15: also a circle
  ASSERT_EQ(series_marker(0), series_marker(15));
  SvgDocument doc(900, kChartBaseHeight, "t");
  draw_chart(doc, c, 0, 0, 900, kChartBaseHeight);
  const auto marks = groups(doc.str(), "<g class=\"markers\">");
  ASSERT_EQ(marks.size(), 1u);
  const auto circles = elements(marks[0], "circle");
  ASSERT_EQ(circles.size(), 4u);
  // Painted: both first-series circles (larger), then both second-series ones.
  for (int i = 0; i < 2; ++i) {
    EXPECT_EQ(attr(circles[i], "cx"), attr(circles[i + 2], "cx"));
    EXPECT_EQ(attr(circles[i], "cy"), attr(circles[i + 2], "cy"));
    EXPECT_NE(circles[i].find(series_colour(0)), std::string::npos);
    EXPECT_NE(circles[i + 2].find(series_colour(15)), std::string::npos);
    // A rim of the first series shows around the second's marker and its outline.
    EXPECT_GE(attr(circles[i], "r") - attr(circles[i + 2], "r") - attr(circles[i + 2], "stroke-width"), 1.0);
  }
}

// Every marker sits exactly at its register size: its centre is the x of that size's tick (the
// axis mapping), whatever other series share the point; lines pass through the markers' centres.
TEST(SvgChart, MarkersSitExactlyAtTheirX) {
  ChartSpec c;
  c.integer_x = true;
  // Styles 0, 15 and 22 are all circles (8 colours cycle, the shape steps once per 8 series).
  for (const int style : {0, 15, 22}) ASSERT_EQ(series_marker(static_cast<std::size_t>(style)), MarkerShape::circle);
  c.series.push_back({"a", {{4, 10}, {8, 20}, {12, 30}}, 0});
  c.series.push_back({"b", {{4, 10}, {8, 21}, {12, 60}}, 15});
  c.series.push_back({"c", {{4, 10}, {8, 20}, {12, 45}}, 22});
  SvgDocument doc(900, kChartBaseHeight, "t");
  draw_chart(doc, c, 0, 0, 900, kChartBaseHeight);
  const std::string svg = doc.str();
  // The tick of value v: its label's x (anchored at the middle) and its grid line's x.
  std::map<int, double> tick_x;
  const auto xt = groups(svg, "<g class=\"x-ticks\">");
  ASSERT_EQ(xt.size(), 1u);
  for (const auto& t : elements(xt[0], "text")) tick_x[std::stoi(text_of(t))] = attr(t, "x");
  for (const int n : {4, 8, 12}) ASSERT_TRUE(tick_x.count(n)) << n;
  const auto circles = elements(groups(svg, "<g class=\"markers\">")[0], "circle");
  ASSERT_EQ(circles.size(), 9u);
  std::set<double> xs;
  for (const auto& m : circles) {
    const double x = attr(m, "cx");
    xs.insert(x);
    EXPECT_TRUE(x == tick_x[4] || x == tick_x[8] || x == tick_x[12]) << m;
  }
  EXPECT_EQ(xs.size(), 3u);
  // Each series' line runs through the tick positions in order.
  for (const auto& l : elements(groups(svg, "<g class=\"lines\">")[0], "polyline")) {
    std::smatch m;
    ASSERT_TRUE(std::regex_search(l, m, std::regex("points=\"([-0-9.]+),[-0-9.]+ ([-0-9.]+),[-0-9.]+ ([-0-9.]+),")));
    EXPECT_EQ(std::stod(m[1]), tick_x[4]);
    EXPECT_EQ(std::stod(m[2]), tick_x[8]);
    EXPECT_EQ(std::stod(m[3]), tick_x[12]);
  }
}

// A survey varying the direction and the degree: one panel per setting in every group, the
// panels sharing both axes and the group one legend naming each device entry once.
TEST(SurveyCharts, OnePanelPerSetting) {
  std::vector<SurveyRow> rows;
  for (const bool inverse : {false, true})
    for (const std::string approx : {"none", "2", "4"})
      for (const auto& r : survey_rows({"line:*", "grid:*"}, {6, 12, 18})) {
        SurveyRow x = r;
        x.inverse = inverse;
        x.asked_approx = approx;
        x.cx_count += inverse ? 7 : 0;
        rows.push_back(x);
      }
  const auto charts = survey_charts(rows);
  ASSERT_EQ(charts.size(), 3u);
  for (const auto& g : charts) {
    ASSERT_EQ(g.panels.size(), 6u);  // 2 directions x 3 degrees
    std::set<std::string> titles;
    for (const auto& p : g.panels) {
      titles.insert(p.title);
      ASSERT_EQ(p.series.size(), 2u);
      EXPECT_EQ(p.series[0].name, "line:*");
      EXPECT_EQ(p.series[1].style, 1);
      ASSERT_TRUE(p.y_span && g.panels[0].y_span);
      EXPECT_EQ(p.y_span->x, g.panels[0].y_span->x);
      EXPECT_EQ(p.y_span->y, g.panels[0].y_span->y);
    }
    EXPECT_EQ(titles.size(), 6u);
    EXPECT_TRUE(titles.count("inverse, degree 2"));
  }
  const std::string svg = survey_svg(rows);
  std::string why;
  EXPECT_TRUE(well_formed(svg, why)) << why;
  EXPECT_EQ(groups(svg, "<g class=\"chart\">").size(), 18u);
  const auto legends = groups(svg, "<g class=\"legend\">");
  ASSERT_EQ(legends.size(), 3u);
  for (const auto& l : legends) EXPECT_EQ(elements(l, "text").size(), 2u);
}

// A centred text rendered by an independent renderer (librsvg's rsvg-convert): the ink of the
// digits is centred on the y asked for. The PNG is decoded by a small stdlib-only script (chunks,
// zlib and the five row filters of ISO/IEC 15948, PNG, sections 5 and 9).
TEST(SvgDocument, MiddleTextIsCentredWhenRendered) {
  if (!std::filesystem::exists("/usr/bin/rsvg-convert") || !std::filesystem::exists("/usr/bin/python3"))
    GTEST_SKIP() << "rsvg-convert or python3 not installed";
  SvgDocument doc(400, 100, "t");
  doc.rect(0, 0, 400, 100, SvgPaint{"#ffffff"});
  SvgFont f{40, "start", "#000000"};
  f.middle = true;
  doc.text(10, 50, "0123456789", f);
  const std::string svg = doc.str();
  EXPECT_EQ(svg.find("dominant-baseline"), std::string::npos);  // not honoured by every renderer
  const auto dir = testing::temp_dir();
  testing::write_file(dir / "t.svg", svg);
  testing::write_file(dir / "ink.py", R"(import struct, sys, zlib
d = open(sys.argv[1], 'rb').read()
assert d[:8] == b'\x89PNG\r\n\x1a\n'
pos, idat = 8, b''
while pos < len(d):
    n, = struct.unpack('>I', d[pos:pos + 4]); kind = d[pos + 4:pos + 8]; body = d[pos + 8:pos + 8 + n]; pos += 12 + n
    if kind == b'IHDR': w, h, depth, ctype = struct.unpack('>IIBB', body[:10])
    elif kind == b'IDAT': idat += body
bpp = {2: 3, 6: 4}[ctype]; stride = w * bpp; raw = zlib.decompress(idat); prev = bytearray(stride); rows = []; i = 0
for y in range(h):
    f = raw[i]; line = bytearray(raw[i + 1:i + 1 + stride]); i += 1 + stride
    for x in range(stride):
        a = line[x - bpp] if x >= bpp else 0; b = prev[x]; c = prev[x - bpp] if x >= bpp else 0
        if f == 1: line[x] = (line[x] + a) & 255
        elif f == 2: line[x] = (line[x] + b) & 255
        elif f == 3: line[x] = (line[x] + (a + b) // 2) & 255
        elif f == 4:
            p = a + b - c; pa, pb, pc = abs(p - a), abs(p - b), abs(p - c)
            line[x] = (line[x] + (a if pa <= pb and pa <= pc else b if pb <= pc else c)) & 255
    rows.append(line); prev = line
ink = [y for y in range(h) if any(rows[y][x * bpp] < 128 for x in range(w))]
print(ink[0], ink[-1] + 1)
)");
  const std::string cmd = "/usr/bin/rsvg-convert -o '" + (dir / "t.png").string() + "' '" + (dir / "t.svg").string() +
                          "' && /usr/bin/python3 '" + (dir / "ink.py").string() + "' '" + (dir / "t.png").string() + "' > '" +
                          (dir / "ink.txt").string() + "'";
  ASSERT_EQ(std::system(cmd.c_str()), 0);
  std::istringstream in(testing::read_file(dir / "ink.txt"));
  double top = 0, bottom = 0;
  in >> top >> bottom;
  EXPECT_NEAR((top + bottom) / 2, 50, 1.5) << top << " " << bottom;
  EXPECT_NEAR(bottom - top, 2 * kTextMiddleEm * 40, 2.0);  // the digits' height, 0.729 em
  std::filesystem::remove_all(dir);
}

}  // namespace
}  // namespace qftplan
