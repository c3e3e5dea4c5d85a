#include "qftplan/svg/svg_layout.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>

namespace qftplan {

bool has_all_positions(const Device& device) {
  if (!device.has_positions()) return false;
  for (int q = 0; q < device.qubit_count(); ++q)
    if (!device.position(q)) return false;
  return true;
}

std::vector<Point> drawing_positions(const Device& device) {
  const int n = device.qubit_count();
  std::vector<Point> p(static_cast<std::size_t>(n));
  if (has_all_positions(device)) {
    for (int q = 0; q < n; ++q) p[q] = *device.position(q);
    return p;
  }
  // Start on a circle with neighbouring qubits one unit apart.
  const double radius = n > 1 ? 0.5 / std::sin(std::numbers::pi / n) : 0.0;
  for (int q = 0; q < n; ++q) {
    const double a = 2 * std::numbers::pi * q / std::max(n, 1);
    p[q] = {radius * std::cos(a), radius * std::sin(a)};
  }
  if (n < 3 || n > 600) return p;

  // Fruchterman and Reingold (1991): every pair repels with k^2/d, every coupler attracts with
  // d^2/k, and each step moves a qubit by at most a "temperature" that cools linearly to zero.
  // k = 1 makes a coupler about one unit long. Fixed step count and start: deterministic.
  const double k = 1.0;
  const int steps = 300;
  double temperature = radius / 4 + 1;
  const double cooling = temperature / steps;
  const double frame = std::max(radius, std::sqrt(static_cast<double>(n)));
  std::vector<Point> disp(static_cast<std::size_t>(n));
  for (int step = 0; step < steps; ++step) {
    std::fill(disp.begin(), disp.end(), Point{});
    for (int a = 0; a < n; ++a)
      for (int b = a + 1; b < n; ++b) {
        double dx = p[a].x - p[b].x, dy = p[a].y - p[b].y;
        double d2 = dx * dx + dy * dy;
        if (d2 < 1e-12) dx = 1e-3 * (a - b), dy = 1e-3, d2 = dx * dx + dy * dy;
        const double f = k * k / d2;  // (k^2/d) along the unit vector (dx, dy)/d
        disp[a].x += dx * f, disp[a].y += dy * f;
        disp[b].x -= dx * f, disp[b].y -= dy * f;
      }
    for (const auto& c : device.couplers()) {
      const double dx = p[c.a].x - p[c.b].x, dy = p[c.a].y - p[c.b].y;
      const double d = std::sqrt(dx * dx + dy * dy);
      const double f = d / k;  // (d^2/k) along the unit vector
      disp[c.a].x -= dx * f, disp[c.a].y -= dy * f;
      disp[c.b].x += dx * f, disp[c.b].y += dy * f;
    }
    for (int q = 0; q < n; ++q) {
      const double len = std::sqrt(disp[q].x * disp[q].x + disp[q].y * disp[q].y);
      if (len < 1e-12) continue;
      const double move = std::min(len, temperature);
      p[q].x += disp[q].x / len * move;
      p[q].y += disp[q].y / len * move;
      // The frame of the original method: isolated qubits (dead ones) must not drift away.
      p[q].x = std::clamp(p[q].x, -frame, frame);
      p[q].y = std::clamp(p[q].y, -frame, frame);
    }
    temperature = std::max(temperature - cooling, 1e-3);
  }
  return p;
}

}  // namespace qftplan
