#pragma once
/// \file device_summary.hpp
/// The numbers `qftplan device --summary` prints.

#include <string>
#include <vector>

#include "qftplan/device/device.hpp"

namespace qftplan {

/// Smallest and largest value of one calibration quantity over the qubits or couplers.
struct Range {
  double min = 0;
  double max = 0;
};

/// A qubit (one id) or coupler (two ids) out of service, and why ("disabled", "error 1", ...).
struct PartOutOfService {
  std::vector<int> qubits;
  std::string reason;
};

/// Graph and calibration figures of a device. The graph figures (degrees, diameter, components,
/// bipartiteness) and the calibration ranges are those of the parts in service.
struct DeviceSummary {
  std::string name;
  int qubits = 0;    ///< every qubit, in service or not
  int couplers = 0;  ///< every coupler, in service or not
  std::vector<PartOutOfService> out_of_service;  ///< qubits first, then couplers, in file order
  int min_degree = 0;
  int max_degree = 0;
  int diameter = 0;         ///< largest hop distance within a component (a lower bound above 5000 qubits)
  int components = 0;
  int largest_component = 0;
  bool bipartite = false;
  std::string native_2q;
  bool calibrated = false;
  Range error_1q, error_2q, error_readout, t1_us, t2_us, duration_1q_ns, duration_2q_ns;
};

/// Computes the summary: the diameter is exact up to 5000 qubits, a double-sweep lower bound above.
DeviceSummary summarize(const Device& device);
/// Human-readable multi-line text.
std::string format_summary(const DeviceSummary& s);

}  // namespace qftplan
