#pragma once
/// \file statevector.hpp
/// A small dense state-vector simulator (used by the checker for registers up to ~20 qubits).

#include <complex>
#include <vector>

#include "qftplan/core/gate.hpp"

namespace qftplan {

/// Amplitudes of `qubits` qubits; basis index bit k is qubit k (little-endian).
class StateVector {
 public:
  explicit StateVector(int qubits);
  int qubits() const { return n_; }
  std::vector<std::complex<double>>& amplitudes() { return a_; }
  const std::vector<std::complex<double>>& amplitudes() const { return a_; }
  /// Sets the computational basis state |index>.
  void set_basis(std::size_t index);
  /// Applies a gate whose q0/q1 are indices 0..qubits-1 of this vector (measure is not allowed).
  void apply(const Gate& g);

 private:
  int n_;
  std::vector<std::complex<double>> a_;
};

/// |<a|b>|, the overlap magnitude (1 means equal up to a global phase for unit vectors).
double overlap(const std::vector<std::complex<double>>& a, const std::vector<std::complex<double>>& b);

}  // namespace qftplan
