#pragma once
/// \file parity_qft.hpp
/// The parity network (ours): the reversal network's meetings done with two CX each, the register
/// travelling along the chain as parities instead of being swapped.
///
/// Wires meet in the reversal network's order (Fowler, Devitt and Hollenberg, Quantum Inf. Comput. 4,
/// 237, 2004), but a meeting of a right-moving wire a with a left-moving wire b is one parity_step
/// (cx b->a; cx a->b; rz a, gate.hpp) instead of a fused controlled phase and SWAP. The right-mover a
/// carries y_a XOR y_(a-1) (y: output bits), the left-mover b carries x_b XOR y_a after meeting a
/// (x: input bits), so every meeting makes exactly the parity y_a XOR x_b the rotation between them
/// needs, and the rz on it is the rotation's parity term (a controlled phase c on bits u, v is
/// c/2 (u + v - (u XOR v))). The Hadamard of wire b meets x_b XOR y_(b-1): naming its output so that
/// the qubit holds y_b XOR y_(b-1) turns the Hadamard's phase into pi x_b y_b plus pi x_b y_(b-1)
/// (taken off the meeting of b-1 and b), pi y_(b-1) y_b (cancelled by an rz on y_b XOR y_(b-1)) and
/// pi y_(b-1). The one-bit terms go on x_b at the start and on y_a at the end, and a last CX ladder
/// turns the differences y_a XOR y_(a-1) back into y_a. The last wire is the exception: the ladder
/// reaches wire n-2 before the last Hadamard, so the ladder's last cx (from y_(n-2) onto
/// x_(n-1) XOR y_(n-2)) goes before that Hadamard, which then meets the plain x_(n-1): no cross terms,
/// so the last meeting carries its rotation alone and nothing follows the Hadamard (total depth
/// 5n - 4). Cost: n(n-1)/2 parity steps and n-1 CX, that is n^2 - 1 CX for the exact QFT of n qubits
/// (the fused network needs 3 n(n-1)/2), in 2n-1 block layers; the final placement is the reversal
/// network's.

#include <span>

#include "qftplan/networks/chain_qft.hpp"

namespace qftplan {

/// Streams the QFT of `spec` on `chain` with the parity network (`network` must be the reversal
/// network of spec's register and degree, as make_parity_network gives) as h, rz, cx and
/// parity_step gates; the inverse runs the circuit backwards. Returns the qubit maps.
QubitMaps emit_parity_qft(const QftSpec& spec, const QftNetwork& network, std::span<const int> chain, GateSink& sink);

/// Streams the QFT of `spec` on `chain` with the insertion network in parity form (`network` as
/// make_parity_insertion_network gives, Rendering::window) as h, rz and cx gates. Every wire past its
/// Hadamard holds y_w XOR y_next (the derivation is in window_parity_qft.cpp): a fused block and a
/// SWAP of a finished wire cost 2 CX, the last meeting before a Hadamard 1 and 2 more after it, and a
/// closing ladder n-1. The inverse runs the circuit backwards (kept in memory). Returns the maps.
QubitMaps emit_window_parity_qft(const QftSpec& spec, const QftNetwork& network, std::span<const int> chain,
                                 GateSink& sink);

/// CX gates emit_window_parity_qft writes for `network` (a dry run).
long long window_parity_cx(const QftNetwork& network);

}  // namespace qftplan
