#include "sim/linear_setup.hpp"

#include <cmath>
#include <complex>
#include <sstream>
#include <type_traits>

#include "core/constants.hpp"
#include "sim/hall_setup.hpp"
#include "sim/initial.hpp"
#include "sim/mhd_setup.hpp"
#include "sim/twofluid_setup.hpp"

namespace tw {

namespace {

std::string num(real v) {
  std::ostringstream s;
  s.precision(6);
  s << v;
  return s.str();
}

/// Constants of a linear form that are one value for the whole tube (references of the
/// entropy variables, 1/(e n_e) per density).
struct References {
  real rho = 1, rho_e = 1;   ///< reference mass densities (two fluids: ions, electrons) [kg/m^3]
  real mass_per_charge = 0;  ///< m/(Z e) [kg/C]
};

// The model's parameters at one point of a varying background: closures whose constants
// come from the local temperatures (the nonlinear models take them at x_min).
Mhd local_model(const Mhd& m, const PlasmaPoint& p, const CaseSetup& c) {
  Mhd l = m;
  if (l.closure == Closure::isothermal)
    l.sound_speed_iso = std::sqrt(std::max(p.t_i + c.plasma.charge * p.t_e, real(0)) / m.particle_mass);
  return l;
}
HallMhd local_model(const HallMhd& m, const PlasmaPoint& p, const CaseSetup& c) {
  HallMhd l = m;
  l.ideal = local_model(m.ideal, p, c);
  l.electron_sound_speed2 = c.plasma.charge * p.t_e / m.ideal.particle_mass;
  return l;
}
TwoFluid local_model(const TwoFluid& m, const PlasmaPoint&, const CaseSetup&) { return m; }

LinearForm<Mhd> make_form(const Mhd& l, const References& r) { return {l, r.rho}; }
LinearForm<HallMhd> make_form(const HallMhd& l, const References& r) { return {l, r.mass_per_charge, r.rho}; }
LinearForm<TwoFluid> make_form(const TwoFluid& l, const References& r) { return {l, r.rho, r.rho_e}; }

/// The background at one position: the local model's form, its 3D state and the model's.
template <class M>
struct Point {
  LinearForm<M> form;
  typename LinearForm<M>::Vars W0;
  typename M::State Wm;
};

template <class M>
Point<M> point_at(const M& nl, real x, const CaseSetup& c, const References& r) {
  const PlasmaPoint p = c.plasma.at(x, c.units);
  const M loc = local_model(nl, p, c);
  const auto Wm = ModelSetup<M>::primitive(loc, p, c);
  return {make_form(loc, r), LinearForm<M>::from_model(loc, Wm), Wm};
}

template <class M>
References references(const M& nl, const CaseSetup& c) {
  References r;
  const PlasmaPoint p = c.plasma.at(c.grid.x_min, c.units);
  const auto W = ModelSetup<M>::primitive(local_model(nl, p, c), p, c);
  if constexpr (std::is_same_v<M, TwoFluid>) {
    r.rho = W[TwoFluid::ION + Fluid::RHO];
    r.rho_e = W[TwoFluid::ELECTRON + Fluid::RHO];
  } else {
    r.rho = W[0];
    const real mp = c.plasma.particle_mass(c.units);
    r.mass_per_charge = mp / (c.plasma.charge * c.units.e);
  }
  return r;
}

/// Total pressure (thermal, all species, plus B^2/2mu0) of a background, for the force
/// balance warning.
template <class M>
real total_pressure(const M& nl, const typename LinearForm<M>::Vars& W) {
  using F = LinearForm<M>;
  real p = 0, mu0 = 1;
  if constexpr (std::is_same_v<M, TwoFluid>) {
    p = W[F::ION + 4] + W[F::ELECTRON + 4];
    mu0 = nl.mu0;
  } else if constexpr (std::is_same_v<M, HallMhd>) {
    p = W[F::P];
    mu0 = nl.ideal.mu0;
  } else {
    p = W[F::P];
    mu0 = nl.mu0;
  }
  const VariableRoles r = F::roles();
  return p + (W[r.bx] * W[r.bx] + W[r.by] * W[r.by] + W[r.bz] * W[r.bz]) / (2 * mu0);
}

template <class M>
DispersionInput dispersion_input_for(const M& nl, const CaseSetup& c, real x, real k_perp) {
  const References r = references(nl, c);
  const Point<M> pt = point_at(nl, x, c, r);
  DispersionInput in;
  in.coeffs = linearize(pt.form, pt.W0, typename LinearForm<M>::Vars{}, 1.0);
  in.roles = LinearForm<M>::roles();
  in.background.assign(pt.W0.begin(), pt.W0.end());
  const auto sc = pt.form.scales(pt.W0);
  in.scales.assign(sc.begin(), sc.end());
  in.k_perp = k_perp;
  in.mu0 = c.units.mu0;
  return in;
}

}  // namespace

void declare_linear_keys(io::Schema& schema) {
  io::Section& model = schema.root().section("model", "which equations are solved");
  model.real("perpendicular_wavenumber", "m^-1",
             "linearized: wavenumber k_perp of the perturbations across the tube, along y (perpendicular to x and "
             "to B0): they vary as exp(i k_perp y); 0 = one-dimensional")
      .non_negative()
      .def(0.0);
  io::Section& init = schema.root().section("initial", "the state at t = 0");
  init.integer("mode_number",
               "eigenmode: which branch, numbered from the lowest frequency among the waves travelling in "
               "`direction` at `wavelength` (as `tubewave modes` numbers them)")
      .at_least(1)
      .def(1);
}

void reject_linear_keys(const io::RunFile& rf) {
  if (rf.get_string("model.form") == "linearized") return;
  if (rf.given("model.perpendicular_wavenumber"))
    rf.fail("model.perpendicular_wavenumber", "only linearized runs (model.form: linearized) have a perpendicular wavenumber");
  if (rf.get_string("initial.kind") == "eigenmode")
    rf.fail("initial.kind", "the eigenmode initial state is for linearized runs (model.form: linearized)");
  if (rf.given("initial.mode_number")) rf.fail("initial.mode_number", "only the eigenmode kind takes 'mode_number'");
}

template <class M>
Linearized<M> ModelSetup<Linearized<M>>::make(const io::RunFile& rf, const CaseSetup& c) {
  using Form = LinearForm<M>;
  L lin;
  if constexpr (std::is_same_v<M, HallMhd>) {
    if (rf.given("model.hall_stepping") && rf.get_string("model.hall_stepping") != "explicit")
      rf.fail("model.hall_stepping",
              "linearized Hall MHD steps the Hall and resistive terms in the Runge-Kutta stages (explicit): leave "
              "hall_stepping out or set it to explicit");
  }
  lin.nonlinear = ModelSetup<M>::make(rf, c);
  const real k_perp = rf.get_real("model.perpendicular_wavenumber");
  const bool dispersive = std::is_same_v<M, HallMhd> || k_perp > 0;
  if (dispersive && c.time.integrator != IntegratorKind::ssp_rk3)
    rf.fail("numerics.integrator",
            std::string(k_perp > 0 ? "the perpendicular wavenumber (model.perpendicular_wavenumber > 0)"
                                   : "linearized Hall MHD (the Hall term)") +
                " adds dispersive terms to the Runge-Kutta stages: they need ssp-rk3 (the stability region of "
                "ssp-rk2 holds no part of the imaginary axis)");
  const Grid& g = c.grid;
  const int n = g.n_cells;
  const real dx = g.dx();
  const References refs = references(lin.nonlinear, c);
  std::vector<Point<M>> cells, faces;
  for (int i = 0; i < n; ++i) cells.push_back(point_at(lin.nonlinear, g.x_centre(i), c, refs));
  for (int f = 0; f <= n; ++f) faces.push_back(point_at(lin.nonlinear, g.x_face(f), c, refs));
  for (int i = 0; i < n; ++i) {
    if (!lin.nonlinear.admissible(cells[static_cast<std::size_t>(i)].Wm)) {
      std::ostringstream msg;
      msg << "the background is not physical at x = " << g.x_centre(i) << " m (cell " << i
          << "): densities and pressures must be > 0 (check plasma.density and the temperatures)";
      rf.fail("plasma", msg.str());
    }
  }
  LinearSystemSpec spec;
  spec.n = Form::n;
  spec.dx = dx;
  spec.k_perp = k_perp;
  spec.stiff_source = Form::stiff_source;
  spec.gradient_limit_name = Form::gradient_limit_name();
  using Vars = typename Form::Vars;
  auto diff = [](const Vars& a, const Vars& b, real h) {
    Vars d{};
    for (int k = 0; k < Form::n; ++k) d[k] = (a[k] - b[k]) / h;
    return d;
  };
  for (int i = 0; i < n; ++i) {
    const auto I = static_cast<std::size_t>(i);
    spec.cell.push_back(linearize(cells[I].form, cells[I].W0, diff(faces[I + 1].W0, faces[I].W0, dx), dx));
  }
  for (int f = 0; f <= n; ++f) {
    const auto F = static_cast<std::size_t>(f);
    const Vars grad = f == 0   ? diff(cells[0].W0, faces[0].W0, 0.5 * dx)
                      : f == n ? diff(faces[F].W0, cells[F - 1].W0, 0.5 * dx)
                               : diff(cells[F].W0, cells[F - 1].W0, dx);
    spec.face.push_back(linearize(faces[F].form, faces[F].W0, grad, dx));
  }
  lin.form = faces[0].form;
  lin.system = std::make_shared<const LinearSystem>(spec);
  lin.x_min = g.x_min;
  lin.dx = dx;
  return lin;
}

template <class M>
typename Linearized<M>::State ModelSetup<Linearized<M>>::primitive(const L&, const PlasmaPoint&, const CaseSetup&) {
  return State{};
}

template <class M>
bool ModelSetup<Linearized<M>>::perturb(const L& m, const io::RunFile& rf, const CaseSetup& c, Field<State>& W) {
  using Form = LinearForm<M>;
  constexpr int nc = Form::n;
  const Grid& g = c.grid;
  const int n = g.n_cells;
  const std::string kind = rf.get_string("initial.kind");
  const References refs = references(m.nonlinear, c);
  if (kind == "eigenmode") {
    for (const char* k : {"mode", "branch", "position", "left", "right"})
      if (rf.given(std::string("initial.") + k))
        rf.fail(std::string("initial.") + k, "the eigenmode kind does not take '" + std::string(k) + "'");
    const Point<M> p0 = point_at(m.nonlinear, g.x_min, c, refs);
    for (int i = 0; i < n; ++i) {
      const auto w = point_at(m.nonlinear, g.x_centre(i), c, refs).W0;
      for (int k = 0; k < nc; ++k)
        if (std::abs(w[k] - p0.W0[k]) > 1e-12 * std::max(std::abs(p0.W0[k]), real(1e-300)))
          rf.fail("initial.kind", "the eigenmode initial state needs a uniform background (the plasma varies along "
                                  "the tube at x = " + num(g.x_centre(i)) + " m)");
    }
    if (rf.get_string("initial.direction") == "standing")
      rf.fail("initial.direction", "an eigenmode travels: choose forward or backward");
    const real lambda = rf.has("initial.wavelength") ? rf.get_real("initial.wavelength") : g.length;
    const real k = (rf.get_string("initial.direction") == "forward" ? 1.0 : -1.0) * 2 * constants::pi / lambda;
    const DispersionInput in = dispersion_input_for(m.nonlinear, c, g.x_min, m.system->k_perp());
    const auto branches = forward_branches(in, k);
    const long N = rf.get_int("initial.mode_number");
    if (N > static_cast<long>(branches.size()))
      rf.fail("initial.mode_number", "there are " + std::to_string(branches.size()) + " branches travelling " +
                                         rf.get_string("initial.direction") + " at wavelength " + num(lambda) +
                                         " m (see tubewave modes)");
    const WaveMode& mode = branches[static_cast<std::size_t>(N - 1)];
    const real amp = rf.get_real("initial.amplitude");
    for (int i = 0; i < n; ++i) {
      const cplx ph = std::exp(cplx(0, k * (g.x_centre(i) - g.x_min)));
      for (int j = 0; j < nc; ++j) {
        const cplx v = amp * mode.vector[static_cast<std::size_t>(j)] * ph;
        W[i][j] = v.real();
        W[i][nc + j] = v.imag();
      }
    }
    return true;
  }
  if (rf.given("initial.mode_number")) rf.fail("initial.mode_number", "only the eigenmode kind takes 'mode_number'");
  // A kind of the nonlinear model: its state minus the background, with each cell's
  // local model (so isothermal closures keep their local constants).
  const auto pts = initial_plasma(rf, c);
  Field<typename M::State> Wb(g), Wp(g);
  for (int i = 0; i < n; ++i) {
    const PlasmaPoint bg = c.plasma.at(g.x_centre(i), c.units);
    const M loc = local_model(m.nonlinear, bg, c);
    Wb[i] = ModelSetup<M>::primitive(loc, bg, c);
    Wp[i] = ModelSetup<M>::primitive(loc, pts[static_cast<std::size_t>(i)], c);
  }
  if (!ModelSetup<M>::perturb(m.nonlinear, rf, c, Wp)) return false;
  for (int i = 0; i < n; ++i) {
    const auto a = Form::from_model(m.nonlinear, Wp[i]), b = Form::from_model(m.nonlinear, Wb[i]);
    for (int j = 0; j < nc; ++j) {
      W[i][j] = a[j] - b[j];
      W[i][nc + j] = 0;
    }
  }
  return true;
}

template <class M>
std::vector<io::ParameterValue> ModelSetup<Linearized<M>>::parameters(const L& m, const CaseSetup& c) {
  auto p = ModelSetup<M>::parameters(m.nonlinear, c);
  p.push_back({"linearized", 1.0, "1", "1: the run evolves linear perturbations about the background"});
  p.push_back({"perpendicular_wavenumber", m.system->k_perp(), c.units.unit("m^-1"),
               "wavenumber k_perp across the tube: perturbations vary as exp(i k_perp y)"});
  const References refs = references(m.nonlinear, c);
  const Point<M> p0 = point_at(m.nonlinear, c.grid.x_min, c, refs);
  const auto vars = LinearForm<M>::variables();
  for (std::size_t j = 0; j < vars.size(); ++j)
    p.push_back({"linear_background_" + vars[j].name, p0.W0[static_cast<int>(j)], c.units.unit(vars[j].units),
                 "background " + vars[j].description + " at x_min"});
  return p;
}

template <class M>
FluxKind ModelSetup<Linearized<M>>::flux(const io::RunFile& rf, const L&) {
  const std::string f = rf.get_string("numerics.flux");
  if (f != "auto" && f != "upwind")
    rf.fail("numerics.flux", "linearized models use the exact upwind flux of the linear system: choose upwind (or auto)");
  return FluxKind::upwind;
}

template <class M>
std::vector<std::string> ModelSetup<Linearized<M>>::check_warnings(const L& m, const CaseSetup& c) {
  std::vector<std::string> w;
  if constexpr (std::is_same_v<M, TwoFluid>) w = ModelSetup<TwoFluid>::check_warnings(m.nonlinear, c);
  if constexpr (std::is_same_v<M, Mhd>) w = displacement_warnings(m.nonlinear, c);
  if constexpr (std::is_same_v<M, HallMhd>) w = displacement_warnings(m.nonlinear.ideal, c);
  // Force balance of the background along x: with a uniform B0 the thermal pressure must be
  // uniform; otherwise the background is held by an unmodelled force.
  const References refs = references(m.nonlinear, c);
  real lo = 0, hi = 0;
  for (int i = 0; i < c.grid.n_cells; ++i) {
    const real pt = total_pressure(m.nonlinear, point_at(m.nonlinear, c.grid.x_centre(i), c, refs).W0);
    lo = i == 0 ? pt : std::min(lo, pt);
    hi = i == 0 ? pt : std::max(hi, pt);
  }
  if (hi > lo * (1 + 1e-3))
    w.push_back("the background's total pressure (thermal plus magnetic) varies by " + num(100 * (hi - lo) / hi) +
                "% along the tube: it is not in force balance, and the linearized run treats it as held by an "
                "external force (it does not evolve)");
  return w;
}

template struct ModelSetup<Linearized<Mhd>>;
template struct ModelSetup<Linearized<HallMhd>>;
template struct ModelSetup<Linearized<TwoFluid>>;

DispersionInput dispersion_input(const io::RunFile& rf, const CaseSetup& c, real x, real k_perp) {
  const std::string eq = rf.get_string("model.equations");
  if (eq == "mhd") return dispersion_input_for(ModelSetup<Mhd>::make(rf, c), c, x, k_perp);
  if (eq == "hall") return dispersion_input_for(ModelSetup<HallMhd>::make(rf, c), c, x, k_perp);
  if (eq == "two-fluid") return dispersion_input_for(ModelSetup<TwoFluid>::make(rf, c), c, x, k_perp);
  rf.fail("model.equations", "model '" + eq + "' has no linear form in this tubewave");
}

std::vector<VariableInfo> linear_variables(const std::string& equations) {
  if (equations == "hall") return LinearForm<HallMhd>::variables();
  if (equations == "two-fluid") return LinearForm<TwoFluid>::variables();
  return LinearForm<Mhd>::variables();
}

}  // namespace tw
