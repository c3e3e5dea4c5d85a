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

/// A colour on our sequential ramp for t in [0, 1] (clamped): light blue-grey (low) to dark navy
/// (high), monotone in lightness so that it reads in grey scale and with colour-vision deficiency.
std::string ramp_colour(double t);

/// The colour that marks a plan's chain (Okabe-Ito vermillion, apart from the blue ramp).
inline constexpr const char* kHighlightColour = "#D55E00";

}  // namespace qftplan
