// Figures of the approximate QFT (README "What the numbers mean": distance, bound, infidelity, readout).
//
// Notation. x = sum_a x_a 2^a is the input, y = sum_b y_b 2^b the output (logical qubit k holds bit k),
// QFT_{y,x} = 2^{-n/2} e^{2 pi i x y / 2^n} (Nielsen & Chuang 2000, eq. 5.2). The phase splits into
// couplings x_a y_b 2^{a+b-n} (mod 1, only a + b <= n-1 matter); coupling (a, b) is the controlled
// rotation between processing distance d = n-1-a-b (a Hadamard when d = 0), angle pi/2^d. Degree M keeps
// d <= M-1, i.e. a + b >= n - M. So AQFT_{y,x} = QFT_{y,x} e^{-2 pi i sum_b y_b delta_b(x)} with the
// dropped part of output bit b's phase
//     delta_b(x) = sum_{a < n-M-b} x_a 2^{a+b-n} = (x mod 2^{n-M-b}) / 2^{n-b}  in [0, 2^-M).
// On a basis input both transforms give product states: output qubit b is (|0> + e^{2 pi i phi_b}|1>)/sqrt2,
// and the approximation shifts phi_b by -delta_b (Barenco et al. 1996, section 2; Coppersmith 1994).

#include "qftplan/core/approximation.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>
#include <random>
#include <vector>

#include <Eigen/Dense>

