#pragma once
/// The background plasma of a run: ion species, densities, temperatures, field and flow,
/// in the units of the run (SI, or normalized). Every model builds its primitive state
/// from a PlasmaPoint, so the run-file keys mean the same thing for every model.
#include <functional>
#include <string>

#include "core/plasma_params.hpp"
#include "core/types.hpp"
#include "core/units.hpp"

namespace tw {

/// A function of position along the tube, with a one-line description.
struct Profile {
  std::function<real(real)> f;
  std::string description;
  bool uniform = true;  ///< the same value everywhere (some initial states need that)
  real operator()(real x) const { return f(x); }
  static Profile constant(real v);
};

/// The plasma at one point.
struct PlasmaPoint {
  real n_e = 0;             ///< electron number density [m^-3]
  real t_e = 0, t_i = 0;    ///< temperatures as energies per particle [J] (k_B T)
  Vec<3> velocity{};        ///< flow velocity [m/s]
  Vec<3> field{};           ///< magnetic field [T]; field[0] is the constant B_x
};

/// The resolved `plasma` section.
struct PlasmaSpec {
  std::string ion_name;     ///< species symbol or "custom"
  real ion_mass = 0;        ///< ion mass [kg] (1 in normalized units)
  int charge = 1;           ///< ion charge number Z
  Profile n_e;              ///< electron density [m^-3]
  Profile t_e_eV, t_i_eV;   ///< temperatures [eV] (code energy units when normalized)
  real field = 0;           ///< |B0| [T]
  real field_angle_deg = 0; ///< angle of B0 from the x axis, in the x-z plane
  Vec<3> flow{};            ///< background flow [m/s]

  [[nodiscard]] Vec<3> b0() const;
  /// The background at x, temperatures converted to energies with `units`.
  [[nodiscard]] PlasmaPoint at(real x, const UnitSystem& units) const;
  /// The input of the formulary (derive_plasma_parameters) for the background at x: n_e,
  /// temperatures in eV, |B0|, ion mass and charge; the Coulomb logarithm is left to the
  /// caller. SI runs only.
  [[nodiscard]] PlasmaInput formulary_input(real x, const UnitSystem& units) const;
  /// Mass per ion including its Z electrons [kg]: mass density = n_i * this.
  [[nodiscard]] real particle_mass(const UnitSystem& units) const { return ion_mass + charge * units.m_e; }
};

}  // namespace tw
