#pragma once
/// Linearized form of the two-fluid model (models/twofluid.hpp) for models/linear_form.hpp:
/// two Euler fluids and Maxwell's equations in three dimensions (d/dz = 0), B_x a variable.
///
/// Primitive variables W = (ion: rho_i, u_i (3), p_i; electron: rho_e, u_e (3), p_e;
/// E (3); B (3)). For each species s (charge q_s, mass m_s, n_s = rho_s/m_s):
///
///   C = (rho_s, rho_s u_s, S_s;  E;  B),   S_s = p_s (rho_ref,s/rho_s)^(gamma_s - 1)
///   F_d = (rho_s u_sd, rho_s u_sd u_s + p_s e_d, S_s u_sd;
///          E_i: -c^2 eps_idk B_k;   B_i: eps_idk E_k)            (Maxwell: curl)
///   S   = (0, q_s n_s (E + u_s x B) + R_s, 0;  -J/eps0;  0),   J = sum_s q_s n_s u_s
///
/// with the model's friction R_s (Braginskii electron-ion friction, ion-neutral friction;
/// their heating is quadratic in the perturbation). The source holds the plasma and
/// cyclotron frequencies: it is stiff, and linearized runs integrate it per cell by the
/// implicit midpoint rule, as the nonlinear model does.
#include <algorithm>
#include <cmath>
#include <vector>

#include "core/plasma_params.hpp"
#include "models/linear_form.hpp"
#include "models/mhd_linear.hpp"
#include "models/twofluid.hpp"

namespace tw {

template <>
struct LinearForm<TwoFluid> {
  static constexpr int n = 16;
  using Vars = Vec<n>;
  static constexpr int ION = 0, ELECTRON = 5;  ///< species blocks (rho, u_x, u_y, u_z, p)
  enum : int { EX = 10, EY = 11, EZ = 12, BX = 13, BY = 14, BZ = 15 };
  static constexpr bool stiff_source = true;

  TwoFluid model;                     ///< constants, masses, charges and collisions
  real rho_ref_i = 1, rho_ref_e = 1;  ///< reference densities of the entropy variables [kg/m^3]

  [[nodiscard]] static Vars from_model(const TwoFluid& m, const TwoFluid::State& W) {
    Vars v{};
    for (int k = 0; k <= TwoFluid::EZ; ++k) v[k] = W[k];
    v[BX] = m.bx;
    v[BY] = W[TwoFluid::BY];
    v[BZ] = W[TwoFluid::BZ];
    return v;
  }
  /// The model's 1D state of a 3D one (B_x dropped), for the model's own functions.
  [[nodiscard]] static TwoFluid::State to_model(const Vars& v) {
    TwoFluid::State W{};
    for (int k = 0; k <= TwoFluid::EZ; ++k) W[k] = v[k];
    W[TwoFluid::BY] = v[BY];
    W[TwoFluid::BZ] = v[BZ];
    return W;
  }

