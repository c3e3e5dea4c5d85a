// The checker of semi-classical files (mid-circuit measurements and phases conditioned on their
// outcomes): a structural proof for any register size and, for small registers, a simulation of every
// measurement branch compared with the unitary transform followed by a measurement.
//
// What is proved. The measured QFT of n qubits (forward or inverse, degree M) is, by the deferred
// measurement principle, the circuit of Griffiths and Niu ("Semiclassical Fourier transform for
// quantum computation", PRL 76, 3228, 1996; Nielsen and Chuang, "Quantum Computation and Quantum
// Information", 2000, sections 4.4 and 5.2): round k = 0 .. n-1 works on the qubit holding input bit
// n-1-k, applies for every earlier outcome c[m] with 0 < k - m <= M - 1 the phase s pi / 2^(k-m)
// conditioned on c[m] (s = +1 forward, -1 inverse), then h, then measures into c[k]. A file has the
// same outcome distribution when (1) every register qubit gets, in this order, only diagonal phases
// (conditioned or not), one h, then one measurement, (2) each conditioned phase reads a bit already
// measured in the file, (3) each bit is measured once, and c[k] from the qubit of input bit n-1-k, and
// (4) on each qubit the conditioned phases on bit m add up to the required angle and the unconditioned
// ones before its h to zero (diagonal gates on one qubit commute; diagonal gates after the h commute
// with the measurement and change no outcome). Gates on different qubits commute, and (2) keeps every
// classical dependency in order, so the file is the recipe up to reordering.

#include "semiclassical_check.hpp"

#include <cmath>
#include <complex>
#include <functional>
#include <map>
#include <random>

#include <fmt/format.h>

#include "qftplan/check/statevector.hpp"

