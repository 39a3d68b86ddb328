#include "core/plasma_params.hpp"

#include <cmath>
#include <cstdio>
#include <string>

#include "core/constants.hpp"
#include "core/error.hpp"

namespace tw {
namespace {

namespace K = tw::constants;

std::string fmt(real v) {
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.6g", v);
  return buf;
}

void require(bool ok, const std::string& what, real value, const std::string& range) {
  if (!ok) {
    throw InputError("plasma input: " + what + " = " + fmt(value) + " is invalid; it must be " +
                     range);
  }
}

}  // namespace

const char* alfven_regime_name(AlfvenRegime r) {
  return r == AlfvenRegime::inertial ? "inertial Alfvén" : "kinetic Alfvén";
}

void validate_plasma_input(const PlasmaInput& in) {
  require(std::isfinite(in.n_e) && in.n_e > 0, "electron density n_e [m^-3]", in.n_e,
          "finite and > 0");
  require(std::isfinite(in.B) && in.B > 0, "magnetic field B [T]", in.B, "finite and > 0");
  require(std::isfinite(in.ion_mass) && in.ion_mass > 0, "ion mass [kg]", in.ion_mass,
          "finite and > 0");
  require(in.Z >= 1, "ion charge number Z", static_cast<real>(in.Z), "an integer >= 1");
  require(std::isfinite(in.Te_eV) && in.Te_eV >= 0, "electron temperature T_e [eV]", in.Te_eV,
          "finite and >= 0");
  require(std::isfinite(in.Ti_eV) && in.Ti_eV >= 0, "ion temperature T_i [eV]", in.Ti_eV,
          "finite and >= 0");
  if (in.ln_lambda) {
    require(std::isfinite(*in.ln_lambda) && *in.ln_lambda > 0, "Coulomb logarithm override",
            *in.ln_lambda, "finite and > 0");
  }
}

real braginskii_alpha0(int Z) {
  // Braginskii (1965), Table 1, coefficient alpha_0 (from memory).
  switch (Z) {
    case 1: return 0.5129;
    case 2: return 0.4408;
    case 3: return 0.3965;
    case 4: return 0.3752;
    default: break;
  }
  TW_CHECK(Z > 4, "Z must be >= 1");
  constexpr real alpha_4 = 0.3752;
  constexpr real alpha_inf = 0.2949;
  return alpha_inf + (alpha_4 - alpha_inf) * 4.0 / static_cast<real>(Z);
}

real braginskii_tau_e(real n_e, real Te_eV, int Z, real ln_lambda) {
  TW_CHECK(n_e > 0 && Te_eV > 0 && Z >= 1 && ln_lambda > 0, "needs n_e, T_e, ln Lambda > 0 and Z >= 1");
  const real kTe = Te_eV * K::eV;
  return 6.0 * std::sqrt(2.0) * std::pow(K::pi, 1.5) * K::eps0 * K::eps0 * std::sqrt(K::m_e) *
         std::pow(kTe, 1.5) / (ln_lambda * std::pow(K::e, 4) * static_cast<real>(Z) * n_e);
}

real coulomb_logarithm_nrl(real n_e, real Te_eV, int Z) {
  TW_CHECK(n_e > 0 && Te_eV > 0 && Z >= 1, "needs n_e > 0, T_e > 0, Z >= 1");
  const real n_cc = n_e * 1e-6;  // the formulary's n_e is in cm^-3
  const real z = static_cast<real>(Z);
  if (Te_eV < 10.0 * z * z) return 23.0 - std::log(std::sqrt(n_cc) * z * std::pow(Te_eV, -1.5));
  return 24.0 - std::log(std::sqrt(n_cc) / Te_eV);
}

PlasmaParameters derive_plasma_parameters(const PlasmaInput& in) {
  validate_plasma_input(in);
  PlasmaParameters p;
  p.input = in;

  const real z = static_cast<real>(in.Z);
  const real m_i = in.ion_mass;
  const real n_e = in.n_e;
  const real n_i = n_e / z;
  const real kTe = in.Te_eV * K::eV;  // [J]
  const real kTi = in.Ti_eV * K::eV;  // [J]
  const real c2 = K::c * K::c;

  p.n_i = n_i;
  p.mass_density = n_i * m_i;
  p.mass_density_with_electrons = n_i * m_i + n_e * K::m_e;
  p.electron_ion_mass_ratio = K::m_e / m_i;

  // Alfvén speeds and the low-frequency perpendicular dielectric constant.
  p.v_A = in.B / std::sqrt(K::mu0 * p.mass_density);
  p.v_A_with_me = in.B / std::sqrt(K::mu0 * p.mass_density_with_electrons);
  p.v_A_over_c = p.v_A / K::c;
  p.c2_over_vA2 = c2 / (p.v_A * p.v_A);
  p.c2_over_vA2_with_me = c2 / (p.v_A_with_me * p.v_A_with_me);
  p.eps_perp_over_eps0 = 1.0 + p.c2_over_vA2_with_me;
  p.v_A_displacement = K::c / std::sqrt(p.eps_perp_over_eps0);

  // Frequencies.
  const real two_pi = 2.0 * K::pi;
  p.omega_ci = z * K::e * in.B / m_i;
  p.omega_ce = K::e * in.B / K::m_e;
  p.omega_pi = std::sqrt(n_i * (z * K::e) * (z * K::e) / (K::eps0 * m_i));
  p.omega_pe = std::sqrt(n_e * K::e * K::e / (K::eps0 * K::m_e));
  p.omega_LH = 1.0 / std::sqrt(1.0 / (p.omega_ci * p.omega_ci + p.omega_pi * p.omega_pi) +
                               1.0 / (p.omega_ci * p.omega_ce));
  p.f_ci = p.omega_ci / two_pi;
  p.f_ce = p.omega_ce / two_pi;
  p.f_pi = p.omega_pi / two_pi;
  p.f_pe = p.omega_pe / two_pi;
  p.f_LH = p.omega_LH / two_pi;

  // Lengths and thermal quantities (all exactly 0 for a cold species).
  p.d_i = K::c / p.omega_pi;
  p.d_e = K::c / p.omega_pe;
  p.c_s = std::sqrt(z * kTe / m_i);
  p.rho_s = p.c_s / p.omega_ci;
  p.v_ti = std::sqrt(kTi / m_i);
  p.v_te = std::sqrt(kTe / K::m_e);
  p.rho_i = p.v_ti / p.omega_ci;
  p.rho_e = p.v_te / p.omega_ce;
  p.lambda_De = std::sqrt(K::eps0 * kTe / (n_e * K::e * K::e));
  p.beta = 2.0 * K::mu0 * (n_e * kTe + n_i * kTi) / (in.B * in.B);
  p.beta_e = 2.0 * K::mu0 * n_e * kTe / (in.B * in.B);

  p.v_te_over_v_A = p.v_te / p.v_A;
  p.regime = p.v_te_over_v_A > 1.0 ? AlfvenRegime::kinetic : AlfvenRegime::inertial;

  if (p.v_A_over_c > 0.1) {
    p.notes.push_back("v_A/c = " + fmt(p.v_A_over_c) +
                      ": the displacement current slows shear Alfvén waves to c/sqrt(eps_perp/eps0) = " +
                      fmt(p.v_A_displacement) + " m/s");
  }

  // Coulomb collisions.
  if (in.Te_eV <= 0) {
    p.notes.push_back(
        "T_e = 0: Coulomb logarithm, collision time, collision frequency and resistivities "
        "need T_e > 0 and are omitted");
    return p;
  }
  real ln_lambda = 0;
  if (in.ln_lambda) {
    ln_lambda = *in.ln_lambda;
    p.ln_lambda_given = true;
  } else {
    ln_lambda = coulomb_logarithm_nrl(n_e, in.Te_eV, in.Z);
    if (in.Te_eV < in.Ti_eV * z * K::m_e / m_i) {
      p.notes.push_back(
          "T_e < T_i Z m_e/m_i: the ion-dominated Coulomb logarithm applies, which is not "
          "implemented; the electron formula was used (give a Coulomb logarithm override)");
    }
    if (ln_lambda <= 1.0) {
      p.notes.push_back("the NRL Coulomb logarithm is " + fmt(ln_lambda) +
                        " <= 1: classical Coulomb collisions do not describe this plasma; "
                        "collision time and resistivities are omitted (give an override to force them)");
      return p;
    }
  }
  if (ln_lambda < 5.0) {
    p.notes.push_back("ln Lambda = " + fmt(ln_lambda) +
                      " < 5: weakly coupled plasma theory (Spitzer, Braginskii) is marginal");
  }
  p.ln_lambda = ln_lambda;

  // Braginskii tau_e; Z n_e = Z^2 n_i for one ion species.
  const real tau_e = braginskii_tau_e(n_e, in.Te_eV, in.Z, ln_lambda);
  p.tau_e = tau_e;
  p.nu_ei = 1.0 / tau_e;
  p.omega_ce_tau_e = p.omega_ce * tau_e;
  const real eta_perp = K::m_e / (n_e * K::e * K::e * tau_e);
  p.eta_perp = eta_perp;
  p.eta_par = braginskii_alpha0(in.Z) * eta_perp;
  p.diffusivity_perp = eta_perp / K::mu0;
  p.diffusivity_par = *p.eta_par / K::mu0;
  if (*p.omega_ce_tau_e < 10.0) {
    p.notes.push_back("omega_ce tau_e = " + fmt(*p.omega_ce_tau_e) +
                      " is not >> 1: eta_perp assumes strongly magnetised electrons");
  }
  return p;
}

std::vector<PlasmaParameterRow> plasma_input_rows(const PlasmaInput& in) {
  std::vector<PlasmaParameterRow> rows{
      {"electron_density_per_m3", in.n_e, "m^-3", "n_e", "electron density"},
      {"ion_density_per_m3", in.n_e / static_cast<real>(in.Z), "m^-3", "n_i",
       "ion density n_e/Z"},
      {"magnetic_field_t", in.B, "T", "B", "magnetic field strength"},
      {"ion_mass_kg", in.ion_mass, "kg", "m_i", "ion mass (atom minus Z electrons)"},
      {"ion_mass_amu", in.ion_mass / K::u, "u", "m_i/u", "ion mass in unified atomic mass units"},
      {"ion_to_proton_mass_ratio", in.ion_mass / K::m_p, "1", "mu", "ion mass over proton mass"},
      {"ion_charge_number", static_cast<real>(in.Z), "1", "Z", "ion charge in units of e"},
      {"electron_temperature_ev", in.Te_eV, "eV", "T_e", "electron temperature"},
      {"ion_temperature_ev", in.Ti_eV, "eV", "T_i", "ion temperature"},
  };
  if (in.ln_lambda) {
    rows.push_back({"coulomb_logarithm_override", *in.ln_lambda, "1", "lnL",
                    "Coulomb logarithm given instead of the NRL formula"});
  }
  return rows;
}

std::vector<PlasmaParameterRow> plasma_parameter_rows(const PlasmaParameters& p) {
  std::vector<PlasmaParameterRow> rows{
      {"mass_density_kg_per_m3", p.mass_density, "kg m^-3", "rho", "ion mass density n_i m_i"},
      {"electron_to_ion_mass_ratio", p.electron_ion_mass_ratio, "1", "m_e/m_i",
       "electron to ion mass ratio"},
      {"alfven_speed_m_per_s", p.v_A, "m/s", "v_A", "Alfvén speed, ions only (MHD)"},
      {"alfven_speed_with_electron_mass_m_per_s", p.v_A_with_me, "m/s", "v_A,e",
       "Alfvén speed, mass density incl. electrons"},
      {"alfven_speed_over_light_speed", p.v_A_over_c, "1", "v_A/c", "Alfvén speed over c (ions only)"},
      {"light_over_alfven_speed_squared", p.c2_over_vA2, "1", "c^2/v_A^2",
       "c^2/v_A^2, ions only (= omega_pi^2/omega_ci^2)"},
      {"light_over_alfven_speed_squared_with_electron_mass", p.c2_over_vA2_with_me, "1",
       "c^2/v_A,e^2", "c^2/v_A^2 incl. electron mass"},
      {"perpendicular_relative_permittivity", p.eps_perp_over_eps0, "1", "eps_perp/eps0",
       "perpendicular dielectric constant at low frequency"},
      {"alfven_speed_with_displacement_current_m_per_s", p.v_A_displacement, "m/s", "v_A,disp",
       "shear Alfvén speed incl. displacement current"},
      {"ion_cyclotron_frequency_rad_per_s", p.omega_ci, "rad/s", "omega_ci", "ion cyclotron frequency"},
      {"ion_cyclotron_frequency_hz", p.f_ci, "Hz", "f_ci", "ion cyclotron frequency"},
      {"electron_cyclotron_frequency_rad_per_s", p.omega_ce, "rad/s", "omega_ce",
       "electron cyclotron frequency"},
      {"electron_cyclotron_frequency_hz", p.f_ce, "Hz", "f_ce", "electron cyclotron frequency"},
      {"ion_plasma_frequency_rad_per_s", p.omega_pi, "rad/s", "omega_pi", "ion plasma frequency"},
      {"ion_plasma_frequency_hz", p.f_pi, "Hz", "f_pi", "ion plasma frequency"},
      {"electron_plasma_frequency_rad_per_s", p.omega_pe, "rad/s", "omega_pe",
       "electron plasma frequency"},
      {"electron_plasma_frequency_hz", p.f_pe, "Hz", "f_pe", "electron plasma frequency"},
      {"lower_hybrid_frequency_rad_per_s", p.omega_LH, "rad/s", "omega_LH", "lower hybrid frequency"},
      {"lower_hybrid_frequency_hz", p.f_LH, "Hz", "f_LH", "lower hybrid frequency"},
      {"ion_inertial_length_m", p.d_i, "m", "d_i", "ion inertial length c/omega_pi"},
      {"electron_inertial_length_m", p.d_e, "m", "d_e", "electron inertial length c/omega_pe"},
      {"ion_sound_speed_m_per_s", p.c_s, "m/s", "c_s", "ion sound speed sqrt(Z k T_e/m_i)"},
      {"ion_sound_gyroradius_m", p.rho_s, "m", "rho_s", "ion sound gyroradius c_s/omega_ci"},
      {"ion_thermal_speed_m_per_s", p.v_ti, "m/s", "v_ti", "ion thermal speed sqrt(k T_i/m_i)"},
      {"electron_thermal_speed_m_per_s", p.v_te, "m/s", "v_te",
       "electron thermal speed sqrt(k T_e/m_e)"},
      {"ion_gyroradius_m", p.rho_i, "m", "rho_i", "ion gyroradius v_ti/omega_ci"},
      {"electron_gyroradius_m", p.rho_e, "m", "rho_e", "electron gyroradius v_te/omega_ce"},
      {"electron_debye_length_m", p.lambda_De, "m", "lambda_De", "electron Debye length"},
      {"plasma_beta", p.beta, "1", "beta", "total plasma beta"},
      {"electron_beta", p.beta_e, "1", "beta_e", "electron beta"},
      {"electron_thermal_over_alfven_speed", p.v_te_over_v_A, "1", "v_te/v_A",
       "v_te/v_A: < 1 inertial, > 1 kinetic Alfvén regime"},
  };
  auto add = [&rows](const std::optional<real>& v, const char* key, const char* units,
                     const char* symbol, const char* description) {
    if (v) rows.push_back({key, *v, units, symbol, description});
  };
  add(p.ln_lambda, "coulomb_logarithm", "1", "lnL",
      p.ln_lambda_given ? "electron-ion Coulomb logarithm (given)"
                        : "electron-ion Coulomb logarithm (NRL Formulary)");
  add(p.tau_e, "electron_collision_time_s", "s", "tau_e", "electron collision time (Braginskii)");
  add(p.nu_ei, "electron_ion_collision_frequency_per_s", "s^-1", "nu_ei",
      "electron-ion collision frequency 1/tau_e");
  add(p.omega_ce_tau_e, "electron_magnetization", "1", "omega_ce tau_e",
      "electron magnetization omega_ce tau_e");
  add(p.eta_perp, "perpendicular_resistivity_ohm_m", "ohm m", "eta_perp",
      "transverse Spitzer resistivity m_e/(n_e e^2 tau_e)");
  add(p.eta_par, "parallel_resistivity_ohm_m", "ohm m", "eta_par",
      "parallel resistivity alpha_0(Z) eta_perp (Braginskii)");
  add(p.diffusivity_perp, "perpendicular_magnetic_diffusivity_m2_per_s", "m^2/s", "eta_perp/mu0",
      "magnetic diffusivity from eta_perp");
  add(p.diffusivity_par, "parallel_magnetic_diffusivity_m2_per_s", "m^2/s", "eta_par/mu0",
      "magnetic diffusivity from eta_par");
  return rows;
}

}  // namespace tw
