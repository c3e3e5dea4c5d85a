#include "svg_probe.hpp"

#include <cmath>
#include <regex>

namespace qftplan::testing {

double attr(const std::string& element, const std::string& name) {
  const std::regex re("\\s" + name + "=\"([-0-9.e]+)\"");
  std::smatch m;
  return std::regex_search(element, m, re) ? std::stod(m[1]) : std::nan("");
}

std::vector<std::string> elements(const std::string& svg, const std::string& tag) {
  std::vector<std::string> out;
  const std::regex re("<" + tag + "\\s[^>]*>([^<]*</" + tag + ">)?");
  for (auto it = std::sregex_iterator(svg.begin(), svg.end(), re); it != std::sregex_iterator(); ++it) out.push_back(it->str());
  return out;
}

std::string text_of(const std::string& element) {
  const auto a = element.find('>'), b = element.rfind('<');
  return element.substr(a + 1, b - a - 1);
}

}  // namespace qftplan::testing