  [[nodiscard]] Vars conservative(const Vars& W) const {
    Vars U = W;
    for (const auto& [off, f, ref] : {std::tuple{ION, &model.ion, rho_ref_i}, std::tuple{ELECTRON, &model.electron, rho_ref_e}}) {
      for (int k = 0; k < 3; ++k) U[off + 1 + k] = W[off] * W[off + 1 + k];
      U[off + 4] = W[off + 4] * std::pow(ref / W[off], f->gamma - 1);
    }
    return U;
  }
  [[nodiscard]] Vars flux(const Vars& W, int d) const {
    Vars F{};
    const Vars U = conservative(W);
    for (int off : {ION, ELECTRON}) {
      const real ud = W[off + 1 + d];
      F[off] = W[off] * ud;
      for (int i = 0; i < 3; ++i) F[off + 1 + i] = W[off] * ud * W[off + 1 + i] + (i == d ? W[off + 4] : 0.0);
      F[off + 4] = U[off + 4] * ud;
    }
    const real c2 = model.c * model.c;
    for (int i = 0; i < 3; ++i)
      for (int k = 0; k < 3; ++k) {
        const real e = linear_detail::levi_civita(i, d, k);
        F[EX + i] -= c2 * e * W[BX + k];
        F[BX + i] += e * W[EX + k];
      }
    return F;
  }
  [[nodiscard]] static bool has_gradient_terms() { return false; }
  [[nodiscard]] Vars gradient_flux(const Vars&, const Vars&, const Vars&, int) const { return {}; }
  [[nodiscard]] static bool has_inertia() { return false; }
  [[nodiscard]] Vars inertia_flux(const Vars&, const Vars&, const Vars&, int) const { return {}; }
  [[nodiscard]] static bool has_gradient_source() { return false; }
  [[nodiscard]] Vars gradient_source(const Vars&, const Vars&, const Vars&) const { return {}; }
  [[nodiscard]] static bool has_source() { return true; }
  [[nodiscard]] Vars source(const Vars& W) const {
    using linear_detail::cross;
    Vars S{};
    const std::array<real, 3> E{W[EX], W[EY], W[EZ]}, B{W[BX], W[BY], W[BZ]};
    const std::array<real, 3> ui{W[ION + 1], W[ION + 2], W[ION + 3]}, ue{W[ELECTRON + 1], W[ELECTRON + 2], W[ELECTRON + 3]};
    const real ni = W[ION] / model.ion.particle_mass, ne = W[ELECTRON] / model.electron.particle_mass;
    const real qi = model.ion_charge, qe = model.electron_charge;
    const auto uixB = cross(ui, B), uexB = cross(ue, B);
    // Friction (twofluid.hpp): R_e = -rho_e nu_ei K (u_e - u_i), K = I + (alpha0 - 1) b b;
    // R_i = -R_e - rho_i nu_in u_i.
    const TwoFluid::State w1 = to_model(W);
    const real nu_ei = model.electron_ion_collision_frequency(w1);
    const real nu_in = model.ion_neutral_collision_frequency(w1);
    std::array<real, 3> Re{}, Ri{};
    if (nu_ei > 0) {
      const real alpha = braginskii_alpha0(model.charge_number);
      const real bn = std::sqrt(B[0] * B[0] + B[1] * B[1] + B[2] * B[2]);
      std::array<real, 3> du{ue[0] - ui[0], ue[1] - ui[1], ue[2] - ui[2]};
      real bdu = 0;
      std::array<real, 3> bh{};
      if (bn > 0)
        for (int k = 0; k < 3; ++k) {
          bh[k] = B[k] / bn;
          bdu += bh[k] * du[k];
        }
      for (int k = 0; k < 3; ++k) {
        Re[k] = -W[ELECTRON] * nu_ei * (du[k] + (alpha - 1) * bdu * bh[k]);
        Ri[k] = -Re[k];
      }
    }
    for (int k = 0; k < 3; ++k) {
      Ri[k] -= W[ION] * nu_in * ui[k];
      S[ION + 1 + k] = qi * ni * (E[k] + uixB[k]) + Ri[k];
      S[ELECTRON + 1 + k] = qe * ne * (E[k] + uexB[k]) + Re[k];
      S[EX + k] = -(qi * ni * ui[k] + qe * ne * ue[k]) / model.eps0;
    }
    return S;
  }

  [[nodiscard]] Vars scales(const Vars& W0) const {
    const real rho = W0[ION] + W0[ELECTRON];
    const real b2 = W0[BX] * W0[BX] + W0[BY] * W0[BY] + W0[BZ] * W0[BZ];
    real s = std::sqrt(b2 / (model.mu0 * rho));
    for (const auto& [off, f] : {std::pair{ION, &model.ion}, std::pair{ELECTRON, &model.electron}}) {
      s = std::max(s, std::sqrt(f->gamma * std::max(W0[off + 4], real(0)) / W0[off]));
      for (int k = 1; k <= 3; ++k) s = std::max(s, std::abs(W0[off + k]));
    }
    if (!(s > 0)) s = model.c * 1e-3;
    const real bs = b2 > 0 ? std::sqrt(b2) : std::sqrt(model.mu0 * rho) * s;
    Vars sc{};
    for (int off : {ION, ELECTRON}) {
      sc[off] = W0[off];
      for (int k = 1; k <= 3; ++k) sc[off + k] = s;
      sc[off + 4] = W0[off + 4] > 0 ? W0[off + 4] : W0[off] * s * s;
    }
    real es = s * bs;
    for (int k = 0; k < 3; ++k) es = std::max(es, std::abs(W0[EX + k]));
    for (int k = 0; k < 3; ++k) {
      sc[EX + k] = es;
      sc[BX + k] = bs;
    }
    return sc;
  }

