#pragma once
/// Linearized form of Hall MHD (models/hall.hpp) for models/linear_form.hpp: the MHD form
/// (models/mhd_linear.hpp) with the electron pressure, the Hall electric field and electron
/// inertia, in three dimensions (d/dz = 0).
///
/// Primitive variables W = (rho, u_x, u_y, u_z, B_x, B_y, B_z, p, p_e) (p the total thermal
/// pressure). With n_e = Z rho/m, J = curl B/mu0 and the electron velocity u_e = u - J/(e n_e):
///
///   C: as MHD, with S_i = p_i (rho_ref/rho)^(gamma-1), p_i = p - p_e (ions), and
///      S_e = p_e (rho_ref/rho)^(gamma-1) (adiabatic electrons, advected by u_e) or
///      p_e - rho c_e^2 (isothermal electrons at the local T_e: kept at zero);
///      isothermal closure: p - rho a^2 for the ions, as MHD
///   F_d: MHD with the total pressure; S_i u_d, S_e u_d
///   H_d(B_i) = eps_idk E'_k,  E' = eta J + (J x B - grad p_e) / (e n_e)   (generalised Ohm's law)
///   H_d(S_e) = -S_e J_d / (e n_e)                  (adiabatic electrons move at u_e)
///   H_d(m): viscosity as MHD;  Q: Powell's div B terms, as MHD
///   P_d(B_i) = -eps_idk d_e^2 mu0 J_k,  d_e^2 = m_e/(mu0 n_e e^2)   (electron inertia:
///      U_B = B + curl(d_e^2 curl B), the generalised field of the nonlinear model)
///
/// In 1D (d/dy = 0) grad p_e drives no field and J_x = 0, so this reduces to the nonlinear
/// model; with k_perp the electron pressure and the Hall field together give the kinetic
/// Alfvén wave (k_perp rho_s), electron inertia the inertial Alfvén wave (k_perp d_e).
#include <algorithm>
#include <cmath>
#include <vector>

#include "models/hall.hpp"
#include "models/mhd_linear.hpp"

namespace tw {

template <>
struct LinearForm<HallMhd> {
  static constexpr int n = 9;
  using Vars = Vec<n>;
  enum : int { RHO = 0, VX = 1, VY = 2, VZ = 3, BX = 4, BY = 5, BZ = 6, P = 7, PE = 8 };
  static constexpr bool stiff_source = false;

  HallMhd model;          ///< the model at this point (isothermal c_e^2 and a^2 of the local temperatures)
  real mass_per_charge = 0;  ///< m/(Z e): 1/(e n_e) = mass_per_charge / rho [kg/C]
  real rho_ref = 1;       ///< reference density of the entropy variables [kg/m^3]

  [[nodiscard]] const Mhd& ideal() const { return model.ideal; }
  [[nodiscard]] bool adiabatic_ions() const { return model.ideal.closure == Closure::adiabatic; }
  [[nodiscard]] bool adiabatic_electrons() const { return model.electron_closure == ElectronClosure::adiabatic; }
  [[nodiscard]] real resistivity() const { return model.resistivity + model.ideal.resistivity; }

  [[nodiscard]] static Vars from_model(const HallMhd& m, const HallMhd::State& W) {
    return {W[HallMhd::RHO], W[HallMhd::VX], W[HallMhd::VY], W[HallMhd::VZ], m.ideal.bx,
            W[HallMhd::BY],  W[HallMhd::BZ], W[HallMhd::P],  W[HallMhd::PE]};
  }

