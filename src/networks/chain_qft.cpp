#include "qftplan/networks/chain_qft.hpp"

#include <stdexcept>

#include "qftplan/networks/parity_qft.hpp"

namespace qftplan {

using Kind = NetworkOp::Kind;

QubitMaps chain_maps(const QftSpec& spec, const QftNetwork& network, std::span<const int> chain) {
  const int n = spec.qubits;
  if (static_cast<int>(chain.size()) != n || network.wires() != n)
    throw std::invalid_argument("chain, network and register sizes differ");
  // The inverse runs the network backwards, so its start is the forward network's end.
  const auto start = spec.inverse ? network.final_positions() : network.initial_positions();
  const auto end = spec.inverse ? network.initial_positions() : network.final_positions();
  QubitMaps maps;
  maps.placement.resize(n);
  maps.final_placement.resize(n);
  for (int k = 0; k < n; ++k) {
    maps.placement[k] = chain[start[spec.input_wire(k)]];
    maps.final_placement[k] = chain[end[spec.output_wire(k)]];
  }
  return maps;
}

namespace {

Gate to_gate(const NetworkOp& op, const QftSpec& spec, std::span<const int> chain, const std::vector<int>& pos) {
  const auto angle = [&] { return op.undo ? -spec.rotation(op.j - op.i) : spec.rotation(op.j - op.i); };
  switch (op.kind) {
    case Kind::h: return make_gate(GateKind::h, chain[pos[op.i]]);
    case Kind::cp: return make_gate(GateKind::cp, chain[pos[op.i]], chain[pos[op.j]], angle());
    case Kind::swap: return make_gate(GateKind::swap, chain[pos[op.i]], chain[pos[op.j]]);
    case Kind::cp_swap: return make_gate(GateKind::cp_swap, chain[pos[op.i]], chain[pos[op.j]], angle());
  }
  return {};
}

bool swaps(Kind k) { return k == Kind::swap || k == Kind::cp_swap; }

}  // namespace

QubitMaps emit_chain_qft(const QftSpec& spec, const QftNetwork& network, std::span<const int> chain, GateSink& sink) {
  if (network.rendering() == QftNetwork::Rendering::parity) return emit_parity_qft(spec, network, chain, sink);
  if (network.rendering() == QftNetwork::Rendering::window) return emit_window_parity_qft(spec, network, chain, sink);
  QubitMaps maps = chain_maps(spec, network, chain);
  std::vector<NetworkOp> ops;
  // Gates go to the sink in runs of about a thousand (one virtual call per run, not per gate).
  GateRun out(sink);
  if (!spec.inverse) {
    auto pos = network.initial_positions();
    network.for_each_chunk([&](std::span<const NetworkOp> steps) {
      for (const auto& op : steps) {
        out.put(to_gate(op, spec, chain, pos));
        out.flush_if_full();
        if (swaps(op.kind)) std::swap(pos[op.i], pos[op.j]);
      }
    });
  } else {
    // Backwards: positions are those after each step; a swap step acts on the same two positions
    // either way, and is undone after it is emitted.
    auto pos = network.final_positions();
    for (int c = network.chunk_count(); c-- > 0;) {
      network.chunk(c, ops);
      for (auto it = ops.rbegin(); it != ops.rend(); ++it) {
        out.put(to_gate(*it, spec, chain, pos));
        out.flush_if_full();
        if (swaps(it->kind)) std::swap(pos[it->i], pos[it->j]);
      }
    }
  }
  out.flush();
  return maps;
}

}  // namespace qftplan
