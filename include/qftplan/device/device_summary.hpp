#pragma once
/// \file device_summary.hpp
/// The numbers `qftplan device --summary` prints.

#include <string>

#include "qftplan/device/device.hpp"

namespace qftplan {

/// Smallest and largest value of one calibration quantity over the qubits or couplers.
struct Range {
  double min = 0;
  double max = 0;
};

/// Graph and calibration figures of a device.
struct DeviceSummary {
  std::string name;
  int qubits = 0;
  int couplers = 0;
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
