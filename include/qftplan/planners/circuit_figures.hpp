#pragma once
/// \file circuit_figures.hpp
/// Streaming a planned circuit through the counting sinks (logical and native counters, the noise
/// model) and, when given, an output: the one place that wires those sinks, used to report a plan
/// and to score candidates while planning.

#include <map>
#include <optional>
#include <string>

#include "qftplan/device/device.hpp"
#include "qftplan/planners/planned_circuit.hpp"
#include "qftplan/qasm/qasm_writer.hpp"
#include "qftplan/sinks/native_gates.hpp"
#include "qftplan/sinks/noise_model.hpp"

namespace qftplan {

class RunBudget;

/// What a count needs besides the circuit: the request's gate set, measurement and file format.
struct CountSettings {
  GateSet gates = GateSet::cx;             ///< the gate set the output receives
  bool measure = false;                    ///< end with a measurement of every register qubit
  QasmVersion format = QasmVersion::v3;    ///< counts and depth of the emitted gates as this format spells them
  const RunBudget* budget = nullptr;       ///< Ctrl-C stops the stream (the deadline is not checked)
  bool peephole = true;                    ///< native gate sets: the peephole pass (sinks/peephole.hpp) on the stream
};

/// The figures of one streamed circuit (PlanReport documents each).
struct CircuitFigures {
  long long two_qubit_blocks = 0;
  long long swaps = 0;
  long long rotations = 0;
  long long depth_2q = 0;
  long long depth_2q_unfused = 0;
  long long depth = 0;                       ///< of the emitted gates
  long long cx_count = 0;                    ///< native two-qubit gates
  long long cx_depth = 0;
  std::map<std::string, long long> gate_counts;  ///< of the emitted gates, by their names in the file
  std::optional<long long> peephole_removed;  ///< gates the peephole pass took out of the emitted circuit; absent: no pass
  NoiseFigures noise;
};

/// Streams `circuit` (and the measurement when asked) into the counters and, when non-null,
/// `output` (in `settings.gates`), and returns the figures.
CircuitFigures count_circuit(const Device& device, const PlannedCircuit& circuit, const CountSettings& settings,
                             GateSink* output);

}  // namespace qftplan
