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

#include "core/error.hpp"
#include "core/types.hpp"

namespace tw {

struct ModeSet {
  std::vector<real> speeds;                ///< eigenvalues, ascending [m/s]
  std::vector<std::vector<real>> vectors;  ///< right eigenvectors (primitive), same order
  real max_imag = 0;                       ///< largest |imaginary part| seen (0 if hyperbolic)
};

/// The modes cannot be computed at this state (scales beyond double precision): bad input,
/// which the caller turns into an error at the run-file key that chose the state.
class EigenModeError : public InputError {
 public:
  using InputError::InputError;
};

/// `flux(W, F)` and `cons(W, U)` act on the n active primitive variables (a model with a
/// dead slot, like the isothermal energy, passes a reduced system). `scale[k]` is the
/// typical size of variable k (never zero).
ModeSet primitive_modes(int n, const std::function<void(const real*, real*)>& flux,
                        const std::function<void(const real*, real*)>& cons,
                        const std::vector<real>& W0, const std::vector<real>& scale);

}  // namespace tw
