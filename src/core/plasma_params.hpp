#pragma once
/// Derived parameters of a uniform, quasi-neutral electron + single-ion plasma in a
/// magnetic field: speeds, frequencies, lengths, beta, Coulomb collisions, resistivity.
///
/// Conventions (SI throughout; temperatures enter in eV, as k_B T / e):
/// - The density given is the ELECTRON density n_e; the ion density is n_i = n_e / Z
///   (quasi-neutrality with one ion species of charge Z e).
/// - Thermal speeds v_ts = sqrt(k T_s / m_s) (the NRL Formulary convention, no factor 2);
///   gyroradii r_s = v_ts / omega_cs.
/// - Gyrofrequencies are magnitudes, omega_cs = |q_s| B / m_s.
///
/// Formulas (each with its source):
/// - v_A = B / sqrt(mu0 rho): Alfvén speed, rho = n_i m_i (ions only, the MHD value), or
///   rho = n_i m_i + n_e m_e (the value a two-fluid model propagates).
/// - c^2/v_A^2 with rho incl. m_e equals sum_s omega_ps^2/Omega_s^2, and
///   eps_perp/eps0 = 1 + c^2/v_A^2 is the low-frequency limit S(omega -> 0) of the cold-plasma
///   dielectric tensor (Stix, "Waves in Plasmas", 1992, ch. 1-2). The shear Alfvén speed
///   with the displacement current kept is c/sqrt(eps_perp/eps0) = v_A/sqrt(1 + v_A^2/c^2)
///   (Boris 1970, NRL Memo Rep. 2167 — from memory).
/// - omega_ci = Z e B/m_i, omega_ce = e B/m_e, omega_ps = sqrt(n_s q_s^2/(eps0 m_s)),
///   d_s = c/omega_ps; lower hybrid 1/omega_LH^2 = 1/(omega_ci^2 + omega_pi^2)
///   + 1/(omega_ci omega_ce) (NRL Plasma Formulary, "Fundamental Plasma Parameters" and
///   "Approximate Magnitudes"; Stix 1992).
/// - c_s = sqrt(Z k T_e/m_i) (isothermal electrons, gamma = 1, cold ions), rho_s = c_s/omega_ci.
/// - lambda_De = sqrt(eps0 k T_e/(n_e e^2)).
/// - beta = 2 mu0 (n_e k T_e + n_i k T_i)/B^2, beta_e = 2 mu0 n_e k T_e/B^2.
/// - ln Lambda_ei, NRL Plasma Formulary, "Collisions and Transport" (n_e in cm^-3, T in eV):
///   23 - ln(n_e^1/2 Z T_e^-3/2) for T_e < 10 Z^2 eV, 24 - ln(n_e^1/2 T_e^-1) above.
///   The formulary's third, ion-dominated branch (T_e < T_i Z m_e/m_i) is not used; a note
///   is added when the input falls there.
/// - Braginskii (1965, Rev. Plasma Phys. 1, 205; coefficients from memory):
///   tau_e = 6 sqrt(2) pi^3/2 eps0^2 sqrt(m_e) (k T_e)^3/2 / (ln Lambda e^4 Z n_e)
///   (Z n_e = Z^2 n_i), nu_ei = 1/tau_e;
///   eta_perp = m_e/(n_e e^2 tau_e) (the NRL "transverse Spitzer resistivity"; valid for
///   omega_ce tau_e >> 1, a note is added otherwise); eta_par = alpha_0(Z) eta_perp with
///   Braginskii's Table 1: alpha_0 = 0.5129 (Z=1), 0.4408 (2), 0.3965 (3), 0.3752 (4),
///   0.2949 (Z -> infinity); for Z > 4 interpolated linearly in 1/Z between the last two.
///   Magnetic diffusivities are eta/mu0.
/// - Alfvén-wave regime (common practice): v_te/v_A < 1 is the inertial Alfvén regime,
///   v_te/v_A > 1 the kinetic Alfvén regime. Since v_te^2/v_A^2 = (beta_e/2) m_i/(Z m_e),
///   this is the usual comparison of beta_e with m_e/m_i.
///
/// Zero temperatures are allowed (a cold plasma): thermal speeds, sound speed, gyroradii,
/// Debye length and beta are then exactly 0, while the collisional quantities (ln Lambda,
/// tau_e, nu_ei, eta, diffusivities) need T_e > 0 and are left empty (std::nullopt) with
/// a note. They are also left empty when the NRL formula gives ln Lambda <= 1, where the
/// classical collision theory has no meaning.
#include <optional>
#include <string>
#include <vector>

