#pragma once
/// \file chain_qft.hpp
/// Emitting a QFT network onto a chain of physical qubits.

#include <span>
#include <vector>

#include "qftplan/core/gate.hpp"
#include "qftplan/core/qft_spec.hpp"
#include "qftplan/networks/qft_network.hpp"

namespace qftplan {

/// Where the register's bits start and end (the contract with downstream tools).
struct QubitMaps {
  std::vector<int> placement;        ///< physical qubit holding input bit k at the start
  std::vector<int> final_placement;  ///< physical qubit holding output bit k at the end
};

/// The maps that emit_chain_qft will produce, without emitting.
QubitMaps chain_maps(const QftSpec& spec, const QftNetwork& network, std::span<const int> chain);

/// Streams the QFT of `spec` on `chain` (chain[p] = physical qubit at position p, consecutive ones
/// coupled) into `sink` as h, cp, swap and cp_swap gates (the parity network: parity_qft.hpp); the
/// inverse runs the network backwards with negated angles. Returns the qubit maps.
QubitMaps emit_chain_qft(const QftSpec& spec, const QftNetwork& network, std::span<const int> chain, GateSink& sink);

}  // namespace qftplan
