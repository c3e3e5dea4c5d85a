// The state-vector comparison: the circuit is simulated on the qubits it touches, from every basis
// input (small registers) or from a fixed sample of basis and random inputs, and each output is
// compared with reference_qft up to one global phase.

#include "statevector_check.hpp"

#include <algorithm>
#include <bit>
#include <cmath>
#include <complex>
#include <cstdio>
#include <random>
#include <vector>

#include "qftplan/check/statevector.hpp"

namespace qftplan::statevector_check {

namespace {

using cplx = std::complex<double>;

constexpr int kMaxSimQubits = 24;
constexpr double kSimBudget = 3e9;  // amplitude updates, a few seconds
constexpr double kTolerance = 1e-9;
constexpr int kSampledRandom = 8;
constexpr int kSampledBasis = 4;

// The circuit on compact local indices 0..m-1 of the qubits it touches (the maps' qubits first).
struct LocalCircuit {
  std::vector<int> local;  // physical qubit -> local index, or -1
  int m = 0;
  std::vector<Gate> gates;
};

// Stops as soon as more than kMaxSimQubits qubits are touched (m then says so).
LocalCircuit localise(const Device& device, const QasmProgram& program, const CheckRequest& req) {
  LocalCircuit lc;
  lc.local.assign(device.qubit_count(), -1);
  auto use = [&](int q) {
    if (lc.local[q] < 0) lc.local[q] = lc.m++;
  };
  for (int q : req.placement) use(q);
  for (int q : req.final_placement) use(q);
  lc.gates.reserve(program.gates.size());
  for (const auto& g : program.gates) {
    if (g.kind == GateKind::measure) continue;  // trailing (checked before)
    use(g.q0);
    if (is_two_qubit(g.kind)) use(g.q1);
    if (lc.m > kMaxSimQubits) break;
    Gate lg = g;
    lg.q0 = lc.local[g.q0];
    if (is_two_qubit(g.kind)) lg.q1 = lc.local[g.q1];
    lc.gates.push_back(lg);
  }
  return lc;
}

// Where logical basis index j sits among the local qubits, at the start and at the end.
struct IndexMaps {
  std::vector<std::size_t> in, out;
  std::vector<char> is_out;  // per local index: an output index (everything else must stay empty)
};

IndexMaps index_maps(const CheckRequest& req, const LocalCircuit& lc, std::size_t dim) {
  IndexMaps maps;
  maps.in.resize(dim);
  maps.out.resize(dim);
  maps.in[0] = maps.out[0] = 0;
  for (std::size_t j = 1; j < dim; ++j) {
    const int k = std::countr_zero(j);
    maps.in[j] = maps.in[j & (j - 1)] | (std::size_t{1} << lc.local[req.placement[k]]);
    maps.out[j] = maps.out[j & (j - 1)] | (std::size_t{1} << lc.local[req.final_placement[k]]);
  }
  maps.is_out.assign(std::size_t{1} << lc.m, 0);
  for (std::size_t y = 0; y < dim; ++y) maps.is_out[maps.out[y]] = 1;
  return maps;
}

// The inputs: every basis state, or 4 basis states and 8 random states (fixed seed).
struct Inputs {
  bool full = false;
  std::vector<std::size_t> basis;
  int random_inputs = 0;
  std::mt19937_64 rng{20240607};
  std::normal_distribution<double> gauss;  // one for all inputs: it carries state between draws