#include "core/types.hpp"

namespace tw {

/// What determines the plasma parameters. It may come from command-line flags or from a
/// run file; derive_plasma_parameters() does not care which.
struct PlasmaInput {
  real n_e = 0;            ///< electron density [m^-3], > 0; ion density is n_e/Z
  real B = 0;              ///< magnetic field strength [T], > 0
  real ion_mass = 0;       ///< ion mass [kg], > 0 (atom minus Z electrons)
  int Z = 1;               ///< ion charge number, >= 1
  real Te_eV = 0;          ///< electron temperature [eV], >= 0
  real Ti_eV = 0;          ///< ion temperature [eV], >= 0
  std::optional<real> ln_lambda;  ///< Coulomb logarithm override, > 0; else NRL formula
};

/// Which dispersive correction dominates a shear Alfvén wave at large k_perp.
enum class AlfvenRegime { inertial, kinetic };

/// "inertial Alfvén" or "kinetic Alfvén".
[[nodiscard]] const char* alfven_regime_name(AlfvenRegime r);

/// Everything derived from a PlasmaInput, SI units (see the file comment for formulas).
struct PlasmaParameters {
  PlasmaInput input;          ///< the input these were derived from
  real n_i = 0;               ///< ion density n_e/Z [m^-3]
  real mass_density = 0;      ///< n_i m_i [kg/m^3]
  real mass_density_with_electrons = 0;  ///< n_i m_i + n_e m_e [kg/m^3]
  real electron_ion_mass_ratio = 0;      ///< m_e/m_i [1]

  real v_A = 0;               ///< Alfvén speed, ions only [m/s]
  real v_A_with_me = 0;       ///< Alfvén speed, rho incl. m_e [m/s]
  real v_A_over_c = 0;        ///< v_A/c, ions only [1]
  real c2_over_vA2 = 0;       ///< c^2/v_A^2, ions only (= omega_pi^2/omega_ci^2) [1]
  real c2_over_vA2_with_me = 0;  ///< c^2/v_A^2, rho incl. m_e [1]
  real eps_perp_over_eps0 = 0;   ///< 1 + c^2/v_A^2 (rho incl. m_e) [1]
  real v_A_displacement = 0;  ///< c/sqrt(eps_perp/eps0): shear Alfvén speed with displacement current [m/s]

  real omega_ci = 0, f_ci = 0;  ///< ion cyclotron frequency [rad/s], [Hz]
  real omega_ce = 0, f_ce = 0;  ///< electron cyclotron frequency [rad/s], [Hz]
  real omega_pi = 0, f_pi = 0;  ///< ion plasma frequency [rad/s], [Hz]
  real omega_pe = 0, f_pe = 0;  ///< electron plasma frequency [rad/s], [Hz]
  real omega_LH = 0, f_LH = 0;  ///< lower hybrid frequency [rad/s], [Hz]

