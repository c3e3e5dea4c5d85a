// The README's figures of the block construction (`--network blockwise`; Kahanamoku-Meyer, Blue,
// Bergamaschi, Gidney, Chuang, arXiv:2505.00701, 2025). Not a test and no timing; prints
//   1. for n = 64 .. 4096 and block lengths 4, 8, 12 on line:n: CX, two-qubit depth, CX depth (the plan's
//      report) and the error figures (blockwise_error.hpp: normalised Frobenius distance, readout success,
//      fraction of columns beyond 0.1, with standard errors where sampled);
//   2. with --eps: for errors 0.1 and 0.03, the shortest block length whose Frobenius distance is at most
//      that error at each n, with its two-qubit depth (slow: minutes, large blocks cost 2^m an input).
// In a build tree BUILD configured with -DQFTPLAN_BUILD_BENCH=ON: BUILD/bench/qftplan_blockwise_figures [--eps]

#include <cstdio>
#include <cstring>
#include <string>

#include "qftplan/core/blockwise_error.hpp"
#include "qftplan/device/lattices.hpp"
#include "qftplan/networks/blockwise_qft.hpp"
#include "qftplan/planners/plan.hpp"

using namespace qftplan;

int main(int argc, char** argv) {
  const bool eps_table = argc > 1 && std::strcmp(argv[1], "--eps") == 0;
  std::printf("| n | m | CX | two-qubit depth | CX depth | Frobenius distance | readout success | columns > 0.1 |\n");
  std::printf("|---|---|---|---|---|---|---|---|\n");
  for (int m : {4, 8, 12})
    for (int n : {64, 256, 1024, 4096}) {
      PlanSettings s;
      s.qubits = n;
      s.approx = std::to_string(m);
      s.network = "blockwise";
      s.strategy = "chain";
      const PlanReport r = plan_qft(make_line(n), plan_options(s));
      const BlockwiseFigures& b = *r.approx.blockwise;
      std::printf("| %d | %d | %lld | %lld | %lld | %.3g +- %.2g | %.4g +- %.2g | %.3g%% |\n", n, m, r.cx_count, r.depth_2q,
                  r.cx_depth, b.frobenius, b.frobenius_standard_error, b.readout_success, b.readout_standard_error,
                  100 * b.fraction_above);
    }
  if (!eps_table) return 0;
  for (double eps : {0.1, 0.03})
    for (int n : {64, 256, 1024, 4096})
      for (int m = 4; m <= kMaxBlockwiseFigureLength; ++m) {
        const BlockwiseFigures f = blockwise_figures(n, m, eps, 1, 2e7);
        if (f.frobenius > eps) continue;
        std::printf("error %g, n = %d: m = %d, Frobenius %.3g +- %.2g, readout %.4f, columns beyond %.3g%%, two-qubit depth %d\n",
                    eps, n, m, f.frobenius, f.frobenius_standard_error, f.readout_success, 100 * f.fraction_above,
                    blockwise_two_qubit_depth(n, m));
        break;
      }
  return 0;
}
