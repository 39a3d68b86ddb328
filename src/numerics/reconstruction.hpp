#pragma once
/// Reconstruction of face values from cell averages of the primitive variables.
///
/// - first-order: piecewise constant (Godunov 1959).
/// - plm: piecewise linear with a slope limiter (van Leer 1979):
///     minmod   — the most dissipative TVD limiter (Roe 1986);
///     mc       — monotonized central, minmod(2a, 2b, (a+b)/2) (van Leer 1977);
///     van-leer — harmonic mean 2ab/(a+b) for ab > 0 (van Leer 1974);
///     none     — the unlimited central slope (a+b)/2 (Fromm), second order everywhere,
///                for smooth wave problems only (it oscillates at discontinuities).
/// - weno5: fifth-order WENO-Z (Borges, Carmona, Costa & Don 2008, J. Comput. Phys. 227,
///   3191) of each primitive variable, the low-dispersion option for wave runs; pair it
///   with SSP-RK3.
///
/// Whatever the scheme, a face state with non-positive density or pressure falls back to
/// the cell average (first order in that cell), which keeps the scheme positive where
/// strong rarefactions would otherwise break it.
#include <algorithm>
#include <cmath>
#include <string>
#include <vector>

#include "core/types.hpp"

namespace tw {

enum class Reconstruction { first_order, plm, weno5 };
enum class Limiter { minmod, mc, van_leer, none };

/// Names used in run files, in the order of the enums.
inline const std::vector<std::string>& reconstruction_names() {
  static const std::vector<std::string> n{"first-order", "plm", "weno5"};
  return n;
}
inline const std::vector<std::string>& limiter_names() {
  static const std::vector<std::string> n{"minmod", "mc", "van-leer", "none"};
  return n;
}

/// Stencil half-width each scheme needs (cells on each side of the reconstructed cell).
inline int stencil_half_width(Reconstruction r) {
  switch (r) {
    case Reconstruction::first_order: return 0;
    case Reconstruction::plm: return 1;
    case Reconstruction::weno5: return 2;
  }
  return 2;
}

namespace limiters {

inline real minmod(real a, real b) {
  if (a * b <= 0) return 0;
  return std::abs(a) < std::abs(b) ? a : b;
}
inline real mc(real a, real b) {
  if (a * b <= 0) return 0;
  const real c = 0.5 * (a + b);
  const real m = std::min({2 * std::abs(a), 2 * std::abs(b), std::abs(c)});
  return std::copysign(m, c);
}
inline real van_leer(real a, real b) {
  if (a * b <= 0) return 0;
  return 2 * a * b / (a + b);
}
inline real none(real a, real b) { return 0.5 * (a + b); }

}  // namespace limiters

/// Limited slope of one variable from its backward and forward differences.
template <Limiter L>
inline real limited_slope(real back, real fwd) {
  if constexpr (L == Limiter::minmod) return limiters::minmod(back, fwd);
  if constexpr (L == Limiter::mc) return limiters::mc(back, fwd);
  if constexpr (L == Limiter::van_leer) return limiters::van_leer(back, fwd);
  if constexpr (L == Limiter::none) return limiters::none(back, fwd);
}

/// WENO-Z value at the right face of the centre cell of the stencil (a, b, c, d, e),
/// i.e. the left state of face i+1/2 from cells i-2 .. i+2. Mirror the stencil for the
/// other face.
inline real weno5z_right_face(real a, real b, real c, real d, real e) {
  // Candidate third-order values (Jiang & Shu 1996, J. Comput. Phys. 126, 202).
  const real q0 = (2 * a - 7 * b + 11 * c) / 6;
  const real q1 = (-b + 5 * c + 2 * d) / 6;
  const real q2 = (2 * c + 5 * d - e) / 6;
  // Smoothness indicators.
  const real b0 = 13.0 / 12 * (a - 2 * b + c) * (a - 2 * b + c) + 0.25 * (a - 4 * b + 3 * c) * (a - 4 * b + 3 * c);
  const real b1 = 13.0 / 12 * (b - 2 * c + d) * (b - 2 * c + d) + 0.25 * (b - d) * (b - d);
  const real b2 = 13.0 / 12 * (c - 2 * d + e) * (c - 2 * d + e) + 0.25 * (3 * c - 4 * d + e) * (3 * c - 4 * d + e);
  const real tau5 = std::abs(b0 - b2);
  // Scale-aware epsilon so that tiny perturbations about a large background stay smooth.
  const real scale = a * a + b * b + c * c + d * d + e * e;
  const real eps = 1e-40 + 1e-30 * scale;
  const real a0 = 0.1 * (1 + tau5 / (b0 + eps));
  const real a1 = 0.6 * (1 + tau5 / (b1 + eps));
  const real a2 = 0.3 * (1 + tau5 / (b2 + eps));
  return (a0 * q0 + a1 * q1 + a2 * q2) / (a0 + a1 + a2);
}

}  // namespace tw
