#include "sim/case.hpp"

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <limits>
#include <sstream>

#include "core/species.hpp"
#include "sim/drives.hpp"
#include "sim/profiles.hpp"

namespace tw {

namespace {

int index_of(const std::vector<std::string>& names, const std::string& v) {
  const auto it = std::find(names.begin(), names.end(), v);
  TW_CHECK(it != names.end(), "choice '" + v + "' not in list");
  return static_cast<int>(it - names.begin());
}

void declare_end(io::Section& s) {
  s.choice("kind", {"periodic", "zero-gradient", "conducting", "driven", "open"},
           "what the end does: a ring, a free outflow, a line-tied conducting plate, a drive "
           "(moving plate or prescribed field), or open (non-reflecting, with an optional absorbing layer)")
      .require();
  declare_end_drive_keys(s);
}

EndSpec read_end(const io::RunFile& rf, const std::string& key) {
  EndSpec e;
  e.key = key;
  e.kind = rf.get_string(key + ".kind");
  check_end_keys(rf, e);
  return e;
}

}  // namespace

void declare_case_keys(io::Schema& schema) {
  io::Section& root = schema.root();
  root.string("title", "one-line title of the run, stored in the output").def("");
  root.string("description", "free text describing the run").def("");
  root.choice("units", {"si", "normalized"},
              "unit system of every value in the file: SI (temperatures in eV), or normalized "
              "code units (mu0 = 1, ion mass = 1, k_B = 1) for textbook test problems")
      .def("si");

  io::Section& norm = root.section("normalized", "settings of units: normalized");
  norm.real("ion_inertial_length", "", "ion inertial length at unit mass density (sets the charge unit)")
      .positive()
      .def(1.0);
  norm.real("light_speed", "", "speed of light in code units").positive().def(1e6);
  norm.real("mass_ratio", "", "ion to electron mass ratio m_i/m_e")
      .above(1.0)
      .def(1836.15267343);

  io::Section& plasma = root.section("plasma", "the background plasma");
  plasma.string("ion", "ion species by element symbol or name (H, D, T, He, Li, N, O, Ne, Ar, Kr, Xe, ...)")
      .def("H");
  plasma.real("ion_mass_amu", "u", "ion atomic mass instead of a species name (the ion mass is this minus Z electron masses)")
      .positive();
  plasma.integer("ion_charge", "ion charge number Z").at_least(1).at_most(100).def(1);
  declare_profile_key(plasma, "density", "m^-3", "electron number density n_e (ion density is n_e/Z)")
      .positive()
      .require();
  declare_profile_key(plasma, "electron_temperature", "eV", "electron temperature T_e").non_negative().def(0.0);
  declare_profile_key(plasma, "ion_temperature", "eV", "ion temperature T_i").non_negative().def(0.0);
  plasma.real("field", "T", "background magnetic field strength |B0|").non_negative().require();
  plasma.real("field_angle_deg", "deg", "angle of B0 from the tube axis x, in the x-z plane")
      .at_least(-180)
      .at_most(180)
      .def(0.0);
  plasma.real_list("flow", "m/s", "background flow velocity (x, y, z)").length(3).def_list({0, 0, 0});

  io::Section& grid = root.section("grid", "the cells along the tube");
  grid.real("x_min", "m", "position of the left end").def(0.0);
  grid.real("length", "m", "length of the tube").positive().require();
  grid.integer("cells", "number of cells").at_least(4).at_most(100000000).require();

  io::Section& time = root.section("time", "how long to run");
  time.real("end", "s", "simulated time at which the run stops").positive().require();
  time.integer("max_steps", "stop with an error after this many steps").at_least(1).def(100000000L);

  io::Section& num = root.section("numerics", "discretisation");
  num.choice("reconstruction", reconstruction_names(),
             "face values: first-order, piecewise linear (plm) or fifth-order WENO-Z (weno5)")
      .def("plm");
  num.choice("limiter", limiter_names(), "slope limiter of plm ('none' = unlimited central slope, smooth problems only)")
      .def("mc");
  std::vector<std::string> fluxes = flux_names();
  fluxes.insert(fluxes.begin(), "auto");
  num.choice("flux", fluxes,
             "numerical flux; auto = hlld for adiabatic MHD, upwind for linearized models, hll otherwise")
      .def("auto");
  num.choice("integrator", integrator_names(), "strong-stability-preserving Runge-Kutta scheme")
      .def("ssp-rk2");
  num.real("cfl", "", "Courant number: fraction of the largest stable step (each limit is scaled by it)")
      .above(0)
      .at_most(1)
      .def(0.8);
  num.real("max_dt", "s", "upper bound on the time step").positive();

  io::Section& ends = root.section("boundaries", "what happens at the two ends of the tube");
  declare_end(ends.section("left", "the end at x = x_min"));
  declare_end(ends.section("right", "the end at x = x_min + length"));

  io::Section& out = root.section("output", "what is written to the HDF5 file");
  out.string("file", "output file (default: the run file's name with .h5, in the working directory)").def("");
  out.real("snapshot_interval", "s", "time between snapshots of all fields (default: end/50)").positive();
  out.real("probe_interval", "s", "time between probe samples (default: end/500); steps are shortened to land on sample times").positive();
  out.real("history_interval", "s", "time between records of totals (default: end/1000)").positive();
  out.real_list("probes", "m", "positions of the probes (time series of every field)").def_list({});
}

CaseSetup read_case(const io::RunFile& rf, const std::string& output_override) {
  CaseSetup c;
  c.title = rf.get_string("title");

  // Units.
  if (rf.get_string("units") == "normalized") {
    c.units = UnitSystem::normalized_units(rf.get_real("normalized.ion_inertial_length"),
                                           rf.get_real("normalized.light_speed"),
                                           rf.get_real("normalized.mass_ratio"));
  } else {
    for (const char* k : {"ion_inertial_length", "light_speed", "mass_ratio"})
      if (rf.given(std::string("normalized.") + k))
        rf.fail(std::string("normalized.") + k, "only used with 'units: normalized'");
  }

  // Grid (profiles are checked on its cells).
  c.grid = Grid(static_cast<int>(rf.get_int("grid.cells")), rf.get_real("grid.x_min"),
                rf.get_real("grid.length"));

  // Plasma.
  PlasmaSpec& p = c.plasma;
  p.n_e = read_profile(rf, "plasma.density", c.grid, "n", ProfileSign::positive);
  p.t_e_eV = read_profile(rf, "plasma.electron_temperature", c.grid, "T_e", ProfileSign::non_negative);
  p.t_i_eV = read_profile(rf, "plasma.ion_temperature", c.grid, "T_i", ProfileSign::non_negative);
  p.charge = static_cast<int>(rf.get_int("plasma.ion_charge"));
  if (c.units.normalized) {
    if (rf.given("plasma.ion") || rf.given("plasma.ion_mass_amu"))
      rf.fail(rf.given("plasma.ion") ? "plasma.ion" : "plasma.ion_mass_amu",
              "in normalized units the ion mass is 1; do not name a species or mass");
    p.ion_name = "normalized";
    p.ion_mass = 1;
  } else if (rf.given("plasma.ion_mass_amu")) {
    if (rf.given("plasma.ion"))
      rf.fail("plasma.ion_mass_amu", "give either 'ion' or 'ion_mass_amu', not both");
    p.ion_name = "custom";
    p.ion_mass = rf.get_real("plasma.ion_mass_amu") * constants::u - p.charge * constants::m_e;
    if (p.ion_mass <= 0) rf.fail("plasma.ion_mass_amu", "the ion mass minus its electrons is not positive");
  } else {
    const std::string name = rf.get_string("plasma.ion");
    const IonSpecies* sp = find_species(name);
    if (sp == nullptr)
      rf.fail("plasma.ion", "unknown ion species '" + name + "'; known: " + known_species_list());
    p.ion_name = std::string(sp->symbol);
    p.ion_mass = sp->atomic_mass_u * constants::u - p.charge * constants::m_e;
  }
  p.field = rf.get_real("plasma.field");
  p.field_angle_deg = rf.get_real("plasma.field_angle_deg");
  const auto flow = rf.get_reals("plasma.flow");
  p.flow = {flow[0], flow[1], flow[2]};

  // Time.
  c.t_end = rf.get_real("time.end");
  c.max_steps = rf.get_int("time.max_steps");

  // Numerics (the flux is resolved by the model setup, which knows what it offers).
  c.scheme.reconstruction = static_cast<Reconstruction>(
      index_of(reconstruction_names(), rf.get_string("numerics.reconstruction")));
  c.scheme.limiter = static_cast<Limiter>(index_of(limiter_names(), rf.get_string("numerics.limiter")));
  if (c.scheme.reconstruction != Reconstruction::plm && rf.given("numerics.limiter"))
    rf.fail("numerics.limiter", "a limiter applies to plm reconstruction only");
  c.time.integrator = static_cast<IntegratorKind>(
      index_of(integrator_names(), rf.get_string("numerics.integrator")));
  c.time.cfl = rf.get_real("numerics.cfl");
  if (rf.has("numerics.max_dt")) c.time.dt_max = rf.get_real("numerics.max_dt");

  // Ends.
  c.left = read_end(rf, "boundaries.left");
  c.right = read_end(rf, "boundaries.right");
  if ((c.left.kind == "periodic") != (c.right.kind == "periodic"))
    rf.fail(c.left.kind == "periodic" ? "boundaries.right.kind" : "boundaries.left.kind",
            "periodic ends come in pairs: set both ends to periodic");

  // Output.
  OutputSpec& o = c.output;
  if (!output_override.empty()) {
    o.file = output_override;
  } else if (!rf.get_string("output.file").empty()) {
    o.file = rf.get_string("output.file");
  } else {
    o.file = std::filesystem::path(rf.source_name()).stem().string() + ".h5";
  }
  o.snapshot_interval = rf.has("output.snapshot_interval") ? rf.get_real("output.snapshot_interval") : c.t_end / 50;
  o.probe_interval = rf.has("output.probe_interval") ? rf.get_real("output.probe_interval") : c.t_end / 500;
  o.history_interval = rf.has("output.history_interval") ? rf.get_real("output.history_interval") : c.t_end / 1000;
  o.probes = rf.get_reals("output.probes");
  for (std::size_t k = 0; k < o.probes.size(); ++k) {
    if (o.probes[k] < c.grid.x_min || o.probes[k] > c.grid.x_max()) {
      std::ostringstream msg;
      msg << "probe " << k << " at x = " << o.probes[k] << " m is outside the tube ["
          << c.grid.x_min << ", " << c.grid.x_max() << "] m";
      rf.fail("output.probes[" + std::to_string(k) + "]", msg.str());
    }
  }
  return c;
}

FluxKind resolve_flux(const io::RunFile& rf, bool hlld_available, bool upwind_available) {
  const std::string f = rf.get_string("numerics.flux");
  if (f == "auto") return upwind_available ? FluxKind::upwind : hlld_available ? FluxKind::hlld : FluxKind::hll;
  const auto k = static_cast<FluxKind>(index_of(flux_names(), f));
  if (k == FluxKind::hlld && !hlld_available)
    rf.fail("numerics.flux", "hlld is available for adiabatic MHD only; use hll or rusanov");
  if (k == FluxKind::upwind && !upwind_available)
    rf.fail("numerics.flux", "upwind is available for linearized models only; use hll or rusanov");
  return k;
}

}  // namespace tw
