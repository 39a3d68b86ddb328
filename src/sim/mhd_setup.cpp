#include "sim/mhd_setup.hpp"

#include <cmath>
#include <sstream>

#include "core/constants.hpp"
#include "models/eigen_modes.hpp"

namespace tw {

void declare_mhd_keys(io::Schema& schema) {
  io::Section& model = schema.root().section("model", "which equations are solved");
  model.choice("closure", {"adiabatic", "isothermal"},
               "energy closure: gamma-law (adiabatic) or fixed temperature (isothermal)")
      .def("adiabatic");
  model.real("gamma", "", "ratio of specific heats of the adiabatic closure").above(1.0).at_most(3.0).def(5.0 / 3.0);
  model.real("resistivity", "ohm m", "electrical resistivity eta (constant)").non_negative().def(0.0);
  model.real("viscosity", "m^2/s", "kinematic viscosity nu (constant)").non_negative().def(0.0);

  io::Section& init = schema.root().section("initial", "the state at t = 0");
  init.choice("mode", {"fast", "alfven", "slow", "entropy"}, "wave: which linear MHD wave").def("alfven");
  init.choice("direction", {"forward", "backward"}, "wave: travelling toward +x (forward) or -x").def("forward");
  init.real("amplitude", "", "wave: peak perturbation relative to the background scales "
                             "(density rho0, velocities c_f, fields sqrt(mu0 rho0) c_f, pressure rho0 c_f^2)")
      .positive()
      .def(1e-4);
  init.real("wavelength", "m", "wave: wavelength (default: the tube length)").positive();
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
  m.viscosity = rf.get_real("model.viscosity");
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

namespace {

/// The adiabatic closure needs p > 0 in every cell. A cold plasma (both temperatures default
/// to 0) is the usual cause; name the keys that set the pressure there, rather than leaving
/// it to the generic "not physical" check.
void require_pressure(const io::RunFile& rf, const CaseSetup& c, const Field<Mhd::State>& W) {
  const Grid& g = c.grid;
  for (int i = 0; i < g.n_cells; ++i) {
    if (W[i][Mhd::P] > 0) continue;
    std::ostringstream msg;
    msg << "the adiabatic closure needs a pressure > 0, but it is " << W[i][Mhd::P] << " at x = "
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

}  // namespace

bool ModelSetup<Mhd>::perturb(const Mhd& m, const io::RunFile& rf, const CaseSetup& c, Field<State>& W) {
  const std::string kind = rf.get_string("initial.kind");
  if (kind != "wave") {
    for (const char* k : {"mode", "direction", "amplitude", "wavelength"})
      if (rf.given(std::string("initial.") + k))
        rf.fail(std::string("initial.") + k, "only the wave kind takes '" + std::string(k) + "'");
  }
  if (m.closure == Closure::adiabatic) require_pressure(rf, c, W);
  if (kind != "wave") return kind == "uniform" || kind == "riemann";
  const Grid& g = c.grid;
  if (!c.plasma.n_e.uniform || !c.plasma.t_e_eV.uniform || !c.plasma.t_i_eV.uniform)
    rf.fail("initial.kind", "the wave initial state needs a uniform background, but the plasma "
                            "has a profile along x");
  const std::string mode = rf.get_string("initial.mode");
  const bool forward = rf.get_string("initial.direction") == "forward";
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
    const real dv = (forward ? -sgn : sgn) * db / std::sqrt(m.mu0 * rho);
    r[Mhd::BY] = ey * db;
    r[Mhd::BZ] = ez * db;
    r[Mhd::VY] = ey * dv;
    r[Mhd::VZ] = ez * dv;
    real big = std::max({std::abs(r[Mhd::BY]), std::abs(r[Mhd::BZ])}) / db;
    big = std::max(big, std::max(std::abs(r[Mhd::VY]), std::abs(r[Mhd::VZ])) / cf);
    for (auto& q : r) q /= big;
  } else {
    const ModeSet ms = primitive_modes_mhd(m, W0);
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
  return p;
}

FluxKind ModelSetup<Mhd>::flux(const io::RunFile& rf, const Mhd& m) {
  return resolve_flux(rf, m.closure == Closure::adiabatic, false);
}

}  // namespace tw