  [[nodiscard]] Vars conservative(const Vars& W) const {
    Vars U{};
    linear_detail::mhd_conservative(ideal(), W, RHO, VX, BX, U);
    const real f = std::pow(rho_ref / W[RHO], ideal().gamma - 1);
    const real a2 = ideal().sound_speed_iso * ideal().sound_speed_iso;
    U[P] = adiabatic_ions() ? (W[P] - W[PE]) * f : W[P] - W[RHO] * a2;
    U[PE] = adiabatic_electrons() ? W[PE] * f : W[PE] - W[RHO] * model.electron_sound_speed2;
    return U;
  }
  [[nodiscard]] Vars flux(const Vars& W, int d) const {
    Vars F{};
    linear_detail::mhd_flux(ideal(), W, RHO, VX, BX, P, d, F);
    const Vars U = conservative(W);
    F[P] = adiabatic_ions() ? U[P] * W[VX + d] : 0.0;
    F[PE] = adiabatic_electrons() ? U[PE] * W[VX + d] : 0.0;
    return F;
  }
  [[nodiscard]] static bool has_gradient_terms() { return true; }  // the Hall field
  [[nodiscard]] Vars gradient_flux(const Vars& W, const Vars& gx, const Vars& gy, int d) const {
    using linear_detail::cross;
    Vars H{};
    const auto J = linear_detail::current(gx, gy, BX, ideal().mu0);
    const real inv_ne = mass_per_charge / W[RHO];  // 1/(e n_e)
    const auto JxB = cross(J, {W[BX], W[BY], W[BZ]});
    const std::array<real, 3> grad_pe{gx[PE], gy[PE], 0.0};
    std::array<real, 3> E{};
    for (int k = 0; k < 3; ++k) E[k] = resistivity() * J[k] + (JxB[k] - grad_pe[k]) * inv_ne;
    linear_detail::add_field_flux(E, BX, d, H);
    if (adiabatic_electrons()) H[PE] -= conservative(W)[PE] * J[d] * inv_ne;
    if (ideal().viscosity > 0) linear_detail::add_viscous_flux(W[RHO] * ideal().viscosity, gx, gy, VX, d, H);
    return H;
  }
  [[nodiscard]] bool has_inertia() const { return model.inertia_rho > 0; }
  [[nodiscard]] Vars inertia_flux(const Vars& W, const Vars& gx, const Vars& gy, int d) const {
    Vars P_{};
    const auto J = linear_detail::current(gx, gy, BX, ideal().mu0);
    std::array<real, 3> A{};
    for (int k = 0; k < 3; ++k) A[k] = -model.inertia_length2(W[RHO]) * ideal().mu0 * J[k];
    linear_detail::add_field_flux(A, BX, d, P_);
    return P_;
  }
  [[nodiscard]] static bool has_source() { return false; }
  [[nodiscard]] Vars source(const Vars&) const { return {}; }
  [[nodiscard]] static bool has_gradient_source() { return true; }
  [[nodiscard]] Vars gradient_source(const Vars& W, const Vars& gx, const Vars& gy) const {
    return linear_detail::powell_source(W, gx, gy, VX, BX, ideal().mu0);
  }

  [[nodiscard]] Vars scales(const Vars& W0) const {
    const LinearForm<Mhd> mhd{ideal(), rho_ref};
    const auto s8 = mhd.scales({W0[RHO], W0[VX], W0[VY], W0[VZ], W0[BX], W0[BY], W0[BZ], W0[P]});
    Vars s{};
    for (int k = 0; k < 8; ++k) s[k] = s8[k];
    s[PE] = W0[PE] > 0 ? W0[PE] : s8[P];
    return s;
  }

  static std::vector<VariableInfo> variables() {
    auto v = LinearForm<Mhd>::variables();
    v.push_back({"electron_pressure", "Pa", "electron pressure"});
    return v;
  }
  static std::vector<VariableInfo> conserved() {
    auto v = LinearForm<Mhd>::conserved();
    v.back() = {"ion_adiabatic_pressure", "Pa m",
                "integral of p_i (rho_ref/rho)^(gamma-1) (isothermal closure: of p - rho a^2, which stays 0)"};
    v.push_back({"electron_adiabatic_pressure", "Pa m",
                 "integral of p_e (rho_ref/rho)^(gamma-1) (isothermal electrons: of p_e - rho c_e^2, which stays 0)"});
    return v;
  }
  static std::vector<VariableInfo> output_info() {
    auto v = LinearForm<Mhd>::output_info();
    v.push_back({"electron_pressure", "Pa", "electron pressure p_e (part of pressure)"});
    return v;
  }
  void to_output(const Vars& w, real* out) const {
    out[0] = w[RHO] / ideal().particle_mass;
    for (int k = 0; k < n; ++k) out[k + 1] = w[k];
  }
  static VariableRoles roles() { return LinearForm<Mhd>::roles(); }
  static Vars wall_parity() { return {1, -1, -1, -1, -1, 1, 1, 1, 1}; }
  static const char* gradient_limit_name() { return "whistler and diffusion (Hall, resistivity, viscosity)"; }
};

}  // namespace tw