  real d_i = 0;        ///< ion inertial length c/omega_pi [m]
  real d_e = 0;        ///< electron inertial length c/omega_pe [m]
  real c_s = 0;        ///< ion sound speed sqrt(Z k T_e/m_i) [m/s]
  real rho_s = 0;      ///< ion sound gyroradius c_s/omega_ci [m]
  real v_ti = 0;       ///< ion thermal speed sqrt(k T_i/m_i) [m/s]
  real v_te = 0;       ///< electron thermal speed sqrt(k T_e/m_e) [m/s]
  real rho_i = 0;      ///< ion gyroradius v_ti/omega_ci [m]
  real rho_e = 0;      ///< electron gyroradius v_te/omega_ce [m]
  real lambda_De = 0;  ///< electron Debye length [m]
  real beta = 0;       ///< total plasma beta [1]
  real beta_e = 0;     ///< electron beta [1]

  real v_te_over_v_A = 0;  ///< v_te / v_A (ions only) [1]
  AlfvenRegime regime = AlfvenRegime::inertial;  ///< inertial if v_te/v_A < 1, else kinetic

  // Collisional quantities: empty when T_e = 0 or ln Lambda <= 1 (see notes).
  std::optional<real> ln_lambda;       ///< electron-ion Coulomb logarithm [1]
  bool ln_lambda_given = false;        ///< true if ln_lambda came from the input override
  std::optional<real> tau_e;           ///< Braginskii electron collision time [s]
  std::optional<real> nu_ei;           ///< electron-ion collision frequency 1/tau_e [s^-1]
  std::optional<real> omega_ce_tau_e;  ///< electron magnetisation omega_ce tau_e [1]
  std::optional<real> eta_perp;        ///< transverse Spitzer resistivity [ohm m]
  std::optional<real> eta_par;         ///< parallel resistivity alpha_0(Z) eta_perp [ohm m]
  std::optional<real> diffusivity_perp;  ///< eta_perp/mu0 [m^2/s]
  std::optional<real> diffusivity_par;   ///< eta_par/mu0 [m^2/s]

  std::vector<std::string> notes;  ///< caveats about validity, in plain sentences
};

/// Throws InputError naming the offending field and value if `in` is outside the valid
/// ranges documented on PlasmaInput (also rejects non-finite numbers).
void validate_plasma_input(const PlasmaInput& in);

/// Derives every parameter; validates `in` first (InputError on bad input).
[[nodiscard]] PlasmaParameters derive_plasma_parameters(const PlasmaInput& in);

/// Braginskii's parallel-resistivity coefficient alpha_0(Z) (eta_par = alpha_0 eta_perp).
[[nodiscard]] real braginskii_alpha0(int Z);

/// Braginskii electron collision time tau_e [s] (formula in the file comment; SI constants,
/// physical electron mass); n_e [m^-3] > 0, Te_eV > 0, Z >= 1, ln_lambda > 0. The one place
/// the formula is written: derive_plasma_parameters() and the two-fluid friction use it.
[[nodiscard]] real braginskii_tau_e(real n_e, real Te_eV, int Z, real ln_lambda);

/// NRL Formulary electron-ion Coulomb logarithm (see the file comment); requires
/// n_e > 0 [m^-3] and T_e > 0 [eV].
[[nodiscard]] real coulomb_logarithm_nrl(real n_e, real Te_eV, int Z);

/// One named scalar: the single table that text output, JSON and HDF5 all print from.
struct PlasmaParameterRow {
  std::string key;          ///< JSON key / dataset name, SI-suffixed, e.g. "alfven_speed_m_per_s"
  real value = 0;           ///< value in `units`
  std::string units;        ///< CF-style unit string ("1" for dimensionless)
  std::string symbol;       ///< short symbol for text tables, e.g. "v_A"
  std::string description;  ///< one line
};

/// The input as rows (densities, field, mass, charge, temperatures, ln Lambda override).
[[nodiscard]] std::vector<PlasmaParameterRow> plasma_input_rows(const PlasmaInput& in);

/// Every derived quantity as rows, in a fixed order; empty optionals are skipped.
[[nodiscard]] std::vector<PlasmaParameterRow> plasma_parameter_rows(const PlasmaParameters& p);

}  // namespace tw
