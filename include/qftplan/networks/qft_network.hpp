#pragma once
/// \file qft_network.hpp
/// QFT networks on a chain, written in processing-index terms (see qft_spec.hpp): which pairs of
/// wires meet, in what order, and whether they swap. A network knows nothing of the device; the
/// chain planner maps positions on the chain to physical qubits.

#include <array>
#include <functional>
#include <memory>
#include <span>
#include <string>
#include <vector>

#include "qftplan/core/qft_spec.hpp"

namespace qftplan {

/// One step of a network. Wires i < j are processing indices; for two-wire steps they sit on
/// neighbouring chain positions at that moment.
struct NetworkOp {
  enum class Kind : unsigned char { h, cp, swap, cp_swap };
  NetworkOp() = default;
  NetworkOp(Kind k, int wire_i, int wire_j = -1, bool undone = false) : kind(k), undo(undone), i(wire_i), j(wire_j) {}
  Kind kind = Kind::h;
  /// The step belongs to an inverse block transform (the block construction): its rotation is negated.
  bool undo = false;
  int i = 0;
  int j = -1;
};

/// A forward QFT network as an ordered sequence of chunks (small groups of steps), so that it can be
/// streamed forwards, or backwards for the inverse, without holding all its steps.
class QftNetwork {
 public:
  virtual ~QftNetwork() = default;
  /// Our name for the network ("reversal", "leapfrog", "adjacent", "hadamard-only").
  virtual std::string name() const = 0;
  virtual int chunk_count() const = 0;
  /// Appends the steps of chunk `c` in forward order to `out` (which is cleared first).
  virtual void chunk(int c, std::vector<NetworkOp>& out) const = 0;
  /// Streams the steps forwards to `visit`, one chunk at a time (the chunks of chunk(), in order).
  /// The default walks chunk(); a network that computes its steps by simulation streams them
  /// without keeping them all.
  virtual void for_each_chunk(const std::function<void(std::span<const NetworkOp>)>& visit) const;
  /// Chain position of every wire at the start (identity for all our networks).
  std::vector<int> initial_positions() const;
  /// Chain position of every wire at the end (by a dry run of the steps, unless a network knows it).
  virtual std::vector<int> final_positions() const;
  /// Steps of each kind, indexed by NetworkOp::Kind (h, cp, swap, cp_swap): by a dry run of the
  /// steps, unless the network knows them.
  virtual std::array<long long, 4> step_counts() const;
  /// Number of two-wire steps (blocks) and of those that swap.
  long long block_count() const;
  long long swap_count() const;
  /// How the chain planner turns the steps into gates.
  enum class Rendering {
    fused,   ///< one gate a step: h, cp, swap (3 CX), cp_swap (3 CX)
    parity,  ///< the reversal network's meetings as parity steps of 2 CX (parity_qft.hpp)
    window,  ///< the insertion network's steps on a chain of output differences (parity_qft.hpp)
  };
  virtual Rendering rendering() const { return Rendering::fused; }
  /// True when the rotations sit inside rz gates on parities (parity and window renderings).
  bool parity() const { return rendering() != Rendering::fused; }
  int wires() const { return wires_; }
  int max_distance() const { return d_; }

