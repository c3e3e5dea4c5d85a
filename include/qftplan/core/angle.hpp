#pragma once
/// \file angle.hpp
/// Exact rotation angles of the form num * pi / 2^k, so that QFTs of thousands of qubits
/// (angles down to pi/2^4095) lose nothing.

#include <cstddef>
#include <cstdint>
#include <string>

namespace qftplan {

/// An angle num * pi / 2^log2_den, kept reduced (num odd unless log2_den == 0) and in (-pi, pi].
class Angle {
 public:
  constexpr Angle() = default;
  /// num * pi / 2^log2_den; reduced on construction.
  Angle(std::int64_t num, std::uint32_t log2_den);
  /// pi / 2^k.
  static Angle pi_over_pow2(std::uint32_t k) { return Angle(1, k); }

  std::int64_t num() const { return num_; }
  std::uint32_t log2_den() const { return log2_den_; }
  bool is_zero() const { return num_ == 0; }
  double radians() const;

  Angle operator-() const { return Angle(-num_, log2_den_); }
  /// Half of this angle (exact).
  Angle half() const { return Angle(num_, log2_den_ + 1); }
  /// Sum, exact while the two denominators are within 2^60 of each other (always so for QFT angles).
  Angle operator+(const Angle& o) const;
  Angle operator-(const Angle& o) const { return *this + (-o); }
  bool operator==(const Angle&) const = default;

  /// OpenQASM 3 text: "0", "pi", "-pi/2", "3*pi/2**5".
  std::string qasm3() const;
  /// OpenQASM 2 text with a decimal power-of-two denominator: "pi/4", "-3*pi/32".
  std::string qasm2() const;
  /// The most characters write_qasm3() writes.
  static constexpr std::size_t kMaxQasm3Chars = 48;
  /// Writes qasm3() at `out` (room for kMaxQasm3Chars) and returns the end (hot path of the writer).
  char* write_qasm3(char* out) const;
  /// Appends qasm2() to `out` without allocating a temporary.
  void append_qasm2(std::string& out) const;

 private:
  std::int64_t num_ = 0;
  std::uint32_t log2_den_ = 0;
};

/// Decimal text of 2^k (cached; exact for any k).
const std::string& pow2_decimal(std::uint32_t k);

}  // namespace qftplan
