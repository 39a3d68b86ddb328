// Hall MHD: conversions, conservation budgets in every stepping mode, the whistler limit
// in `tubewave check`, and the run-file errors of the Hall and displacement-current keys.
#include <catch2/catch.hpp>
#include <cmath>
#include <string>

#include "models/hall.hpp"
#include "sim/run.hpp"
#include "support/run_support.hpp"

using namespace tw::test;

namespace {

bool contains(const std::string& text, const std::string& part) { return text.find(part) != std::string::npos; }

double max_abs(const std::vector<double>& v) {
  double m = 0;
  for (double q : v) m = std::max(m, std::abs(q));
  return m;
}

/// total(t) - total(0) == inflow(t) for every conserved quantity (as in test_conservation.cpp).
void check_budgets(const RunOutput& r, double rel_tol) {
  const auto& h = r.history;
  const double mass = max_abs(h.at("mass_total")), energy = max_abs(h.at("energy_total"));
  const double flux = std::max(max_abs(h.at("magnetic_flux_y_total")), max_abs(h.at("magnetic_flux_z_total")));
  const double momentum = std::max({std::sqrt(2 * mass * energy), max_abs(h.at("momentum_x_total")),
                                    max_abs(h.at("momentum_y_total")), max_abs(h.at("momentum_z_total"))});
  const std::pair<const char*, double> quantities[] = {
      {"mass", mass}, {"momentum_x", momentum}, {"momentum_y", momentum}, {"momentum_z", momentum},
      {"magnetic_flux_y", std::max(flux, 1e-300)}, {"magnetic_flux_z", std::max(flux, 1e-300)},
      {"energy", energy}, {"electron_entropy", std::max(max_abs(h.at("electron_entropy_total")), 1e-300)}};
  for (const auto& [q, scale] : quantities) {
    const auto& total = h.at(std::string(q) + "_total");
    const auto& inflow = h.at(std::string(q) + "_inflow");
    double worst = 0;
    for (std::size_t k = 0; k < total.size(); ++k)
      worst = std::max(worst, std::abs(total[k] - total[0] - inflow[k]) / scale);
    INFO(q << ": largest |total - initial - inflow| / scale = " << worst);
    CHECK(worst < rel_tol);
  }
}

constexpr const char* kConfig = "configs/hall_whistler.yaml";

/// A Riemann problem with flow, density, pressure and field jumps, oblique field: every
/// term of the model acts.
const char* kRiemann = R"(
units: normalized
model:
  equations: hall
  resistivity: 0.02
  viscosity: 0.01
plasma:
  density: 1
  field: 1
  field_angle_deg: 20
  ion_temperature: 0.1
  electron_temperature: 0.1
grid:
  length: 6
  cells: 48
time:
  end: 0.5
numerics:
  integrator: ssp-rk3
  flux: hll
initial:
  kind: riemann
  left:
    density: 1.5
    pressure: 0.4
    field_y: 0.3
    velocity: [0.1, 0.2, 0]
  right:
    field_z: -0.2
boundaries:
  left: {kind: periodic}
  right: {kind: periodic}
output:
  history_interval: 0.05
  snapshot_interval: 0.5
)";

}  // namespace

TEST_CASE("Hall MHD: primitive and conservative variables convert both ways", "[unit][hall]") {
  using tw::HallMhd;
  HallMhd m;
  m.ideal.mu0 = 1;
  m.ideal.bx = 0.8;
  m.ideal.gamma = 5.0 / 3.0;
  m.reference_density = 1.2;
  m.electron_reference_pressure = 0.3;
  m.electron_sound_speed2 = 0.25;
  const HallMhd::State W{1.3, 0.1, -0.2, 0.3, 0.4, -0.5, 0.9, 0.325};  // p_e = rho c_e^2 = 0.325
  for (auto ec : {tw::ElectronClosure::isothermal, tw::ElectronClosure::adiabatic}) {
    for (double eps : {0.0, 0.4}) {
      m.electron_closure = ec;
      m.ideal.eps_disp = eps;
      const auto back = m.prim_from_cons(m.cons_from_prim(W));
      for (int k = 0; k < HallMhd::n_vars; ++k) CHECK(back[k] == Approx(W[k]).epsilon(1e-13));
      // Isothermal electrons with adiabatic ions: the electron free energy is in E, and
      // the thermal part of energy_density is p_i/(gamma-1) + p_e ln(rho/rho_ref).
      const auto e = m.energy_density(W);
      const double pi_ = W[HallMhd::P] - W[HallMhd::PE];
      const double expect = ec == tw::ElectronClosure::isothermal
                                ? pi_ / (m.ideal.gamma - 1) + W[HallMhd::PE] * std::log(W[0] / 1.2)
                                : W[HallMhd::P] / (m.ideal.gamma - 1);
      CHECK(e.thermal == Approx(expect).epsilon(1e-13));
      CHECK(e.total() == Approx(m.cons_from_prim(W)[HallMhd::EN]).epsilon(1e-13));
    }
  }
}

