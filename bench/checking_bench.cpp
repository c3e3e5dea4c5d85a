// `qftplan check` on the exact 1024-qubit circuit for grid:32x32 (--gates cx): parse the file and
// run the structural proof. Under 2 s. The file is written once, before timing.

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

}  // namespace
