#pragma once
/// \file device.hpp
/// The device graph: qubits, couplers, calibration and drawing positions. A value type built once
/// (by the YAML loader or a lattice generator) and read by planners, the noise model and drawings.

#include <cstdint>
#include <optional>
#include <span>
#include <string>
#include <vector>

namespace qftplan {

/// The two-qubit gate a chip executes natively.
enum class TwoQubitGate { cx, cz };

/// Lower-case name used in files and reports ("cx", "cz").
const char* two_qubit_gate_name(TwoQubitGate g);

/// Calibration values as written in a file: every field may be absent.
struct CalibrationValues {
  std::optional<double> error_1q;        ///< probability of error per one-qubit gate
  std::optional<double> error_2q;        ///< probability of error per two-qubit gate
  std::optional<double> error_readout;   ///< probability of a wrong readout
  std::optional<double> duration_1q_ns;  ///< one-qubit gate time, ns
  std::optional<double> duration_2q_ns;  ///< two-qubit gate time, ns
  std::optional<double> t1_us;           ///< energy relaxation time, microseconds
  std::optional<double> t2_us;           ///< dephasing time, microseconds
  std::optional<double> duration_readout_ns;  ///< a mid-circuit measurement, ns
  std::optional<double> feed_forward_ns;      ///< from a measurement's end to a gate conditioned on it, ns
  bool operator==(const CalibrationValues&) const = default;
  bool empty() const;
};

/// Per-qubit calibration override (as written).
struct QubitOverride {
  int id = 0;
  std::optional<double> error_1q, error_readout, duration_1q_ns, t1_us, t2_us;
  std::optional<double> duration_readout_ns, feed_forward_ns;  ///< dynamic circuits (see CalibrationValues)
  bool disabled = false;  ///< `disabled: true`: out of service, kept in the file, never planned on
  bool operator==(const QubitOverride&) const = default;
};

/// An undirected coupler between qubits `a` < `b`, with optional own calibration.
struct Coupler {
  int a = 0;
  int b = 0;
  std::optional<double> error;        ///< two-qubit gate error on this coupler
  std::optional<double> duration_ns;  ///< two-qubit gate time on this coupler
  bool disabled = false;              ///< `disabled: true`: out of service, kept in the file, never planned on
  bool operator==(const Coupler&) const = default;
};

/// A drawing position.
struct Point {
  double x = 0;
  double y = 0;
  bool operator==(const Point&) const = default;
};

/// Filled-in calibration of one qubit (defaults applied).
struct QubitCalibration {
  double error_1q = 0;
  double error_readout = 0;
  double duration_1q_ns = 0;
  double t1_us = 0;  ///< +infinity when unknown
  double t2_us = 0;  ///< +infinity when unknown
  double duration_readout_ns = 0;  ///< a mid-circuit measurement of this qubit, ns
  /// Latency from the end of a measurement of this qubit to the start of a gate conditioned on its
  /// outcome, ns; absent: the device offers no feed-forward from this qubit.
  std::optional<double> feed_forward_ns;
};

/// Filled-in calibration of one coupler (defaults applied).
struct CouplerCalibration {
  double error = 0;
  double duration_ns = 0;
};

/// Values used when neither the device defaults nor an override give one (common practice for
/// superconducting chips; an ideal chip has no errors and no decoherence).
inline constexpr double kDefaultDuration1qNs = 35.0;
inline constexpr double kDefaultDuration2qNs = 300.0;
/// A measurement's length when a device gives none (common practice: superconducting readout takes
/// about a microsecond; a value from memory, not from a source).
inline constexpr double kDefaultDurationReadoutNs = 1000.0;

/// Largest device accepted anywhere (files and built-in lattices).
inline constexpr int kMaxDeviceQubits = 1'000'000;
/// Longest gate time accepted, in ns (one second): keeps every schedule sum far from overflowing.
inline constexpr double kMaxGateDurationNs = 1e9;

/// Everything a device description holds, as written; `Device` validates and indexes it.
struct DeviceDescription {
  std::string name;
  int qubits = 0;
  std::vector<Coupler> couplers;
  CalibrationValues calibration;
  std::vector<QubitOverride> qubit_calibration;
  std::vector<std::optional<Point>> positions;  ///< empty, or one entry per qubit
  std::optional<TwoQubitGate> native_2q;        ///< absent means cx
  bool operator==(const DeviceDescription&) const = default;
};

/// Why lifetimes `t1_us`, `t2_us` (of `who`, e.g. "qubit 3") are impossible, or empty: T2 <= 2 T1 always
/// holds, since pure dephasing cannot be negative (1/T2 = 1/(2 T1) + 1/T_phi; Nielsen and Chuang,
/// "Quantum Computation and Quantum Information", 2000, section 8.3, from memory).
std::string lifetime_violation(std::optional<double> t1_us, std::optional<double> t2_us, const std::string& who);

/// A validated, indexed device graph. Qubits are 0..qubit_count()-1; couplers are undirected.
///
/// Parts out of service: a qubit written `disabled: true`, or whose one-qubit error is 1; a coupler
/// written `disabled: true`, whose two-qubit error is 1 (certain failure), or touching a qubit out of
/// service. They stay in description() and couplers() (files, summaries, drawings), but the graph
/// (neighbours, degree, coupled, coupler_index, distances_from, components, diameter) is the graph of
/// the parts in service only: this is the one place that decides what planning may use.
class Device {
 public:
  /// Validates (ids in range, no self-loops or duplicates, rates in [0,1], positive times, T2 <= 2 T1) and
  /// indexes the description. Throws InputError with a plain message on a violation.
  explicit Device(DeviceDescription description);