TEST_CASE("Hall MHD conserves mass, momentum, flux and energy in every stepping mode", "[unit][hall][conservation]") {
  // A large-amplitude oblique wave packet with density and pressure variations exercises
  // every term; with periodic ends the totals hold to round-off, with conducting ends they
  // change by exactly the integrated end fluxes (the split step reports its own).
  ScratchDir dir("hall-conserve");
  for (const char* stepping : {"explicit", "subcycled", "implicit"}) {
    for (const char* ends : {"periodic", "conducting"}) {
      for (const char* electrons : {"isothermal", "adiabatic"}) {
        for (const char* inertia : {"false", "true"}) {
          DYNAMIC_SECTION(stepping << ", " << ends << ", " << electrons << " electrons, inertia " << inertia) {
            const RunOutput r = run_text(
                kRiemann,
                {std::string("model.hall_stepping=") + stepping, std::string("model.electron_closure=") + electrons,
                 std::string("model.electron_inertia=") + inertia, std::string("boundaries.left.kind=") + ends,
                 std::string("boundaries.right.kind=") + ends},
                dir);
            REQUIRE(r.summary.outcome == "completed");
            check_budgets(r, 1e-12);
            if (std::string(ends) == "periodic")
              for (double v : r.history.at("energy_inflow")) CHECK(v == 0.0);
          }
        }
      }
    }
  }
}

TEST_CASE("tubewave check names the whistler limit and the Hall stepping", "[unit][hall][cli]") {
  ScratchDir dir("hall-check");
  const std::string cfg = source_path(kConfig).string();
  const auto ex = run_tubewave("check " + cfg + " --set grid.cells=256", dir.path());
  CHECK(ex.exit_code == 0);
  CHECK(contains(ex.output, "limited by whistler"));
  CHECK(contains(ex.output, "whistler: "));
  const auto im = run_tubewave("check " + cfg + " --set grid.cells=256 --set model.hall_stepping=implicit", dir.path());
  CHECK(im.exit_code == 0);
  CHECK(contains(im.output, "limited by CFL (fastest wave)"));
  CHECK(contains(im.output, "warning: model.hall_stepping: implicit steps past the explicit whistler limit"));
  const auto sub = run_tubewave("check " + cfg + " --set model.hall_stepping=subcycled", dir.path());
  CHECK(contains(sub.output, "warning: model.hall_stepping: subcycled"));
  const auto de = run_tubewave("check " + cfg + " --set model.electron_inertia=true", dir.path());
  CHECK(contains(de.output, "warning: electron inertia: d_e = "));
}

TEST_CASE("Hall and displacement-current keys: bad combinations are rejected with the key named",
          "[unit][hall][config]") {
  ScratchDir dir("hall-errors");
  const std::string cfg = source_path(kConfig).string();
  struct Case {
    std::string set;
    std::string key;
    std::string reason;
  };
  const Case cases[] = {
      {"numerics.integrator=ssp-rk2", "key 'numerics.integrator'", "hall_stepping: explicit needs ssp-rk3"},
      {"model.equations=mhd", "key 'model.electron_closure'", "only the hall model takes 'electron_closure'"},
      {"model.electron_closure=adiabatic --set model.closure=isothermal", "key 'model.electron_closure'",
       "adiabatic electrons need model.closure: adiabatic"},
      {"model.light_speed=3", "key 'model.light_speed'", "only used with model.displacement_current: true"},
      {"model.displacement_current=true --set model.light_speed=2e6", "key 'model.light_speed'",
       "must not exceed c = 1e+06"},
      {"model.resistivity_model=spitzer", "key 'model.resistivity_model'", "needs SI units"},
      {"plasma.field_angle_deg=30", "key 'plasma.field_angle_deg'", "exact only along the background field"},
      {"numerics.flux=hlld", "key 'numerics.flux'", "hlld is for ideal MHD"},
  };
  for (const auto& c : cases) {
    DYNAMIC_SECTION(c.set) {
      const auto r = run_tubewave("check " + cfg + " --set " + c.set, dir.path());
      INFO(r.output);
      CHECK(r.exit_code == 2);
      CHECK(contains(r.output, c.key));
      CHECK(contains(r.output, c.reason));
    }
  }
  SECTION("ideal-MHD eigenmodes are not offered for Hall MHD") {
    std::string yaml = kRiemann;
    yaml = yaml.substr(0, yaml.find("initial:")) + "initial:\n  kind: wave\nboundaries:\n  left: {kind: periodic}\n  right: {kind: periodic}\n";
    tw::test::write_text(dir / "w.yaml", yaml);
    const auto r = run_tubewave("check w.yaml", dir.path());
    INFO(r.output);
    CHECK(r.exit_code == 2);
    CHECK(contains(r.output, "the wave initial state is not available for the hall model"));
  }
}
