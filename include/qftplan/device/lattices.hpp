#pragma once
/// \file lattices.hpp
/// Built-in device lattices and their spec strings: line:N, ring:N, grid:RxC, heavy-hex:RxC, full:N.

#include <cstdint>
#include <string>
#include <vector>

#include "qftplan/device/device.hpp"

namespace qftplan {

/// Qubits 0..n-1 in a row, coupler (i, i+1). Positions (i, 0).
Device make_line(int n);
/// A line closed into a cycle (n >= 3). Positions on a circle.
Device make_ring(int n);
/// R x C grid, qubit r*C + c at row r, column c; couplers to the right and below.
Device make_grid(int rows, int cols);
/// Heavy-hexagon lattice of R rows and C columns of hexagonal cells: the vertices of a hexagonal
/// (brick-wall) lattice of cells, with one extra qubit on every hexagon edge. Degree <= 3, bipartite.
/// Numbering is documented in the README ("Built-in lattices").
Device make_heavy_hex(int rows, int cols);
/// Every pair coupled.
Device make_full(int n);

/// True when `text` has the form "family:args" with a known family name.
bool is_lattice_spec(const std::string& text);
/// Builds a lattice from its spec; throws InputError naming the spec on malformed input.
Device make_lattice(const std::string& spec);
/// The known family names, for help texts and errors.
const std::vector<std::string>& lattice_families();

/// A defective copy of `clean`, as the files of real chips describe them: `dead_qubits` qubits and
/// `broken_couplers` couplers removed at random (seeded), the remaining qubits renumbered in a random
/// order, no positions, no calibration; with `largest_component`, only the largest connected piece
/// is kept. Deterministic for a seed (tests, benchmarks and surveys of defective chips).
Device with_defects(const Device& clean, int dead_qubits, int broken_couplers, std::uint64_t seed,
                    bool largest_component = true);

}  // namespace qftplan
