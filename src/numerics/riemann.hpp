#pragma once
/// Approximate Riemann solvers: the numerical flux at a face from the reconstructed
/// primitive states on its left (WL) and right (WR).
///
/// Every solver is a stateless function object with
///   FaceFlux<N> operator()(const M& model, const State& WL, const State& WR) const
/// returning the flux and the largest signal speed it used (for the CFL step).
///
/// - Rusanov (local Lax-Friedrichs; Rusanov 1961): F = (FL + FR)/2 - s (UR - UL)/2 with
///   s the largest |signal speed|; works for every model.
/// - HLL (Harten, Lax & van Leer 1983) with Davis (1988) speed estimates
///   sL = min(min_L, min_R), sR = max(max_L, max_R); works for every model.
/// - HLLD for MHD (Miyoshi & Kusano 2005), in numerics/hlld.hpp.
#include <algorithm>
#include <cmath>

#include "models/model.hpp"

namespace tw {

template <int N>
struct FaceFlux {
  Vec<N> flux{};
  real speed = 0;  ///< largest |signal speed| seen at this face [m/s]
};

struct RusanovFlux {
  static constexpr const char* name = "rusanov";
  template <Model M>
  FaceFlux<M::n_vars> operator()(const M& m, const typename M::State& WL,
                                 const typename M::State& WR) const {
    const SpeedRange a = m.signal_speeds(WL), b = m.signal_speeds(WR);
    return bounded(m, WL, WR, std::min(a.min, b.min), std::max(a.max, b.max));
  }
  /// The flux with given bounds sl <= sr on the signal speeds (s = max(-sl, sr)); lets a
  /// model share bounds between sub-systems (the two-fluid model's fluids).
  template <Model M>
  static FaceFlux<M::n_vars> bounded(const M& m, const typename M::State& WL,
                                     const typename M::State& WR, real sl, real sr) {
    constexpr int N = M::n_vars;
    const real s = std::max(-sl, sr);
    const auto FL = m.flux(WL), FR = m.flux(WR);
    const auto UL = m.cons_from_prim(WL), UR = m.cons_from_prim(WR);
    FaceFlux<N> out;
    for (int k = 0; k < N; ++k) out.flux[k] = 0.5 * (FL[k] + FR[k]) - 0.5 * s * (UR[k] - UL[k]);
    out.speed = s;
    return out;
  }
};

struct HllFlux {
  static constexpr const char* name = "hll";
  template <Model M>
  FaceFlux<M::n_vars> operator()(const M& m, const typename M::State& WL,
                                 const typename M::State& WR) const {
    const SpeedRange a = m.signal_speeds(WL), b = m.signal_speeds(WR);
    return bounded(m, WL, WR, std::min(a.min, b.min), std::max(a.max, b.max));
  }
  /// The flux with given bounds sl <= sr on the signal speeds (see RusanovFlux::bounded).
  template <Model M>
  static FaceFlux<M::n_vars> bounded(const M& m, const typename M::State& WL,
                                     const typename M::State& WR, real sl, real sr) {
    constexpr int N = M::n_vars;
    FaceFlux<N> out;
    out.speed = std::max(-sl, sr);
    if (sl >= 0) {
      out.flux = m.flux(WL);
    } else if (sr <= 0) {
      out.flux = m.flux(WR);
    } else {
      const auto FL = m.flux(WL), FR = m.flux(WR);
      const auto UL = m.cons_from_prim(WL), UR = m.cons_from_prim(WR);
      const real inv = 1 / (sr - sl);
      for (int k = 0; k < N; ++k)
        out.flux[k] = (sr * FL[k] - sl * FR[k] + sl * sr * (UR[k] - UL[k])) * inv;
    }
    return out;
  }
};

}  // namespace tw
