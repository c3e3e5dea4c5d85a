#pragma once
/// \file gate_program.hpp
/// A short fixed sequence of gates on two operand slots: what one logical gate becomes in native
/// gates. Counting sinks replay it on the real operands, so a plan's native circuit is counted
/// without being written out gate by gate (issue 7: one step per logical gate on the hot path).

#include <array>
#include <cstdint>
#include <span>
#include <utility>
#include <vector>

#include "qftplan/core/gate.hpp"

namespace qftplan {

/// One gate of a program: its kind and the operand slot of each qubit (0: the logical gate's q0,
/// 1: its q1). Angles are left out: the counters that replay programs never read them.
struct ProgramStep {
  GateKind kind = GateKind::h;
  std::uint8_t a = 0;  ///< slot of q0
  std::uint8_t b = 0;  ///< slot of q1 (equal to a for one-qubit steps)
};

/// A 2 x 2 matrix over the max-plus semiring: applied to the ASAP levels (l0, l1) of the two slots
/// it gives new l_i = max_j (l_j + m[i][j]). Running a sequence of gates is multiplying their
/// matrices, so a whole program's effect on the levels is one matrix (Baccelli, Cohen, Olsder and
/// Quadrat, "Synchronization and Linearity", 1992, chapter 3: ASAP schedules are max-plus linear).
struct MaxPlus2 {
  static constexpr long long kNone = -(1LL << 60);  ///< minus infinity
  long long m[2][2] = {{0, kNone}, {kNone, 0}};    ///< identity
  /// The matrix of `first` then this.
  MaxPlus2 after(const MaxPlus2& first) const;
  std::pair<long long, long long> apply(long long l0, long long l1) const {
    return {std::max(l0 + m[0][0], l1 + m[0][1]), std::max(l0 + m[1][0], l1 + m[1][1])};
  }
};

/// The native gates of one logical gate, in emission order, with what they do to counts and depths.
class GateProgram {
 public:
  static constexpr int kMaxSteps = 16;
  GateProgram() = default;
  /// The program of `steps` (at most kMaxSteps).
  explicit GateProgram(std::span<const ProgramStep> steps);
  std::span<const ProgramStep> view() const { return {steps_.data(), static_cast<std::size_t>(size_)}; }
  /// Some step acts on both slots.
  bool two_qubit() const { return two_qubit_; }
  /// Effect on the levels of all gates, and on the levels of two-qubit gates only.
  const MaxPlus2& levels() const { return levels_; }
  const MaxPlus2& levels_2q() const { return levels_2q_; }
  /// How many steps of each kind (only kinds that occur).
  std::span<const std::pair<GateKind, int>> kind_counts() const { return kind_counts_; }
  /// The qubit of a slot for a gate on (q0, q1).
  static int qubit(std::uint8_t slot, int q0, int q1) { return slot == 0 ? q0 : q1; }

 private:
  std::array<ProgramStep, kMaxSteps> steps_{};
  int size_ = 0;
  bool two_qubit_ = false;
  MaxPlus2 levels_, levels_2q_;
  std::vector<std::pair<GateKind, int>> kind_counts_;
};

}  // namespace qftplan
