#pragma once
/// \file svg_palette.hpp
/// Colours of our drawings: a colour-blind-safe set for series and a light-to-dark ramp for values.

#include <cstddef>
#include <string>
#include <vector>

namespace qftplan {

/// The eight colours of Okabe and Ito ("Color Universal Design (CUD): how to make figures and
/// presentations that are friendly to colorblind people", 2002), ordered for series: blue,
/// vermillion, bluish green, reddish purple, orange, sky blue, black, yellow.
const std::vector<std::string>& okabe_ito_colours();

/// The colour of series i (cycling through okabe_ito_colours).
std::string series_colour(std::size_t i);

/// The stroke-dasharray of series i: solid for the first eight, then dashed patterns, so that
/// series sharing a colour still differ.
std::string series_dash(std::size_t i);

/// Relative luminance of an sRGB colour "#RRGGBB" (W3C, Web Content Accessibility Guidelines 2.1,
/// 2018, definition "relative luminance"): 0 for black, 1 for white.
double relative_luminance(const std::string& colour);

/// Contrast ratio (L1 + 0.05) / (L2 + 0.05) of two colours, lighter over darker (WCAG 2.1), 1 to 21.
double contrast_ratio(const std::string& a, const std::string& b);

/// True when `colour` on white falls below the 3:1 that WCAG 2.1 success criterion 1.4.11 (non-text
/// contrast) asks of graphical objects: such series get a dark outline (kOutlineColour) on lines and markers.
bool needs_outline(const std::string& colour);

/// The outline of light series colours (contrast 12.6:1 on white).
inline constexpr const char* kOutlineColour = "#333333";

/// A colour on our sequential ramp for t in [0, 1] (clamped): light blue-grey (low) to dark navy
/// (high), monotone in lightness so that it reads in grey scale and with colour-vision deficiency.
std::string ramp_colour(double t);

/// The colour that marks a plan's chain (Okabe-Ito vermillion, apart from the blue ramp).
inline constexpr const char* kHighlightColour = "#D55E00";

}  // namespace qftplan