 protected:
  QftNetwork(int wires, int max_distance) : wires_(wires), d_(max_distance) {}
  int wires_;
  int d_;
};

/// The linear-nearest-neighbour QFT of Fowler, Devitt and Hollenberg (Quantum Inf. Comput. 4, 237,
/// 2004) with every controlled phase fused with a SWAP: the register reverses along the chain in
/// n(n-1)/2 blocks and 2n-3 layers. With an approximation, dropped rotations leave plain SWAPs.
std::unique_ptr<QftNetwork> make_reversal_network(int wires, int max_distance);

/// Our network for the approximate QFT with kept distance d: each wire travels right past the d
/// wires it must meet, leapfrogging the wires that have finished (at most 2d blocks per wire,
/// linear depth). Its steps are computed by simulation: streamed forwards without being kept, and
/// kept (O(n d) memory) once chunk() asks for random access (the inverse runs it backwards).
std::unique_ptr<QftNetwork> make_leapfrog_network(int wires, int max_distance);

/// Our network for the approximate QFT with kept distance d >= 2: the wires that still owe a rotation
/// to a later wire sit together (the window); each new wire walks into it from the right, meeting
/// every window wire, and the wire that finishes steps out to the left (qft_network.cpp). Fewer CX
/// than the leapfrog network at every degree (half at degree 3), two-qubit depth about 2n. Computed by
/// simulation like the leapfrog network.
std::unique_ptr<QftNetwork> make_insertion_network(int wires, int max_distance);

/// The insertion network in its parity form (ours): the finishing wire steps to the front of the
/// window first, and the steps are rendered on a chain of output differences (parity_qft.hpp), about
/// 4d CX a wire (the leapfrog network: 6d).
std::unique_ptr<QftNetwork> make_parity_insertion_network(int wires, int max_distance);

/// Ours: the first wire stays at the start of the chain and the reversal network of the other wires
/// runs beside it, each meeting the first with a plain controlled phase just before its Hadamard:
/// n(n-1)/2 blocks in 2n-3 layers like the reversal network, with n-1 SWAPs fewer.
std::unique_ptr<QftNetwork> make_anchored_network(int wires, int max_distance);

/// Ours: the reversal network's meetings as parity steps of 2 CX each (parity_qft.hpp); n^2 - 1 CX
/// for the exact QFT. Its steps, counts and positions are the reversal network's.
std::unique_ptr<QftNetwork> make_parity_network(int wires, int max_distance);

/// The block construction of the QFT (Kahanamoku-Meyer et al., arXiv:2505.00701, 2025) with blocks of m
/// wires: three layers of block transforms, each a reversal network on at most 2m neighbours
/// (blockwise_qft.hpp), so its depth depends on m, not on the register. The steps of the read-back layer
/// are marked `undo`.
std::unique_ptr<QftNetwork> make_blockwise_network(int wires, int block_length);

/// Distance d = 1: wires stay in order and only neighbours interact (n-1 controlled phases, no SWAP).
std::unique_ptr<QftNetwork> make_adjacent_network(int wires);

/// Distance d = 0: Hadamards only.
std::unique_ptr<QftNetwork> make_hadamard_network(int wires);

/// Which chain network to plan with (--network).
enum class NetworkChoice {
  automatic,  ///< choose_network(): of anchored, parity, insertion and leapfrog, the fewest native two-qubit gates
  reversal,   ///< the fused reversal network
  anchored,   ///< the fused reversal network of all wires but the first, beside it
  leapfrog,   ///< the fused leapfrog network (approximate degrees 3 .. n-1 only)
  insertion,  ///< the insertion network (approximate degrees 3 .. n-1 only)
  parity_insertion,  ///< the insertion network in parity form (approximate degrees 3 .. n-1 only)
  parity,     ///< the parity network
  blockwise,  ///< the block construction (arXiv:2505.00701), blocks of --approx M bits; never chosen by auto
};
/// Every choice, in the order --help lists them.
std::span<const NetworkChoice> network_choices();
/// "auto", "reversal", "anchored", "leapfrog", "insertion", "parity-insertion", "parity", "blockwise".
const char* network_choice_name(NetworkChoice c);
/// Parses a --network value; InputError listing the valid ones otherwise.
NetworkChoice parse_network_choice(const std::string& text);

/// Native two-qubit gates of a network when emitted, from its step counts (2 per cp, 3 per swap or
/// cp_swap; the parity network 2 per meeting and n-1 more).
long long network_native_cost(const QftNetwork& network);

/// The network qftplan uses for a spec: for degrees 1 and 2 the hadamard-only and adjacent networks;
/// otherwise, of the anchored, parity and (approximate only) insertion and leapfrog networks, the one with the
/// fewest native two-qubit gates (ties go to the anchored network, which has the lowest depth).
std::unique_ptr<QftNetwork> choose_network(const QftSpec& spec);
/// The network of `choice` for a spec. Degrees 1 and 2 need no meetings and get the hadamard-only
/// and adjacent networks, except for `reversal` and `parity`, built as named (they end in order);
/// `leapfrog` or `insertion` on a spec without such a network (exact, or
/// more steps than can be kept) is an InputError.
std::unique_ptr<QftNetwork> choose_network(const QftSpec& spec, NetworkChoice choice);

}  // namespace qftplan
