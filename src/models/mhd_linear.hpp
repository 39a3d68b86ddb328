#pragma once
/// Linearized form of ideal and resistive MHD (models/mhd.hpp), the description that
/// models/linear_form.hpp turns into linear equations: the same physics in three dimensions
/// (d/dz = 0), with B_x a variable.
///
/// Primitive variables W = (rho, u_x, u_y, u_z, B_x, B_y, B_z, p). Balance laws, direction
/// d = x or y (e_d its unit vector), E = -u x B:
///
///   C = (rho, rho u + eps E x B, B, S),   S = p (rho_ref/rho)^(gamma-1)
///       (isothermal closure: S = p - rho a^2, kept at zero: no flux, no source)
///   F_d = (rho u_d,
///          rho u_d u + (p + |B|^2/2mu0 + eps |E|^2/2) e_d - B_d B/mu0 - eps E_d E,
///          u_d B - B_d u,
///          S u_d)
///   H_d(B_i) = eps_idk E'_k,  E' = eta J,  J = curl B / mu0        (resistivity)
///   H_d(m_i) = -rho nu (d_d u_i + d_i u_d - (2/3) delta_di div u)  (viscosity)
///   Q = -(div B)(0, B/mu0, u, 0)                                   (Powell; see linear_form.hpp)
///
/// The x components reproduce Mhd::flux and Mhd::gradient_flux (the energy equation
/// replaced by the entropy-like S, see linear_form.hpp); eps = 1/(mu0 c^2) is the
/// displacement current (Boris correction) of the model.
#include <algorithm>
#include <cmath>
#include <vector>

#include "models/linear_form.hpp"
#include "models/mhd.hpp"

namespace tw {

namespace linear_detail {

/// a x b for 3-vectors.
inline std::array<real, 3> cross(const std::array<real, 3>& a, const std::array<real, 3>& b) {
  return {a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]};
}

/// The ideal single-fluid MHD part shared by MHD and Hall MHD: mass, momentum (with the
/// displacement current's eps E x B and electric stress) and induction, for the variables
/// at rho, v (3), b (3) and total pressure p of W. Writes C or F_d into the same slots.
template <class V>
void mhd_conservative(const Mhd& m, const V& W, int rho, int v, int b, V& U) {
  const std::array<real, 3> u{W[v], W[v + 1], W[v + 2]}, B{W[b], W[b + 1], W[b + 2]};
  U[rho] = W[rho];
  const auto E = cross(B, u);  // -u x B
  const auto ExB = cross(E, B);
  for (int i = 0; i < 3; ++i) {
    U[v + i] = W[rho] * u[i] + m.eps_disp * ExB[i];
    U[b + i] = B[i];
  }
}

template <class V>
void mhd_flux(const Mhd& m, const V& W, int rho, int v, int b, int p, int d, V& F) {
  const std::array<real, 3> u{W[v], W[v + 1], W[v + 2]}, B{W[b], W[b + 1], W[b + 2]};
  const auto E = cross(B, u);
  const real b2 = B[0] * B[0] + B[1] * B[1] + B[2] * B[2];
  const real e2 = E[0] * E[0] + E[1] * E[1] + E[2] * E[2];
  const real ptot = W[p] + b2 / (2 * m.mu0) + 0.5 * m.eps_disp * e2;
  F[rho] = W[rho] * u[d];
  for (int i = 0; i < 3; ++i) {
    F[v + i] = W[rho] * u[d] * u[i] + (i == d ? ptot : 0.0) - B[d] * B[i] / m.mu0 - m.eps_disp * E[d] * E[i];
    F[b + i] = u[d] * B[i] - B[d] * u[i];
  }
}

/// Current density curl B / mu0 from the gradients (d/dz = 0) of the field at b.
template <class V>
std::array<real, 3> current(const V& gx, const V& gy, int b, real mu0) {
  return {gy[b + 2] / mu0, -gx[b + 2] / mu0, (gx[b + 1] - gy[b]) / mu0};
}

/// Adds the flux of an electric field E' to the induction equation: H_d(B_i) += eps_idk E'_k.
template <class V>
void add_field_flux(const std::array<real, 3>& E, int b, int d, V& H) {
  for (int i = 0; i < 3; ++i)
    for (int k = 0; k < 3; ++k) H[b + i] += levi_civita(i, d, k) * E[k];
}

/// Powell's div B source, -(div B)(B/mu0 in the momentum, u in the induction)
/// (linear_form.hpp): the momentum then feels the Lorentz force, not the (div B) B force of
/// the conservation form.
template <class V>
V powell_source(const V& W, const V& gx, const V& gy, int v, int b, real mu0) {
  V Q{};
  const real div_b = gx[b] + gy[b + 1];
  for (int i = 0; i < 3; ++i) {
    Q[v + i] = -div_b * W[b + i] / mu0;
    Q[b + i] = -div_b * W[v + i];
  }
  return Q;
}

/// Navier-Stokes viscous momentum flux of kinematic viscosity nu at density rho.
template <class V>
void add_viscous_flux(real rho_nu, const V& gx, const V& gy, int v, int d, V& H) {
  auto grad = [&](int l, int j) { return l == 0 ? gx[v + j] : l == 1 ? gy[v + j] : 0.0; };  // d_l u_j
  const real div = gx[v] + gy[v + 1];
  for (int i = 0; i < 3; ++i)
    H[v + i] -= rho_nu * (grad(d, i) + grad(i, d) - (i == d ? 2.0 / 3.0 * div : 0.0));
}

}  // namespace linear_detail

