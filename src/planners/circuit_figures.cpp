#include "qftplan/planners/circuit_figures.hpp"

#include <memory>
#include <optional>
#include <vector>

#include "qftplan/core/run_budget.hpp"
#include "qftplan/sinks/circuit_metrics.hpp"
#include "qftplan/sinks/peephole.hpp"

namespace qftplan {

CircuitFigures count_circuit(const Device& device, const PlannedCircuit& circuit, const CountSettings& settings,
                             GateSink* output) {
  const int D = device.qubit_count();
  const TwoQubitGate native_gate = device.native_2q();
  const bool emitted_is_native = settings.gates == gate_set_of(native_gate);
  // The peephole pass rewrites native streams only (the logical gate set is written as planned), and not
  // circuits that measure as they go: it may move a gate past others on other qubits, and a conditioned
  // phase must stay after the measurement of its bit (such circuits have no two-qubit gate to gain on).
  const bool peephole = settings.peephole && settings.gates != GateSet::logical && !circuit.measures_itself();

  // Sinks: the fused stream feeds the logical counters (which also count the depth the blocks
  // would have unfused) and the native counters and the noise model. Without the peephole pass the
  // native gates are replayed as per-kind programs (the native gates themselves are made only for a
  // writer of them); with it, NativePeephole holds logical gates whole where the pass cannot touch
  // them (replayed as programs when they leave) and opens them into native gates where it can, and
  // the counters see what is left; a writer of the native gates is fed by it, so that the counts are
  // those of the file. The emitted circuit is the native one when the gate set is native, so then
  // those counters (and that pass) serve both; otherwise a second path rewrites the stream into the
  // emitted gate set (through a gate-level PeepholePass of its own).
  MetricsSink logical(D, /*unfused_depth=*/true), native(D);
  std::optional<MetricsSink> emitted_counter;
  if (!emitted_is_native) emitted_counter.emplace(D);
  NoiseSink noise(device, circuit.maps().placement, circuit.measures_itself());
  std::vector<GateSink*> emitted_targets;
  if (emitted_counter) emitted_targets.push_back(&*emitted_counter);
  if (output) emitted_targets.push_back(output);
  TeeSink emitted_tee(emitted_targets);

  std::unique_ptr<GateSink> to_native, emit_path, written_form;
  std::unique_ptr<PeepholePass> emitted_pass;
  NativePeephole* native_pass = nullptr;
  if (peephole) {
    auto p = std::make_unique<NativePeephole>(native_gate, D, native, noise, emitted_is_native ? output : nullptr);
    native_pass = p.get();
    to_native = std::move(p);
  } else {
    to_native = std::make_unique<NativeReplay>(native_gate, native, noise);
  }
  if (emitted_is_native) {
    if (output && !peephole) emit_path = std::make_unique<NativeDecomposer>(native_gate, emitted_tee);
  } else if (settings.gates == GateSet::logical) {
    // The file's own spelling of the logical gates decides what is counted (OpenQASM 2: swap as cx).
    written_form = as_written(settings.format, emitted_tee);
    emit_path = std::make_unique<FusedBlockSplitter>(written_form ? *written_form : emitted_tee);
  } else {
    GateSink* into = &emitted_tee;
    if (peephole) {
      emitted_pass = std::make_unique<PeepholePass>(D, emitted_tee);
      into = emitted_pass.get();
    }
    emit_path = std::make_unique<NativeDecomposer>(settings.gates == GateSet::cz ? TwoQubitGate::cz : TwoQubitGate::cx,
                                                   *into);
  }
  MetricsSink& emitted = emitted_counter ? *emitted_counter : native;
  std::vector<GateSink*> top{&logical, to_native.get()};
  if (emit_path) top.push_back(emit_path.get());
  // Ctrl-C stops a long stream (every 4096 gates; the deadline is not checked: this is no search).
  InterruptCheckSink interrupt(settings.budget, nullptr);
  if (settings.budget) top.push_back(&interrupt);
  TeeSink all(top);

  circuit.emit(all);
  if (settings.measure && !circuit.measures_itself())
    for (int k = 0; k < circuit.spec().qubits; ++k)
      all.gate(make_gate(GateKind::measure, circuit.maps().final_placement[k], k));
  all.finish();

  CircuitFigures f;
  f.two_qubit_blocks = logical.two_qubit_count();
  f.swaps = logical.count(GateKind::swap) + logical.count(GateKind::cp_swap);
  f.rotations = circuit.rotations_inside_gates().value_or(logical.rotations());
  f.depth_2q = logical.depth_2q();
  f.depth_2q_unfused = logical.depth_2q_unfused();
  f.depth = emitted.depth();
  f.cx_count = native.two_qubit_count();
  f.cx_depth = native.depth_2q();
  f.gate_counts = emitted.counts_by_name();
  rename_as_written(settings.format, f.gate_counts);
  f.noise = noise.figures();
  // The pass of the written circuit: the native one when the emitted gate set is native.
  if (emitted_pass) f.peephole_removed = emitted_pass->removed();
  else if (native_pass) f.peephole_removed = native_pass->removed();
  return f;
}

}  // namespace qftplan
