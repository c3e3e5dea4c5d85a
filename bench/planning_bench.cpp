// Planning and emission at the sizes of issue 7: prepare the plan (chain search, placement, degree
// choice, strategy choice) and stream the circuit through the counters and noise model, and through
// the OpenQASM 3 writer into a file when one is asked for. Each timed iteration does what
// `qftplan plan` does, from building the device to renaming the finished file into place.

#include <optional>
#include <string>

#include "bench_support.hpp"
#include "qftplan/core/atomic_file.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/qasm/qasm_writer.hpp"
#include "qftplan/report/circuit_header.hpp"

namespace {

using namespace qftplan;

struct PlanCase {
  std::string device;     // built-in spec
  bool auto_approx = false;
  std::optional<GateSet> gates;
  bool write_file = false;
  double target_s = 0;
  std::string network = "auto";   // --network
  std::optional<int> block_length;  // --network blockwise --approx M (absent with auto_approx: chosen)
};

void run_plan_case(benchmark::State& state, const PlanCase& c) {
  const int n = static_cast<int>(state.range(0));
  const std::string device = c.device.empty() ? "line:" + std::to_string(n) : c.device;
  const std::string path = bench::scratch_path("plan.qasm");
  PlanReport last;
  for (auto _ : state) {
    const Device dev = load_device(device);
    PlanOptions opt;
    opt.spec.qubits = n;
    opt.auto_approx = c.auto_approx;
    opt.gates = c.gates;
    opt.network = parse_network_choice(c.network);
    opt.spec.block_length = c.block_length;
    const PreparedPlan plan = prepare_plan(dev, opt);
    if (c.write_file) {
      AtomicFile file(path);
      QasmWriter writer(QasmVersion::v3, circuit_header(dev, opt, plan), file);
      last = execute_plan(dev, opt, plan, &writer);
      last.output_bytes = writer.bytes();
      file.commit();
    } else {
      last = execute_plan(dev, opt, plan, nullptr);
    }
    benchmark::DoNotOptimize(last.noise.log_esp);
  }
  bench::record(state, bench::total_gates(last.gate_counts), c.target_s, static_cast<double>(last.output_bytes));
  state.SetLabel(device + (last.block_length     ? " blocks of " + std::to_string(*last.block_length)
                           : last.approx_degree ? " M=" + std::to_string(*last.approx_degree)
                                                : " exact"));
}

// Exact QFT, n = 1024 on grid:32x32, --gates cx, OpenQASM 3 to a file: under 1 s.
void exact_grid_cx_file(benchmark::State& s) { run_plan_case(s, {"grid:32x32", false, GateSet::cx, true, 1.0}); }
BENCHMARK(exact_grid_cx_file)->Arg(1024);

// Approximate QFT, n = 16384, --approx auto, on line:16384 and on a heavy-hexagon lattice of at
// least 16384 qubits (heavy-hex:64x64 has 5*64*64+4*64+4*64-1 = 20991): under 1 s each.
void approx_auto_line(benchmark::State& s) { run_plan_case(s, {"", true, std::nullopt, false, 1.0}); }
BENCHMARK(approx_auto_line)->Arg(16384);
void approx_auto_heavy_hex(benchmark::State& s) { run_plan_case(s, {"heavy-hex:64x64", true, std::nullopt, false, 1.0}); }
BENCHMARK(approx_auto_heavy_hex)->Arg(16384);

// Exact QFT, n = 4096 on line:4096, report only: under 1 s.
void exact_line_report(benchmark::State& s) { run_plan_case(s, {"", false, std::nullopt, false, 1.0}); }
BENCHMARK(exact_line_report)->Arg(4096);

// The same with OpenQASM 3 written to a file: at least 100 MB/s of text (tools/bench turns the
// bytes into a rate).
void exact_line_file(benchmark::State& s) { run_plan_case(s, {"", false, std::nullopt, true, 0}); }
BENCHMARK(exact_line_file)->Arg(4096);

// The block construction (--network blockwise) on line:4096: blocks of 12 with the error figures from
// a seeded sample, report only, under 1 s; the block length chosen by --approx auto (every length
// 1 .. 16 counted and sampled), under 5 s.
void blockwise_line(benchmark::State& s) { run_plan_case(s, {"", false, std::nullopt, false, 1.0, "blockwise", 12}); }
BENCHMARK(blockwise_line)->Arg(4096)->Unit(benchmark::kMillisecond);
void blockwise_auto_line(benchmark::State& s) { run_plan_case(s, {"", true, std::nullopt, false, 5.0, "blockwise"}); }
BENCHMARK(blockwise_auto_line)->Arg(4096)->Unit(benchmark::kMillisecond);

// Doubling series: exact time may grow at most 4.5x per doubling of n, approximate at most 2.3x.
BENCHMARK(exact_line_report)->Name("doubling_exact")->Arg(512)->Arg(1024)->Arg(2048)->Arg(4096)->Arg(8192);
BENCHMARK(approx_auto_line)->Name("doubling_approx")->Arg(2048)->Arg(4096)->Arg(8192)->Arg(16384);

}  // namespace
