// `qftplan check` on the exact 1024-qubit circuit for grid:32x32 (--gates cx): parse the file and
// run the structural proof. Under 2 s. The file is written once, before timing.
// And the streamed check (files of 256 MiB and more) on the exact 2048-qubit chain plan for
// line:2048, the same shape as the 8192-qubit file of issue 15 at 1/16 of its gates.

#include "bench_support.hpp"
#include "qftplan/check/qft_checker.hpp"
#include "qftplan/core/atomic_file.hpp"
#include "qftplan/device/device_source.hpp"
#include "qftplan/planners/plan.hpp"
#include "qftplan/qasm/qasm_program.hpp"
#include "qftplan/qasm/qasm_writer.hpp"
#include "qftplan/report/circuit_header.hpp"

namespace {

using namespace qftplan;

void check_grid_cx_file(benchmark::State& state) {
  const int n = static_cast<int>(state.range(0));
  const Device dev = load_device("grid:32x32");
  const std::string path = bench::scratch_path("check.qasm");
  PlanOptions opt;
  opt.spec.qubits = n;
  opt.gates = GateSet::cx;
  const PreparedPlan plan = prepare_plan(dev, opt);
  {
    AtomicFile file(path);
    QasmWriter writer(QasmVersion::v3, circuit_header(dev, opt, plan), file);
    execute_plan(dev, opt, plan, &writer);
    file.commit();
  }
  double gates = 0;
  for (auto _ : state) {
    const Device checked_on = load_device("grid:32x32");
    const QasmProgram prog = load_qasm_file(path);
    CheckRequest req;
    req.spec.qubits = n;
    req.placement = *prog.placement;
    req.final_placement = *prog.final_placement;
    const CheckResult res = check_qft_circuit(checked_on, prog, req);
    if (!res.ok || !res.structural_proved) state.SkipWithError(("check failed: " + res.message).c_str());
    gates = static_cast<double>(prog.gates.size());
  }
  bench::record(state, gates, 2.0);
}
BENCHMARK(check_grid_cx_file)->Arg(1024);

void check_line_file_streaming(benchmark::State& state) {
  const int n = static_cast<int>(state.range(0));
  const std::string spec = "line:" + std::to_string(n);
  const Device dev = load_device(spec);
  const std::string path = bench::scratch_path("check_stream.qasm");
  PlanOptions opt;
  opt.spec.qubits = n;
  const PreparedPlan plan = prepare_plan(dev, opt);
  double gates = 0;  // as written (gate_counts, by name in the file)
  {
    AtomicFile file(path);
    QasmWriter writer(QasmVersion::v3, circuit_header(dev, opt, plan), file);
    for (const auto& [name, count] : execute_plan(dev, opt, plan, &writer).gate_counts) gates += static_cast<double>(count);
    file.commit();
  }
  for (auto _ : state) {
    const Device checked_on = load_device(spec);
    const CheckResult res = check_qft_file_streaming(
        checked_on, path,
        [n](const QasmProgram& header) {
          CheckRequest req;
          req.spec.qubits = n;
          req.placement = *header.placement;
          req.final_placement = *header.final_placement;
          return req;
        },
        nullptr);
    if (!res.ok || !res.structural_proved) state.SkipWithError(("check failed: " + res.message).c_str());
  }
  // Target: issue 15's budget for the 8192-qubit file (60 s for 100.69M gates) per gate, times this
  // file's 6.30M gates.
  bench::record(state, gates, 60.0 * 6.30 / 100.69);
}
BENCHMARK(check_line_file_streaming)->Arg(2048)->Unit(benchmark::kMillisecond);

}  // namespace
