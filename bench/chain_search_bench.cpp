// Finding a chain of 4000 qubits in a heavy-hexagon lattice of about 10000 qubits: under 0.5 s.
// heavy-hex:44x45 has 5*44*45+4*44+4*45-1 = 10255 qubits. The lattice is built before timing.

#include "bench_support.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/planners/chain_search.hpp"

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
