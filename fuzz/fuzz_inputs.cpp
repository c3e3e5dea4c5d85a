#include "fuzz_inputs.hpp"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstdlib>
#include <map>
#include <memory>
#include <numeric>
#include <optional>
#include <set>

#include <fmt/format.h>

#include "qftplan/check/qft_checker.hpp"
#include "qftplan/core/atomic_file.hpp"
#include "qftplan/core/input_error.hpp"
#include "qftplan/device/device.hpp"
#include "qftplan/device/device_check.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/device/device_summary.hpp"
#include "qftplan/device/device_yaml.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/report/circuit_header.hpp"
#include "qftplan/qasm/qasm_program.hpp"
#include "qftplan/qasm/qasm_writer.hpp"

namespace qftplan::fuzz {
namespace {

// Round trips and summaries cost O(size); past this the harness only checks that loading is clean,
// so that the fuzzer does not spend its time on a few huge (but valid) devices.
constexpr int kDeepCheckQubits = 20'000;
constexpr int kDeepCheckCouplers = 100'000;

[[noreturn]] void broken(const std::string& what) { throw InvariantBroken(what); }

void require(bool ok, const std::string& what) {
  if (!ok) broken(what);
}

// README "Device files": every error is one line. A control character in a message would split it
// (or smuggle escape sequences to the terminal).
void check_message(const std::exception& e) {
  const std::string_view m = e.what();
  require(!m.empty(), "empty error message");
  for (char c : m)
    if (static_cast<unsigned char>(c) < 0x20 || c == 0x7f)
      broken(fmt::format("error message with control character {:#04x}: {}", static_cast<unsigned char>(c), m));
}

// Loaded devices: the exact round trip the README promises, and the self-check must not throw.
void check_loaded_device(const Device& d, const std::string& source) {
  require(d.qubit_count() >= 1 && d.qubit_count() <= kMaxDeviceQubits, "device size out of range");
  if (d.qubit_count() > kDeepCheckQubits || d.coupler_count() > kDeepCheckCouplers) return;
  const std::string yaml = device_to_yaml(d);
  std::optional<Device> back;
  try {
    back.emplace(parse_device_yaml(yaml, source + " (written back)"));
  } catch (const InputError& e) {
    broken(std::string("device_to_yaml wrote a file parse_device_yaml refuses: ") + e.what());
  }
  require(*back == d, "YAML round trip changed the device");
  require(device_to_yaml(*back) == yaml, "YAML round trip is not a fixed point");
  (void)check_device(d);
  if (d.qubit_count() <= 2000) (void)format_summary(summarize(d));
}

}  // namespace

void device_yaml_input(std::string_view data) {
  std::optional<Device> d;
  try {
    d.emplace(parse_device_yaml(std::string(data), "fuzz.yaml"));
  } catch (const InputError& e) {
    check_message(e);
    return;
  }
  check_loaded_device(*d, "fuzz.yaml");
}

namespace {

// The decimal numbers of a spec's argument text ("3x4" -> {3, 4}); empty when not all digits.
std::vector<long long> spec_numbers(std::string_view args) {
  std::vector<long long> out;
  std::size_t i = 0;
  while (i <= args.size()) {
    const std::size_t j = std::min(args.find('x', i), args.size());
    long long v = 0;
    const auto [p, ec] = std::from_chars(args.data() + i, args.data() + j, v);
    if (ec != std::errc{} || p != args.data() + j) return {};
    out.push_back(v);
    i = j + 1;
  }
  return out;
}

bool bipartite(const Device& d) {
  std::vector<int> side(d.qubit_count(), -1);
  for (int s = 0; s < d.qubit_count(); ++s) {
    if (side[s] >= 0) continue;
    side[s] = 0;
    std::vector<int> stack{s};
    while (!stack.empty()) {
      const int q = stack.back();
      stack.pop_back();
      for (int nb : d.neighbours(q)) {
        if (side[nb] == side[q]) return false;
        if (side[nb] < 0) side[nb] = 1 - side[q], stack.push_back(nb);
      }
    }
  }
  return true;
}

}  // namespace

void lattice_spec_input(std::string_view data) {
  const std::string text(data);
  if (!is_lattice_spec(text)) {
    // Not a spec: make_lattice must refuse it cleanly (load_device would look for a file instead,
    // which a fuzzer must not do).
    try {
      (void)make_lattice(text);
    } catch (const InputError& e) {
      check_message(e);
      return;
    }
    broken("make_lattice accepted text that is_lattice_spec rejects");
  }
  const std::string family = text.substr(0, text.find(':'));
  const auto v = spec_numbers(std::string_view(text).substr(text.find(':') + 1));
  // Valid lattices of 10^5..10^6 qubits (or 2000-qubit complete graphs) take a second each under the
  // sanitizers and teach the fuzzer nothing new: skip them. Larger ones must be refused at once.
  if (!v.empty() && v[0] <= kMaxDeviceQubits && (v.size() < 2 || v[1] <= kMaxDeviceQubits)) {
    const long long a = v[0], b = v.size() > 1 ? v[1] : 1;
    const long long size = family == "heavy-hex" ? 5 * a * b + 4 * a + 4 * b : a * b;
    if (family == "full" ? a > 447 && a <= 2000 : size > 100'000 && size <= kMaxDeviceQubits) return;
  }
  std::optional<Device> d;
  try {
    d.emplace(make_lattice(text));
  } catch (const InputError& e) {
    check_message(e);
    return;
  }
  require(d->name() == text, "a lattice is not named by its spec");
  // Counts of the families (README "Built-in lattices"; line, ring, grid and complete graph: common
  // practice of graph theory).
  require(!v.empty(), "accepted spec without plain numbers: " + text);
  const long long N = d->qubit_count(), E = d->coupler_count();
  const long long a = v[0], b = v.size() > 1 ? v[1] : 0;
  if (family == "line") require(N == a && E == a - 1, "line:N counts");
  if (family == "ring") require(N == a && E == a, "ring:N counts");
  if (family == "full") require(N == a && E == a * (a - 1) / 2, "full:N counts");
  if (family == "grid") require(N == a * b && E == a * (b - 1) + b * (a - 1), "grid:RxC counts");
  if (family == "heavy-hex") {
    require(N == 5 * a * b + 4 * a + 4 * b - 1 && E == 6 * a * b + 4 * a + 4 * b - 2, "heavy-hex:RxC counts");
    if (N <= kDeepCheckQubits) {
      int max_degree = 0;
      for (int q = 0; q < N; ++q) max_degree = std::max(max_degree, d->degree(q));
      require(max_degree <= 3 && bipartite(*d), "heavy-hex must have degree <= 3 and be bipartite");
    }
  }
  require(d->has_positions(), "lattices come with positions");
  if (N > kDeepCheckQubits || E > kDeepCheckCouplers) return;
  require(d->components().second == 1, "a lattice is connected");
  require(check_device(*d).empty(), "a built-in lattice fails the device self-check: " + text);
  require(load_device(text) == *d, "load_device and make_lattice disagree on " + text);
  check_loaded_device(*d, text);
}

namespace {

// Small devices a fuzzed circuit may name in its header; anything else is checked on grid:3x3.
const Device& device_for(const std::optional<std::string>& name) {
  static const std::map<std::string, Device> devices = [] {
    std::map<std::string, Device> m;
    for (const char* s : {"grid:3x3", "line:4", "line:6", "ring:6", "heavy-hex:1x1", "full:5", "grid:2x4"})
      m.emplace(s, make_lattice(s));
    return m;
  }();
  if (name) {
    const auto it = devices.find(*name);
    if (it != devices.end()) return it->second;
  }
  return devices.at("grid:3x3");
}

// "approximate (degree 3)" and "inverse QFT" in the header's transform line, as our writer puts them.
void spec_from_header(std::string_view text, QftSpec& spec) {
  const auto line_at = text.find("// transform:");
  if (line_at == std::string_view::npos) return;
  const auto line = text.substr(line_at, text.find('\n', line_at) - line_at);
  spec.inverse = line.find("inverse QFT") != std::string_view::npos;
  const bool blocks = line.find("(blocks of ") != std::string_view::npos;
  const auto deg = blocks ? line.find("(blocks of ") : line.find("(degree ");
  if (deg == std::string_view::npos) return;
  int m = 0;
  const auto digits = line.substr(deg + (blocks ? 11 : 8));
  const auto [p, ec] = std::from_chars(digits.data(), digits.data() + digits.size(), m);
  if (ec == std::errc{} && m >= 1) (blocks ? spec.block_length : spec.approx_degree) = m;
}

}  // namespace

void qasm_check_input(std::string_view data) {
  const std::string text(data);
  std::optional<QasmProgram> prog;
  try {
    prog.emplace(parse_qasm(text, "fuzz.qasm"));
  } catch (const InputError& e) {
    check_message(e);
    return;
  }
  require(prog->version == 2 || prog->version == 3, "version other than 2 or 3");
  require(prog->gate_lines.size() == prog->gates.size(), "a line for every gate");
  const Device& dev = device_for(prog->device_name);
  CheckRequest req;
  // As the command line: the maps come from the header, and their size is the register size.
  const int n = prog->placement ? static_cast<int>(prog->placement->size()) : 3;
  if (n < 1 || n > 64) return;
  req.spec.qubits = n;
  spec_from_header(text, req.spec);
  if (prog->placement) req.placement = *prog->placement;
  else req.placement.resize(n), std::iota(req.placement.begin(), req.placement.end(), 0);
  req.final_placement = prog->final_placement ? *prog->final_placement : req.placement;
  if (static_cast<int>(req.final_placement.size()) != n) return;
  req.statevector_limit = 8;
  const CheckResult r = check_qft_circuit(dev, *prog, req);
  if (!r.ok) require(!r.message.empty(), "a failed check without a reason");
  // Two independent methods: a passed structural proof must survive the state-vector comparison.
  if (r.structural_proved && n <= req.statevector_limit) {
    CheckRequest sim = req;
    sim.structural = false;
    const CheckResult s = check_qft_circuit(dev, *prog, sim);
    require(s.ok && s.simulated, "the structural proof passed but the simulation disagrees: " + s.message);
  }
}

namespace {

// Reads the fuzz bytes as small numbers; past the end every read is 0, so any input decodes.
class ByteReader {
 public:
  explicit ByteReader(std::string_view d) : d_(d) {}
  unsigned next() { return i_ < d_.size() ? static_cast<unsigned char>(d_[i_++]) : 0u; }
  /// A number in [0, bound).
  int below(int bound) { return bound <= 1 ? 0 : static_cast<int>(next() % static_cast<unsigned>(bound)); }
  bool bit() { return next() & 1u; }

 private:
  std::string_view d_;
  std::size_t i_ = 0;
};

DeviceDescription fuzzed_device(ByteReader& r) {
  DeviceDescription d;
  const int shape = r.below(4);
  int N = 1 + r.below(10);
  std::vector<bool> dead;  // qubits of a grid with holes: present but uncoupled
  std::set<std::pair<int, int>> edges;
  auto add = [&](int a, int b) {
    if (a == b || a < 0 || b < 0 || a >= N || b >= N) return;
    if (!dead.empty() && (dead[a] || dead[b])) return;
    edges.insert({std::min(a, b), std::max(a, b)});
  };
  if (shape == 3) {
    // A grid with holes (dead qubits, as on real chips).
    const int R = 1 + r.below(3), C = 1 + r.below(4);
    N = R * C;
    dead.assign(N, false);
    const unsigned holes = r.next();
    for (int q = 0; q < N && q < 8; ++q) dead[q] = (holes >> q) & 1u && (holes & 0x80u);
    for (int y = 0; y < R; ++y)
      for (int x = 0; x < C; ++x) {
        if (x + 1 < C) add(y * C + x, y * C + x + 1);
        if (y + 1 < R) add(y * C + x, (y + 1) * C + x);
      }
  } else if (shape == 2) {
    for (int q = 1; q < N; ++q) add(q, r.below(q));  // a random tree
  } else if (shape == 1) {
    for (int q = 1; q < N; ++q) add(q - 1, q);  // a line, plus the random extras below
  }
  const int extra = r.below(2 * N + 1);
  for (int k = 0; k < extra; ++k) {
    const int a = r.below(N), b = r.below(N);
    add(a, b);
  }
  d.qubits = N;
  // A name with whatever bytes come next (line breaks too: names are free text): it reaches the
  // OpenQASM header, where a line break once ended the comment and injected the rest as gates.
  const int name_len = r.below(4);
  d.name = "fuzz";
  for (int k = 0; k < name_len; ++k) d.name += static_cast<char>(r.next());
  const unsigned cal = r.next();
  for (const auto& [a, b] : edges) {
    Coupler c;
    c.a = a;
    c.b = b;
    if (cal & 1u) c.error = r.below(64) / 256.0;
    if (cal & 2u) c.duration_ns = 1 + r.below(500);
    d.couplers.push_back(c);
  }
  if (cal & 4u) d.calibration.error_1q = r.below(16) / 1000.0;
  if (cal & 8u) d.calibration.error_2q = r.below(64) / 512.0;
  if (cal & 16u) {
    QubitOverride o;
    o.id = r.below(N);
    o.error_1q = r.below(32) / 512.0;
    o.t1_us = 1 + r.below(200);
    o.t2_us = 1 + r.below(200);
    // T2 <= 2 T1 (a device breaking it is refused); clamped so the input bytes keep their meaning.
    o.t2_us = std::min(*o.t2_us, 2 * *o.t1_us);
    d.qubit_calibration.push_back(o);
  }
  if (cal & 32u) d.native_2q = TwoQubitGate::cz;
  if (cal & 64u) {
    d.positions.resize(N);
    for (int q = 0; q < N; ++q)
      if (r.bit()) d.positions[q] = Point{static_cast<double>(r.below(8)), static_cast<double>(r.below(8))};
  }
  return d;
}

std::string plan_text(const Device& dev, const PlanOptions& opt, QasmVersion version, PlanReport* report_out,
                      PreparedPlan* plan_out) {
  PreparedPlan plan = prepare_plan(dev, opt);
  StringOutput text;
  QasmWriter writer(version, circuit_header(dev, opt, plan), text);
  StructuralChecker proof(dev, plan.spec, plan.maps.placement);
  TeeSink both({&writer, &proof});
  PlanReport r = execute_plan(dev, opt, plan, &both);
  const CheckResult res = proof.finish(plan.maps.final_placement);
  require(res.ok || res.inconclusive, "the streamed plan fails the structural proof: " + res.message);
  if (report_out) *report_out = r;
  if (plan_out) *plan_out = std::move(plan);
  return text.text();
}

}  // namespace

void plan_input(std::string_view data) {
  ByteReader r(data);
  std::optional<Device> dev;
  try {
    dev.emplace(fuzzed_device(r));
  } catch (const InputError& e) {
    // The decoder only builds valid devices; a refusal means the two disagree on validity.
    broken(std::string("a valid fuzzed device was refused: ") + e.what());
  }
  const int N = dev->qubit_count();
  PlanOptions opt;
  opt.spec.qubits = 1 + r.below(N);
  const int n = opt.spec.qubits;
  switch (r.below(4)) {
    case 0: break;
    case 1: opt.auto_approx = true; break;
    default: opt.spec.approx_degree = 1 + r.below(n + 1);
  }
  const unsigned flags = r.next();
  opt.spec.inverse = flags & 1u;
  opt.measure = flags & 2u;
  const QasmVersion version = (flags & 4u) ? QasmVersion::v2 : QasmVersion::v3;
  opt.format = version;
  opt.calibration_aware = !(flags & 16u);
  if (flags & 32u) opt.end_order = EndOrder::same;
  switch (r.below(4)) {
    case 0: break;
    case 1: opt.gates = GateSet::logical; break;
    case 2: opt.gates = GateSet::cx; break;
    default: opt.gates = GateSet::cz;
  }
  const auto& strategies = plan_strategies();
  opt.strategy = strategies[r.below(static_cast<int>(strategies.size()))].name;
  opt.search.seed = r.next();
  if (flags & 8u) {
    // A pin, sometimes naming qubits outside the device or twice: must be refused cleanly.
    std::vector<int> pin;
    for (int k = 0; k < n; ++k) pin.push_back(r.below(N + 1));
    opt.placement = pin;
  }
  // Read last, so that inputs saved before it decode as they did (an exhausted reader gives 0: auto).
  const auto networks = network_choices();
  opt.network = networks[r.below(static_cast<int>(networks.size()))];
  // As plan_options does: the block construction takes its block length from the degree.
  if (opt.network == NetworkChoice::blockwise) {
    opt.spec.block_length = opt.spec.approx_degree;
    opt.spec.approx_degree.reset();
  }
  // Parts out of service (read after everything else, for the same reason): a disabled qubit, a disabled
  // coupler, a coupler of error 1. No plan may touch them; the checker refuses any gate that does. Behind
  // a marker byte, so that saved inputs with trailing bytes almost always keep their old meaning.
  if (r.next() == 0xD5u)
    if (const unsigned service = r.next(); service & 1u) {
      DeviceDescription d = dev->description();
      if (service & 2u) {
        QubitOverride o;
        o.id = r.below(N);
        o.disabled = true;
        if (std::none_of(d.qubit_calibration.begin(), d.qubit_calibration.end(),
                         [&](const QubitOverride& x) { return x.id == o.id; }))
          d.qubit_calibration.push_back(o);
      }
      const int couplers = static_cast<int>(d.couplers.size());
      if ((service & 4u) && couplers > 0) d.couplers[static_cast<std::size_t>(r.below(couplers))].disabled = true;
      if ((service & 8u) && couplers > 0) d.couplers[static_cast<std::size_t>(r.below(couplers))].error = 1.0;
      try {
        dev.emplace(std::move(d));
      } catch (const InputError& e) {
        broken(std::string("a device with parts out of service was refused: ") + e.what());
      }
    }

  if (std::getenv("QFTPLAN_FUZZ_SHOW")) {
    // For reproducing a saved input with the command line (DEVELOPERS.md "Sanitizers and fuzzing").
    std::string pin;
    if (opt.placement)
      for (int q : *opt.placement) pin += (pin.empty() ? "" : ",") + std::to_string(q);
    fmt::print(stderr, "{}--- plan --qubits {} --approx {}{}{}{} --gates {} --strategy {} --network {} --seed {}{}{}{}\n",
               device_to_yaml(*dev), n,
               opt.auto_approx ? "auto" : opt.spec.approx_degree ? std::to_string(*opt.spec.approx_degree) : "none",
               opt.spec.inverse ? " --inverse" : "", opt.measure ? " --measure" : "",
               version == QasmVersion::v2 ? " --format qasm2" : "", opt.gates ? gate_set_name(*opt.gates) : "(native)",
               opt.strategy, network_choice_name(opt.network), opt.search.seed, opt.calibration_aware ? "" : " (calibration ignored)",
               opt.end_order == EndOrder::same ? " --end-order same" : "", pin.empty() ? "" : " --placement " + pin);
  }
  PlanReport rep;
  PreparedPlan plan;
  std::string text;
  try {
    text = plan_text(*dev, opt, version, &rep, &plan);
  } catch (const InputError& e) {
    check_message(e);
    return;
  } catch (const PlanningError&) {
    // Its message may quote the device name as given; the command line prints it escaped.
    return;
  }
  require(plan.cut_short.empty(), "a search was cut short without a time limit");

  // The report agrees with the request.
  require(rep.qubits == n && static_cast<int>(rep.placement.size()) == n &&
              static_cast<int>(rep.final_placement.size()) == n,
          "report sizes");
  for (const auto* map : {&rep.placement, &rep.final_placement}) {
    std::set<int> seen(map->begin(), map->end());
    require(static_cast<int>(seen.size()) == n && *seen.begin() >= 0 && *seen.rbegin() < N,
            "a qubit map with repeated or out-of-range qubits");
  }
  if (opt.placement) require(rep.placement == *opt.placement, "a pinned placement was not kept");
  for (const auto* map : {&rep.placement, &rep.final_placement})
    for (int q : *map) require(dev->usable(q), "a plan on a qubit out of service");
  require(rep.rotations == plan.spec.kept_rotations(), "every kept rotation appears exactly once");
  require(rep.noise.esp >= 0 && rep.noise.esp <= 1 && rep.noise.log_esp <= 1e-12, "ESP outside [0, 1]");
  require(rep.noise.esp_idle <= 1 + 1e-12 && rep.noise.esp_total <= rep.noise.esp * (1 + 1e-12),
          "idling and readout cannot raise the ESP");
  // The textbook degrees and the block construction (of three blocks or more) are the approximate transforms.
  const bool approximate = plan.spec.approx_degree || (plan.spec.block_length && !plan.spec.effectively_exact());
  require(rep.approx_error_bound >= 0 && rep.approx_error_bound <= 2 && (approximate || rep.approx_error_bound == 0),
          "error bound of the exact transform, and never above 2");
  require(rep.approx.readout_success >= 0 && rep.approx.readout_success <= 1 &&
              (approximate || rep.approx.readout_success == 1),
          "readout success is a probability, 1 for the exact transform");

  // The written file reads back with the same maps and passes the checker, simulation included.
  QasmProgram prog;
  try {
    prog = parse_qasm(text, "plan.qasm");
  } catch (const InputError& e) {
    broken(std::string("our own OpenQASM output does not parse: ") + e.what() + "\n" + text);
  }
  require(prog.version == (version == QasmVersion::v2 ? 2 : 3), "version read back");
  require(prog.placement && *prog.placement == rep.placement, "placement header read back");
  require(prog.final_placement && *prog.final_placement == rep.final_placement, "final_placement header read back");
  long long counted = 0;
  for (const auto& [name, count] : rep.gate_counts) counted += count;
  require(counted == static_cast<long long>(prog.gates.size()), "gate_counts adds up to the gates in the file");
  CheckRequest req;
  req.spec = plan.spec;
  req.placement = rep.placement;
  req.final_placement = rep.final_placement;
  req.statevector_limit = 6;
  CheckResult res = check_qft_circuit(*dev, prog, req);
  // Where the structural proof loses track, the checker's exhaustive simulation decides (issue 21);
  // fuzzed registers have at most 10 qubits. The plan must still be proved.
  if (res.outcome == CheckOutcome::cannot_prove && plan.spec.qubits > req.statevector_limit) {
    req.statevector_limit = 10;
    res = check_qft_circuit(*dev, prog, req);
  }
  require(res.ok, "the written plan fails the checker: " + res.message);

  // Same inputs, same seed: byte-identical output (DEVELOPERS.md "Conventions").
  require(plan_text(*dev, opt, version, nullptr, nullptr) == text, "planning twice gave different files");
}

const std::vector<Target>& targets() {
  static const std::vector<Target> all = {{"device-yaml", &device_yaml_input},
                                          {"lattice-spec", &lattice_spec_input},
                                          {"qasm-check", &qasm_check_input},
                                          {"plan", &plan_input}};
  return all;
}

}  // namespace qftplan::fuzz
