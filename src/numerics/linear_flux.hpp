#pragma once
/// Numerical flux of linearized models: the exact upwind (Godunov) flux of the linear
/// system at each face, F = G+_f w_L + G-_f w_R, precomputed per face from the
/// eigen-decomposition of the background Jacobian (models/linear_system.hpp). Registered as
/// FluxKind::upwind for every Linearized<M>; the generic Rusanov and HLL solvers do not
/// apply (their flux function has no face), so they are unavailable for these models.
///
/// The solver is face-aware: the finite-volume operator passes the face index to a solver
/// that takes one (see FaceAwareSolver in numerics/fv_operator.hpp).
#include "models/linearized.hpp"
#include "numerics/fluxes.hpp"
#include "numerics/riemann.hpp"

namespace tw {

struct LinearUpwindFlux {
  static constexpr const char* name = "upwind";
  template <class M>
  FaceFlux<Linearized<M>::n_vars> operator()(const Linearized<M>& m, const typename Linearized<M>::State& WL,
                                              const typename Linearized<M>::State& WR, int face) const {
    FaceFlux<Linearized<M>::n_vars> out;
    out.speed = m.system->upwind_flux(face, WL.data(), WR.data(), out.flux.data());
    return out;
  }
};

template <class M>
struct FluxFor<Linearized<M>, FluxKind::upwind> {
  using type = LinearUpwindFlux;
};
template <class M>
struct FluxFor<Linearized<M>, FluxKind::hll> {
  using type = void;
};
template <class M>
struct FluxFor<Linearized<M>, FluxKind::rusanov> {
  using type = void;
};

}  // namespace tw
