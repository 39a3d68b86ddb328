#include "sim/plasma.hpp"

#include <cmath>
#include <sstream>

#include "core/constants.hpp"

namespace tw {

Profile Profile::constant(real v) {
  std::ostringstream d;
  d << v;
  return {[v](real) { return v; }, d.str()};
}

Vec<3> PlasmaSpec::b0() const {
  const real a = field_angle_deg * constants::pi / 180;
  Vec<3> b{field * std::cos(a), 0.0, field * std::sin(a)};
  // Exact zeros for the usual angles, so that "parallel" means B_z == 0 exactly.
  if (field_angle_deg == 0 || std::abs(field_angle_deg) == 180) b[2] = 0;
  if (std::abs(field_angle_deg) == 90) b[0] = 0;
  return b;
}

PlasmaPoint PlasmaSpec::at(real x, const UnitSystem& units) const {
  PlasmaPoint p;
  p.n_e = n_e(x);
  p.t_e = t_e_eV(x) * units.energy_per_eV;
  p.t_i = t_i_eV(x) * units.energy_per_eV;
  p.velocity = flow;
  p.field = b0();
  return p;
}

PlasmaInput PlasmaSpec::formulary_input(real x, const UnitSystem& units) const {
  const PlasmaPoint p = at(x, units);
  PlasmaInput in;
  in.n_e = p.n_e;
  in.B = field;
  in.ion_mass = ion_mass;
  in.Z = charge;
  in.Te_eV = p.t_e / units.energy_per_eV;
  in.Ti_eV = p.t_i / units.energy_per_eV;
  return in;
}

}  // namespace tw
