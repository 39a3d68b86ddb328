// Conservation: with periodic ends, the finite-volume update changes the totals only by
// round-off; with open ends, totals change exactly by the time-integrated boundary fluxes.
#include <catch2/catch.hpp>
#include <cmath>

#include "support/run_support.hpp"

using namespace tw::test;

namespace {

double max_abs(const std::vector<double>& v) {
  double m = 0;
  for (double q : v) m = std::max(m, std::abs(q));
  return m;
}

/// Check total(t) - total(0) == inflow(t) for every conserved quantity, relative to the
/// natural scale of its group (a component with no wave in it has a total of zero, so
/// the scale comes from its siblings: B_z for B_y, the momentum sqrt(2 M E) for momenta).
void check_conserved(const RunOutput& r, double rel_tol) {
  const auto& h = r.history;
  const double mass = max_abs(h.at("mass_total")), energy = max_abs(h.at("energy_total"));
  const double flux = std::max(max_abs(h.at("magnetic_flux_y_total")), max_abs(h.at("magnetic_flux_z_total")));
  const double momentum = std::max({std::sqrt(2 * mass * energy), max_abs(h.at("momentum_x_total")),
                                    max_abs(h.at("momentum_y_total")), max_abs(h.at("momentum_z_total"))});
  const std::pair<const char*, double> quantities[] = {
      {"mass", mass}, {"momentum_x", momentum}, {"momentum_y", momentum}, {"momentum_z", momentum},
      {"magnetic_flux_y", flux}, {"magnetic_flux_z", flux}, {"energy", energy}};
  for (const auto& [q, scale] : quantities) {
    const auto& total = h.at(std::string(q) + "_total");
    const auto& inflow = h.at(std::string(q) + "_inflow");
    if (scale == 0) continue;
    double worst = 0;
    for (std::size_t k = 0; k < total.size(); ++k)
      worst = std::max(worst, std::abs(total[k] - total[0] - inflow[k]) / scale);
    INFO(q << ": largest |total - initial - inflow| / scale = " << worst << " (tolerance " << rel_tol << ")");
    CHECK(worst < rel_tol);
  }
}

}  // namespace

TEST_CASE("periodic MHD conserves mass, momentum, flux and energy to round-off", "[unit][mhd][conservation]") {
  // A large-amplitude fast wave steepens into shocks: the nonlinear fluxes, limiter and
  // HLLD all act, and the totals must still hold to round-off (1e-12 relative, a few
  // hundred steps of sums of ~1e3 terms).
  ScratchDir dir("conserve");
  const RunOutput r = run_config("configs/mhd_linear_wave.yaml",
                                 {"initial.mode=fast", "initial.amplitude=0.2", "time.end=2.0", "grid.cells=200",
                                  "output.history_interval=0.05"},
                                 dir);
  REQUIRE(r.summary.outcome == "completed");
  check_conserved(r, 1e-12);
  // The inflow columns must be identically zero with periodic ends.
  for (double v : r.history.at("energy_inflow")) CHECK(v == 0.0);
}

TEST_CASE("open ends: totals change by exactly the boundary fluxes", "[unit][mhd][conservation]") {
  // Sod problem with zero-gradient ends and the waves reaching the ends: the budget
  // total(t) - total(0) = integrated inflow must close to round-off, because the boundary
  // fluxes are integrated with the Runge-Kutta weights of the cell update.
  ScratchDir dir("open-budget");
  const RunOutput r = run_config("configs/sod_shock_tube.yaml",
                                 {"time.end=0.4", "output.history_interval=0.01", "numerics.integrator=ssp-rk3"}, dir);
  REQUIRE(r.summary.outcome == "completed");
  // Something did flow out: mass and energy left through the ends.
  CHECK(std::abs(r.history.at("mass_inflow").back()) > 1e-3);
  check_conserved(r, 1e-12);
}
