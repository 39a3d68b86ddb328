#pragma once
/// Strong-stability-preserving Runge-Kutta schemes in Shu-Osher form
/// (Shu & Osher 1988, J. Comput. Phys. 77, 439; Gottlieb, Shu & Tadmor 2001, SIAM Rev. 43, 89):
///
///   U_0 = U^n;  U_s = a_s U^n + b_s (U_{s-1} + dt L(U_{s-1})),  U^{n+1} = U_S.
///
/// Both have SSP coefficient 1: they are stable (TVD) under the forward-Euler CFL limit.
/// `weight` is each stage's weight in the equivalent Butcher form (used to integrate
/// boundary fluxes exactly as the scheme integrates the cell averages) and `time` its
/// time offset as a fraction of dt.
#include <string>
#include <vector>

#include "core/types.hpp"

namespace tw {

enum class IntegratorKind { ssp_rk2, ssp_rk3 };

inline const std::vector<std::string>& integrator_names() {
  static const std::vector<std::string> n{"ssp-rk2", "ssp-rk3"};
  return n;
}

struct RkStage {
  real a;       ///< weight of U^n
  real b;       ///< weight of the forward-Euler step from the previous stage
  real weight;  ///< Butcher weight of this stage's L
  real time;    ///< stage time offset / dt
};

inline std::vector<RkStage> rk_stages(IntegratorKind k) {
  switch (k) {
    case IntegratorKind::ssp_rk2:  // Heun's method
      return {{0.0, 1.0, 0.5, 0.0}, {0.5, 0.5, 0.5, 1.0}};
    case IntegratorKind::ssp_rk3:
      return {{0.0, 1.0, 1.0 / 6, 0.0}, {0.75, 0.25, 1.0 / 6, 1.0}, {1.0 / 3, 2.0 / 3, 2.0 / 3, 0.5}};
  }
  return {};
}

/// Formal order of accuracy.
inline int rk_order(IntegratorKind k) { return k == IntegratorKind::ssp_rk2 ? 2 : 3; }

}  // namespace tw