  const DeviceDescription& description() const { return d_; }
  const std::string& name() const { return d_.name; }
  int qubit_count() const { return d_.qubits; }
  int coupler_count() const { return static_cast<int>(d_.couplers.size()); }
  const std::vector<Coupler>& couplers() const { return d_.couplers; }
  TwoQubitGate native_2q() const { return d_.native_2q.value_or(TwoQubitGate::cx); }

  /// False for a qubit out of service (see the class comment): no plan may use it.
  bool usable(int q) const { return qubit_on_[q] != 0; }
  /// False for a coupler (index into couplers()) out of service.
  bool coupler_usable(int coupler) const { return coupler_on_[coupler] != 0; }
  /// Qubits in service.
  int usable_qubit_count() const { return usable_qubits_; }
  /// Couplers in service.
  int usable_coupler_count() const { return usable_couplers_; }
  /// True when some qubit or coupler is out of service.
  bool has_parts_out_of_service() const { return usable_qubits_ < d_.qubits || usable_couplers_ < coupler_count(); }
  /// Why qubit `q` is out of service ("disabled", "error_1q 1"), or empty when it is in service.
  std::string out_of_service_reason(int q) const;
  /// Why a coupler (index into couplers()) is out of service ("disabled", "error 1", "qubit 3 out of
  /// service"), or empty when it is in service.
  std::string coupler_out_of_service_reason(int coupler) const;

  /// Neighbours of `q` over couplers in service, sorted ascending.
  std::span<const int> neighbours(int q) const {
    return {adj_.data() + offsets_[q], adj_.data() + offsets_[q + 1]};
  }
  int degree(int q) const { return offsets_[q + 1] - offsets_[q]; }
  /// Index into couplers() of the coupler in service joining `a` and `b`, or -1.
  int coupler_index(int a, int b) const;
  bool coupled(int a, int b) const { return coupler_index(a, b) >= 0; }

  /// Breadth-first hop distances from `source`; -1 for unreachable qubits.
  std::vector<int> distances_from(int source) const;
  /// Index into couplers() of the coupler joining `a` and `b`, in service or not, or -1.
  int any_coupler_index(int a, int b) const;
  /// Component id of every qubit (0-based, in order of smallest member) and the count, over couplers in
  /// service: a qubit out of service is a component of its own (planners skip it by usable()).
  std::pair<std::vector<int>, int> components() const;
  /// Largest finite hop distance between two qubits of the same component.
  int diameter() const;

  /// True when the description carries any calibration value at all.
  bool has_calibration() const;
  QubitCalibration qubit_calibration(int q) const;
  CouplerCalibration coupler_calibration(int coupler) const;
  /// Calibration of the coupler joining a and b (which must be coupled).
  CouplerCalibration coupler_calibration(int a, int b) const;

  bool has_positions() const { return !d_.positions.empty(); }
  std::optional<Point> position(int q) const;

  bool operator==(const Device& other) const { return d_ == other.d_; }

 private:
  void index_service();  // fills the in-service flags and restricts the graph to them

  DeviceDescription d_;
  std::vector<int> offsets_;          // CSR: neighbours of q are adj_[offsets_[q] .. offsets_[q+1])
  std::vector<int> adj_;
  std::vector<int> adj_coupler_;      // coupler index parallel to adj_
  std::vector<int> override_of_;      // index into qubit_calibration, or -1
  std::vector<int> all_offsets_, all_adj_, all_adj_coupler_;  // the same CSR over every coupler, in service or not
  std::vector<char> qubit_on_, coupler_on_;  // 1 where in service
  int usable_qubits_ = 0, usable_couplers_ = 0;
};

}  // namespace qftplan
