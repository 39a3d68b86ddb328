#include "sim/twofluid_setup.hpp"

#include <cmath>
#include <complex>
#include <sstream>

#include "core/constants.hpp"

namespace tw {

namespace {

constexpr const char* kTwoFluidOnlyKeys[] = {"model.electron_gamma", "model.mass_ratio", "model.electron_ion_friction",
                                             "model.neutral_density", "model.ion_neutral_cross_section"};

std::string num(real v) {
  std::ostringstream s;
  s.precision(6);
  s << v;
  return s.str();
}

/// The background as a primitive state must be uniform for the wave kinds.
void require_uniform(const io::RunFile& rf, const Grid& g, const Field<TwoFluid::State>& W, const std::string& kind) {
  for (int i = 1; i < g.n_cells; ++i)
    if (W[i] != W[0]) rf.fail("initial.kind", "the " + kind + " initial state needs a uniform background");
}

}  // namespace

void declare_twofluid_keys(io::Schema& schema) {
  io::Section& model = schema.root().section("model", "which equations are solved");
  model.real("electron_gamma", "", "two-fluid: ratio of specific heats of the electron fluid (default: model.gamma)")
      .above(1.0)
      .at_most(3.0);
  model.real("mass_ratio", "",
             "two-fluid: a reduced ion to electron mass ratio m_i/m_e; the electron is made heavier, the ion "
             "mass is kept (default: the unit system's ratio)")
      .above(1.0);
  model.choice("electron_ion_friction", {"none", "spitzer"},
               "two-fluid: electron-ion friction: none, or Spitzer/Braginskii from the local n_e and T_e "
               "(SI units)")
      .def("none");
  model.real("neutral_density", "m^-3", "two-fluid: density of a neutral gas at rest for ion-neutral friction")
      .non_negative()
      .def(0.0);
  model.real("ion_neutral_cross_section", "m^2",
             "two-fluid: ion-neutral momentum-transfer cross-section (with neutral_density)")
      .non_negative()
      .def(0.0);

}

void reject_two_fluid_keys(const io::RunFile& rf, const std::string& model_name) {
  for (const char* k : kTwoFluidOnlyKeys)
    if (rf.given(k))
      rf.fail(k, "only the two-fluid model reads this key (model.equations is " + model_name + ")");
}

real parallel_wave_frequency(const TwoFluid& m, real n_i, real n_e, real b0, real k, ParallelBranch branch) {
  // Signed gyrofrequencies Omega_s = q_s B0/m_s and plasma frequencies squared.
  const real om_i = m.ion_charge * b0 / m.ion.particle_mass;
  const real om_e = m.electron_charge * b0 / m.electron.particle_mass;
  const real wpi2 = n_i * m.ion_charge * m.ion_charge / (m.eps0 * m.ion.particle_mass);
  const real wpe2 = n_e * m.electron_charge * m.electron_charge / (m.eps0 * m.electron.particle_mass);
  const real sgn = branch == ParallelBranch::right ? 1.0 : -1.0;
  const real kc2 = k * k * m.c * m.c;
  // D(w) = w^2 - sum_s wps^2 w/(w + sgn Omega_s) - k^2 c^2: negative at w -> 0+, +infinity
  // at the resonance w = -sgn Omega_s of the species with the right sign.
  auto d = [&](real w) { return w * w - wpi2 * w / (w + sgn * om_i) - wpe2 * w / (w + sgn * om_e) - kc2; };
  const real w_res = branch == ParallelBranch::right ? -om_e : om_i;
  TW_CHECK(w_res > 0 && k > 0, "parallel wave needs B0 > 0 and k > 0");
  // Scan for the first sign change (the lowest root), then bisect to round-off.
  constexpr int n_scan = 4096;
  real lo = 0, hi = w_res;
  for (int j = 1; j <= n_scan; ++j) {
    const real w = w_res * (j < n_scan ? static_cast<real>(j) / n_scan : 1 - 1e-12);
    if (d(w) > 0) {
      hi = w;
      break;
    }
    lo = w;
  }
  for (int it = 0; it < 200 && hi - lo > 1e-15 * hi; ++it) {
    const real mid = 0.5 * (lo + hi);
    (d(mid) > 0 ? hi : lo) = mid;
  }
  return 0.5 * (lo + hi);
}

TwoFluid ModelSetup<TwoFluid>::make(const io::RunFile& rf, const CaseSetup& c) {
  TwoFluid m;
  if (rf.get_string("model.closure") != "adiabatic")
    rf.fail("model.closure", "the two-fluid model evolves each fluid's energy (adiabatic closure only)");
  for (const char* k : {"model.resistivity", "model.resistivity_model", "model.viscosity"})
    if (rf.given(k))
      rf.fail(k, "not used by the two-fluid model (collisions: model.electron_ion_friction, model.neutral_density)");
  if (rf.given("model.displacement_current"))
    rf.fail("model.displacement_current", "the two-fluid model always keeps the displacement current");
  const UnitSystem& u = c.units;
  m.mu0 = u.mu0;
  m.bx = c.plasma.b0()[0];
  m.c = u.c;
  const real m_i = c.plasma.ion_mass;
  real m_e = u.m_e;
  // Both constants may only be reduced from the unit system's (SI: physical; normalized:
  // the `normalized` section's).
  if (rf.given("model.light_speed")) {
    m.c = rf.get_real("model.light_speed");
    if (m.c > u.c * (1 + 1e-12))
      rf.fail("model.light_speed", "the light speed " + num(m.c) + " exceeds the unit system's c = " + num(u.c) +
                                       "; it may only be reduced");
  }
  if (rf.given("model.mass_ratio")) {
    m_e = m_i / rf.get_real("model.mass_ratio");
    if (m_e < u.m_e * (1 - 1e-12))
      rf.fail("model.mass_ratio", "m_i/m_e = " + num(rf.get_real("model.mass_ratio")) + " exceeds the unit system's " +
                                      num(m_i / u.m_e) + "; it may only be reduced");
  }
  m.eps0 = 1 / (m.mu0 * m.c * m.c);
  m.ion.gamma = rf.get_real("model.gamma");
  m.electron.gamma = rf.given("model.electron_gamma") ? rf.get_real("model.electron_gamma") : m.ion.gamma;
  m.ion.particle_mass = m_i;
  m.electron.particle_mass = m_e;
  m.charge_number = c.plasma.charge;
  m.ion_charge = c.plasma.charge * u.e;
  m.electron_charge = -u.e;
  m.energy_per_eV = u.energy_per_eV;

  if (rf.get_string("model.electron_ion_friction") == "spitzer") {
    if (u.normalized)
      rf.fail("model.electron_ion_friction", "spitzer friction needs SI units (temperatures in eV)");
    m.spitzer_friction = true;
    m.friction_mass_factor = constants::m_e / m_e;
    if (rf.given("model.coulomb_logarithm")) m.coulomb_logarithm = rf.get_real("model.coulomb_logarithm");
  } else if (rf.given("model.coulomb_logarithm")) {
    rf.fail("model.coulomb_logarithm", "only electron_ion_friction: spitzer uses a Coulomb logarithm");
  }
  const bool nn = rf.given("model.neutral_density"), cs = rf.given("model.ion_neutral_cross_section");
  if (nn != cs)
    rf.fail(nn ? "model.neutral_density" : "model.ion_neutral_cross_section",
            "ion-neutral friction needs both model.neutral_density and model.ion_neutral_cross_section");
  m.neutral_density = rf.get_real("model.neutral_density");
  m.ion_neutral_cross_section = rf.get_real("model.ion_neutral_cross_section");

  // Each fluid has a pressure: a cold species would have no sound speed and could not stay
  // positive. The background must be warm (riemann sides are checked as initial states).
  const PlasmaPoint p = c.plasma.at(c.grid.x_min, u);
  if (!(p.t_e > 0)) rf.fail("plasma.electron_temperature", "the two-fluid model needs T_e > 0 (give a small value for a cold plasma)");
  if (!(p.t_i > 0)) rf.fail("plasma.ion_temperature", "the two-fluid model needs T_i > 0 (give a small value for a cold plasma)");
  return m;
}

TwoFluid::State ModelSetup<TwoFluid>::primitive(const TwoFluid& m, const PlasmaPoint& p, const CaseSetup& c) {
  const real n_e = p.n_e;
  const real n_i = n_e / c.plasma.charge;
  TwoFluid::State W{};
  const auto& v = p.velocity;
  for (const auto& [off, n, f, t] : {std::tuple{TwoFluid::ION, n_i, &m.ion, p.t_i},
                                     std::tuple{TwoFluid::ELECTRON, n_e, &m.electron, p.t_e}}) {
    W[off + Fluid::RHO] = n * f->particle_mass;
    W[off + Fluid::VX] = v[0];
    W[off + Fluid::VY] = v[1];
    W[off + Fluid::VZ] = v[2];
    W[off + Fluid::P] = n * t;
  }
  const real bx = m.bx, by = p.field[1], bz = p.field[2];
  W[TwoFluid::BY] = by;
  W[TwoFluid::BZ] = bz;
  // Ideal Ohm's law E = -u x B: both species drift together.
  W[TwoFluid::EX] = -(v[1] * bz - v[2] * by);
  W[TwoFluid::EY] = -(v[2] * bx - v[0] * bz);
  W[TwoFluid::EZ] = -(v[0] * by - v[1] * bx);
  return W;
}

bool ModelSetup<TwoFluid>::perturb(const TwoFluid& m, const io::RunFile& rf, const CaseSetup& c, Field<State>& W) {
  const std::string kind = rf.get_string("initial.kind");
  const bool wave = kind == "circular", langmuir = kind == "langmuir";
  if (!wave && !langmuir && kind != "uniform" && kind != "riemann") return false;
  if (rf.given("initial.mode")) rf.fail("initial.mode", "the two-fluid model has no 'mode' (that is MHD's wave kind)");
  if (!wave) {
    for (const char* k : {"direction", "branch"})
      if (rf.given(std::string("initial.") + k))
        rf.fail(std::string("initial.") + k, "only the circular kind takes '" + std::string(k) + "'");
  } else if (rf.get_string("initial.direction") == "standing") {
    rf.fail("initial.direction", "a circular wave travels: choose forward or backward");
  }
  if (!wave && !langmuir) {
    for (const char* k : {"amplitude", "wavelength"})
      if (rf.given(std::string("initial.") + k))
        rf.fail(std::string("initial.") + k, "only the circular and langmuir kinds take '" + std::string(k) + "'");
    return true;
  }
  const Grid& g = c.grid;
  require_uniform(rf, g, W, kind);
  const State W0 = W[0];
  const real amp = rf.get_real("initial.amplitude");
  const real lambda = rf.has("initial.wavelength") ? rf.get_real("initial.wavelength") : g.length;
  const real k = 2 * constants::pi / lambda;
  const real n_i = W0[TwoFluid::ION + Fluid::RHO] / m.ion.particle_mass;
  const real n_e = W0[TwoFluid::ELECTRON + Fluid::RHO] / m.electron.particle_mass;

  if (langmuir) {
    if (amp >= 1) rf.fail("initial.amplitude", "a langmuir wave needs a relative density amplitude below 1");
    // n_e = n_e0 (1 + a cos kx); eps0 dE_x/dx = q_e (n_e - n_e0) gives E_x below.
    const real ex0 = m.electron_charge * n_e * amp / (m.eps0 * k);
    for (int i = 0; i < g.n_cells; ++i) {
      const real ph = k * (g.x_centre(i) - g.x_min);
      const real f = 1 + amp * std::cos(ph);
      W[i][TwoFluid::ELECTRON + Fluid::RHO] = W0[TwoFluid::ELECTRON + Fluid::RHO] * f;
      W[i][TwoFluid::ELECTRON + Fluid::P] = W0[TwoFluid::ELECTRON + Fluid::P] * std::pow(f, m.electron.gamma);
      W[i][TwoFluid::EX] = W0[TwoFluid::EX] + ex0 * std::sin(ph);
    }
    return true;
  }

  // circular: B0 along x, plasma at rest.
  const real b0 = std::abs(m.bx);
  if (b0 == 0 || W0[TwoFluid::BY] != 0 || W0[TwoFluid::BZ] != 0)
    rf.fail("plasma.field_angle_deg", "a circular wave needs B0 along the tube (field_angle_deg 0 or 180, field > 0)");
  for (int j : {TwoFluid::ION, TwoFluid::ELECTRON})
    for (int d = Fluid::VX; d <= Fluid::VZ; ++d)
      if (W0[j + d] != 0) rf.fail("plasma.flow", "a circular wave needs a plasma at rest");
  const real ks = rf.get_string("initial.direction") == "forward" ? k : -k;
  const std::string pol = rf.get_string("initial.branch");
  using cplx = std::complex<real>;
  const cplx I(0, 1);
  // A circularly polarised mode: complex amplitudes of (E_y, E_z), (b_y, b_z) and each
  // species' (v_y, v_z); fields go as Re(X exp(i(k x - omega t))).
  struct Mode {
    real omega;
    cplx e[2], b[2], vi[2], ve[2];
  };
  auto mode = [&](ParallelBranch br, real a) {
    Mode md;
    md.omega = parallel_wave_frequency(m, n_i, n_e, b0, k, br);
    // R rotates in the electron sense about B0: b ~ (1, i), i.e. b = |b| (cos, -sin) of
    // the phase, for B0 along +x; (1, -i) along -x. |b| = a |B0|; R + L is then along y.
    const real s = (br == ParallelBranch::right ? 1.0 : -1.0) * (m.bx > 0 ? 1.0 : -1.0);
    md.b[0] = a * b0;
    md.b[1] = I * s * a * b0;
    // Faraday, b = (k/omega) x^ x E: E_y = (omega/k) b_z, E_z = -(omega/k) b_y.
    md.e[0] = (md.omega / ks) * md.b[1];
    md.e[1] = -(md.omega / ks) * md.b[0];
    // -i omega v = (q/m)(E + v x B_x x^): [[-i w, -Om], [Om, -i w]] v = (q/m) E.
    auto vel = [&](real qm, cplx* v) {
      const real om = qm * m.bx;
      const cplx a11 = -I * md.omega, a12 = -om, a21 = om, a22 = -I * md.omega;
      const cplx det = a11 * a22 - a12 * a21;
      const cplx r0 = qm * md.e[0], r1 = qm * md.e[1];
      v[0] = (r0 * a22 - a12 * r1) / det;
      v[1] = (a11 * r1 - a21 * r0) / det;
    };
    vel(m.ion_charge / m.ion.particle_mass, md.vi);
    vel(m.electron_charge / m.electron.particle_mass, md.ve);
    return md;
  };
  std::vector<Mode> modes;
  if (pol == "right") modes.push_back(mode(ParallelBranch::right, amp));
  if (pol == "left") modes.push_back(mode(ParallelBranch::left, amp));
  if (pol == "linear") {
    modes.push_back(mode(ParallelBranch::right, 0.5 * amp));
    modes.push_back(mode(ParallelBranch::left, 0.5 * amp));
  }
  for (int i = 0; i < g.n_cells; ++i) {
    const cplx ph = std::exp(I * (ks * (g.x_centre(i) - g.x_min)));
    State& w = W[i];
    for (const Mode& md : modes) {
      w[TwoFluid::EY] += std::real(md.e[0] * ph);
      w[TwoFluid::EZ] += std::real(md.e[1] * ph);
      w[TwoFluid::BY] += std::real(md.b[0] * ph);
      w[TwoFluid::BZ] += std::real(md.b[1] * ph);
      w[TwoFluid::ION + Fluid::VY] += std::real(md.vi[0] * ph);
      w[TwoFluid::ION + Fluid::VZ] += std::real(md.vi[1] * ph);
      w[TwoFluid::ELECTRON + Fluid::VY] += std::real(md.ve[0] * ph);
      w[TwoFluid::ELECTRON + Fluid::VZ] += std::real(md.ve[1] * ph);
    }
  }
  return true;
}

std::vector<io::ParameterValue> ModelSetup<TwoFluid>::parameters(const TwoFluid& m, const CaseSetup& c) {
  auto unit = [&](const char* si) { return c.units.unit(si); };
  const real m_i = m.ion.particle_mass, m_e = m.electron.particle_mass;
  // The background's frequencies with the model's constants (what the time step meets).
  const PlasmaPoint p = c.plasma.at(c.grid.x_min, c.units);
  const real n_e = p.n_e, n_i = n_e / c.plasma.charge;
  const real b = c.plasma.field;
  const real wpe = std::sqrt(n_e * m.electron_charge * m.electron_charge / (m.eps0 * m_e));
  const real wpi = std::sqrt(n_i * m.ion_charge * m.ion_charge / (m.eps0 * m_i));
  return {
      {"ion_gamma", m.ion.gamma, "1", "ratio of specific heats of the ion fluid"},
      {"electron_gamma", m.electron.gamma, "1", "ratio of specific heats of the electron fluid"},
      {"field_x", m.bx, unit("T"), "constant B_x"},
      {"mu0", m.mu0, unit("H/m"), "magnetic permeability of the unit system"},
      {"model_light_speed", m.c, unit("m/s"), "speed of light in the model's Maxwell equations (may be reduced)"},
      {"light_speed_reduction", m.c / c.units.c, "1", "model_light_speed / light_speed (1 = not reduced)"},
      {"model_permittivity", m.eps0, unit("F/m"), "eps0 = 1/(mu0 c^2) with the model's light speed"},
      {"mass_ratio", m_i / m_e, "1", "ion to electron mass ratio m_i/m_e used by the model"},
      {"mass_ratio_unreduced", m_i / c.units.m_e, "1",
       "m_i/m_e of the unit system (SI: the physical electron mass; normalized: normalized.mass_ratio)"},
      {"model_electron_mass", m_e, unit("kg"), "electron mass used by the model"},
      {"model_ion_charge", m.ion_charge, unit("C"), "charge of one ion"},
      {"electron_ion_friction", m.spitzer_friction ? 1.0 : 0.0, "1", "1: Spitzer/Braginskii electron-ion friction on"},
      {"neutral_density", m.neutral_density, unit("m^-3"), "neutral gas density for ion-neutral friction"},
      {"ion_neutral_cross_section", m.ion_neutral_cross_section, unit("m^2"), "ion-neutral cross-section"},
      {"model_electron_plasma_frequency", wpe, unit("rad/s"), "omega_pe of the background with the model's constants"},
      {"model_ion_plasma_frequency", wpi, unit("rad/s"), "omega_pi of the background with the model's constants"},
      {"model_electron_cyclotron_frequency", std::abs(m.electron_charge) * b / m_e, unit("rad/s"),
       "|Omega_ce| of the background with the model's constants"},
      {"model_ion_cyclotron_frequency", m.ion_charge * b / m_i, unit("rad/s"),
       "Omega_ci of the background with the model's constants"},
  };
}

FluxKind ModelSetup<TwoFluid>::flux(const io::RunFile& rf, const TwoFluid& /*m*/) {
  return resolve_flux(rf, false, false);
}

std::vector<std::string> ModelSetup<TwoFluid>::check_warnings(const TwoFluid& m, const CaseSetup& c) {
  std::vector<std::string> w;
  // The light speed is the fastest signal, so this is the step the run takes.
  const real dt = c.time.cfl * c.grid.dx() / m.c;
  const real m_i = m.ion.particle_mass, m_e = m.electron.particle_mass;
  if (m.c < c.units.c)
    w.push_back("model.light_speed reduces the speed of light by a factor " + num(c.units.c / m.c) + " to " +
                num(m.c) + " m/s: eps0 grows by its square, plasma frequencies fall and Debye lengths "
                "grow by that factor (inertial lengths are unchanged), and only waves much slower than " + num(m.c) +
                " m/s keep their physical speed (a shear wave runs at v_A/sqrt(1 + v_A^2/c^2))");
  if (m_e != c.units.m_e)
    w.push_back("model.mass_ratio = " + num(m_i / m_e) + " replaces the " +
                (c.units.normalized ? "normalized.mass_ratio " : "physical m_i/m_e = ") + num(m_i / c.units.m_e) +
                ": electron inertia, d_e, omega_pe and Omega_ce are those of a heavier electron");
  const PlasmaPoint p = c.plasma.at(c.grid.x_min, c.units);
  const real wpe = std::sqrt(p.n_e * m.electron_charge * m.electron_charge / (m.eps0 * m_e));
  const real wce = std::abs(m.electron_charge) * c.plasma.field / m_e;
  if (wpe * dt > 1 || wce * dt > 1)
    w.push_back("omega_pe dt = " + num(wpe * dt) + " and Omega_ce dt = " + num(wce * dt) +
                " at the step cfl dx/c: plasma and cyclotron oscillations are not resolved. The implicit "
                "source keeps them bounded, but their frequencies are wrong, and a slow wave resolved by N "
                "cells per wavelength runs about 5 (omega_pe dt / N)^2 per cent slow (README, two-fluid "
                "model)");
  return w;
}

}  // namespace tw
