#pragma once
// Local improvement of a virtual line (private to the spine strategy, spine_layout.cpp): qubits and
// short runs of the line are moved next to a qubit they are coupled to, or a stretch of the line is
// reversed, whenever that lowers the weighted detour cost the chain networks pay on the line.

#include <cstdint>
#include <vector>

#include "qftplan/device/device.hpp"
#include "qftplan/sinks/detour_sink.hpp"

namespace qftplan {

class BudgetPoll;

/// Hop distances between the qubits of a line, through qubits of the line only (detours never leave
/// the register's qubits).
class LineDistances {
 public:
  LineDistances(const Device& device, const std::vector<int>& line);
  /// Hops from physical qubit a to physical qubit b (both on the line); kFar when not joined.
  int operator()(int a, int b) const {
    return dist_[static_cast<std::size_t>(index_[static_cast<std::size_t>(a)]) * size_ +
                 static_cast<std::size_t>(index_[static_cast<std::size_t>(b)])];
  }
  /// Whether physical qubit q is on the line.
  bool contains(int q) const { return index_[static_cast<std::size_t>(q)] >= 0; }
  static constexpr int kFar = 1 << 14;

 private:
  std::size_t size_;
  std::vector<int> index_;          // line index of a physical qubit (-1: not on the line)
  std::vector<std::uint16_t> dist_;  // size_ x size_
};

/// The weighted detour cost of `line`, the sum over line pairs p of (gates on the pair, about
/// n - p) x (CX of one detour): a pair d hops apart costs 6 (d - 1) CX a gate (two SWAPs per qubit
/// between, out and back), 4 fewer when `fused` and one end can step aside onto its other line
/// neighbour along a shortest path (that SWAP fuses with the parity step the network ran on the same
/// pair just before; sinks/detour_sink.hpp). Returns -1 when some pair is not joined at all.
long long line_cost(const Device& device, const LineDistances& dist, const std::vector<int>& line, bool fused);

/// Lowers line_cost(line) by local moves until none helps or the poll stops (deterministic): for each
/// qubit at the end of an uncoupled line pair and each qubit coupled to it, the run of one to three
/// line qubits ending or starting there is moved (as it is or reversed) beside that qubit, or the
/// stretch of line between them is reversed so that the two become line neighbours. The first
/// improving move is kept; the moves stop after a fixed amount of work. Returns the improved line (a
/// permutation of `line`).
std::vector<int> polish_line(const Device& device, const LineDistances& dist, std::vector<int> line, bool fused,
                             BudgetPoll& poll);

/// The detours of `line` for its cost above: for each uncoupled line pair a shortest path through
/// line qubits, starting with the step aside that fuses when there is one.
std::vector<Detour> line_detours_by_distance(const Device& device, const LineDistances& dist,
                                             const std::vector<int>& line, bool fused);

}  // namespace qftplan
