#pragma once
/// The unit system of a run: the one place where the constants that enter the equations
/// are chosen.
///
/// - SI (the default): CODATA 2018 values; temperatures typed in eV are converted to joules
///   per particle with the elementary charge.
/// - normalized: the textbook system of many published test problems: mu0 = 1 (so the
///   magnetic pressure is B^2/2), k_B = 1 (temperatures are energies per particle, typed
///   directly), the ion mass is 1 (so number density equals mass density), and the charge
///   unit is chosen so that the ion inertial length at unit density is `ion_inertial_length`
///   (d_i = m_i / (e sqrt(mu0 rho)), hence e = 1 / d_i). The light speed is `light_speed`
///   and eps0 = 1 / (mu0 c^2). Lengths and times are in code units.
#include <string>

#include "core/constants.hpp"
#include "core/types.hpp"

namespace tw {

struct UnitSystem {
  bool normalized = false;
  real mu0 = constants::mu0;        ///< magnetic permeability
  real eps0 = constants::eps0;      ///< electric permittivity
  real c = constants::c;            ///< light speed
  real e = constants::e;            ///< elementary charge
  real m_e = constants::m_e;        ///< electron mass
  real mass_unit = constants::u;    ///< what an ion mass of "1" means (1 u in SI)
  real energy_per_eV = constants::eV;  ///< joules per eV in SI; 1 in normalized units

  static UnitSystem si() { return {}; }

  /// Normalized units; `mass_ratio` = m_i/m_e with m_i = 1.
  static UnitSystem normalized_units(real ion_inertial_length, real light_speed, real mass_ratio) {
    UnitSystem u;
    u.normalized = true;
    u.mu0 = 1;
    u.c = light_speed;
    u.eps0 = 1 / (light_speed * light_speed);
    u.e = 1 / ion_inertial_length;
    u.m_e = 1 / mass_ratio;
    u.mass_unit = 1;
    u.energy_per_eV = 1;
    return u;
  }

  [[nodiscard]] std::string name() const { return normalized ? "normalized" : "si"; }
  /// Unit string for output attributes: the SI unit, or "1" (code units) when normalized.
  [[nodiscard]] std::string unit(const std::string& si_unit) const {
    return normalized ? std::string("1") : si_unit;
  }
};

}  // namespace tw
