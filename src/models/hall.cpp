// Whole-grid parts of Hall MHD: recovering B from the generalized field of electron
// inertia, and the split step of the Hall and resistive field law (sub-cycled or
// Crank-Nicolson). The equations are in hall.hpp.
#include "models/hall.hpp"

#include <algorithm>
#include <cmath>

#include "core/block_tridiagonal.hpp"
#include "core/parallel.hpp"
#include "models/ghost_map.hpp"

namespace tw {

namespace {

using State = HallMhd::State;

V2 field_of(const State& s) { return {s[HallMhd::BY], s[HallMhd::BZ]}; }
void set_field(State& s, V2 b) {
  s[HallMhd::BY] = b.x;
  s[HallMhd::BZ] = b.y;
}
real norm2(V2 v) { return v.x * v.x + v.y * v.y; }

/// A nudge of the size of the field, for probing the ends.
real probe_delta(const HallMhd& m, const Field<State>& W) {
  const int n = W.n_cells();
  real d = std::abs(m.ideal.bx);
  for (int i : {0, n - 1}) d = std::max({d, std::abs(W[i][HallMhd::BY]), std::abs(W[i][HallMhd::BZ])});
  return d > 0 ? d : 1.0;
}

/// (1/rho_l + 1/rho_r)/2 at the faces f = 0 .. n (ghost densities of W must be filled):
/// the Hall coefficient and d_e^2 at a face are their per-density constants times this.
std::vector<real> face_inverse_density(const Field<State>& W) {
  const int n = W.n_cells();
  std::vector<real> r(static_cast<std::size_t>(n + 1));
  for (int f = 0; f <= n; ++f) r[static_cast<std::size_t>(f)] = 0.5 * (1 / W[f - 1][HallMhd::RHO] + 1 / W[f][HallMhd::RHO]);
  return r;
}

/// Solves, for the interior field x,
///   x_i - (K_{i+1} (x_{i+1} - x_i) - K_i (x_i - x_{i-1})) = rhs_i,   i = 0 .. n-1,
/// with K_f the 2x2 face coefficients (f = 0 .. n, face f left of cell f) and the ghosts
/// x_{-1}, x_n given by the ends' map. Returns x for cells -1 .. n (index i + 1).
std::vector<V2> solve_field(const std::vector<M2>& K, const std::vector<V2>& rhs, const GhostMap& gm) {
  const std::size_t n = rhs.size();
  std::vector<M2> A(n), B(n), C(n);
  std::vector<V2> r = rhs;
  for (std::size_t i = 0; i < n; ++i) {
    A[i] = -1.0 * K[i];
    C[i] = -1.0 * K[i + 1];
    B[i] = M2::identity() + K[i] + K[i + 1];
  }
  // The ghosts in rows 0 and n-1 in terms of x_0 and x_{n-1}: A_0 and C_{n-1} become the
  // corner blocks (zero unless the ends join, as periodic ones do).
  const M2 a0 = A[0], cn = C[n - 1];
  B[0] = B[0] + a0 * gm.left_first;
  r[0] = r[0] - a0 * gm.left_offset;
  B[n - 1] = B[n - 1] + cn * gm.right_last;
  r[n - 1] = r[n - 1] - cn * gm.right_offset;
  A[0] = a0 * gm.left_last;
  C[n - 1] = cn * gm.right_first;
  solve_block_tridiagonal(A, B, C, r);
  std::vector<V2> x(n + 2);
  for (std::size_t i = 0; i < n; ++i) x[i + 1] = r[i];
  x[0] = gm.left(r[0], r[n - 1]);
  x[n + 1] = gm.right(r[0], r[n - 1]);
  return x;
}

/// Electron kinetic energy d_e^2 |dB/dx|^2 / 2mu0 of cell i, from the two face gradients
/// (b holds cells -1 .. n at index i + 1; de2 the faces' d_e^2).
real electron_kinetic_energy(const std::vector<V2>& b, const std::vector<real>& de2, int i, real dx, real mu0) {
  const auto k = static_cast<std::size_t>(i);
  const real gl = norm2(b[k + 1] - b[k]), gr = norm2(b[k + 2] - b[k + 1]);
  return (de2[k] * gl + de2[k + 1] * gr) / (4 * mu0 * dx * dx);
}

}  // namespace

void HallMhd::recover_primitives(const Grid& g, const Field<State>& U, Field<State>& W, const GhostFill<State>& fill,
                                 real t) const {
  const int n = g.n_cells;
  const real dx = g.dx();
  // W holds the cell-wise conversion, with B' in the field slots: enough for the ends' map
  // and the ghost densities.
  const GhostMap gm = probe_ghost_map(W, fill, t, BY, BZ, probe_delta(*this, W));
  const auto inv_rho = face_inverse_density(W);
  std::vector<real> de2(static_cast<std::size_t>(n + 1));
  std::vector<M2> K(static_cast<std::size_t>(n + 1));
  for (std::size_t f = 0; f < K.size(); ++f) {
    de2[f] = inertia_rho * inv_rho[f];
    K[f] = M2::identity(de2[f] / (dx * dx));
  }
  std::vector<V2> rhs(static_cast<std::size_t>(n));
  for (int i = 0; i < n; ++i) rhs[static_cast<std::size_t>(i)] = field_of(U[i]);
  const std::vector<V2> b = solve_field(K, rhs, gm);
  const bool energy = ideal.closure == Closure::adiabatic;
#pragma omp parallel for schedule(static) if (run_parallel(n))
  for (int i = 0; i < n; ++i) {
    State Uc = U[i];
    set_field(Uc, b[static_cast<std::size_t>(i + 1)]);
    if (energy) Uc[EN] -= electron_kinetic_energy(b, de2, i, dx, ideal.mu0);
    W[i] = prim_from_cons(Uc);
  }
}

void HallMhd::complete_conservatives(const Grid& g, Field<State>& W, Field<State>& U, const GhostFill<State>& fill,
                                     real t) const {
  const int n = g.n_cells;
  const real dx = g.dx();
  fill(W, t);
  const auto inv_rho = face_inverse_density(W);
  std::vector<real> de2(static_cast<std::size_t>(n + 1));
  for (std::size_t f = 0; f < de2.size(); ++f) de2[f] = inertia_rho * inv_rho[f];
  std::vector<V2> b(static_cast<std::size_t>(n + 2));
  for (int i = -1; i <= n; ++i) b[static_cast<std::size_t>(i + 1)] = field_of(W[i]);
  const bool energy = ideal.closure == Closure::adiabatic;
  for (int i = 0; i < n; ++i) {
    const auto k = static_cast<std::size_t>(i);
    const V2 flux_r = (de2[k + 1] / (dx * dx)) * (b[k + 2] - b[k + 1]);
    const V2 flux_l = (de2[k] / (dx * dx)) * (b[k + 1] - b[k]);
    set_field(U[i], b[k + 1] - (flux_r - flux_l));
    if (energy) U[i][EN] += electron_kinetic_energy(b, de2, i, dx, ideal.mu0);
  }
}

long HallMhd::substeps(const Grid& g, const Field<State>& U, real dt) const {
  const real dx = g.dx();
  const real eta_m = resistivity / ideal.mu0;
  real rate = 0;
  for (int i = 0; i < g.n_cells; ++i) {
    const real rho = U[i][RHO];
    rate = std::max(rate, (constants::pi * std::abs(hall_coefficient(rho)) + 2 * eta_m) /
                              (dx * dx + 4 * inertia_length2(rho)));
  }
  return rate > 0 ? static_cast<long>(std::ceil(dt * rate / split_cfl)) : 0;
}

std::array<State, 2> HallMhd::split_step(const Grid& g, Field<State>& U, real t, real dt,
                                         const GhostFill<State>& fill) const {
  const int n = g.n_cells;
  const auto nf = static_cast<std::size_t>(n + 1);
  const real dx = g.dx();
  const real mu0 = ideal.mu0;
  const bool energy = ideal.closure == Closure::adiabatic;
  const bool inertia = grid_coupled();

  // The state at t: density (frozen in this step), B with its ghosts.
  Field<State> W(g);
#pragma omp parallel for schedule(static) if (run_parallel(n))
  for (int i = 0; i < n; ++i) W[i] = prim_from_cons(U[i]);
  if (inertia) recover_primitives(g, U, W, fill, t);
  fill(W, t);
  const auto inv_rho = face_inverse_density(W);
  const real eta_m = resistivity / mu0;
  std::vector<real> h(nf), de2(nf);
  for (std::size_t f = 0; f < nf; ++f) {
    h[f] = hall_rho * inv_rho[f];
    de2[f] = inertia_rho * inv_rho[f];
  }
  // Face fluxes of the field law for a field b (cells -1 .. n at index i + 1).
  auto face_flux = [&](const std::vector<V2>& b, std::size_t f) {
    return field_gradient_flux(eta_m, h[f], mu0, b[f].x, b[f].y, b[f + 1].x, b[f + 1].y, dx);
  };
  std::vector<FieldGradientFlux> I(nf);  // time integrals of the face fluxes over the step

  if (stepping == HallStepping::implicit) {
    // Crank-Nicolson: (M - dt/2 L) B^{n+1} = B'^n + dt/2 L B^n, with M = 1 - D d_e^2 D and
    // L = D C D. The ends at t + dt enter through their map.
    constexpr real theta = 0.5;
    std::vector<V2> b0(nf + 1);
    for (int i = -1; i <= n; ++i) b0[static_cast<std::size_t>(i + 1)] = field_of(W[i]);
    const GhostMap gm = probe_ghost_map(W, fill, t + dt, BY, BZ, probe_delta(*this, W));
    std::vector<M2> K(nf), Cf(nf);
    for (std::size_t f = 0; f < nf; ++f) {
      Cf[f] = {eta_m, h[f], -h[f], eta_m};
      K[f] = (1 / (dx * dx)) * (M2::identity(de2[f]) + (theta * dt) * Cf[f]);
    }
    std::vector<V2> rhs(static_cast<std::size_t>(n));
    const real c = (1 - theta) * dt / (dx * dx);
    for (std::size_t i = 0; i < rhs.size(); ++i) {
      const V2 lap = Cf[i + 1] * (b0[i + 2] - b0[i + 1]) - Cf[i] * (b0[i + 1] - b0[i]);
      rhs[i] = field_of(U[static_cast<int>(i)]) + c * lap;
    }
    const std::vector<V2> b1 = solve_field(K, rhs, gm);
    std::vector<V2> bt(nf + 1);
    for (std::size_t k = 0; k < bt.size(); ++k) bt[k] = theta * b1[k] + (1 - theta) * b0[k];
    for (std::size_t f = 0; f < nf; ++f) {
      FieldGradientFlux F = face_flux(bt, f);
      I[f] = {dt * F.by, dt * F.bz, dt * F.energy};
    }
#pragma omp parallel for schedule(static) if (run_parallel(n))
    for (int i = 0; i < n; ++i) {
      const auto k = static_cast<std::size_t>(i);
      U[i][BY] -= (I[k + 1].by - I[k].by) / dx;
      U[i][BZ] -= (I[k + 1].bz - I[k].bz) / dx;
    }
  } else {
    // Sub-cycling: SSP-RK3 sub-steps (Shu & Osher 1988, J. Comput. Phys. 77, 439) within
    // the explicit limit (dx^2 + 4 d_e^2)/(pi |h| + 2 eta_m), scaled by split_cfl. The
    // coefficients (U^n weight, step weight, Butcher weight, time offset) match
    // rk_stages(ssp_rk3) in time/integrators.hpp.
    constexpr real sa[3] = {0.0, 0.75, 1.0 / 3}, sb[3] = {1.0, 0.25, 2.0 / 3}, sw[3] = {1.0 / 6, 1.0 / 6, 2.0 / 3},
                   sc[3] = {0.0, 1.0, 0.5};
    real rate = 0;
    for (std::size_t f = 0; f < nf; ++f)
      rate = std::max(rate, (constants::pi * std::abs(h[f]) + 2 * eta_m) / (dx * dx + 4 * de2[f]));
    const long nsub = rate > 0 ? std::max(1L, static_cast<long>(std::ceil(dt * rate / split_cfl))) : 0;
    if (nsub == 0) return {};
    const real ds = dt / static_cast<real>(nsub);
    std::vector<V2> bp(static_cast<std::size_t>(n)), bp0(bp.size()), b(nf + 1);
    std::vector<FieldGradientFlux> F(nf);
    for (int i = 0; i < n; ++i) bp[static_cast<std::size_t>(i)] = field_of(U[i]);
    GhostMap gm;
    std::vector<M2> Kin;
    if (inertia) {
      gm = probe_ghost_map(W, fill, t, BY, BZ, probe_delta(*this, W));
      Kin.resize(nf);
      for (std::size_t f = 0; f < nf; ++f) Kin[f] = M2::identity(de2[f] / (dx * dx));
    }
    for (long s = 0; s < nsub; ++s) {
      bp0 = bp;
      for (int st = 0; st < 3; ++st) {
        const real ts = t + (static_cast<real>(s) + sc[st]) * ds;
        if (inertia) {
          b = solve_field(Kin, bp, gm);
        } else {
          for (int i = 0; i < n; ++i) set_field(W[i], bp[static_cast<std::size_t>(i)]);
          fill(W, ts);
          for (int i = -1; i <= n; ++i) b[static_cast<std::size_t>(i + 1)] = field_of(W[i]);
        }
#pragma omp parallel for schedule(static) if (run_parallel(n))
        for (int f = 0; f <= n; ++f) {
          const auto k = static_cast<std::size_t>(f);
          F[k] = face_flux(b, k);
          I[k].by += sw[st] * ds * F[k].by;
          I[k].bz += sw[st] * ds * F[k].bz;
          I[k].energy += sw[st] * ds * F[k].energy;
        }
        const real a = sa[st], bw = sb[st], r = ds / dx;
#pragma omp parallel for schedule(static) if (run_parallel(n))
        for (int i = 0; i < n; ++i) {
          const auto k = static_cast<std::size_t>(i);
          const V2 div{F[k + 1].by - F[k].by, F[k + 1].bz - F[k].bz};
          bp[k] = a * bp0[k] + bw * (bp[k] - r * div);
        }
      }
    }
    for (int i = 0; i < n; ++i) set_field(U[i], bp[static_cast<std::size_t>(i)]);
  }

  if (energy) {
#pragma omp parallel for schedule(static) if (run_parallel(n))
    for (int i = 0; i < n; ++i) {
      const auto k = static_cast<std::size_t>(i);
      U[i][EN] -= (I[k + 1].energy - I[k].energy) / dx;
    }
  }
  std::array<State, 2> ends{};
  for (int side = 0; side < 2; ++side) {
    const FieldGradientFlux& f = I[side == 0 ? 0 : nf - 1];
    ends[static_cast<std::size_t>(side)][BY] = f.by;
    ends[static_cast<std::size_t>(side)][BZ] = f.bz;
    ends[static_cast<std::size_t>(side)][EN] = energy ? f.energy : 0.0;
  }
  return ends;
}

}  // namespace tw
