// The two-fluid model's local source update and diagnostics (the parts that need Eigen or
// loops over the grid; the rest of the model is inline in twofluid.hpp).
#include "models/twofluid.hpp"

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>

#include "core/parallel.hpp"
#include "core/plasma_params.hpp"

namespace tw {

namespace {

using Mat3 = Eigen::Matrix3d;

/// Matrix of J -> J x w.
Mat3 cross_matrix(const Eigen::Vector3d& w) {
  Mat3 m;
  m << 0, w.z(), -w.y(),  //
      -w.z(), 0, w.x(),   //
      w.y(), -w.x(), 0;
  return m;
}

}  // namespace

real TwoFluid::electron_ion_collision_frequency(const State& W) const {
  if (!spitzer_friction) return 0;
  const real n_e = W[ELECTRON + Fluid::RHO] / electron.particle_mass;
  const real te_ev = W[ELECTRON + Fluid::P] / n_e / energy_per_eV;
  if (!(n_e > 0) || !(te_ev > 0)) return 0;
  // The NRL logarithm falls below 1 only far outside the weakly coupled regime; keep the
  // friction finite there (1 is the smallest value the classical theory could mean).
  const real ln_lambda =
      coulomb_logarithm > 0 ? coulomb_logarithm : std::max(coulomb_logarithm_nrl(n_e, te_ev, charge_number), real(1));
  return friction_mass_factor / braginskii_tau_e(n_e, te_ev, charge_number, ln_lambda);
}

// The source ODE for fixed densities and B, in the variables x = (J_i, J_e, G) with
// J_s = q_s n_s u_s and G = eps0 w E (w = sqrt(omega_pi^2 + omega_pe^2) balances the
// blocks, so the matrix is well scaled for any plasma frequency):
//
//   dJ_s/dt = (omega_ps^2 / w) G + J_s x Omega_s + (friction, linear in J_i, J_e)
//   dG/dt   = -w (J_i + J_e)
//
// with Omega_s = q_s B / m_s. The implicit midpoint rule (I - h A/2) x1 = (I + h A/2) x0 is
// second order, A-stable, and conserves the quadratic invariant sum rho_s u_s^2/2 +
// eps0 E^2/2 of the friction-free part exactly, so plasma and cyclotron oscillations stay
// bounded (undamped) for any omega h.
TwoFluid::State TwoFluid::source_update(const State& U, real h) const {
  const real rho_i = U[ION + Fluid::RHO], rho_e = U[ELECTRON + Fluid::RHO];
  const real m_i = ion.particle_mass, m_e = electron.particle_mass;
  const real q_i = ion_charge, q_e = electron_charge;
  const real n_i = rho_i / m_i, n_e = rho_e / m_e;
  const real wpi2 = n_i * q_i * q_i / (eps0 * m_i), wpe2 = n_e * q_e * q_e / (eps0 * m_e);
  const real w = std::sqrt(wpi2 + wpe2);
  const Eigen::Vector3d b(bx, U[BY], U[BZ]);
  const Mat3 I3 = Mat3::Identity();

  // Blocks of A: dJ_i/dt = Aii J_i + Aie J_e + ai G, dJ_e/dt = Aei J_i + Aee J_e + ae G,
  // dG/dt = -w (J_i + J_e).
  Mat3 Aii = cross_matrix(b * (q_i / m_i)), Aee = cross_matrix(b * (q_e / m_e));
  Mat3 Aie = Mat3::Zero(), Aei = Mat3::Zero();
  const real ai = wpi2 / w, ae = wpe2 / w;
  real nu_ei = 0, nu_in = 0;
  if (spitzer_friction || neutral_density > 0) {
    const State W = prim_from_cons(U);
    nu_ei = electron_ion_collision_frequency(W);
    nu_in = ion_neutral_collision_frequency(W);
  }
  if (nu_ei > 0) {
    // K = alpha_0 b b^T + (I - b b^T): Braginskii's friction, parallel factor alpha_0.
    const real alpha = braginskii_alpha0(charge_number);
    const real bn = b.norm();
    Mat3 K = alpha * I3;
    if (bn > 0) {
      const Eigen::Vector3d e = b / bn;
      K = I3 + (alpha - 1) * e * e.transpose();
    }
    // R_e = -rho_e nu K (u_e - u_i), u_s = J_s/(q_s n_s); dJ_s/dt gets (q_s/m_s) R_s.
    const real r = (q_e * n_e) / (q_i * n_i);
    Aee -= nu_ei * K;
    Aei += nu_ei * r * K;
    Aie += nu_ei * (q_i * m_e / (m_i * q_e)) * K;
    Aii -= nu_ei * (rho_e / rho_i) * K;
  }
  if (nu_in > 0) Aii -= nu_in * I3;

  Eigen::Vector3d ji0, je0, g0;
  for (int k = 0; k < 3; ++k) {
    ji0[k] = (q_i / m_i) * U[ION + Fluid::MX + k];
    je0[k] = (q_e / m_e) * U[ELECTRON + Fluid::MX + k];
    g0[k] = eps0 * w * U[EX + k];
  }
  // Implicit midpoint: (I - hh A) x1 = (I + hh A) x0, hh = h/2, solved by eliminating G
  // (G1 = rG - hh w (J_i1 + J_e1)) and then J_e (Schur complement on the electron block,
  // the larger one), all with closed-form 3x3 inverses.
  const real hh = 0.5 * h;
  const Eigen::Vector3d ri = ji0 + hh * (Aii * ji0 + Aie * je0 + ai * g0);
  const Eigen::Vector3d re = je0 + hh * (Aei * ji0 + Aee * je0 + ae * g0);
  const Eigen::Vector3d rg = g0 - hh * w * (ji0 + je0);
  const real alpha_i = hh * hh * wpi2, alpha_e = hh * hh * wpe2;  // hh^2 omega_ps^2
  const Mat3 P = I3 - hh * Aii + alpha_i * I3, Q = -hh * Aie + alpha_i * I3;
  const Mat3 R = -hh * Aei + alpha_e * I3, T = I3 - hh * Aee + alpha_e * I3;
  const Eigen::Vector3d si = ri + hh * ai * rg, se = re + hh * ae * rg;
  const Mat3 Tinv = T.inverse();
  const Mat3 S = P - Q * Tinv * R;
  const Eigen::Vector3d ji1 = S.inverse() * (si - Q * (Tinv * se));
  const Eigen::Vector3d je1 = Tinv * (se - R * ji1);
  const Eigen::Vector3d g1 = rg - hh * w * (ji1 + je1);

  State out = U;
  for (int k = 0; k < 3; ++k) {
    out[ION + Fluid::MX + k] = (m_i / q_i) * ji1[k];
    out[ELECTRON + Fluid::MX + k] = (m_e / q_e) * je1[k];
    out[EX + k] = g1[k] / (eps0 * w);
  }
  // Energies: the ion thermal energy changes only by the ion-neutral frictional heat
  // (exactly h rho_i nu_in |u_mid|^2 for the midpoint rule); the electron slot takes the
  // rest, so the total is unchanged (to round-off) and the electrons receive the
  // electron-ion frictional heat.
  const real ke_i0 = Fluid::kinetic_energy_cons(block(U, ION));
  const real ke_i1 = Fluid::kinetic_energy_cons(block(out, ION));
  real heat_i = 0;
  if (nu_in > 0) {
    real um2 = 0;
    for (int k = 0; k < 3; ++k) {
      const real um = 0.5 * (U[ION + Fluid::MX + k] + out[ION + Fluid::MX + k]) / rho_i;
      um2 += um * um;
    }
    heat_i = h * rho_i * nu_in * um2;
  }
  const real total = U[ION + Fluid::EN] + U[ELECTRON + Fluid::EN];
  out[ION + Fluid::EN] = U[ION + Fluid::EN] + (ke_i1 - ke_i0) + heat_i;
  out[ELECTRON + Fluid::EN] = total - out[ION + Fluid::EN];
  return out;
}

void TwoFluid::stiff_source_step(const Grid& grid, Field<State>& U, real /*t*/, real dt) const {
  const int n = grid.n_cells;
#pragma omp parallel for schedule(static) if (run_parallel(n))
  for (int i = 0; i < n; ++i) U[i] = source_update(U[i], dt);
}

void TwoFluid::diagnostics(const Grid& grid, const Field<State>& U, real* out) const {
  const int n = grid.n_cells;
  const real dx = grid.dx();
  real charge = 0, energy = 0;
  for (int i = 0; i < n; ++i) {  // serial, fixed order: reproducible sums
    charge += charge_density(U[i]);
    energy += U[i][ION + Fluid::EN] + U[i][ELECTRON + Fluid::EN];
  }
  // Gauss's law at the interior faces: eps0 (E_x,i+1 - E_x,i)/dx against the mean charge
  // density of the two cells.
  real res_max = 0, res_sum = 0, div_sum = 0, rho_sum = 0;
  for (int i = 0; i + 1 < n; ++i) {
    const real div = eps0 * (U[i + 1][EX] - U[i][EX]) / dx;
    const real rho = 0.5 * (charge_density(U[i]) + charge_density(U[i + 1]));
    const real r = std::abs(div - rho);
    res_max = std::max(res_max, r);
    res_sum += r;
    div_sum += std::abs(div);
    rho_sum += std::abs(rho);
  }
  // Charge densities at round-off level of the species' own (1e-12 of sum |q_e n_e|) count
  // as zero, so an exactly neutral state reads 0, not round-off over round-off.
  real species = 0, species_max = 0;
  for (int i = 0; i < n; ++i) {
    const real qn = std::abs(electron_charge * U[i][ELECTRON + Fluid::RHO] / electron.particle_mass);
    species += qn;
    species_max = std::max(species_max, qn);
  }
  const real scale = std::max({div_sum, rho_sum, 1e-12 * species});
  out[0] = charge * dx;
  out[1] = energy * dx;
  out[2] = res_max;
  out[3] = scale > 0 ? res_sum / scale : 0.0;
  out[4] = species_max > 0 ? res_max / species_max : 0.0;
}

}  // namespace tw
