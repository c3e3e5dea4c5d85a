#include "qftplan/svg/svg_palette.hpp"

#include <algorithm>
#include <array>
#include <cctype>
#include <cmath>

#include <fmt/format.h>

namespace qftplan {

const std::vector<std::string>& okabe_ito_colours() {
  // Okabe and Ito (2002): blue #0072B2, vermillion #D55E00, bluish green #009E73, reddish purple
  // #CC79A7, orange #E69F00, sky blue #56B4E9, black #000000, yellow #F0E442. Yellow comes last:
  // it is the hardest to see on white.
  static const std::vector<std::string> c = {"#0072B2", "#D55E00", "#009E73", "#CC79A7",
                                             "#E69F00", "#56B4E9", "#000000", "#F0E442"};
  return c;
}

std::string series_colour(std::size_t i) { return okabe_ito_colours()[i % okabe_ito_colours().size()]; }

std::string series_dash(std::size_t i) {
  static const std::array<const char*, 4> dashes = {"", "7 4", "2 3", "9 3 2 3"};
  return dashes[(i / okabe_ito_colours().size()) % dashes.size()];
}

double relative_luminance(const std::string& colour) {
  if (colour.size() != 7 || colour[0] != '#' ||
      !std::all_of(colour.begin() + 1, colour.end(), [](char c) { return std::isxdigit(static_cast<unsigned char>(c)); }))
    return 0;
  // WCAG 2.1: each 8-bit channel to [0, 1], then the sRGB transfer function undone, then weighted.
  auto channel = [&](std::size_t at) {
    const double c = std::stoi(colour.substr(at, 2), nullptr, 16) / 255.0;
    return c <= 0.03928 ? c / 12.92 : std::pow((c + 0.055) / 1.055, 2.4);
  };
  return 0.2126 * channel(1) + 0.7152 * channel(3) + 0.0722 * channel(5);
}

double contrast_ratio(const std::string& a, const std::string& b) {
  const double la = relative_luminance(a), lb = relative_luminance(b);
  return (std::max(la, lb) + 0.05) / (std::min(la, lb) + 0.05);
}

bool needs_outline(const std::string& colour) { return contrast_ratio(colour, "#FFFFFF") < 3.0; }

std::string ramp_colour(double t) {
  if (!std::isfinite(t)) t = 0;
  t = std::clamp(t, 0.0, 1.0);
  // Three stops of decreasing lightness; linear interpolation between neighbours.
  struct Rgb {
    double r, g, b;
  };
  static const std::array<Rgb, 3> stops = {Rgb{196, 214, 234}, Rgb{86, 128, 190}, Rgb{18, 36, 74}};
  const double s = t * (stops.size() - 1);
  const std::size_t i = std::min<std::size_t>(static_cast<std::size_t>(s), stops.size() - 2);
  const double f = s - static_cast<double>(i);
  auto mix = [&](double a, double b) { return static_cast<int>(std::lround(a + (b - a) * f)); };
  return fmt::format("#{:02X}{:02X}{:02X}", mix(stops[i].r, stops[i + 1].r), mix(stops[i].g, stops[i + 1].g),
                     mix(stops[i].b, stops[i + 1].b));
}

}  // namespace qftplan
