#include "sim/hall_setup.hpp"

#include <cmath>
#include <sstream>

#include "sim/mhd_setup.hpp"

namespace tw {

namespace {

/// Mass density of the background at x_min.
real background_density(const HallMhd& m, const CaseSetup& c) {
  const PlasmaPoint p = c.plasma.at(c.grid.x_min, c.units);
  return p.n_e / c.plasma.charge * m.ideal.particle_mass;
}

}  // namespace

void declare_hall_keys(io::Schema& schema) {
  io::Section& model = schema.root().section("model", "which equations are solved");
  model.choice("electron_closure", {"isothermal", "adiabatic"},
               "hall: electron pressure, isothermal (T_e fixed at plasma.electron_temperature at x_min) or "
               "adiabatic (the ions' gamma; needs closure: adiabatic)")
      .def("isothermal");
  model.boolean("electron_inertia",
                "hall: keep electron inertia (evolve B - d_e^2 d2B/dx2): whistlers bend over toward the "
                "electron cyclotron frequency")
      .def(false);
  model.choice("hall_stepping", {"explicit", "subcycled", "implicit"},
               "hall: how the Hall and resistive field terms are stepped: explicit (in the Runge-Kutta "
               "stages, under the whistler limit; needs ssp-rk3), subcycled (sub-steps under that limit) or "
               "implicit (Crank-Nicolson; the step follows the MHD CFL limit)")
      .def("implicit");
}

HallMhd ModelSetup<HallMhd>::make(const io::RunFile& rf, const CaseSetup& c) {
  HallMhd m;
  read_mhd_fluid(rf, c, m.ideal);
  m.electron_closure = rf.get_string("model.electron_closure") == "adiabatic" ? ElectronClosure::adiabatic
                                                                              : ElectronClosure::isothermal;
  if (m.electron_closure == ElectronClosure::adiabatic && m.ideal.closure == Closure::isothermal)
    rf.fail("model.electron_closure", "adiabatic electrons need model.closure: adiabatic");
  const std::string stepping = rf.get_string("model.hall_stepping");
  m.stepping = stepping == "explicit"    ? HallStepping::explicit_stages
               : stepping == "subcycled" ? HallStepping::subcycled
                                         : HallStepping::implicit;
  if (m.stepping == HallStepping::explicit_stages) {
    if (c.time.integrator != IntegratorKind::ssp_rk3)
      rf.fail("numerics.integrator",
              "hall_stepping: explicit needs ssp-rk3: the Hall term is dispersive, and SSP-RK2 is unstable "
              "for it at any step (its stability region holds no part of the imaginary axis); or choose "
              "model.hall_stepping: implicit or subcycled");
  } else {
    // The split step takes the resistive field too (implicitly, or sub-cycled).
    m.resistivity = m.ideal.resistivity;
    m.ideal.resistivity = 0;
  }
  m.split_cfl = c.time.cfl;
  const PlasmaPoint p = c.plasma.at(c.grid.x_min, c.units);
  const real z = c.plasma.charge;
  const real mp = m.ideal.particle_mass;
  m.electron_sound_speed2 = z * p.t_e / mp;
  m.reference_density = p.n_e / z * mp;
  const real pe0 = p.n_e * p.t_e, p0 = p.n_e / z * p.t_i + pe0;
  m.electron_reference_pressure = pe0 > 0 ? pe0 : p0 > 0 ? p0 : 1.0;
  m.hall_rho = m.ideal.bx * mp / (m.ideal.mu0 * c.units.e * z);
  if (rf.get_bool("model.electron_inertia"))
    m.inertia_rho = c.units.m_e * mp / (m.ideal.mu0 * c.units.e * c.units.e * z);
  return m;
}

HallMhd::State ModelSetup<HallMhd>::primitive(const HallMhd& m, const PlasmaPoint& p, const CaseSetup& c) {
  const Mhd::State w = ModelSetup<Mhd>::primitive(m.ideal, p, c);
  State W{};
  for (int k = 0; k < Mhd::n_vars; ++k) W[k] = w[k];
  if (m.electron_closure == ElectronClosure::isothermal) {
    // The electrons keep the background temperature everywhere.
    W[HallMhd::PE] = W[HallMhd::RHO] * m.electron_sound_speed2;
    if (m.ideal.closure == Closure::adiabatic) W[HallMhd::P] = p.n_e / c.plasma.charge * p.t_i + W[HallMhd::PE];
  } else {
    W[HallMhd::PE] = p.n_e * p.t_e;
  }
  return W;
}

bool ModelSetup<HallMhd>::perturb(const HallMhd& m, const io::RunFile& rf, const CaseSetup& c, Field<State>& W) {
  const std::string kind = rf.get_string("initial.kind");
  if (kind != "circular" && kind != "wave" && kind != "uniform" && kind != "riemann") return false;  // another model's
  if (kind != "circular" && rf.given("initial.branch"))
    rf.fail("initial.branch", "only the circular kind takes 'branch'");
  if (m.ideal.closure == Closure::adiabatic && kind != "wave")
    require_pressure(rf, c, [&](int i) { return W[i][HallMhd::P]; });
  if (kind == "circular") {
    // Exact at any amplitude with the Hall dispersion relation (and electron inertia, and
    // the displacement current's inertia eps B_x^2 on u_perp): see hall.hpp.
    const State W0 = W[0];
    const CircularWave wave = read_circular_wave(rf, c, m.ideal, HallMhd::head(W0));
    const real rho = W0[HallMhd::RHO];
    const real rho_eff = rho + m.ideal.eps_disp * m.ideal.bx * m.ideal.bx;
    const real omega = m.circular_frequency(wave.k, wave.right, rho);
    for (int i = 0; i < c.grid.n_cells; ++i) {
      const auto d = wave.at(c.grid.x_centre(i), m.ideal.bx, m.ideal.mu0, rho_eff, omega);
      W[i][HallMhd::VY] += d[0];
      W[i][HallMhd::VZ] += d[1];
      W[i][HallMhd::BY] += d[2];
      W[i][HallMhd::BZ] += d[3];
    }
    return true;
  }
  if (kind == "wave") return false;  // ideal-MHD eigenmodes are not Hall eigenmodes
  for (const char* k : {"mode", "direction", "amplitude", "wavelength"})
    if (rf.given(std::string("initial.") + k))
      rf.fail(std::string("initial.") + k, "only the circular kind takes '" + std::string(k) + "' in Hall MHD");
  return kind == "uniform" || kind == "riemann";
}

std::vector<io::ParameterValue> ModelSetup<HallMhd>::parameters(const HallMhd& m, const CaseSetup& c) {
  auto p = ModelSetup<Mhd>::parameters(m.ideal, c);
  auto unit = [&](const char* si) { return c.units.unit(si); };
  for (auto& q : p)
    if (q.name == "resistivity") q.value = m.resistivity + m.ideal.resistivity;  // wherever it is stepped
  const real rho = background_density(m, c);
  const real h = m.hall_coefficient(rho);
  const real va = std::abs(m.ideal.bx) / std::sqrt(m.ideal.mu0 * rho);
  p.push_back({"hall_coefficient", h, unit("m^2/s"), "Hall coefficient h = B_x/(mu0 e n_e) at x_min (= v_A d_i)"});
  p.push_back({"ion_inertial_length", va > 0 ? std::abs(h) / va : 0.0, unit("m"),
               "ion inertial length |h|/v_A at x_min (mass density including the electrons)"});
  p.push_back({"electron_inertial_length", std::sqrt(m.inertia_length2(rho)), unit("m"),
               "electron inertial length d_e at x_min (0 = electron inertia off)"});
  p.push_back({"electron_closure_adiabatic", m.electron_closure == ElectronClosure::adiabatic ? 1.0 : 0.0, "1",
               "1 for adiabatic electrons, 0 for isothermal"});
  p.push_back({"isothermal_electron_sound_speed", std::sqrt(m.electron_sound_speed2), unit("m/s"),
               "sqrt(Z T_e/m) of isothermal electrons"});
  p.push_back({"hall_stepping", static_cast<real>(static_cast<int>(m.stepping)), "1",
               "Hall and resistive field terms: 0 explicit, 1 subcycled, 2 implicit"});
  p.push_back({"whistler_step_limit", h != 0 ? m.whistler_limit(c.grid.dx(), rho) : 0.0, unit("s"),
               "explicit whistler limit (dx^2 + 4 d_e^2)/(pi |h|) at x_min (0 without a Hall term)"});
  return p;
}

FluxKind ModelSetup<HallMhd>::flux(const io::RunFile& rf, const HallMhd&) {
  const std::string f = rf.get_string("numerics.flux");
  if (f == "hlld") rf.fail("numerics.flux", "hlld is for ideal MHD; Hall MHD uses hll or rusanov");
  return resolve_flux(rf, false, false);
}

std::vector<std::string> ModelSetup<HallMhd>::check_warnings(const HallMhd& m, const CaseSetup& c) {
  std::vector<std::string> w = displacement_warnings(m.ideal, c);
  const real rho = background_density(m, c);
  const real dx = c.grid.dx();
  std::ostringstream msg;
  msg.precision(4);
  if (m.hall_rho != 0) {
    const real limit = m.whistler_limit(dx, rho);
    if (m.stepping == HallStepping::implicit) {
      msg << "model.hall_stepping: implicit steps past the explicit whistler limit " << limit
          << " s; the Hall field is stepped by Crank-Nicolson, so whistlers with omega dt > 0.5 lag in phase "
             "(error about (omega dt)^2/12); limit the step with numerics.max_dt to follow them";
      w.push_back(msg.str());
    } else if (m.stepping == HallStepping::subcycled) {
      msg << "model.hall_stepping: subcycled: the Hall field takes sub-steps of at most "
          << m.split_cfl * limit << " s (the whistler limit " << limit << " s times numerics.cfl) within each step";
      w.push_back(msg.str());
    }
  } else {
    w.push_back("B_x = 0: the Hall field has no effect along the tube in 1D (it needs a field component along x)");
  }
  if (m.inertia_rho > 0) {
    const real de = std::sqrt(m.inertia_length2(rho));
    if (de < dx) {
      std::ostringstream d;
      d.precision(4);
      d << "electron inertia: d_e = " << de << " m is not resolved by dx = " << dx << " m";
      w.push_back(d.str());
    }
  }
  return w;
}

}  // namespace tw
