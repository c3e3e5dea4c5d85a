#pragma once
/// \file end_order.hpp
/// Where the register's bits sit at the end: wherever the plan leaves them (`free`), or back on the
/// physical qubits that held the same bit index at the start (`same`: final_placement == placement),
/// by SWAPs appended to the plan.

#include <memory>
#include <string>
#include <utility>
#include <vector>

#include "qftplan/core/gate.hpp"
#include "qftplan/core/qft_spec.hpp"
#include "qftplan/device/device.hpp"
#include "qftplan/networks/chain_qft.hpp"
#include "qftplan/networks/qft_network.hpp"

namespace qftplan {

/// The end-order policy of `qftplan plan --end-order`.
enum class EndOrder { free, same };

/// Parses "free" / "same"; InputError listing the valid names otherwise.
EndOrder parse_end_order(const std::string& text);
/// "free" or "same".
const char* end_order_name(EndOrder order);

/// The adjacent transpositions that sort `keys` ascending (each entry p swaps positions p and p+1),
/// grouped in rounds of odd-even transposition sort (Knuth, The Art of Computer Programming vol. 3,
/// section 5.3.4; from memory): at most keys.size() rounds, and each swap removes exactly one
/// inversion, so the total is the inversion count, the fewest adjacent swaps that can sort.
std::vector<std::vector<int>> odd_even_sort_rounds(std::vector<long long> keys);

/// Number of inversions of `keys` (pairs p < q with keys[p] > keys[q]), by merge sort.
long long count_inversions(std::vector<long long> keys);

/// A network that ends with wire k at chain position n-1-k, which is what final_placement ==
/// placement asks of a network (see chain_maps; the same for the QFT and its inverse). Appends
/// odd-even transposition rounds of plain SWAPs to `inner`; a SWAP on the two wires of the inner
/// network's last step on both of them is merged into it (cp -> cp_swap, cp_swap -> cp, swap ->
/// nothing). Returns `inner` itself when it already ends in that order. Keeps all steps (O(steps)).
std::unique_ptr<QftNetwork> with_order_restored(std::unique_ptr<QftNetwork> inner);

/// SWAPs the network appended to restore the order (0 for networks not made by with_order_restored).
/// Merged ones are included: this counts adjacent transpositions.
long long end_swap_count(const QftNetwork& network);

/// The network qftplan uses for `spec` under an end order: choose_network(spec, choice) for `free`;
/// for `same`, a network chosen by name with its order restored, or (automatic) choose_network(spec)
/// when it ends in order, else the cheapest in native two-qubit gates of the reversal and parity
/// networks (both already in order) and choose_network(spec) with its order restored (ties go to the
/// reversal network).
std::unique_ptr<QftNetwork> choose_network(const QftSpec& spec, EndOrder order,
                                           NetworkChoice choice = NetworkChoice::automatic);

/// SWAPs on couplers of `device` that carry the content of physical qubit from[k] to to[k] for every
/// k (other qubits' contents may move anywhere). On a tree spanning the qubits involved, vertices are
/// settled leaves first: the content due at a vertex is walked to it along a shortest path through
/// unsettled qubits, then the vertex is left alone. On a path this is the inversion count (optimal).
/// Throws PlanningError when from and to are not in one connected component.
std::vector<std::pair<int, int>> route_permutation(const Device& device, const std::vector<int>& from,
                                                   const std::vector<int>& to);

/// Appends to a gate list on physical qubits the SWAPs that move output bit k from
/// maps.final_placement[k] back to maps.placement[k], merging each into the last gate on its two
/// qubits where possible (as with_order_restored does), and sets final_placement = placement.
/// Returns the number of SWAPs routed (merged ones included).
long long restore_order(const Device& device, std::vector<Gate>& gates, QubitMaps& maps);

}  // namespace qftplan
