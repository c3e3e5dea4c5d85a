#include "qftplan/device/device_check.hpp"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <map>
#include <unordered_map>
#include <utility>

#include <fmt/format.h>

namespace qftplan {
namespace {

bool probability(double v) { return v >= 0.0 && v <= 1.0; }
bool positive_time(double v) { return v > 0.0 && std::isfinite(v); }
/// T1 and T2 may be +infinity, meaning "not given".
bool positive_or_unset(double v) { return v > 0.0; }

}  // namespace

std::vector<std::string> check_device(const Device& device) {
  std::vector<std::string> problems;
  // One bad table entry tends to repeat across thousands of qubits; report the first few of each kind.
  std::map<std::string, int> repeats;
  const auto report = [&](const std::string& kind, std::string text) {
    if (++repeats[kind] <= 5) problems.push_back(std::move(text));
  };
  const int n = device.qubit_count();
  const auto& d = device.description();

  if (d.name.empty()) report("name", "the device has no name");
  if (n < 1) report("qubits", fmt::format("the device has {} qubits", n));

  // Coupler list: ids in range, normalized a < b, no duplicates, and found through the adjacency.
  std::unordered_map<std::uint64_t, int> seen;
  std::int64_t degree_sum = 0;
  for (int i = 0; i < device.coupler_count(); ++i) {
    const Coupler& c = device.couplers()[i];
    if (c.a < 0 || c.b >= n || c.a >= c.b) {
      report("coupler ids", fmt::format("coupler #{} [{}, {}] has ids out of range or not ordered", i, c.a, c.b));
      continue;
    }
    if (const auto [it, fresh] = seen.emplace(static_cast<std::uint64_t>(c.a) * n + c.b, i); !fresh)
      report("duplicate", fmt::format("coupler [{}, {}] is listed twice (#{} and #{})", c.a, c.b, it->second, i));
    if (device.any_coupler_index(c.a, c.b) != i || device.any_coupler_index(c.b, c.a) != i)
      report("lookup", fmt::format("coupler [{}, {}] is not found at its own index {} from both ends", c.a, c.b, i));
    // The graph holds exactly the couplers in service.
    if (device.coupled(c.a, c.b) != device.coupler_usable(i))
      report("service", fmt::format("coupler [{}, {}] is {} the graph but {} service", c.a, c.b,
                                    device.coupled(c.a, c.b) ? "in" : "not in",
                                    device.coupler_usable(i) ? "in" : "out of"));
    if (device.coupler_usable(i) && (!device.usable(c.a) || !device.usable(c.b)))
      report("service", fmt::format("coupler [{}, {}] is in service but touches a qubit out of service", c.a, c.b));
    if (c.error && !probability(*c.error))
      report("coupler error", fmt::format("coupler [{}, {}] has error {} outside [0, 1]", c.a, c.b, *c.error));
    if (c.duration_ns && !positive_time(*c.duration_ns))
      report("coupler time", fmt::format("coupler [{}, {}] has duration {} ns", c.a, c.b, *c.duration_ns));
  }

  // Adjacency: sorted, no self-loops, symmetric, and exactly the couplers in service.
  for (int q = 0; q < n; ++q) {
    const auto nbs = device.neighbours(q);
    degree_sum += static_cast<std::int64_t>(nbs.size());
    if (!std::is_sorted(nbs.begin(), nbs.end()) || std::adjacent_find(nbs.begin(), nbs.end()) != nbs.end())
      report("adjacency order", fmt::format("neighbours of qubit {} are not sorted and distinct", q));
    for (int nb : nbs) {
      if (nb < 0 || nb >= n || nb == q) {
        report("adjacency ids", fmt::format("qubit {} lists neighbour {}", q, nb));
        continue;
      }
      const auto back = device.neighbours(nb);
      if (!std::binary_search(back.begin(), back.end(), q))
        report("symmetry", fmt::format("qubit {} lists {} as a neighbour but not the other way round", q, nb));
      const int ci = device.coupler_index(q, nb);
      if (ci < 0 || std::minmax(q, nb) != std::minmax(device.couplers()[ci].a, device.couplers()[ci].b))
        report("adjacency couplers", fmt::format("qubits {} and {} are neighbours without a coupler", q, nb));
    }
  }
  if (degree_sum != 2 * static_cast<std::int64_t>(device.usable_coupler_count()))
    report("degree sum", fmt::format("degrees add up to {}, expected twice the {} couplers in service", degree_sum,
                                     device.usable_coupler_count()));

  // Calibration as applied, qubit by qubit and coupler by coupler.
  for (const auto& o : d.qubit_calibration)
    if (o.id < 0 || o.id >= n) report("override id", fmt::format("qubit_calibration names qubit {}", o.id));
  for (int q = 0; q < n; ++q) {
    const auto c = device.qubit_calibration(q);
    if (!probability(c.error_1q))
      report("error_1q", fmt::format("qubit {}: error_1q {} outside [0, 1]", q, c.error_1q));
    if (!probability(c.error_readout))
      report("error_readout", fmt::format("qubit {}: error_readout {} outside [0, 1]", q, c.error_readout));
    if (!positive_time(c.duration_1q_ns))
      report("duration_1q_ns", fmt::format("qubit {}: duration_1q_ns {} is not a positive time", q, c.duration_1q_ns));
    if (!positive_or_unset(c.t1_us)) report("t1", fmt::format("qubit {}: t1_us {} is not positive", q, c.t1_us));
    if (!positive_or_unset(c.t2_us)) report("t2", fmt::format("qubit {}: t2_us {} is not positive", q, c.t2_us));
    // Pure dephasing cannot be negative, so T2 <= 2 T1 (common practice; a physical bound).
    if (std::isfinite(c.t1_us) && std::isfinite(c.t2_us) && c.t2_us > 2.0 * c.t1_us)
      report("t2 > 2 t1", fmt::format("qubit {}: t2_us {} exceeds 2 * t1_us = {}", q, c.t2_us, 2.0 * c.t1_us));
  }
  for (int i = 0; i < device.coupler_count(); ++i) {
    const auto c = device.coupler_calibration(i);
    const auto& cp = device.couplers()[i];
    if (!probability(c.error))
      report("error_2q", fmt::format("coupler [{}, {}]: error {} outside [0, 1]", cp.a, cp.b, c.error));
    if (!positive_time(c.duration_ns))
      report("duration_2q_ns",
             fmt::format("coupler [{}, {}]: duration {} ns is not a positive time", cp.a, cp.b, c.duration_ns));
  }

  // Drawing positions: finite, and no two qubits drawn on the same spot.
  if (device.has_positions()) {
    if (static_cast<int>(d.positions.size()) != n)
      report("positions size", fmt::format("positions has {} entries for {} qubits", d.positions.size(), n));
    std::map<std::pair<double, double>, int> at;
    for (int q = 0; q < static_cast<int>(d.positions.size()); ++q) {
      const auto& p = d.positions[q];
      if (!p) continue;
      if (!std::isfinite(p->x) || !std::isfinite(p->y)) {
        report("position value", fmt::format("qubit {} has a non-finite position", q));
        continue;
      }
      if (const auto [it, fresh] = at.emplace(std::pair(p->x, p->y), q); !fresh)
        report("position clash",
               fmt::format("qubits {} and {} are drawn at the same position ({}, {})", it->second, q, p->x, p->y));
    }
  }
  for (const auto& [kind, count] : repeats)
    if (count > 5) problems.push_back(fmt::format("... and {} more problems of the kind '{}'", count - 5, kind));
  return problems;
}

}  // namespace qftplan