  static std::vector<VariableInfo> variables() {
    return {{"ion_mass_density", "kg m^-3", "ion mass density"},
            {"ion_velocity_x", "m/s", "ion velocity along the tube"},
            {"ion_velocity_y", "m/s", "ion velocity, y"},
            {"ion_velocity_z", "m/s", "ion velocity, z"},
            {"ion_pressure", "Pa", "ion pressure"},
            {"electron_mass_density", "kg m^-3", "electron mass density"},
            {"electron_velocity_x", "m/s", "electron velocity along the tube"},
            {"electron_velocity_y", "m/s", "electron velocity, y"},
            {"electron_velocity_z", "m/s", "electron velocity, z"},
            {"electron_pressure", "Pa", "electron pressure"},
            {"electric_field_x", "V/m", "electric field along the tube"},
            {"electric_field_y", "V/m", "electric field, y"},
            {"electric_field_z", "V/m", "electric field, z"},
            {"magnetic_field_x", "T", "magnetic field along the tube"},
            {"magnetic_field_y", "T", "magnetic field, y"},
            {"magnetic_field_z", "T", "magnetic field, z"}};
  }
  static std::vector<VariableInfo> conserved() {
    return {{"ion_mass", "kg m^-2", "ion mass per unit area"},
            {"ion_momentum_x", "kg m^-1 s^-1", "ion x momentum per unit area"},
            {"ion_momentum_y", "kg m^-1 s^-1", "ion y momentum per unit area"},
            {"ion_momentum_z", "kg m^-1 s^-1", "ion z momentum per unit area"},
            {"ion_adiabatic_pressure", "Pa m", "integral of p_i (rho_ref,i/rho_i)^(gamma_i-1)"},
            {"electron_mass", "kg m^-2", "electron mass per unit area"},
            {"electron_momentum_x", "kg m^-1 s^-1", "electron x momentum per unit area"},
            {"electron_momentum_y", "kg m^-1 s^-1", "electron y momentum per unit area"},
            {"electron_momentum_z", "kg m^-1 s^-1", "electron z momentum per unit area"},
            {"electron_adiabatic_pressure", "Pa m", "integral of p_e (rho_ref,e/rho_e)^(gamma_e-1)"},
            {"electric_field_x_integral", "V", "integral of E_x along the tube"},
            {"electric_field_y_integral", "V", "integral of E_y along the tube"},
            {"electric_field_z_integral", "V", "integral of E_z along the tube"},
            {"magnetic_flux_x", "T m", "integral of B_x along the tube"},
            {"magnetic_flux_y", "T m", "integral of B_y along the tube"},
            {"magnetic_flux_z", "T m", "integral of B_z along the tube"}};
  }
  static std::vector<VariableInfo> output_info() {
    return {{"ion_density", "m^-3", "ion number density"},
            {"ion_velocity_x", "m/s", "ion flow velocity along the tube"},
            {"ion_velocity_y", "m/s", "ion flow velocity, y"},
            {"ion_velocity_z", "m/s", "ion flow velocity, z"},
            {"ion_pressure", "Pa", "ion pressure"},
            {"electron_density", "m^-3", "electron number density"},
            {"electron_velocity_x", "m/s", "electron flow velocity along the tube"},
            {"electron_velocity_y", "m/s", "electron flow velocity, y"},
            {"electron_velocity_z", "m/s", "electron flow velocity, z"},
            {"electron_pressure", "Pa", "electron pressure"},
            {"electric_field_x", "V/m", "electric field along the tube"},
            {"electric_field_y", "V/m", "transverse electric field, y"},
            {"electric_field_z", "V/m", "transverse electric field, z"},
            {"magnetic_field_x", "T", "magnetic field along the tube"},
            {"magnetic_field_y", "T", "transverse magnetic field, y"},
            {"magnetic_field_z", "T", "transverse magnetic field, z"},
            {"mass_density", "kg m^-3", "mass density of ions and electrons"},
            {"charge_density", "C m^-3", "charge density q_i n_i + q_e n_e"}};
  }
  void to_output(const Vars& w, real* out) const {
    for (int k = 0; k < n; ++k) out[k] = w[k];
    out[ION] = w[ION] / model.ion.particle_mass;
    out[ELECTRON] = w[ELECTRON] / model.electron.particle_mass;
    out[16] = w[ION] + w[ELECTRON];
    out[17] = model.ion_charge * out[ION] + model.electron_charge * out[ELECTRON];
  }
  static VariableRoles roles() {
    VariableRoles r;
    r.rho = ION;
    r.vx = ION + 1, r.vy = ION + 2, r.vz = ION + 3;
    r.p = ION + 4;
    r.p_extra = ELECTRON + 4;
    r.ex = EX, r.ey = EY, r.ez = EZ;
    r.bx = BX, r.by = BY, r.bz = BZ;
    return r;
  }
  /// Conducting end: velocities, tangential E and normal B odd; densities, pressures,
  /// normal E and tangential B even (as TwoFluid::wall_mirror).
  static Vars wall_parity() { return {1, -1, -1, -1, 1, 1, -1, -1, -1, 1, 1, -1, -1, -1, 1, 1}; }
  static const char* gradient_limit_name() { return "gradient terms"; }
};

}  // namespace tw
