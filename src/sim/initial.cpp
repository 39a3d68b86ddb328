#include "sim/initial.hpp"

#include <cmath>
#include <sstream>

namespace tw {

namespace {

void declare_state(io::Section& s) {
  s.real("density", "m^-3", "electron number density (instead of mass_density)").positive();
  s.real("mass_density", "kg m^-3", "mass density of ions and electrons (instead of density)").positive();
  s.real("pressure", "Pa", "total thermal pressure; the background's T_e/T_i ratio is kept").positive();
  s.real("electron_temperature", "eV", "electron temperature").non_negative();
  s.real("ion_temperature", "eV", "ion temperature").non_negative();
  s.real_list("velocity", "m/s", "flow velocity (x, y, z)").length(3);
  s.real("field_y", "T", "transverse magnetic field B_y");
  s.real("field_z", "T", "transverse magnetic field B_z");
}

/// Apply a riemann side's overrides to the background point.
PlasmaPoint side_state(const io::RunFile& rf, const std::string& key, PlasmaPoint p,
                       const CaseSetup& c) {
  const real z = c.plasma.charge;
  const real mp = c.plasma.particle_mass(c.units);
  if (rf.given(key + ".density") && rf.given(key + ".mass_density"))
    rf.fail(key + ".mass_density", "give either density or mass_density, not both");
  if (rf.given(key + ".density")) p.n_e = rf.get_real(key + ".density");
  if (rf.given(key + ".mass_density")) p.n_e = z * rf.get_real(key + ".mass_density") / mp;
  if (rf.given(key + ".electron_temperature"))
    p.t_e = rf.get_real(key + ".electron_temperature") * c.units.energy_per_eV;
  if (rf.given(key + ".ion_temperature"))
    p.t_i = rf.get_real(key + ".ion_temperature") * c.units.energy_per_eV;
  if (rf.given(key + ".pressure")) {
    if (rf.given(key + ".electron_temperature") || rf.given(key + ".ion_temperature"))
      rf.fail(key + ".pressure", "give either pressure or temperatures, not both");
    // p = n_i T_i + n_e T_e with n_i = n_e / Z; keep the ratio T_e : T_i of the point.
    const real pressure = rf.get_real(key + ".pressure");
    const real ni = p.n_e / z;
    real fe = 0.5, fi = 0.5;  // equal temperatures when the background is cold
    if (p.t_e + p.t_i > 0) {
      fe = p.t_e / (p.t_e + p.t_i);
      fi = p.t_i / (p.t_e + p.t_i);
    }
    const real t = pressure / (ni * fi + p.n_e * fe);
    p.t_e = fe * t;
    p.t_i = fi * t;
  }
  if (rf.given(key + ".velocity")) {
    const auto v = rf.get_reals(key + ".velocity");
    p.velocity = {v[0], v[1], v[2]};
  }
  if (rf.given(key + ".field_y")) p.field[1] = rf.get_real(key + ".field_y");
  if (rf.given(key + ".field_z")) p.field[2] = rf.get_real(key + ".field_z");
  return p;
}

}  // namespace

void declare_initial_keys(io::Schema& schema, const std::vector<std::string>& model_kinds) {
  io::Section& init = schema.root().section("initial", "the state at t = 0");
  std::vector<std::string> kinds{"uniform", "riemann"};
  kinds.insert(kinds.end(), model_kinds.begin(), model_kinds.end());
  init.choice("kind", kinds,
              "uniform background, a riemann problem (two states), or a model's wave "
              "(see the model's keys)")
      .def("uniform");
  init.real("position", "m", "riemann: where the two states meet (default: the middle)");
  declare_state(init.section("left", "riemann: the state left of position"));
  declare_state(init.section("right", "riemann: the state right of position"));
}

std::vector<PlasmaPoint> initial_plasma(const io::RunFile& rf, const CaseSetup& c) {
  const Grid& g = c.grid;
  std::vector<PlasmaPoint> pts(static_cast<std::size_t>(g.n_cells));
  for (int i = 0; i < g.n_cells; ++i) pts[static_cast<std::size_t>(i)] = c.plasma.at(g.x_centre(i), c.units);
  const std::string kind = rf.get_string("initial.kind");
  if (kind != "riemann") {
    for (const char* k : {"position", "left", "right"})
      if (rf.given(std::string("initial.") + k))
        rf.fail(std::string("initial.") + k, "only the riemann kind takes '" + std::string(k) + "'");
    return pts;
  }
  const real x0 = rf.has("initial.position") ? rf.get_real("initial.position") : g.x_min + 0.5 * g.length;
  if (x0 <= g.x_min || x0 >= g.x_max()) {
    std::ostringstream msg;
    msg << "must lie inside the tube (" << g.x_min << ", " << g.x_max() << ") m (got " << x0 << ")";
    rf.fail("initial.position", msg.str());
  }
  for (int i = 0; i < g.n_cells; ++i) {
    const bool left = g.x_centre(i) < x0;
    auto& p = pts[static_cast<std::size_t>(i)];
    p = side_state(rf, left ? "initial.left" : "initial.right", p, c);
  }
  return pts;
}

}  // namespace tw
