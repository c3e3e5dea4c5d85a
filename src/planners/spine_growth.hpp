#pragma once
// Growing a long main chain (the spine) inside one connected piece of a device, from the graph alone
// (no positions, any numbering). Private to the spine strategy (spine_layout.cpp).

#include <cstdint>
#include <vector>

#include "qftplan/device/device.hpp"

namespace qftplan {

class BudgetPoll;

/// A simple path inside the qubits with `inside[q]` set: the deepest branch of a depth-first tree
/// grown from `start` (neighbours with fewest free neighbours first, ties in a seeded random order).
std::vector<int> deepest_branch(const Device& device, const std::vector<char>& inside, int start, std::uint64_t seed);

/// Lengthens the simple path `spine` (inside `inside`) until no move below adds a qubit or the poll
/// stops: a detour of free qubits between two consecutive spine qubits replaces their coupler, an end
/// grows into the free qubits beyond it, and an end is rotated (Pósa) to open a new one.
void lengthen_spine(const Device& device, const std::vector<char>& inside, std::vector<int>& spine,
                    std::uint64_t seed, BudgetPoll& poll);

}  // namespace qftplan
