#pragma once
/// HLLD approximate Riemann solver for adiabatic MHD: T. Miyoshi and K. Kusano, "A
/// multi-state HLL approximate Riemann solver for ideal magnetohydrodynamics",
/// J. Comput. Phys. 208, 315-344 (2005). Equation numbers below refer to that paper.
///
/// It resolves the fast waves, the rotational (Alfvén) discontinuities and the contact
/// exactly for isolated discontinuities. The paper works in units with mu0 = 1; here the
/// field is scaled to b = B / sqrt(mu0) on entry and the field fluxes back on exit.
#include <algorithm>
#include <cmath>

#include "models/mhd.hpp"
#include "numerics/riemann.hpp"

namespace tw {

struct HlldFlux {
  static constexpr const char* name = "hlld";

  FaceFlux<Mhd::n_vars> operator()(const Mhd& m, const Mhd::State& WL,
                                   const Mhd::State& WR) const {
    using S = Mhd::State;
    const real sqrt_mu0 = std::sqrt(m.mu0), inv_sqrt_mu0 = 1 / sqrt_mu0;
    const real bx = m.bx * inv_sqrt_mu0;
    const real inv_gm1 = 1 / (m.gamma - 1);

    // Left and right states in field units with mu0 = 1.
    struct Side {
      real rho, u, v, w, by, bz, p, e, pt, vb, cf;
    };
    auto make = [&](const S& W) {
      Side s{};
      s.rho = W[Mhd::RHO];
      s.u = W[Mhd::VX];
      s.v = W[Mhd::VY];
      s.w = W[Mhd::VZ];
      s.by = W[Mhd::BY] * inv_sqrt_mu0;
      s.bz = W[Mhd::BZ] * inv_sqrt_mu0;
      s.p = W[Mhd::P];
      const real b2 = bx * bx + s.by * s.by + s.bz * s.bz;
      s.e = s.p * inv_gm1 + 0.5 * s.rho * (s.u * s.u + s.v * s.v + s.w * s.w) + 0.5 * b2;
      s.pt = s.p + 0.5 * b2;
      s.vb = s.u * bx + s.v * s.by + s.w * s.bz;
      // Fast speed from the same sums (the model's fast_speed, in field units).
      const real inv_rho = 1 / s.rho;
      const real a2 = m.gamma * s.p * inv_rho, va2 = b2 * inv_rho, vax2 = bx * bx * inv_rho;
      const real sum = a2 + va2;
      s.cf = std::sqrt(0.5 * (sum + std::sqrt(std::max(sum * sum - 4 * a2 * vax2, real(0)))));
      return s;
    };
    const Side L = make(WL), R = make(WR);

    auto phys_flux = [&](const Side& s) {
      S F;
      F[0] = s.rho * s.u;
      F[1] = s.rho * s.u * s.u + s.pt - bx * bx;
      F[2] = s.rho * s.u * s.v - bx * s.by;
      F[3] = s.rho * s.u * s.w - bx * s.bz;
      F[4] = s.by * s.u - bx * s.v;
      F[5] = s.bz * s.u - bx * s.w;
      F[6] = (s.e + s.pt) * s.u - bx * s.vb;
      return F;
    };
    auto cons = [&](const Side& s) {
      return S{s.rho, s.rho * s.u, s.rho * s.v, s.rho * s.w, s.by, s.bz, s.e};
    };
    // Back to tesla for the field fluxes.
    auto finish = [&](S F, real speed) {
      F[4] *= sqrt_mu0;
      F[5] *= sqrt_mu0;
      return FaceFlux<Mhd::n_vars>{F, speed};
    };

    // Signal speeds, eq. (67).
    const real cmax = std::max(L.cf, R.cf);
    const real sl = std::min(L.u, R.u) - cmax;
    const real sr = std::max(L.u, R.u) + cmax;
    const real speed = std::max(-sl, sr);
    if (sl >= 0) return finish(phys_flux(L), speed);
    if (sr <= 0) return finish(phys_flux(R), speed);

    const real dl = L.rho * (sl - L.u), dr = R.rho * (sr - R.u);
    // Contact speed and total pressure in the star region, eqs. (38) and (41).
    const real inv_ddr = 1 / (dr - dl);
    const real sm = (dr * R.u - dl * L.u - R.pt + L.pt) * inv_ddr;
    const real pts = (dr * L.pt - dl * R.pt + dl * dr * (R.u - L.u)) * inv_ddr;

    // Outer star states, eqs. (43)-(48).
    struct Star {
      real rho, v, w, by, bz, e, vb;
    };
    auto star = [&](const Side& s, real sa) {
      Star st{};
      const real d = s.rho * (sa - s.u);
      const real inv_sasm = 1 / (sa - sm);
      st.rho = d * inv_sasm;
      const real den = d * (sa - sm) - bx * bx;
      // Degenerate case (eq. 45-48 singular): tangential quantities do not jump.
      if (std::abs(den) <= 1e-12 * (std::abs(d * (sa - sm)) + bx * bx)) {
        st.v = s.v;
        st.w = s.w;
        st.by = s.by;
        st.bz = s.bz;
      } else {
        const real inv = 1 / den;
        const real f = bx * (sm - s.u) * inv;
        st.v = s.v - s.by * f;
        st.w = s.w - s.bz * f;
        const real g = (d * (sa - s.u) - bx * bx) * inv;
        st.by = s.by * g;
        st.bz = s.bz * g;
      }
      st.vb = sm * bx + st.v * st.by + st.w * st.bz;
      st.e = ((sa - s.u) * s.e - s.pt * s.u + pts * sm + bx * (s.vb - st.vb)) * inv_sasm;
      return st;
    };
    const Star Ls = star(L, sl), Rs = star(R, sr);
    auto cons_star = [&](const Star& st) {
      return S{st.rho, st.rho * sm, st.rho * st.v, st.rho * st.w, st.by, st.bz, st.e};
    };

    const real sql = std::sqrt(Ls.rho), sqr = std::sqrt(Rs.rho);
    // Alfvén waves bounding the inner star region, eq. (51).
    const real sls = sm - std::abs(bx) / sql;
    const real srs = sm + std::abs(bx) / sqr;

    // Only the side the face lies on is needed from here on.
    S F;
    if (sls >= 0) {  // between sL and sL*: eq. (64), first case
      const S FL = phys_flux(L), UL = cons(L), ULs = cons_star(Ls);
      for (int k = 0; k < 7; ++k) F[k] = FL[k] + sl * (ULs[k] - UL[k]);
      return finish(F, speed);
    }
    if (srs <= 0) {
      const S FR = phys_flux(R), UR = cons(R), URs = cons_star(Rs);
      for (int k = 0; k < 7; ++k) F[k] = FR[k] + sr * (URs[k] - UR[k]);
      return finish(F, speed);
    }
    // Inner (double-star) states, eqs. (59)-(63).
    const real sgn = bx > 0 ? 1.0 : (bx < 0 ? -1.0 : 0.0);
    const real isum = 1 / (sql + sqr);
    const real v2 = (sql * Ls.v + sqr * Rs.v + (Rs.by - Ls.by) * sgn) * isum;
    const real w2 = (sql * Ls.w + sqr * Rs.w + (Rs.bz - Ls.bz) * sgn) * isum;
    const real by2 = (sql * Rs.by + sqr * Ls.by + sql * sqr * (Rs.v - Ls.v) * sgn) * isum;
    const real bz2 = (sql * Rs.bz + sqr * Ls.bz + sql * sqr * (Rs.w - Ls.w) * sgn) * isum;
    const real vb2 = sm * bx + v2 * by2 + w2 * bz2;
    if (sm >= 0) {
      const S FL = phys_flux(L), UL = cons(L), ULs = cons_star(Ls);
      const real e2 = Ls.e - sql * (Ls.vb - vb2) * sgn;
      const S U2{Ls.rho, Ls.rho * sm, Ls.rho * v2, Ls.rho * w2, by2, bz2, e2};
      for (int k = 0; k < 7; ++k) F[k] = FL[k] + sls * U2[k] - (sls - sl) * ULs[k] - sl * UL[k];
    } else {
      const S FR = phys_flux(R), UR = cons(R), URs = cons_star(Rs);
      const real e2 = Rs.e + sqr * (Rs.vb - vb2) * sgn;
      const S U2{Rs.rho, Rs.rho * sm, Rs.rho * v2, Rs.rho * w2, by2, bz2, e2};
      for (int k = 0; k < 7; ++k) F[k] = FR[k] + srs * U2[k] - (srs - sr) * URs[k] - sr * UR[k];
    }
    return finish(F, speed);
  }
};

}  // namespace tw