namespace qftplan {

namespace {
constexpr double kPi = std::numbers::pi;
}

std::optional<int> effective_degree(int n, std::optional<int> degree) {
  if (!degree || *degree >= n) return std::nullopt;
  return std::max(1, *degree);
}

// The bound. Group the dropped rotations by the qubit that controls them: in the textbook network qubit i
// (processing index) takes its Hadamard, then every rotation with a later qubit j, all diagonal, so the
// dropped ones of qubit i (j - i >= M) form one diagonal factor D_i with QFT = prod_i (C~_i D_i H_i) and
// AQFT = prod_i (C~_i H_i). Hence QFT = W AQFT with W = product of the D_i, each conjugated by a unitary.
// The phases of D_i are x_i sum_{j-i>=M} x_j pi/2^{j-i}, in [0, theta_i],
//     theta_i = sum_{d=M}^{r} pi/2^d = pi (2^{1-M} - 2^{-r}),   r = n-1-i the last distance of qubit i.
// Lemma (ours): if the unitary U has eigenphases in [0, a] and V = e^{iK} with 0 <= K <= b, the eigenphases
// of U V, followed along t -> U e^{itK}, stay in [0, a + b]: an eigenvalue e^{i theta} of a normal matrix
// moves as theta' = <v|K|v> in [0, b] (first-order perturbation of an eigenvalue of a normal matrix along
// an analytic branch; Kato, Perturbation Theory for Linear Operators, 1966, ch. II, from memory). So W has
// eigenphases in [0, S], S = sum_i theta_i = pi ((n-M-1) 2^{1-M} + 2^{1-n}), and
//     ||QFT - AQFT|| = ||W - I|| <= max_{0 <= t <= min(S, pi)} |e^{it} - 1| = 2 sin(min(S, pi)/2) <= 2.
// It is never worse than the sum over gates of 2 sin(angle/2) (Nielsen & Chuang 2000, eq. 4.63, the
// argument of Coppersmith 1994), by the subadditivity of sin on [0, pi]; the tests compare it with the
// exact distance for every n <= 12 and every degree.
double approx_error_bound(int n, std::optional<int> degree) {
  const auto m = effective_degree(n, degree);
  if (!m) return 0.0;
  const int M = *m;
  const double s = kPi * (static_cast<double>(n - M - 1) * std::ldexp(1.0, 1 - M) + std::ldexp(1.0, 1 - n));
  return 2.0 * std::sin(std::min(s, kPi) / 2.0);
}

double approx_fidelity_lower_bound(double e) {
  const double r = 1.0 - e * e / 2.0;
  return r <= 0 ? 0.0 : r * r;
}

// ---- The exact distance ----------------------------------------------------------------------------
//
// Both transforms are "bilinear phase" matrices P_{y,x} = 2^{-m/2} e^{2 pi i (sum c_ab x_a y_b +
// sum alpha_a x_a + sum beta_b y_b + gamma)} on the same bits. When output bit p couples, in both, with
// one input bit q only, with c = 1/2, and beta_p agrees, then multiplying both from the left by the same
// unitary (phase e^{-2 pi i beta_p y_p}, then a Hadamard on bit p) turns the pair into block-diagonal
// matrices, one block per value of x_q: sum_{y_p} (-1)^{(z + x_q) y_p} / 2 = [z = x_q]. Within the block
// x_q = 1 the couplings c_qb become linear terms beta_b and alpha_q joins gamma. The same holds with
// inputs and outputs exchanged (multiplying from the right). Unitary factors keep the norm and
// ||blockdiag(A_k) - blockdiag(F_k)|| = max_k ||A_k - F_k||, so the distance is the largest over blocks;
// blocks that no longer peel go to a dense Hermitian eigenvalue problem (largest eigenvalue of D^dag D).
// On the textbook network this peels the last M qubits from the output side and the first M from the
// input side, and further wherever the dropped phases have not reached.
namespace {

struct PhasePair {
  int n = 0, degree = 0;
  std::vector<int> ins, outs;                    // active input bits a, output bits b
  std::vector<double> alpha[2], beta[2];         // [0]: approximate, [1]: exact; in turns
  double gamma[2] = {0, 0};
};

double coupling(const PhasePair& p, int which, int a, int b) {
  const int s = a + b;
  if (s > p.n - 1) return 0.0;
  if (which == 0 && s < p.n - p.degree) return 0.0;
  return std::ldexp(1.0, s - p.n);
}

bool same_turn(double u, double v) {
  const double d = u - v;
  return std::abs(d - std::round(d)) < 1e-12;
}

double dense_block_norm(const PhasePair& p) {
  const int m = static_cast<int>(p.ins.size());
  const long long dim = 1LL << m;
  const double scale = 1.0 / std::sqrt(static_cast<double>(dim));
  Eigen::MatrixXcd d(dim, dim);
  std::vector<double> s(static_cast<std::size_t>(m));
  for (int which = 0; which < 2; ++which) {
    for (long long x = 0; x < dim; ++x) {
      double lin = p.gamma[which];
      for (int i = 0; i < m; ++i) {
        if ((x >> i) & 1) lin += p.alpha[which][p.ins[i]];
      }
      for (int j = 0; j < m; ++j) {
        double c = p.beta[which][p.outs[j]];
        for (int i = 0; i < m; ++i)
          if ((x >> i) & 1) c += coupling(p, which, p.ins[i], p.outs[j]);
        s[j] = c;
      }
      for (long long y = 0; y < dim; ++y) {
        double ph = lin;
        for (int j = 0; j < m; ++j)
          if ((y >> j) & 1) ph += s[j];
        const std::complex<double> v = std::polar(scale, 2 * kPi * (ph - std::floor(ph)));
        if (which == 0) d(y, x) = v;
        else d(y, x) -= v;
      }
    }
  }
  const Eigen::MatrixXcd g = d.adjoint() * d;
  Eigen::SelfAdjointEigenSolver<Eigen::MatrixXcd> es(g, Eigen::EigenvaluesOnly);
  return std::sqrt(std::max(0.0, es.eigenvalues().maxCoeff()));
}

// Peels output bit outs[j] (from_output) or input bit ins[j]; returns false when it does not peel.
bool peel(const PhasePair& p, bool from_output, std::size_t j, PhasePair out[2]) {
  const auto& mine = from_output ? p.outs : p.ins;
  const auto& other = from_output ? p.ins : p.outs;
  const int bit = mine[j];
  int partner = -1;
  for (int which = 0; which < 2; ++which) {
    int found = -1, count = 0;
    for (int o : other) {
      const double c = from_output ? coupling(p, which, o, bit) : coupling(p, which, bit, o);
      if (c != 0.0) {
        ++count;
        found = o;
        if (c != 0.5) return false;
      }
    }
    if (count != 1 || (partner >= 0 && found != partner)) return false;
    partner = found;
  }
  const auto& lin0 = from_output ? p.beta[0] : p.alpha[0];
  const auto& lin1 = from_output ? p.beta[1] : p.alpha[1];
  if (!same_turn(lin0[bit], lin1[bit])) return false;
  for (int v = 0; v < 2; ++v) {
    PhasePair q = p;
    auto& qm = from_output ? q.outs : q.ins;
    auto& qo = from_output ? q.ins : q.outs;
    qm.erase(qm.begin() + static_cast<std::ptrdiff_t>(j));
    qo.erase(std::find(qo.begin(), qo.end(), partner));
    if (v == 1) {
      for (int which = 0; which < 2; ++which) {
        // The partner bit is 1: its couplings become linear terms of the remaining bits on my side.
        for (int b : qm) {
          const double c = from_output ? coupling(p, which, partner, b) : coupling(p, which, b, partner);
          (from_output ? q.beta[which] : q.alpha[which])[b] += c;
        }
        q.gamma[which] += (from_output ? p.alpha[which] : p.beta[which])[partner];
      }
    }
    out[v] = std::move(q);
  }
  return true;
}

bool identical(const PhasePair& p) {
  for (int a : p.ins)
    for (int b : p.outs)
      if (!same_turn(coupling(p, 0, a, b), coupling(p, 1, a, b))) return false;
  for (int a : p.ins)
    if (!same_turn(p.alpha[0][a], p.alpha[1][a])) return false;
  for (int b : p.outs)
    if (!same_turn(p.beta[0][b], p.beta[1][b])) return false;
  return true;
}

// The largest norm over the blocks that peel down to scalars; the others are left in `dense`.
double peeled_norm(const PhasePair& p, std::vector<PhasePair>& dense) {
  if (identical(p)) {  // the same unitary up to the scalars e^{2 pi i gamma}
    const double d = p.gamma[0] - p.gamma[1];
    return 2.0 * std::abs(std::sin(kPi * (d - std::round(d))));
  }
  PhasePair parts[2];
  for (int side = 0; side < 2; ++side) {
    const std::size_t count = side == 0 ? p.outs.size() : p.ins.size();
    for (std::size_t j = 0; j < count; ++j)
      if (peel(p, side == 0, j, parts)) return std::max(peeled_norm(parts[0], dense), peeled_norm(parts[1], dense));
  }
  dense.push_back(p);
  return 0.0;
}

}  // namespace

std::optional<double> approx_distance(int n, std::optional<int> degree, double max_work) {
  const auto m = effective_degree(n, degree);
  if (!m) return 0.0;
  if (n > kMaxExactDistanceQubits) return std::nullopt;
  PhasePair p;
  p.n = n;
  p.degree = *m;
  for (int k = 0; k < n; ++k) {
    p.ins.push_back(k);
    p.outs.push_back(k);
  }
  for (int w = 0; w < 2; ++w) {
    p.alpha[w].assign(static_cast<std::size_t>(n), 0.0);
    p.beta[w].assign(static_cast<std::size_t>(n), 0.0);
  }
  std::vector<PhasePair> dense;
  double best = peeled_norm(p, dense);
  double work = 0;  // the dense eigenvalue problems cost about dim^3 each
  for (const auto& d : dense) work += std::ldexp(1.0, 3 * static_cast<int>(d.ins.size()));
  if (work > max_work) return std::nullopt;
  for (const auto& d : dense) best = std::max(best, dense_block_norm(d));
  return best;
}

// ---- Readout success and infidelity ---------------------------------------------------------------
//
// Phase estimation (Nielsen & Chuang 2000, section 5.2) with a basis-state phase x/2^n prepares
// QFT|x> = (1/sqrt N) sum_y e^{2 pi i x y/N}|y> and applies the inverse transform; with the degree-M
// inverse AQFT^dag the probability of reading x exactly is
//     |<x| AQFT^dag QFT |x>|^2 = |<AQFT x|QFT x>|^2 = prod_b |(1 + e^{2 pi i delta_b(x)})/2|^2
//                              = prod_b cos^2(pi delta_b(x)) = prod_b cos^2(Delta_b / 2),
// both being product states that differ on qubit b by the dropped correction Delta_b = 2 pi delta_b(x)
// (Barenco et al. 1996 analyse the same per-qubit phase errors). readout_success is its mean over the 2^n
// phases. The infidelity needs Tr(QFT^dag AQFT)/2^n = E_x <QFT x|AQFT x> = E_x prod_b (1 + e^{-2 pi i delta_b})/2,
// and F_avg = (d |Tr/d|^2 + 1)/(d + 1) (Nielsen, "A simple formula for the average gate fidelity of a
// quantum dynamical operation", Phys. Lett. A 303, 249, 2002).
//
// With L = n-M-b, delta_b = u_L / 2^M where u_L = (x mod 2^L)/2^L = 0.x_{L-1}...x_0 in binary; only the
// low N = n-M bits matter, and u_L = (x_{L-1} + u_{L-1})/2 from u_0 = 0. So both averages are
// E[prod_{L=1}^{N} f(u_L)] over fair independent bits, f(u) = cos^2(pi u/2^M) or (1 + e^{-2 pi i u/2^M})/2.
namespace {

double readout_factor(double u, double inv_pow) {
  const double c = std::cos(kPi * u * inv_pow);
  return c * c;
}
std::complex<double> overlap_factor(double u, double inv_pow) {
  return 0.5 * (1.0 + std::polar(1.0, -2 * kPi * u * inv_pow));
}

struct Enumerator {
  int bits = 0;
  double inv_pow = 1;
  double readout = 0;
  std::complex<double> overlap{0, 0};
  // Depth-first over the bits from low to high: 2^(N+1) factor evaluations in all.
  void walk(int level, double u, double r, std::complex<double> o) {
    for (int bit = 0; bit < 2; ++bit) {
      const double v = (bit + u) / 2;
      const double r2 = r * readout_factor(v, inv_pow);
      const std::complex<double> o2 = o * overlap_factor(v, inv_pow);
      if (level == bits) {
        readout += r2;
        overlap += o2;
      } else {
        walk(level + 1, v, r2, o2);
      }
    }
  }
};

}  // namespace

InputAverages input_averages_enumerated(int bits, int degree) {
  InputAverages out;
  if (bits <= 0) return out;
  Enumerator e;
  e.bits = bits;
  e.inv_pow = std::ldexp(1.0, -degree);
  e.walk(1, 0.0, 1.0, {1.0, 0.0});
  const double count = std::ldexp(1.0, bits);
  out.readout = e.readout / count;
  out.log_readout = std::log(out.readout);
  out.overlap = e.overlap / count;
  return out;
}

// The transfer operator. G_k(u) = E[prod_{j=1}^{k} f(u_j) | u_0 = u] satisfies
//     G_k(u) = (1/2) sum_{bit} f((bit + u)/2) G_{k-1}((bit + u)/2),   G_0 = 1,   answer G_N(0).
// Every G_k is a mean of products of f at u/2^j + constants, a trigonometric sum of frequencies below
// 2 pi / 2^M * sum 2^-j <= 2 pi, so on [0, 1] it is approximated by its interpolant at K = 40 Chebyshev
// points to rounding (the Chebyshev coefficients of such a function fall like (pi/2)^k / k!: Trefethen,
// Approximation Theory and Approximation Practice, 2013, ch. 8). On that grid the recursion is a fixed
// K x K matrix T (values at the points (t_i + bit)/2 read from the interpolant of the previous G), and the
// answer is l(0) . T^N . 1 with l the interpolation weights at 0: T^N by repeated squaring, scaled to
// keep its logarithm when the value underflows. The tests compare it with enumeration to 1e-12.
namespace {

constexpr int kNodes = 40;

template <class F>
std::pair<std::complex<double>, double> transfer_average(int bits, F f) {
  using Mat = Eigen::Matrix<std::complex<double>, Eigen::Dynamic, Eigen::Dynamic>;
  using Vec = Eigen::Matrix<std::complex<double>, Eigen::Dynamic, 1>;
  std::vector<double> t(kNodes), w(kNodes);
  for (int i = 0; i < kNodes; ++i) {
    const double th = kPi * (2 * i + 1) / (2.0 * kNodes);
    t[i] = (1 - std::cos(th)) / 2;
    w[i] = (i % 2 ? -1.0 : 1.0) * std::sin(th);  // barycentric weights of Chebyshev points of the first kind
  }
  const auto weights_at = [&](double u) {  // interpolation weights l_j(u)
    std::vector<double> l(kNodes, 0.0);
    for (int j = 0; j < kNodes; ++j)
      if (u == t[j]) {
        l[j] = 1;
        return l;
      }
    double sum = 0;
    for (int j = 0; j < kNodes; ++j) sum += (l[j] = w[j] / (u - t[j]));
    for (auto& v : l) v /= sum;
    return l;
  };
  Mat T = Mat::Zero(kNodes, kNodes);
  for (int i = 0; i < kNodes; ++i)
    for (int bit = 0; bit < 2; ++bit) {
      const double v = (bit + t[i]) / 2;
      const auto l = weights_at(v);
      const std::complex<double> fv = f(v);
      for (int j = 0; j < kNodes; ++j) T(i, j) += 0.5 * fv * l[j];
    }
  Vec r = Vec::Ones(kNodes);
  double log_scale = 0;  // r and T carry separate scales, folded into log_scale
  double t_scale = 0;
  for (long long k = bits; k > 0; k >>= 1) {
    if (k & 1) {
      r = T * r;
      const double m = r.cwiseAbs().maxCoeff();
      if (m == 0) return {0.0, -INFINITY};
      r /= m;
      log_scale += std::log(m) + t_scale;
    }
    if (k > 1) {
      T = (T * T).eval();
      const double m = T.cwiseAbs().maxCoeff();
      if (m == 0) return {0.0, -INFINITY};
      T /= m;
      t_scale = 2 * t_scale + std::log(m);
    }
  }
  const auto l0 = weights_at(0.0);
  std::complex<double> v = 0;
  for (int j = 0; j < kNodes; ++j) v += l0[j] * r(j);
  return {v, log_scale};
}

}  // namespace

InputAverages input_averages_transfer(int bits, int degree) {
  InputAverages out;
  if (bits <= 0) return out;
  const double inv_pow = std::ldexp(1.0, -degree);
  const auto [r, lr] = transfer_average(bits, [&](double u) { return std::complex<double>(readout_factor(u, inv_pow)); });
  // Rounding can lift a value of 1 - 1e-13 just above 1: a probability stays at most 1.
  out.log_readout = std::isinf(lr) || r.real() <= 0 ? -INFINITY : std::min(0.0, std::log(r.real()) + lr);
  out.readout = std::exp(out.log_readout);
  const auto [o, lo] = transfer_average(bits, [&](double u) { return overlap_factor(u, inv_pow); });
  out.overlap = std::isinf(lo) ? std::complex<double>(0) : o * std::exp(lo);
  return out;
}

SampledReadout sample_readout_success(int n, int degree, int samples, std::uint64_t seed) {
  SampledReadout s;
  const int bits = n - degree;
  if (bits <= 0 || samples < 2) {
    s.mean = 1;
    return s;
  }
  std::mt19937_64 rng(seed);
  const double inv_pow = std::ldexp(1.0, -degree);
  double sum = 0, sum2 = 0;
  for (int k = 0; k < samples; ++k) {
    double u = 0, prod = 1;
    std::uint64_t word = 0;
    for (int b = 0; b < bits; ++b) {
      if (b % 64 == 0) word = rng();
      u = (static_cast<double>((word >> (b % 64)) & 1) + u) / 2;
      prod *= readout_factor(u, inv_pow);
    }
    sum += prod;
    sum2 += prod * prod;
  }
  s.mean = sum / samples;
  const double var = std::max(0.0, (sum2 - samples * s.mean * s.mean) / (samples - 1));
  s.standard_error = std::sqrt(var / samples);
  return s;
}

const char* readout_method_name(ReadoutMethod m) {
  switch (m) {
    case ReadoutMethod::exact: return "exact";
    case ReadoutMethod::enumeration: return "enumeration";
    case ReadoutMethod::transfer: return "transfer";
    case ReadoutMethod::sampled: return "sampled";
  }
  return "?";
}

ApproxFigures approx_figures(int n, std::optional<int> degree, bool with_distance) {
  ApproxFigures f;
  f.degree = effective_degree(n, degree);
  if (!f.degree) {
    f.distance = 0.0;
    return f;
  }
  const int M = *f.degree;
  const int bits = n - M;
  f.error_bound = approx_error_bound(n, M);
  if (with_distance) f.distance = approx_distance(n, M, kMaxDistanceWork);
  f.method = bits <= kMaxEnumeratedBits ? ReadoutMethod::enumeration : ReadoutMethod::transfer;
  const InputAverages a = f.method == ReadoutMethod::enumeration ? input_averages_enumerated(bits, M)
                                                                 : input_averages_transfer(bits, M);
  f.readout_success = a.readout;
  f.log_readout_success = a.log_readout;
  // 1 - F_avg = d (1 - |t|^2) / (d + 1) with t = Tr/d; d/(d+1) = 1/(1 + 2^-n).
  f.infidelity = std::max(0.0, (1.0 - std::norm(a.overlap)) / (1.0 + std::ldexp(1.0, -n)));
  return f;
}

ApproxFigures spec_figures(const QftSpec& spec, bool with_distance, double threshold, double work) {
  if (!spec.block_length) return approx_figures(spec.qubits, spec.approx_degree, with_distance);
  ApproxFigures f;
  const BlockwiseFigures b = blockwise_figures(spec.qubits, *spec.block_length, threshold, 1, work);
  f.blockwise = b;
  if (b.exact) {
    f.distance = 0.0;
    return f;
  }
  f.error_bound = 2;
  f.readout_success = b.readout_success;
  f.log_readout_success = b.readout_success > 0 ? std::log(b.readout_success) : -std::numeric_limits<double>::infinity();
  f.readout_standard_error = b.readout_standard_error;
  f.infidelity = b.infidelity;
  f.method = b.sampled ? ReadoutMethod::sampled : ReadoutMethod::enumeration;
  return f;
}

}  // namespace qftplan
