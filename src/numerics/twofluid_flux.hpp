#pragma once
/// Numerical flux of the two-fluid model: a fluid solver (HLL or Rusanov) applied to each
/// fluid separately, and the exact upwind (Godunov) flux for Maxwell's equations.
///
/// Fluid part. Each fluid's flux is the solver's formula for that fluid alone, but with
/// signal-speed bounds shared by both fluids (the slowest and fastest of the two fluids'
/// own estimates). Both densities then receive the same numerical diffusion: with each
/// fluid's own bounds the electron density is smeared about sqrt(m_i T_e/(m_e T_i)) times
/// more than the ion density at every contact and shock, and when the Debye length is not
/// resolved that unphysical charge separation (no current carries it, so E_x never sees it)
/// decouples the two densities and rings; shared bounds remove it. The price is extra
/// grid-scale diffusion of the ion fluid at the electron sound speed, which is far below the
/// Maxwell part's (at speed c).
///
/// Maxwell part. The transverse pairs decouple into characteristic variables moving at
/// +-c: E_y + c B_z and E_z - c B_y move toward +x, E_y - c B_z and E_z + c B_y toward -x
/// (E_x has no flux). The Godunov state at a face takes each right-moving variable from
/// the left and each left-moving one from the right:
///
///   E_y* = (E_yL + E_yR)/2 - c (B_zR - B_zL)/2,   B_z* = (B_zL + B_zR)/2 - (E_yR - E_yL)/(2c)
///   E_z* = (E_zL + E_zR)/2 + c (B_yR - B_yL)/2,   B_y* = (B_yL + B_yR)/2 + (E_zR - E_zL)/(2c)
///
/// and the flux is the physical flux of that state (F(E_y) = c^2 B_z*, ...), exact for the
/// linear system (e.g. Toro 2009, "Riemann Solvers and Numerical Methods for Fluid
/// Dynamics", ch. 2 on linear hyperbolic systems). The electron energy slot, which carries
/// the field energy, gets the Poynting flux of the same state, (E* x B*)_x / mu0.
#include <algorithm>

#include "models/twofluid.hpp"
#include "numerics/fluxes.hpp"
#include "numerics/riemann.hpp"

namespace tw {

template <class FluidSolver>
struct TwoFluidFlux {
  FaceFlux<TwoFluid::n_vars> operator()(const TwoFluid& m, const TwoFluid::State& WL,
                                        const TwoFluid::State& WR) const {
    using T = TwoFluid;
    FaceFlux<T::n_vars> out;
    const Fluid::State il = T::block(WL, T::ION), ir = T::block(WR, T::ION);
    const Fluid::State el = T::block(WL, T::ELECTRON), er = T::block(WR, T::ELECTRON);
    const SpeedRange a = m.ion.signal_speeds(il), b = m.ion.signal_speeds(ir);
    const SpeedRange d = m.electron.signal_speeds(el), e = m.electron.signal_speeds(er);
    const real sl = std::min({a.min, b.min, d.min, e.min}), sr = std::max({a.max, b.max, d.max, e.max});
    const auto fi = FluidSolver::bounded(m.ion, il, ir, sl, sr);
    const auto fe = FluidSolver::bounded(m.electron, el, er, sl, sr);
    T::set_block(out.flux, T::ION, fi.flux);
    T::set_block(out.flux, T::ELECTRON, fe.flux);

    const real c = m.c, c2 = c * c;
    const real ey = 0.5 * (WL[T::EY] + WR[T::EY]) - 0.5 * c * (WR[T::BZ] - WL[T::BZ]);
    const real bz = 0.5 * (WL[T::BZ] + WR[T::BZ]) - 0.5 * (WR[T::EY] - WL[T::EY]) / c;
    const real ez = 0.5 * (WL[T::EZ] + WR[T::EZ]) + 0.5 * c * (WR[T::BY] - WL[T::BY]);
    const real by = 0.5 * (WL[T::BY] + WR[T::BY]) + 0.5 * (WR[T::EZ] - WL[T::EZ]) / c;
    out.flux[T::EX] = 0;
    out.flux[T::EY] = c2 * bz;
    out.flux[T::EZ] = -c2 * by;
    out.flux[T::BY] = -ez;
    out.flux[T::BZ] = ey;
    out.flux[T::ELECTRON + Fluid::EN] += m.poynting_flux(ey, ez, by, bz);
    out.speed = std::max({fi.speed, fe.speed, c});
    return out;
  }
};

template <>
struct FluxFor<TwoFluid, FluxKind::hll> {
  using type = TwoFluidFlux<HllFlux>;
};
template <>
struct FluxFor<TwoFluid, FluxKind::rusanov> {
  using type = TwoFluidFlux<RusanovFlux>;
};

}  // namespace tw
