// Finding a chain of 4000 qubits in a heavy-hexagon lattice of about 10000 qubits: under 0.5 s.
// heavy-hex:44x45 has 5*44*45+4*44+4*45-1 = 10255 qubits. The lattice is built before timing.

#include "bench_support.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/chain_search.hpp"
#include "qftplan/planners/plan.hpp"

namespace {

using namespace qftplan;

void find_chain_heavy_hex(benchmark::State& state) {
  const int n = static_cast<int>(state.range(0));
  const Device dev = make_lattice("heavy-hex:44x45");
  for (auto _ : state) {
    const auto found = find_chain(dev, n);
    if (static_cast<int>(found.chain.size()) != n || !is_chain(dev, found.chain))
      state.SkipWithError("no chain found");
    benchmark::DoNotOptimize(found.work);
  }
  bench::record(state, 0, 0.5);
  state.SetLabel("heavy-hex:44x45 (10255 qubits)");
}
BENCHMARK(find_chain_heavy_hex)->Arg(4000);

}  // namespace

namespace {

using namespace qftplan;

// Issue 17: the longest chain of a defective heavy-hexagon chip read without positions and with its
// own numbering (about 8,300 qubits): the guided search should stay within a few qubits of the best.
void find_chain_defective_heavy_hex(benchmark::State& state) {
  const Device dev = with_defects(make_lattice("heavy-hex:40x40"), 20, 40, 1);
  const int n = static_cast<int>(state.range(0));
  for (auto _ : state) {
    const auto found = find_chain(dev, n);
    if (static_cast<int>(found.chain.size()) != n) state.SkipWithError("no chain found");
    benchmark::DoNotOptimize(found.work);
  }
  bench::record(state, 0, 2.0);
  state.SetLabel("heavy-hex:40x40, 20 dead qubits, 40 broken couplers, no positions");
}
BENCHMARK(find_chain_defective_heavy_hex)->Arg(6000);

// Issue 17, item 4: the chain of highest ESP for n = 60 on a calibrated defective chip of a few
// hundred qubits: under a second.
void place_chain_defective(benchmark::State& state) {
  DeviceDescription d = with_defects(make_lattice("heavy-hex:6x6"), 2, 3, 1).description();
  for (std::size_t i = 0; i < d.couplers.size(); ++i) d.couplers[i].error = 0.002 + 0.058 * static_cast<double>((i * 37) % 29) / 28;
  d.calibration.error_1q = 0.001;
  const Device dev(d);
  PlanOptions opt;
  opt.spec.qubits = static_cast<int>(state.range(0));
  opt.strategy = "chain";
  for (auto _ : state) {
    const PreparedPlan plan = prepare_plan(dev, opt);
    benchmark::DoNotOptimize(plan.placement.chains_scored);
  }
  bench::record(state, 0, 1.0);
  state.SetLabel("heavy-hex:6x6 defective, calibrated (" + std::to_string(dev.qubit_count()) + " qubits)");
}
BENCHMARK(place_chain_defective)->Arg(60);

}  // namespace