template <>
struct LinearForm<Mhd> {
  static constexpr int n = 8;
  using Vars = Vec<n>;
  enum : int { RHO = 0, VX = 1, VY = 2, VZ = 3, BX = 4, BY = 5, BZ = 6, P = 7 };
  static constexpr bool stiff_source = false;

  Mhd model;          ///< the model at this point (isothermal sound speed of the local temperatures)
  real rho_ref = 1;   ///< reference density of the entropy variable [kg/m^3] (one value for the tube)

  [[nodiscard]] bool adiabatic() const { return model.closure == Closure::adiabatic; }

  /// The model's primitive state as the 3D variables (B_x from the model).
  [[nodiscard]] static Vars from_model(const Mhd& m, const Mhd::State& W) {
    return {W[Mhd::RHO], W[Mhd::VX], W[Mhd::VY], W[Mhd::VZ], m.bx, W[Mhd::BY], W[Mhd::BZ], W[Mhd::P]};
  }

  [[nodiscard]] Vars conservative(const Vars& W) const {
    Vars U{};
    linear_detail::mhd_conservative(model, W, RHO, VX, BX, U);
    U[P] = adiabatic() ? W[P] * std::pow(rho_ref / W[RHO], model.gamma - 1)
                       : W[P] - W[RHO] * model.sound_speed_iso * model.sound_speed_iso;
    return U;
  }
  [[nodiscard]] Vars flux(const Vars& W, int d) const {
    Vars F{};
    linear_detail::mhd_flux(model, W, RHO, VX, BX, P, d, F);
    F[P] = adiabatic() ? conservative(W)[P] * W[VX + d] : 0.0;
    return F;
  }
  [[nodiscard]] bool has_gradient_terms() const { return model.resistivity > 0 || model.viscosity > 0; }
  [[nodiscard]] Vars gradient_flux(const Vars& W, const Vars& gx, const Vars& gy, int d) const {
    Vars H{};
    if (model.resistivity > 0) {
      auto E = linear_detail::current(gx, gy, BX, model.mu0);
      for (auto& e : E) e *= model.resistivity;
      linear_detail::add_field_flux(E, BX, d, H);
    }
    if (model.viscosity > 0) linear_detail::add_viscous_flux(W[RHO] * model.viscosity, gx, gy, VX, d, H);
    return H;
  }
  [[nodiscard]] static bool has_inertia() { return false; }
  [[nodiscard]] Vars inertia_flux(const Vars&, const Vars&, const Vars&, int) const { return {}; }
  [[nodiscard]] static bool has_source() { return false; }
  [[nodiscard]] Vars source(const Vars&) const { return {}; }
  [[nodiscard]] static bool has_gradient_source() { return true; }
  [[nodiscard]] Vars gradient_source(const Vars& W, const Vars& gx, const Vars& gy) const {
    return linear_detail::powell_source(W, gx, gy, VX, BX, model.mu0);
  }

