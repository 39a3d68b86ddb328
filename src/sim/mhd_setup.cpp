#include "sim/mhd_setup.hpp"

#include <cmath>
#include <sstream>

#include "core/constants.hpp"
#include "core/plasma_params.hpp"
#include "models/eigen_modes.hpp"

namespace tw {

void declare_mhd_keys(io::Schema& schema) {
  io::Section& model = schema.root().section("model", "which equations are solved");
  model.choice("closure", {"adiabatic", "isothermal"},
               "energy closure: gamma-law (adiabatic) or fixed temperature (isothermal)")
      .def("adiabatic");
  model.real("gamma", "", "ratio of specific heats of the adiabatic closure").above(1.0).at_most(3.0).def(5.0 / 3.0);
  model.real("resistivity", "ohm m", "electrical resistivity eta (resistivity_model: constant)").non_negative().def(0.0);
  model.choice("resistivity_model", {"constant", "spitzer"},
               "resistivity: the constant model.resistivity, or the transverse Spitzer value "
               "from the background n_e and T_e at x_min (SI units only)")
      .def("constant");
  model.real("coulomb_logarithm", "", "spitzer: Coulomb logarithm ln Lambda (default: the NRL formula from n_e and T_e)")
      .above(1.0);
  model.real("viscosity", "m^2/s", "kinematic viscosity nu (constant)").non_negative().def(0.0);
  model.boolean("displacement_current",
                "keep the displacement current (Boris correction): shear Alfvén waves travel at "
                "v_A/sqrt(1 + v_A^2/c^2)")
      .def(false);
  model.real("light_speed", "m/s",
             "a reduced light speed c (default: the physical c of the unit system): of the displacement "
             "current (mhd, hall), of Maxwell's equations (two-fluid)")
      .positive();

  io::Section& init = schema.root().section("initial", "the state at t = 0");
  init.choice("mode", {"fast", "alfven", "slow", "entropy"}, "wave: which linear MHD wave").def("alfven");
  init.choice("direction", {"forward", "backward", "standing"},
              "wave, circular: travelling toward +x (forward) or -x (backward); wave: or a standing "
              "Alfvén wave (standing: the field pattern at rest, the sum of both directions)")
      .def("forward");
  init.real("amplitude", "", "wave: peak perturbation relative to the background scales "
                             "(density rho0, velocities c_f, fields sqrt(mu0 rho0) c_f, pressure rho0 c_f^2); "
                             "circular: |delta B_perp| / |B0|; langmuir: delta n_e / n_e)")
      .positive()
      .def(1e-4);
  init.real("wavelength", "m", "wave, circular, langmuir: wavelength (default: the tube length)").positive();
  init.choice("branch", {"right", "left", "linear"},
              "circular: sense of rotation in time about B0, right (electron sense: the whistler "
              "branch with Hall physics) or left (ion sense: the ion-cyclotron branch); two-fluid "
              "also linear (R and L of half the amplitude each: polarised along y)")
      .def("right");
}

CircularWave read_circular_wave(const io::RunFile& rf, const CaseSetup& c, const Mhd& m, const Mhd::State& W0) {
  if (rf.given("initial.mode")) rf.fail("initial.mode", "only the wave kind takes 'mode'");
  if (m.bx == 0 || W0[Mhd::BY] != 0 || W0[Mhd::BZ] != 0)
    rf.fail("plasma.field_angle_deg", "a circular wave is exact only along the background field: set "
                                      "plasma.field_angle_deg to 0 (or 180) and plasma.field > 0");
  CircularWave w;
  const real lambda = rf.has("initial.wavelength") ? rf.get_real("initial.wavelength") : c.grid.length;
  w.k = 2 * constants::pi / lambda;
  if (rf.get_string("initial.direction") == "standing")
    rf.fail("initial.direction", "a circular wave travels: choose forward or backward");
  w.direction = rf.get_string("initial.direction") == "forward" ? 1 : -1;
  if (rf.get_string("initial.branch") == "linear")
    rf.fail("initial.branch", "linear (R + L) is available for the two-fluid model only");
  w.right = rf.get_string("initial.branch") == "right";
  w.db = rf.get_real("initial.amplitude") * std::abs(m.bx);
  w.x0 = c.grid.x_min;
  return w;
}

std::array<real, 4> CircularWave::at(real x, real bx, real mu0, real rho_eff, real omega) const {
  // b = B_y + i B_z = db exp(i sigma d k (x - x0)) at t = 0, rotating in time as
  // exp(-i sigma omega t): sigma = +sign(B_x) is the ion (left) sense about B0.
  const real sgn = bx > 0 ? 1.0 : -1.0;
  const real sigma = right ? -sgn : sgn;
  const real th = sigma * direction * k * (x - x0);
  const real by = db * std::cos(th), bz = db * std::sin(th);
  // Ion momentum: rho_eff du/dt = B_x/mu0 db/dx, so u_perp = -d B_x k / (mu0 rho_eff omega) b.
  const real f = -direction * bx * k / (mu0 * rho_eff * omega);
  return {f * by, f * bz, by, bz};
}

void read_mhd_fluid(const io::RunFile& rf, const CaseSetup& c, Mhd& m) {
  m.mu0 = c.units.mu0;
  m.bx = c.plasma.b0()[0];
  m.particle_mass = c.plasma.particle_mass(c.units);
  m.closure = rf.get_string("model.closure") == "isothermal" ? Closure::isothermal : Closure::adiabatic;
  m.gamma = rf.get_real("model.gamma");
  if (m.closure == Closure::isothermal) {
    if (rf.given("model.gamma")) rf.fail("model.gamma", "gamma is not used by the isothermal closure");
    // a^2 = p / rho = (n_i T_i + n_e T_e) / (n_i m) = (T_i + Z T_e) / m at the reference point.
    const PlasmaPoint p = c.plasma.at(c.grid.x_min, c.units);
    const real a2 = (p.t_i + c.plasma.charge * p.t_e) / m.particle_mass;
    if (a2 <= 0)  // at the temperature given as 0, else at the closure that needs one
      rf.fail(rf.given("plasma.electron_temperature") ? "plasma.electron_temperature"
              : rf.given("plasma.ion_temperature")    ? "plasma.ion_temperature"
                                                      : "model.closure",
              "the isothermal closure needs a temperature: plasma.electron_temperature or "
              "plasma.ion_temperature must be > 0 (both default to 0)");
    m.sound_speed_iso = std::sqrt(a2);
  }
  m.resistivity = rf.get_real("model.resistivity");
  if (rf.get_string("model.resistivity_model") == "spitzer") {
    if (rf.given("model.resistivity"))
      rf.fail("model.resistivity", "give a constant resistivity or resistivity_model: spitzer, not both");
    if (c.units.normalized) rf.fail("model.resistivity_model", "the Spitzer resistivity needs SI units (units: si)");
    PlasmaInput in = c.plasma.formulary_input(c.grid.x_min, c.units);
    if (rf.has("model.coulomb_logarithm")) in.ln_lambda = rf.get_real("model.coulomb_logarithm");
    if (in.Te_eV <= 0) rf.fail("plasma.electron_temperature", "the Spitzer resistivity needs T_e > 0");
    if (in.B <= 0)
      rf.fail("plasma.field", "the transverse Spitzer resistivity is for a magnetised plasma: plasma.field must be > 0");
    const PlasmaParameters pp = derive_plasma_parameters(in);
    if (!pp.eta_perp) {
      std::string why;
      for (const auto& n : pp.notes) why += " " + n;
      rf.fail("model.resistivity_model", "the Spitzer resistivity is undefined for this plasma:" + why);
    }
    m.resistivity = *pp.eta_perp;
  } else if (rf.given("model.coulomb_logarithm")) {
    rf.fail("model.coulomb_logarithm", "only resistivity_model: spitzer uses a Coulomb logarithm");
  }
  m.viscosity = rf.get_real("model.viscosity");
  if (rf.get_bool("model.displacement_current")) {
    real light = c.units.c;
    if (rf.has("model.light_speed")) {
      const real reduced = rf.get_real("model.light_speed");
      if (reduced > light * (1 + 1e-12)) {
        std::ostringstream msg;
        msg << "the light speed may be reduced, not raised: it must not exceed c = " << light;
        rf.fail("model.light_speed", msg.str());
      }
      light = reduced;
    }
    m.eps_disp = 1 / (m.mu0 * light * light);
  } else if (rf.given("model.light_speed")) {
    rf.fail("model.light_speed", "only used with model.displacement_current: true");
  }
}

real displacement_light_speed(const Mhd& m) { return m.eps_disp > 0 ? 1 / std::sqrt(m.mu0 * m.eps_disp) : 0.0; }

std::vector<io::ParameterValue> displacement_parameters(const Mhd& m, const CaseSetup& c) {
  const real cb = displacement_light_speed(m);
  const std::string speed = c.units.unit("m/s");
  const PlasmaPoint p = c.plasma.at(c.grid.x_min, c.units);
  const real rho = p.n_e / c.plasma.charge * m.particle_mass;
  const real va = c.plasma.field / std::sqrt(m.mu0 * rho);
  const real va_corr = cb > 0 ? va / std::sqrt(1 + va * va / (cb * cb)) : va;
  return {
      {"displacement_light_speed", cb, speed,
       "light speed of the displacement current (Boris correction; reduced where below light_speed; 0 = neglected)"},
      {"light_speed_reduction", cb > 0 ? cb / c.units.c : 0.0, "1", "displacement_light_speed / light_speed (1 = physical, 0 = neglected)"},
      {"alfven_speed_displacement", va_corr, speed,
       "background Alfvén speed with the displacement current, v_A/sqrt(1 + v_A^2/c^2) at x_min (v_A without it)"},
  };
}

std::vector<std::string> displacement_warnings(const Mhd& m, const CaseSetup& c) {
  std::vector<std::string> w;
  const real cb = displacement_light_speed(m);
  if (cb > 0 && cb < c.units.c * (1 - 1e-12)) {
    const PlasmaPoint p = c.plasma.at(c.grid.x_min, c.units);
    const real rho = p.n_e / c.plasma.charge * m.particle_mass;
    const real va = c.plasma.field / std::sqrt(m.mu0 * rho);
    std::ostringstream msg;
    msg.precision(4);
    msg << "the light speed is reduced to c_B = " << cb << " m/s (c/c_B = " << c.units.c / cb
        << "): Alfvén and fast waves slow to v_A/sqrt(1 + v_A^2/c^2) = " << va / std::sqrt(1 + va * va / (cb * cb))
        << " m/s here, against " << va / std::sqrt(1 + va * va / (c.units.c * c.units.c))
        << " m/s with the physical light speed";
    w.push_back(msg.str());
  }
  return w;
}

Mhd ModelSetup<Mhd>::make(const io::RunFile& rf, const CaseSetup& c) {
  Mhd m;
  read_mhd_fluid(rf, c, m);
  return m;
}

Mhd::State ModelSetup<Mhd>::primitive(const Mhd& m, const PlasmaPoint& p, const CaseSetup& c) {
  const real z = c.plasma.charge;
  const real ni = p.n_e / z;
  Mhd::State W{};
  W[Mhd::RHO] = ni * m.particle_mass;
  W[Mhd::VX] = p.velocity[0];
  W[Mhd::VY] = p.velocity[1];
  W[Mhd::VZ] = p.velocity[2];
  W[Mhd::BY] = p.field[1];
  W[Mhd::BZ] = p.field[2];
  W[Mhd::P] = m.closure == Closure::adiabatic ? ni * p.t_i + p.n_e * p.t_e
                                              : W[Mhd::RHO] * m.sound_speed_iso * m.sound_speed_iso;
  return W;
}

int mhd_mode_index(const std::string& mode, bool forward) {
  if (mode == "entropy") return 3;
  const int offset = mode == "fast" ? 3 : mode == "alfven" ? 2 : 1;
  return forward ? 3 + offset : 3 - offset;
}

ModeSet primitive_modes_mhd(const Mhd& m, const Mhd::State& W) {
  const bool iso = m.closure == Closure::isothermal;
  const int n = iso ? 6 : 7;
  auto full = [&](const real* w) {
    Mhd::State s{};
    for (int k = 0; k < n; ++k) s[static_cast<std::size_t>(k)] = w[k];
    if (iso) s[Mhd::P] = s[Mhd::RHO] * m.sound_speed_iso * m.sound_speed_iso;
    return s;
  };
  auto flux = [&](const real* w, real* f) {
    const auto F = m.flux(full(w));
    for (int k = 0; k < n; ++k) f[k] = F[static_cast<std::size_t>(k)];
  };
  auto cons = [&](const real* w, real* u) {
    const auto U = m.cons_from_prim(full(w));
    for (int k = 0; k < n; ++k) u[k] = U[static_cast<std::size_t>(k)];
  };
  const real cf = m.fast_speed(W);
  const real bscale = std::sqrt(m.mu0 * W[Mhd::RHO]) * cf;
  std::vector<real> w0(W.begin(), W.begin() + n);
  std::vector<real> scale{W[Mhd::RHO], cf, cf, cf, bscale, bscale, W[Mhd::P]};
  scale.resize(static_cast<std::size_t>(n));
  ModeSet modes = primitive_modes(n, flux, cons, w0, scale);
  if (iso)  // restore the pressure slot: dp = a^2 drho
    for (auto& v : modes.vectors) v.push_back(v[Mhd::RHO] * m.sound_speed_iso * m.sound_speed_iso);
  return modes;
}

/// The adiabatic closure needs p > 0 in every cell. A cold plasma (both temperatures default
/// to 0) is the usual cause; name the keys that set the pressure there, rather than leaving
/// it to the generic "not physical" check.
void require_pressure(const io::RunFile& rf, const CaseSetup& c, const std::function<real(int)>& pressure) {
  const Grid& g = c.grid;
  for (int i = 0; i < g.n_cells; ++i) {
    if (pressure(i) > 0) continue;
    std::ostringstream msg;
    msg << "the adiabatic closure needs a pressure > 0, but it is " << pressure(i) << " at x = "
        << g.x_centre(i) << " m (cell " << i << "): ";
    if (rf.get_string("initial.kind") == "riemann") {
      const real x0 = rf.has("initial.position") ? rf.get_real("initial.position") : g.x_min + 0.5 * g.length;
      const std::string side = g.x_centre(i) < x0 ? "initial.left" : "initial.right";
      rf.fail(side, msg.str() + "give " + side + ".pressure or a temperature, or a background "
                                "temperature (plasma.electron_temperature, plasma.ion_temperature)");
    }
    rf.fail(rf.given("plasma.electron_temperature") ? "plasma.electron_temperature"
            : rf.given("plasma.ion_temperature")    ? "plasma.ion_temperature"
                                                    : "plasma",
            msg.str() + "plasma.electron_temperature or plasma.ion_temperature must be > 0 "
                        "(both default to 0)");
  }
}

bool ModelSetup<Mhd>::perturb(const Mhd& m, const io::RunFile& rf, const CaseSetup& c, Field<State>& W) {
  const std::string kind = rf.get_string("initial.kind");
  if (kind != "wave" && kind != "circular" && kind != "uniform" && kind != "riemann") return false;  // another model's
  if (kind != "circular" && rf.given("initial.branch"))
    rf.fail("initial.branch", "only the circular kind takes 'branch'");
  if (kind == "circular") {
    // Exact at any amplitude: the wave speed is the Alfvén speed along x (with the
    // displacement current, whose inertia eps B_x^2 acts on u_perp; see models/mhd.hpp).
    if (m.closure == Closure::adiabatic) require_pressure(rf, c, [&](int i) { return W[i][Mhd::P]; });
    const State W0 = W[0];
    const CircularWave wave = read_circular_wave(rf, c, m, W0);
    const real rho_eff = W0[Mhd::RHO] + m.eps_disp * m.bx * m.bx;
    const real omega = wave.k * m.alfven_speed_x(W0[Mhd::RHO]);
    for (int i = 0; i < c.grid.n_cells; ++i) {
      const auto d = wave.at(c.grid.x_centre(i), m.bx, m.mu0, rho_eff, omega);
      W[i][Mhd::VY] += d[0];
      W[i][Mhd::VZ] += d[1];
      W[i][Mhd::BY] += d[2];
      W[i][Mhd::BZ] += d[3];
    }
    return true;
  }
  if (kind != "wave") {
    for (const char* k : {"mode", "direction", "amplitude", "wavelength"})
      if (rf.given(std::string("initial.") + k))
        rf.fail(std::string("initial.") + k, "only the wave and circular kinds take '" + std::string(k) + "'");
  }
  if (m.closure == Closure::adiabatic) require_pressure(rf, c, [&](int i) { return W[i][Mhd::P]; });
  if (kind != "wave") return kind == "uniform" || kind == "riemann";
  const Grid& g = c.grid;
  if (!c.plasma.n_e.uniform || !c.plasma.t_e_eV.uniform || !c.plasma.t_i_eV.uniform)
    rf.fail("initial.kind", "the wave initial state needs a uniform background, but the plasma "
                            "has a profile along x");
  const std::string mode = rf.get_string("initial.mode");
  const bool forward = rf.get_string("initial.direction") == "forward";
  const bool standing = rf.get_string("initial.direction") == "standing";
  if (standing && mode != "alfven")
    rf.fail("initial.direction", "a standing wave is available for the Alfvén mode only");
  const real amp = rf.get_real("initial.amplitude");
  const real lambda = rf.has("initial.wavelength") ? rf.get_real("initial.wavelength") : g.length;
  const real k = 2 * constants::pi / lambda;
  // The background must be uniform: take it from the first cell.
  const State W0 = W[0];
  const real rho = W0[Mhd::RHO];
  const real cf = m.fast_speed(W0);
  if (mode == "entropy" && m.closure == Closure::isothermal)
    rf.fail("initial.mode", "the isothermal closure has no entropy wave");
  std::vector<real> r(7, 0.0);
  if (mode == "alfven") {
    // Analytic: the Alfvén wave moves v and B along the direction normal to both x and B0
    // in the y-z plane; dv = -+ sign(Bx) dB / sqrt(mu0 rho) for a forward (backward) wave.
    if (m.bx == 0)
      rf.fail(rf.given("initial.mode") ? "initial.mode" : "initial.kind",
              "no Alfvén wave travels along x when B_x = 0 (plasma.field = 0, or "
              "plasma.field_angle_deg = 90 or -90)");
    const real bt = std::hypot(W0[Mhd::BY], W0[Mhd::BZ]);
    const real ey = bt > 0 ? -W0[Mhd::BZ] / bt : 1.0, ez = bt > 0 ? W0[Mhd::BY] / bt : 0.0;
    const real sgn = m.bx > 0 ? 1.0 : -1.0;
    const real db = std::sqrt(m.mu0 * rho) * cf;  // field scale
    // The velocity is across B0, where the displacement current adds the inertia eps |B0|^2.
    const real rho_eff = rho + m.eps_disp * (m.bx * m.bx + bt * bt);
    const real dv = standing ? 0.0 : (forward ? -sgn : sgn) * db / std::sqrt(m.mu0 * rho_eff);
    r[Mhd::BY] = ey * db;
    r[Mhd::BZ] = ez * db;
    r[Mhd::VY] = ey * dv;
    r[Mhd::VZ] = ez * dv;
    real big = std::max({std::abs(r[Mhd::BY]), std::abs(r[Mhd::BZ])}) / db;
    big = std::max(big, std::max(std::abs(r[Mhd::VY]), std::abs(r[Mhd::VZ])) / cf);
    for (auto& q : r) q /= big;
  } else {
    ModeSet ms;
    try {
      ms = primitive_modes_mhd(m, W0);
    } catch (const EigenModeError& e) {  // found by fuzzing: an SI plasma of 1 particle per m^3
      rf.fail("initial.mode", std::string("the ") + mode + " wave cannot be computed at this background: " + e.what());
    }
    const int idx = mhd_mode_index(mode, forward);
    const real s = ms.speeds[static_cast<std::size_t>(idx)];
    const real gap_tol = 1e-6 * cf;
    for (int j = 0; j < 7; ++j)
      if (j != idx && std::abs(ms.speeds[static_cast<std::size_t>(j)] - s) < gap_tol) {
        std::ostringstream msg;
        msg << "the " << mode << " wave is degenerate with another wave at this background (speeds "
            << s << " and " << ms.speeds[static_cast<std::size_t>(j)]
            << " m/s, e.g. fast and Alfvén along B0); tilt the field (plasma.field_angle_deg) "
               "or choose another mode";
        rf.fail("initial.mode", msg.str());
      }
    r = ms.vectors[static_cast<std::size_t>(idx)];
    const real bscale = std::sqrt(m.mu0 * rho) * cf;
    const std::vector<real> scale{rho, cf, cf, cf, bscale, bscale, rho * cf * cf};
    real big = 0;
    int at = 0;
    for (int j = 0; j < 7; ++j) {
      const real q = std::abs(r[static_cast<std::size_t>(j)]) / scale[static_cast<std::size_t>(j)];
      if (q > big) {
        big = q;
        at = j;
      }
    }
    // Fix the sign so the largest relative component is positive.
    const real sgn = r[static_cast<std::size_t>(at)] > 0 ? 1.0 : -1.0;
    for (auto& q : r) q *= sgn / big;
  }
  for (int i = 0; i < g.n_cells; ++i) {
    const real ph = std::sin(k * (g.x_centre(i) - g.x_min));
    for (int j = 0; j < 7; ++j) W[i][static_cast<std::size_t>(j)] += amp * ph * r[static_cast<std::size_t>(j)];
  }
  return true;
}

std::vector<io::ParameterValue> ModelSetup<Mhd>::parameters(const Mhd& m, const CaseSetup& c) {
  auto unit = [&](const char* si) { return c.units.normalized ? std::string("1") : std::string(si); };
  std::vector<io::ParameterValue> p{
      {"gamma", m.gamma, "1", "ratio of specific heats (adiabatic closure)"},
      {"isothermal_sound_speed", m.sound_speed_iso, unit("m/s"), "isothermal sound speed (0 if adiabatic)"},
      {"field_x", m.bx, unit("T"), "constant B_x"},
      {"mu0", m.mu0, unit("H/m"), "magnetic permeability of the unit system"},
      {"particle_mass", m.particle_mass, unit("kg"), "mass density per ion (ion and its electrons)"},
      {"resistivity", m.resistivity, unit("ohm m"), "electrical resistivity"},
      {"viscosity", m.viscosity, unit("m^2/s"), "kinematic viscosity"},
  };
  for (auto& d : displacement_parameters(m, c)) p.push_back(d);
  return p;
}

FluxKind ModelSetup<Mhd>::flux(const io::RunFile& rf, const Mhd& m) {
  if (m.eps_disp > 0 && rf.get_string("numerics.flux") == "hlld")
    rf.fail("numerics.flux", "hlld does not include the displacement current; use hll or rusanov");
  return resolve_flux(rf, m.closure == Closure::adiabatic && m.eps_disp == 0, false);
}

std::vector<std::string> ModelSetup<Mhd>::check_warnings(const Mhd& m, const CaseSetup& c) {
  return displacement_warnings(m, c);
}

}  // namespace tw