namespace qftplan::semiclassical_check {

namespace {

CheckResult verdict(CheckOutcome o, std::string msg, int line) {
  CheckResult r;
  r.ok = o == CheckOutcome::proved;
  r.outcome = o;
  r.inconclusive = o == CheckOutcome::cannot_prove;
  r.message = std::move(msg);
  r.line = line;
  return r;
}

int line_of(const QasmProgram& p, std::size_t i) { return i < p.gate_lines.size() ? p.gate_lines[i] : 0; }

}  // namespace

bool is_semiclassical(const QasmProgram& program) {
  for (const Gate& g : program.gates)
    if (g.kind == GateKind::p_if) return true;
  return false;
}

CheckResult prove(const Device& device, const QasmProgram& program, const CheckRequest& req) {
  const int n = req.spec.qubits, nq = device.qubit_count(), reach = req.spec.max_distance();
  // The round of each register qubit: the qubit of input bit n-1-k is worked on in round k.
  std::vector<int> round(static_cast<std::size_t>(nq), -1);
  for (int k = 0; k < n; ++k) round[static_cast<std::size_t>(req.placement[n - 1 - k])] = k;
  for (int k = 0; k < n; ++k)
    if (req.final_placement[k] != req.placement[n - 1 - k])
      return verdict(CheckOutcome::wrong,
                     fmt::format("final_placement[{}] is qubit {}, but the semi-classical form measures output bit {} "
                                 "from the qubit of input bit {} (qubit {})",
                                 k, req.final_placement[k], k, n - 1 - k, req.placement[n - 1 - k]),
                     0);
  enum Stage { waiting, turned, measured };
  std::vector<Stage> stage(static_cast<std::size_t>(n), waiting);
  std::vector<int> h_line(static_cast<std::size_t>(n), 0), bit_of(static_cast<std::size_t>(n), -1);
  std::map<int, int> written;  // bit -> line of its measurement
  // Per round k: the conditioned phases summed per bit (bit -1: unconditioned, before the h), with
  // the line of the first one.
  std::vector<std::map<int, std::pair<Angle, int>>> phases(static_cast<std::size_t>(n));
  long long conditioned = 0;
  for (std::size_t i = 0; i < program.gates.size(); ++i) {
    const Gate& g = program.gates[i];
    const int line = line_of(program, i);
    const int k = g.q0 >= 0 && g.q0 < nq ? round[static_cast<std::size_t>(g.q0)] : -1;
    if (k < 0)
      return verdict(CheckOutcome::cannot_prove,
                     fmt::format("cannot prove: {} on qubit {}, outside the register, in a semi-classical file",
                                 gate_name(g.kind), g.q0),
                     line);
    Stage& st = stage[static_cast<std::size_t>(k)];
    switch (g.kind) {
      case GateKind::p_if:
      case GateKind::p:
      case GateKind::rz: {
        if (st == turned) continue;  // diagonal after the h: commutes with the measurement
        const int b = g.kind == GateKind::p_if ? g.q1 : -1;
        if (b >= 0 && !written.count(b))
          return verdict(CheckOutcome::wrong,
                         fmt::format("the phase on qubit {} is conditioned on c[{}] before c[{}] is measured", g.q0, b, b),
                         line);
        auto [it, fresh] = phases[static_cast<std::size_t>(k)].try_emplace(b, Angle{}, line);
        it->second.first = it->second.first + g.angle;
        conditioned += b >= 0 ? 1 : 0;
        continue;
      }
      case GateKind::h:
        if (st != waiting)
          return verdict(CheckOutcome::cannot_prove,
                         fmt::format("cannot prove: a second h on qubit {} (the semi-classical form has one per qubit)", g.q0),
                         line);
        st = turned;
        h_line[static_cast<std::size_t>(k)] = line;
        continue;
      case GateKind::measure:
        if (st != turned)
          return verdict(CheckOutcome::wrong, fmt::format("qubit {} is measured before its h", g.q0), line);
        if (g.q1 < 0 || written.count(g.q1))
          return verdict(CheckOutcome::wrong,
                         g.q1 < 0 ? fmt::format("the measurement of qubit {} writes no bit", g.q0)
                                  : fmt::format("c[{}] is measured twice (first on line {})", g.q1, written[g.q1]),
                         line);
        if (g.q1 != k)
          return verdict(CheckOutcome::wrong,
                         fmt::format("qubit {} (input bit {}) is measured into c[{}], but it holds output bit {}", g.q0,
                                     n - 1 - k, g.q1, k),
                         line);
        st = measured;
        bit_of[static_cast<std::size_t>(k)] = g.q1;
        written[g.q1] = line;
        continue;
      default:
        return verdict(CheckOutcome::cannot_prove,
                       fmt::format("cannot prove: {} in a semi-classical file (only phases, h and measurements)",
                                   gate_name(g.kind)),
                       line);
    }
  }
  for (int k = 0; k < n; ++k) {
    const int q = req.placement[n - 1 - k];
    if (stage[static_cast<std::size_t>(k)] != measured)
      return verdict(CheckOutcome::wrong, fmt::format("qubit {} (output bit {}) is never measured", q, k), 0);
    // Every bit with a phase, and every bit the transform needs one for.
    std::map<int, std::pair<Angle, int>> got = phases[static_cast<std::size_t>(k)];
    for (int m = std::max(0, k - reach); m < k; ++m) got.try_emplace(m, Angle{}, h_line[static_cast<std::size_t>(k)]);
    for (const auto& [b, sum] : got) {
      const Angle want = b >= 0 && b < k && k - b <= reach ? req.spec.rotation(k - b) : Angle{};
      if (!(sum.first == want))
        return verdict(CheckOutcome::wrong,
                       b < 0 ? fmt::format("qubit {} gets an unconditioned phase {} before its h; the transform needs none",
                                           q, angle_text(sum.first))
                             : fmt::format("the phases on qubit {} (output bit {}) conditioned on c[{}] add up to {}, but "
                                           "the transform needs {}",
                                           q, k, b, angle_text(sum.first), angle_text(want)),
                       sum.second);
    }
  }
  return verdict(CheckOutcome::proved,
                 fmt::format("proved (semi-classical): {} qubits measured in turn, {} conditioned phases with the angles "
                             "of the {}",
                             n, conditioned, describe_transform(req.spec)),
                 0);
}

namespace {

// The outcome distribution of `program` on the register (index bit k = input bit k), every
// measurement branch followed (depth first, each branch's state projected and renormalised).
struct BranchSim {
  const std::vector<Gate>& gates;
  std::vector<int> index;  // physical qubit -> register index
  int n;
  std::vector<double> dist;
  std::vector<int> bits;