  [[nodiscard]] Vars scales(const Vars& W0) const {
    const real rho = W0[RHO];
    const real b2 = (W0[BX] * W0[BX] + W0[BY] * W0[BY] + W0[BZ] * W0[BZ]) / (model.mu0 * rho);
    const real a2 = adiabatic() ? model.gamma * W0[P] / rho : model.sound_speed_iso * model.sound_speed_iso;
    const real s = std::max({std::sqrt(a2 + b2), std::abs(W0[VX]), std::abs(W0[VY]), std::abs(W0[VZ])});
    const real bs = std::max(std::sqrt(b2 * model.mu0 * rho), std::sqrt(model.mu0 * rho) * s);
    return {rho, s, s, s, bs, bs, bs, W0[P] > 0 ? W0[P] : rho * s * s};
  }

  static std::vector<VariableInfo> variables() {
    return {{"mass_density", "kg m^-3", "mass density"},   {"velocity_x", "m/s", "velocity along the tube"},
            {"velocity_y", "m/s", "velocity, y"},         {"velocity_z", "m/s", "velocity, z"},
            {"magnetic_field_x", "T", "magnetic field along the tube"},
            {"magnetic_field_y", "T", "magnetic field, y"}, {"magnetic_field_z", "T", "magnetic field, z"},
            {"pressure", "Pa", "total thermal pressure"}};
  }
  static std::vector<VariableInfo> conserved() {
    return {{"mass", "kg m^-2", "mass per unit area"},
            {"momentum_x", "kg m^-1 s^-1", "x momentum per unit area"},
            {"momentum_y", "kg m^-1 s^-1", "y momentum per unit area"},
            {"momentum_z", "kg m^-1 s^-1", "z momentum per unit area"},
            {"magnetic_flux_x", "T m", "integral of B_x along the tube"},
            {"magnetic_flux_y", "T m", "integral of B_y along the tube"},
            {"magnetic_flux_z", "T m", "integral of B_z along the tube"},
            {"adiabatic_pressure", "Pa m",
             "integral of p (rho_ref/rho)^(gamma-1) (isothermal closure: of p - rho a^2, which stays 0)"}};
  }
  static std::vector<VariableInfo> output_info() {
    return {{"density", "m^-3", "ion number density"},
            {"mass_density", "kg m^-3", "mass density (ions and electrons)"},
            {"velocity_x", "m/s", "flow velocity along the tube"},
            {"velocity_y", "m/s", "transverse flow velocity, y"},
            {"velocity_z", "m/s", "transverse flow velocity, z"},
            {"magnetic_field_x", "T", "magnetic field along the tube"},
            {"magnetic_field_y", "T", "transverse magnetic field, y"},
            {"magnetic_field_z", "T", "transverse magnetic field, z"},
            {"pressure", "Pa", "total thermal pressure (ions and electrons)"}};
  }
  void to_output(const Vars& w, real* out) const {
    out[0] = w[RHO] / model.particle_mass;
    for (int k = 0; k < n; ++k) out[k + 1] = w[k];
  }
  static VariableRoles roles() {
    VariableRoles r;
    r.rho = RHO;
    r.vx = VX, r.vy = VY, r.vz = VZ;
    r.bx = BX, r.by = BY, r.bz = BZ;
    r.p = P;
    return r;
  }
  /// Conducting (line-tied) end: velocities and the normal field odd, the rest even.
  static Vars wall_parity() { return {1, -1, -1, -1, -1, 1, 1, 1}; }
  static const char* gradient_limit_name() { return "diffusion (resistivity, viscosity)"; }
};

}  // namespace tw
