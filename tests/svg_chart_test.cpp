// The SVG writer, tick placement, palette and survey charts.

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <regex>
#include <set>
#include <tuple>

#include "qftplan/survey_plots.hpp"
#include "qftplan/svg_chart.hpp"
#include "qftplan/svg_document.hpp"
#include "qftplan/svg_markers.hpp"
#include "qftplan/svg_palette.hpp"
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
  EXPECT_EQ(format_decade(-6), "10\u207B\u2076");
  EXPECT_EQ(format_decade(0), "1");
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
  // The first 24 series differ in (colour, marker, dash).
  std::set<std::tuple<std::string, int, std::string>> styles;
  for (std::size_t i = 0; i < 24; ++i) styles.insert({series_colour(i), static_cast<int>(series_marker(i)), series_dash(i)});
  EXPECT_EQ(styles.size(), 24u);
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
  r.depth_2q = 2 * n - 3;
  r.lower_bound_depth_2q = n - 1;
  r.asked_approx = "none";
  r.asked_strategy = "auto";
  r.log_esp = log_esp;
  if (log_esp) r.esp = std::exp(*log_esp);
  return r;
}

TEST(SurveyCharts, SeriesPerDeviceAndEspOnlyWhenCalibrated) {
  std::vector<SurveyRow> rows = {row("line:*", 4, 6, std::nullopt), row("line:*", 8, 28, std::nullopt),
                                 row("chip & <co>", 4, 6, -0.1), row("chip & <co>", 8, 28, -800.0)};
  rows.push_back(row("chip & <co>", 12, 0, std::nullopt));
  rows.back().ok = false;  // failed runs have no point
  const auto charts = survey_charts(rows);
  ASSERT_EQ(charts.size(), 3u);
  EXPECT_EQ(charts[0].series.size(), 2u);
  EXPECT_EQ(charts[0].series[1].points.size(), 2u);
  ASSERT_EQ(charts[2].series.size(), 1u);         // ESP: only the calibrated device
  EXPECT_EQ(charts[2].series[0].style, 1);          // keeps its colour from the other charts
  EXPECT_TRUE(charts[2].log_y);
  EXPECT_NEAR(charts[2].series[0].points[1].y, -800.0 / std::log(10.0), 1e-9);  // below double's range as esp
  ASSERT_TRUE(charts[1].reference.has_value());
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

}  // namespace
}  // namespace qftplan