  void run(std::size_t from, StateVector& sv, double weight) {
    for (std::size_t i = from; i < gates.size(); ++i) {
      const Gate& g = gates[i];
      Gate local = g;
      local.q0 = index[static_cast<std::size_t>(g.q0)];
      if (is_two_qubit(g.kind)) local.q1 = index[static_cast<std::size_t>(g.q1)];
      if (g.kind == GateKind::p_if) {
        if (g.q1 >= 0 && g.q1 < static_cast<int>(bits.size()) && bits[static_cast<std::size_t>(g.q1)])
          sv.apply(Gate{GateKind::p, local.q0, -1, g.angle});
        continue;
      }
      if (g.kind != GateKind::measure) {
        sv.apply(local);
        continue;
      }
      const std::size_t mask = std::size_t{1} << local.q0;
      for (int o = 0; o < 2; ++o) {
        StateVector branch = sv;
        double p = 0;
        for (std::size_t j = 0; j < branch.amplitudes().size(); ++j) {
          auto& a = branch.amplitudes()[j];
          if (((j & mask) != 0) != (o == 1)) a = 0;
          else p += std::norm(a);
        }
        if (p < 1e-15) continue;
        for (auto& a : branch.amplitudes()) a /= std::sqrt(p);
        const int saved = g.q1 >= 0 ? bits[static_cast<std::size_t>(g.q1)] : 0;
        if (g.q1 >= 0) bits[static_cast<std::size_t>(g.q1)] = o;
        run(i + 1, branch, weight * p);
        if (g.q1 >= 0) bits[static_cast<std::size_t>(g.q1)] = saved;
      }
      return;
    }
    std::size_t y = 0;
    for (int k = 0; k < n; ++k)
      if (bits[static_cast<std::size_t>(k)]) y |= std::size_t{1} << k;
    dist[y] += weight;
  }
};

}  // namespace

namespace {

// The outcome distribution by the deferred measurement principle (Nielsen and Chuang, section 4.4): a
// measured qubit takes no gate afterwards (checked before), so it keeps its value to the end, and a
// phase conditioned on the bit it wrote is the controlled phase with it. One state vector, O(2^n) per
// gate: the simulation for registers beyond the branch walk.
std::vector<double> deferred_distribution(const std::vector<Gate>& gates, const std::vector<int>& index, int n,
                                          int bits, StateVector& sv) {
  std::vector<int> writer(static_cast<std::size_t>(bits), -1);  // register qubit that last wrote each bit
  for (const Gate& g : gates) {
    Gate local = g;
    local.q0 = index[static_cast<std::size_t>(g.q0)];
    if (is_two_qubit(g.kind)) local.q1 = index[static_cast<std::size_t>(g.q1)];
    if (g.kind == GateKind::measure) {
      if (g.q1 >= 0) writer[static_cast<std::size_t>(g.q1)] = local.q0;
    } else if (g.kind == GateKind::p_if) {
      const int w = writer[static_cast<std::size_t>(g.q1)];
      // An unwritten bit reads 0: the phase is not applied.
      if (w >= 0 && w != local.q0) sv.apply(Gate{GateKind::cp, w, local.q0, g.angle});
      else if (w == local.q0) sv.apply(Gate{GateKind::p, w, -1, g.angle});
    } else {
      sv.apply(local);
    }
  }
  std::vector<double> dist(std::size_t{1} << n, 0.0);
  const auto& a = sv.amplitudes();
  for (std::size_t i = 0; i < a.size(); ++i) {
    std::size_t y = 0;
    for (int k = 0; k < n; ++k) {
      const int w = writer[static_cast<std::size_t>(k)];
      if (w >= 0 && ((i >> w) & 1)) y |= std::size_t{1} << k;
    }
    dist[y] += std::norm(a[i]);
  }
  return dist;
}

}  // namespace

statevector_check::SimOutcome simulate(const Device& device, const QasmProgram& program, const CheckRequest& req) {
  statevector_check::SimOutcome out;
  const int n = req.spec.qubits;
  if (n > req.statevector_limit) {
    out.message = fmt::format("no simulation above {} qubits", req.statevector_limit);
    return out;
  }
  BranchSim sim{program.gates, std::vector<int>(static_cast<std::size_t>(device.qubit_count()), -1), n, {}, {}};
  for (int k = 0; k < n; ++k) sim.index[static_cast<std::size_t>(req.placement[k])] = k;
  int top_bit = n - 1, measurements = 0;
  const auto outside = [&](int q) { return q < 0 || q >= device.qubit_count() || sim.index[static_cast<std::size_t>(q)] < 0; };
  for (const Gate& g : program.gates) {
    if (outside(g.q0) || (is_two_qubit(g.kind) && outside(g.q1))) {
      out.message = fmt::format("no simulation: {} on a qubit outside the register", gate_name(g.kind));
      return out;
    }
    if (uses_bit(g.kind)) top_bit = std::max(top_bit, g.q1);
    measurements += g.kind == GateKind::measure ? 1 : 0;
  }
  // Every measurement branch is walked up to kBranchLimit qubits with one measurement per register
  // qubit at most (that bounds the branches, 2^(n+1), and the depth of the walk, n; the structural
  // proof refuses more anyway); otherwise the deferred measurement principle gives the distribution.
  const bool branches = n <= kBranchLimit && measurements <= n;
  const std::size_t dim = std::size_t{1} << n;
  // Inputs: every basis state up to 8 qubits, else 64 spread over the range (16 for the deferred
  // simulation); then three random states (a fixed seed: the same file always gets the same verdict).
  std::vector<std::vector<std::complex<double>>> inputs;
  const std::size_t basis = n <= 8 ? dim : branches ? 64 : 16;
  const auto basis_index = [&](std::size_t j) { return n <= 8 ? j : (j * 2654435761u) % dim; };
  for (std::size_t j = 0; j < basis; ++j) {
    std::vector<std::complex<double>> a(dim, 0.0);
    a[basis_index(j)] = 1.0;
    inputs.push_back(std::move(a));
  }
  std::mt19937_64 rng(20);
  std::normal_distribution<double> normal;
  for (int r = 0; r < 3; ++r) {
    std::vector<std::complex<double>> a(dim);
    double norm = 0;
    for (auto& x : a) {
      x = {normal(rng), normal(rng)};
      norm += std::norm(x);
    }
    for (auto& x : a) x /= std::sqrt(norm);
    inputs.push_back(std::move(a));
  }
  for (std::size_t t = 0; t < inputs.size(); ++t) {
    StateVector sv(n);
    sv.amplitudes() = inputs[t];
    if (branches) {
      sim.dist.assign(dim, 0.0);
      sim.bits.assign(static_cast<std::size_t>(top_bit + 1), 0);
      sim.run(0, sv, 1.0);
    } else {
      sim.dist = deferred_distribution(program.gates, sim.index, n, top_bit + 1, sv);
    }
    const auto want = reference_qft(req.spec, inputs[t]);
    for (std::size_t y = 0; y < dim; ++y)
      if (std::abs(sim.dist[y] - std::norm(want[y])) > 1e-9) {
        out.ran = true;
        out.ok = false;
        const std::string input = t < basis ? fmt::format("basis input {}", basis_index(t))
                                            : fmt::format("random input {}", t - basis + 1);
        out.message = fmt::format("on {} the outcome {} has probability {:.6f}, but the measured {} gives {:.6f}", input,
                                  y, sim.dist[y], describe_transform(req.spec), std::norm(want[y]));
        return out;
      }
  }
  out.ran = true;
  out.exhaustive = n <= 8;
  out.message = fmt::format("{} on {} inputs ({} basis states and 3 random)",
                            branches ? "every measurement branch simulated" : "simulated with the measurements deferred",
                            inputs.size(), n <= 8 ? "every" : std::to_string(basis));
  return out;
}

CheckResult check(const Device& device, const QasmProgram& program, const CheckRequest& req) {
  CheckResult proof = req.structural ? prove(device, program, req)
                                     : verdict(CheckOutcome::cannot_prove, "no structural proof requested", 0);
  if (proof.outcome == CheckOutcome::wrong) return proof;
  statevector_check::SimOutcome sim;
  if (req.spec.qubits <= req.statevector_limit) sim = simulate(device, program, req);
  if (sim.ran && !sim.ok) {
    CheckResult r = verdict(CheckOutcome::wrong, sim.message + (proof.ok ? "; the structural proof had passed" : ""),
                            proof.ok ? 0 : proof.line);
    return r;
  }
  if (proof.ok) {
    proof.structural_proved = true;
    proof.simulated = sim.ran;
    proof.exhaustive = sim.ran && sim.exhaustive;
    if (!sim.message.empty()) proof.message += "; " + sim.message;
    return proof;
  }
  // The structural proof lost track: every basis input simulated decides.
  if (sim.ran && sim.exhaustive) {
    CheckResult r = verdict(CheckOutcome::proved, sim.message + "; the structural proof lost track (" + proof.message + ")", 0);
    r.simulated = r.exhaustive = true;
    r.inconclusive = true;
    r.lost_track_line = proof.line;
    r.lost_track_reason = proof.message;
    return r;
  }
  if (!sim.message.empty()) proof.message += "; " + sim.message;
  proof.lost_track_line = proof.line;
  proof.lost_track_reason = proof.message;
  return proof;
}

}  // namespace qftplan::semiclassical_check