  std::size_t count() const { return basis.size() + static_cast<std::size_t>(random_inputs); }
  // Fills `a` with input number t and returns its name for messages.
  std::string make(std::size_t t, std::vector<cplx>& a);
};

std::string Inputs::make(std::size_t t, std::vector<cplx>& a) {
  if (t < basis.size()) {
    a[basis[t]] = 1.0;
    return "basis input |" + std::to_string(basis[t]) + ">";
  }
  double norm = 0;
  for (auto& x : a) {
    x = cplx(gauss(rng), gauss(rng));
    norm += std::norm(x);
  }
  for (auto& x : a) x /= std::sqrt(norm);
  return "random input #" + std::to_string(t - basis.size() + 1);
}

// Runs every input through the circuit and compares with the reference.
SimOutcome compare(const QftSpec& spec, const LocalCircuit& lc, const IndexMaps& maps, Inputs& inputs) {
  SimOutcome out;
  const std::size_t dim = maps.in.size();
  StateVector sv(lc.m);
  cplx phase = 0;
  double worst = 0;
  for (std::size_t t = 0; t < inputs.count(); ++t) {
    std::vector<cplx> a(dim, 0.0);
    const std::string label = inputs.make(t, a);
    const std::vector<cplx> ref = reference_qft(spec, a);
    auto& amp = sv.amplitudes();
    std::fill(amp.begin(), amp.end(), cplx(0.0, 0.0));
    for (std::size_t j = 0; j < dim; ++j) amp[maps.in[j]] = a[j];
    for (const auto& g : lc.gates) sv.apply(g);
    if (t == 0) {
      // One global phase for all inputs: a unitary is fixed up to a single overall phase.
      cplx inner = 0;
      for (std::size_t y = 0; y < dim; ++y) inner += std::conj(ref[y]) * amp[maps.out[y]];
      if (std::abs(inner) < 0.5) {
        out.ran = true;
        out.ok = false;
        out.message = "state-vector check: for " + label + " the circuit's output has overlap " +
                      std::to_string(std::abs(inner)) + " with the QFT's";
        return out;
      }
      phase = inner / std::abs(inner);
    }
    double dev = 0, outside = 0;
    for (std::size_t y = 0; y < dim; ++y) dev = std::max(dev, std::abs(amp[maps.out[y]] - phase * ref[y]));
    for (std::size_t i = 0; i < amp.size(); ++i)
      if (!maps.is_out[i]) outside += std::norm(amp[i]);
    dev = std::max(dev, std::sqrt(outside));
    worst = std::max(worst, dev);
    if (dev > kTolerance) {
      char buf[32];
      std::snprintf(buf, sizeof buf, "%.3g", dev);
      out.ran = true;
      out.ok = false;
      out.message = "state-vector check: for " + label + " the output differs from the " +
                    std::string(spec.inverse ? "inverse " : "") + "QFT by " + buf + " (tolerance 1e-9)";
      return out;
    }
  }
  out.ran = true;
  out.exhaustive = inputs.full;
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.1e", worst);
  out.message = "state-vector check: " +
                (inputs.full ? "all " + std::to_string(dim) + " basis inputs (full unitary, one global phase)"
                             : std::to_string(inputs.basis.size()) + " basis and " +
                                   std::to_string(inputs.random_inputs) + " random inputs") +
                " on " + std::to_string(lc.m) + " simulated qubits match within " + buf;
  return out;
}

}  // namespace

SimOutcome simulate(const Device& device, const QasmProgram& program, const CheckRequest& req, bool decides) {
  SimOutcome out;
  const int n = req.spec.qubits;
  const LocalCircuit lc = localise(device, program, req);
  if (lc.m > kMaxSimQubits) {
    out.message = "state-vector check skipped: the circuit touches more than " + std::to_string(kMaxSimQubits) + " qubits";
    return out;
  }

  // Every basis input when the register is small and the work fits the budget, else a sample.
  const std::size_t dim = std::size_t{1} << n;
  // Beyond 10 qubits a cross-check of a proof samples; a simulation that decides the verdict
  // simulates every basis input whenever that fits the budget.
  bool full = n <= 10 || decides;
  auto cost = [&](double inputs) { return inputs * (static_cast<double>(lc.gates.size()) + 1) * std::ldexp(1.0, lc.m); };
  if (full && cost(static_cast<double>(dim)) > kSimBudget) full = false;
  if (!full && cost(kSampledRandom + kSampledBasis) > kSimBudget) {
    out.message = "state-vector check skipped: " + std::to_string(lc.gates.size()) + " gates on " +
                  std::to_string(lc.m) + " qubits is beyond the simulation budget";
    return out;
  }

  const IndexMaps maps = index_maps(req, lc, dim);
  Inputs inputs;
  inputs.full = full;
  if (full) {
    for (std::size_t j = 0; j < dim; ++j) inputs.basis.push_back(j);
  } else {
    inputs.basis = {0, 1, dim - 1, static_cast<std::size_t>(inputs.rng() % dim)};
    inputs.random_inputs = kSampledRandom;
  }
  return compare(req.spec, lc, maps, inputs);
}

}  // namespace qftplan::statevector_check
