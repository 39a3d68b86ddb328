#pragma once
/// Characteristic speeds and right eigenvectors of a hyperbolic model at a state, from
/// its flux and its conservative map, differentiated numerically:
///
///   A_W = (dU/dW)^-1 dF/dW,   A_W r = lambda r,
///
/// with central differences (relative step 1e-6 of each variable's scale, so the
/// Jacobian is accurate to ~1e-10 relative) and Eigen's real eigen-solver. Used to lay
/// down linear eigenmodes as initial states and to cross-check analytic wave speeds.
/// Eigen stays inside eigen_modes.cpp.
#include <functional>
#include <vector>

#include "core/types.hpp"

namespace tw {

struct ModeSet {
  std::vector<real> speeds;                ///< eigenvalues, ascending [m/s]
  std::vector<std::vector<real>> vectors;  ///< right eigenvectors (primitive), same order
  real max_imag = 0;                       ///< largest |imaginary part| seen (0 if hyperbolic)
};

/// `flux(W, F)` and `cons(W, U)` act on the n active primitive variables (a model with a
/// dead slot, like the isothermal energy, passes a reduced system). `scale[k]` is the
/// typical size of variable k (never zero).
ModeSet primitive_modes(int n, const std::function<void(const real*, real*)>& flux,
                        const std::function<void(const real*, real*)>& cons,
                        const std::vector<real>& W0, const std::vector<real>& scale);

}  // namespace tw

namespace tw {

/// Characteristic speeds with right and left eigenvectors of a conservative system
/// dU/dt + dF(U)/dx = 0 at a state: A = dF/dU, A r_k = lambda_k r_k, l_k . r_j = delta_kj.
struct CharacteristicBasis {
  std::vector<real> speeds;               ///< eigenvalues (real parts), ascending [m/s]
  std::vector<std::vector<real>> right;   ///< right eigenvectors r_k (conservative)
  std::vector<std::vector<real>> left;    ///< left eigenvectors l_k (rows of R^-1)
  real max_imag = 0;                      ///< largest |imaginary part| of an eigenvalue
};

/// The basis of the flux Jacobian dF/dU at U0, differentiated numerically (central
/// differences with steps 1e-6 scale[k]). `flux(U, F)` evaluates the physical flux of a
/// conservative state. A slot that the flux ignores (an energy that is not evolved) gives
/// a zero eigenvalue with a unit eigenvector, which callers treat as a passive mode.
CharacteristicBasis conservative_basis(int n, const std::function<void(const real*, real*)>& flux,
                                       const std::vector<real>& U0, const std::vector<real>& scale);

}  // namespace tw
