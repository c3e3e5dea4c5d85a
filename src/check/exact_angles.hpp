#pragma once
// Private to the checker: exact angle sums that report overflow instead of wrapping, and
// WideAngle, a sum of angles of any spread of denominators kept exactly.

#include <cstdint>
#include <optional>
#include <vector>

#include "qftplan/core/angle.hpp"

namespace qftplan::proof {

/// a + b, or nothing when the exact sum does not fit one Angle (Angle::operator+ assumes
/// QFT-sized numerators and would wrap).
std::optional<Angle> add_angles(const Angle& a, const Angle& b);

/// a * c for an integer c, or nothing when the product does not fit one Angle.
std::optional<Angle> scale_angle(const Angle& a, std::int64_t c);

/// A sum of angles num * pi / 2^k with any spread of k, kept exactly as a binary fraction of a
/// turn: N / 2^K turns with K = 64 * (number of words), the words little-endian.
class WideAngle {
 public:
  /// Adds `a` exactly.
  void add(const Angle& a);
  /// True when the sum is a multiple of 2 pi.
  bool is_zero() const;
  /// The same angle as an Angle, when its reduced numerator (or that of its negative) fits.
  std::optional<Angle> narrow() const;

 private:
  void add_wide(const Angle& a);
  std::optional<Angle> narrow_wide() const;

  Angle small_;
  bool wide_ = false;
  std::vector<std::uint64_t> w_;
};

}  // namespace qftplan::proof
