#include "qftplan/core/approximation.hpp"

#include <cmath>
#include <numbers>

namespace qftplan {

double approx_error_bound(int n, std::optional<int> degree) {
  if (!degree || *degree >= n) return 0.0;
  double sum = 0;
  for (int k = std::max(1, *degree + 1); k <= n; ++k) {
    const double term = (n - k + 1) * 2.0 * std::sin(std::numbers::pi / std::ldexp(1.0, k));
    sum += term;
    if (term < 1e-300) break;  // the rest underflows
  }
  return sum;
}

double approx_fidelity_lower_bound(double e) {
  const double r = 1.0 - e * e / 2.0;
  return r <= 0 ? 0.0 : r * r;
}

}  // namespace qftplan
