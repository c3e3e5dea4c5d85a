#include "plan_simulation.hpp"

#include <fftw3.h>

#include <algorithm>
#include <cmath>

#include "qftplan/check/statevector.hpp"
#include "qftplan/core/atomic_file.hpp"
#include "qftplan/report/circuit_header.hpp"

namespace qftplan::testing {

using cd = std::complex<double>;

// The backward transform computes Y[y] = sum_j X[j] exp(+2 pi i j y / N) (FFTW manual, section 4.8
// "What FFTW Really Computes"); divided by sqrt(N) it is the QFT of Nielsen & Chuang (2000), eq. 5.2.
// The forward transform (sign -1) gives the inverse QFT.
QftMatrix fftw_qft_matrix(int n, bool inverse) {
  const int N = 1 << n;
  QftMatrix m(N, std::vector<cd>(N));
  std::vector<cd> in(N), out(N);
  fftw_plan p = fftw_plan_dft_1d(N, reinterpret_cast<fftw_complex*>(in.data()), reinterpret_cast<fftw_complex*>(out.data()),
                                 inverse ? FFTW_FORWARD : FFTW_BACKWARD, FFTW_ESTIMATE);
  for (int j = 0; j < N; ++j) {
    std::fill(in.begin(), in.end(), cd{});
    in[j] = 1;
    fftw_execute(p);
    for (int y = 0; y < N; ++y) m[j][y] = out[y] / std::sqrt(double(N));
  }
  fftw_destroy_plan(p);
  return m;
}

QftMatrix plan_unitary(const Device& device, const PreparedPlan& plan, const std::vector<Gate>& gates) {
  const int n = plan.spec.qubits, N = 1 << n;
  std::vector<int> local(device.qubit_count(), -1);
  int used = 0;
  auto touch = [&](int q) {
    if (local[q] < 0) local[q] = used++;
  };
  for (int q : plan.maps.placement) touch(q);
  for (const auto& g : gates) {
    touch(g.q0);
    if (is_two_qubit(g.kind)) touch(g.q1);
  }
  QftMatrix m(N, std::vector<cd>(N));
  for (int j = 0; j < N; ++j) {
    StateVector sv(used);
    std::size_t idx = 0;
    for (int k = 0; k < n; ++k)
      if ((j >> k) & 1) idx |= std::size_t{1} << local[plan.maps.placement[k]];
    sv.set_basis(idx);
    for (Gate g : gates) {
      g.q0 = local[g.q0];
      if (is_two_qubit(g.kind)) g.q1 = local[g.q1];
      sv.apply(g);
    }
    for (int y = 0; y < N; ++y) {
      std::size_t out = 0;
      for (int k = 0; k < n; ++k)
        if ((y >> k) & 1) out |= std::size_t{1} << local[plan.maps.final_placement[k]];
      m[j][y] = sv.amplitudes()[out];
    }
  }
  return m;
}

WrittenPlan write_and_read(const Device& device, const PlanOptions& options, QasmVersion version) {
  WrittenPlan w;
  w.plan = prepare_plan(device, options);
  StringOutput text;
  QasmWriter writer(version, circuit_header(device, options, w.plan), text);
  w.report = execute_plan(device, options, w.plan, &writer);
  w.text = text.text();
  w.program = parse_qasm(w.text, "<memory>");
  w.request.spec = w.plan.spec;
  w.request.placement = w.plan.maps.placement;
  w.request.final_placement = w.plan.maps.final_placement;
  return w;
}

double distance_up_to_phase(const QftMatrix& a, const QftMatrix& b) {
  cd phase = 1;
  for (std::size_t y = 0; y < a[0].size(); ++y)
    if (std::abs(b[0][y]) > 1e-3) {
      phase = a[0][y] / b[0][y];
      break;
    }
  double worst = 0;
  for (std::size_t j = 0; j < a.size(); ++j)
    for (std::size_t y = 0; y < a[j].size(); ++y) worst = std::max(worst, std::abs(a[j][y] - phase * b[j][y]));
  return worst;
}

}  // namespace qftplan::testing
