#include "sim/modes.hpp"

#include <cmath>
#include <cstdio>
#include <sstream>

#include "core/constants.hpp"
#include "sim/linear_setup.hpp"
#include "sim/run.hpp"

namespace tw {

namespace {

std::string exact(real v) {
  char b[40];
  std::snprintf(b, sizeof b, "%.17g", v);
  return b;
}

}  // namespace

io::RunFile plasma_run_file(const PlasmaInput& in, const std::string& ion, const std::string& equations,
                            real field_angle_deg, const std::vector<std::string>& overrides) {
  std::ostringstream y;
  y << "title: dispersion of a uniform plasma\n"
    << "model:\n  equations: " << equations << "\n"
    << "plasma:\n";
  if (!ion.empty()) {
    y << "  ion: " << ion << "\n";
  } else {
    // The run file's ion_mass_amu is the atom's: the ion mass plus its Z electrons.
    y << "  ion_mass_amu: " << exact((in.ion_mass + in.Z * constants::m_e) / constants::u) << "\n";
  }
  y << "  ion_charge: " << in.Z << "\n"
    << "  density: " << exact(in.n_e) << "\n"
    << "  electron_temperature: " << exact(in.Te_eV) << "\n"
    << "  ion_temperature: " << exact(in.Ti_eV) << "\n"
    << "  field: " << exact(in.B) << "\n"
    << "  field_angle_deg: " << exact(field_angle_deg) << "\n";
  y << "grid: {length: 1, cells: 4}\n"
    << "time: {end: 1}\n"
    << "boundaries: {left: {kind: periodic}, right: {kind: periodic}}\n";
  std::vector<std::string> o;
  if (in.ln_lambda) o.push_back("model.coulomb_logarithm=" + exact(*in.ln_lambda));  // models with collisions
  o.insert(o.end(), overrides.begin(), overrides.end());
  return io::RunFile::parse(y.str(), "plasma flags", run_schema(), o);
}

ModesSetup modes_setup(const io::RunFile& rf, std::optional<real> x, std::optional<real> k_perp) {
  const CaseSetup c = read_case(rf);
  ModesSetup s;
  s.equations = rf.get_string("model.equations");
  s.x = x.value_or(c.grid.x_min);
  s.field_angle_deg = c.plasma.field_angle_deg;
  s.normalized = c.units.normalized;
  real kp = 0;
  if (k_perp) kp = *k_perp;
  else if (rf.get_string("model.form") == "linearized") kp = rf.get_real("model.perpendicular_wavenumber");
  s.input = dispersion_input(rf, c, s.x, kp);
  s.variables = linear_variables(s.equations);
  if (!c.units.normalized && c.plasma.field > 0) {
    PlasmaInput in = c.plasma.formulary_input(s.x, c.units);
    if (rf.has("model.coulomb_logarithm")) in.ln_lambda = rf.get_real("model.coulomb_logarithm");
    s.plasma_input = in;
    s.plasma = derive_plasma_parameters(in);
  }
  return s;
}

}  // namespace tw
