#pragma once
/// \file approximation.hpp
/// How far the approximate QFT is from the exact one.

#include <optional>

namespace qftplan {

/// Upper bound on the operator-norm distance ||QFT - AQFT_M|| for n qubits and degree M (0 when
/// exact). The AQFT leaves out n-k+1 controlled rotations R_k for each k = M+1..n, and
/// ||CR_k - I|| = |e^{2 pi i/2^k} - 1| = 2 sin(pi/2^k); errors of a gate sequence add at most
/// linearly (Nielsen & Chuang 2000, section 4.5.3, eq. 4.63), which is Coppersmith's argument
/// (IBM RC19642, 1994) for dropping the small rotations:
///   bound = sum_{k=M+1}^{n} (n-k+1) * 2 sin(pi/2^k)   (about 2 pi n / 2^M).
double approx_error_bound(int n, std::optional<int> degree);

/// Lower bound on the fidelity |<QFT psi|AQFT psi>|^2 for every state psi, from the operator-norm
/// bound e: Re<U psi|V psi> >= 1 - e^2/2, so fidelity >= (1 - e^2/2)^2 (0 when e^2 >= 2).
double approx_fidelity_lower_bound(double error_bound);

}  // namespace qftplan
