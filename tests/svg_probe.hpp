#pragma once
// Helpers shared by the drawing and chart tests: reading elements and attributes out of SVG text.

#include <string>
#include <vector>

namespace qftplan::testing {

/// A numeric attribute of one element's text ("<circle ... r=\"4\"/>"); NaN when absent.
double attr(const std::string& element, const std::string& name);
/// Every element of a kind ("circle", "text", ...) in a piece of SVG, as its whole text.
std::vector<std::string> elements(const std::string& svg, const std::string& tag);
/// The text between an element's opening and closing tags.
std::string text_of(const std::string& element);

}  // namespace qftplan::testing
