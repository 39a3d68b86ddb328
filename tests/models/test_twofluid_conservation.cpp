// Two-fluid conservation with periodic ends, and the Gauss's-law diagnostic.
#include <catch2/catch.hpp>
#include <cmath>
#include <sstream>

#include "support/run_support.hpp"

using namespace tw::test;

namespace {

double max_abs(const std::vector<double>& v) {
  double m = 0;
  for (double q : v) m = std::max(m, std::abs(q));
  return m;
}

}  // namespace

TEST_CASE("two-fluid: total charge and energy are conserved to round-off with periodic ends",
          "[unit][twofluid][conservation]") {
  // A strongly nonlinear periodic problem: the shock-tube states of the two-fluid Riemann
  // test joined into a ring (two discontinuities), d_i = 0.01, omega_pe dt ~ 4, run until
  // the shocks, light waves and plasma oscillations have crossed the box. The densities
  // are conserved by the flux form (and untouched by the source), so the net charge is;
  // the total energy is the sum of two conserved variables (ion energy, and electron energy
  // plus field energy), and the source step exchanges energy between them exactly.
  // Tolerance: round-off of ~2500 steps of sums over 200 cells (1e-12 relative).
  const std::string yaml =
      "units: normalized\n"
      "normalized: {ion_inertial_length: 0.01, light_speed: 1.0, mass_ratio: 1836.2}\n"
      "model: {equations: two-fluid}\n"
      "plasma: {density: 1, field: 0.0075, electron_temperature: 5.0e-5, ion_temperature: 5.0e-5}\n"
      "grid: {length: 1.0, cells: 200}\n"
      "time: {end: 10}\n"
      "initial:\n"
      "  kind: riemann\n"
      "  left: {density: 1.0, pressure: 1.0e-4, field_y: 1.0e-2, velocity: [0.002, 0.001, 0]}\n"
      "  right: {density: 0.125, pressure: 1.0e-5, field_y: -1.0e-2}\n"
      "boundaries: {left: {kind: periodic}, right: {kind: periodic}}\n"
      "output: {history_interval: 0.25}\n";
  ScratchDir dir("tf-conserve");
  const RunOutput r = run_text(yaml, {}, dir);
  REQUIRE(r.summary.outcome == "completed");
  const auto& h = r.history;
  // Charge: zero initially (n_e = n_i); scale = the ion charge per unit area, 1/d_i * mean n.
  const double charge_scale = 100.0 * 0.5625;
  CHECK(max_abs(h.at("charge_total")) < 1e-12 * charge_scale);
  const auto& e = h.at("energy_total");
  double worst = 0;
  for (double q : e) worst = std::max(worst, std::abs(q - e[0]) / e[0]);
  INFO("largest relative change of the total energy " << worst);
  CHECK(worst < 1e-12);
  // The parts do change (energy moves between ions, electrons and fields), so the check
  // above is not trivially satisfied.
  const auto& ie = h.at("ion_energy_total");
  CHECK(std::abs(ie.back() - ie.front()) > 1e-4 * ie.front());
  for (const char* q : {"ion_mass", "electron_mass", "magnetic_flux_y"}) {
    const auto& tot = h.at(std::string(q) + "_total");
    for (double v : tot) CHECK(std::abs(v - tot[0]) <= 1e-12 * std::max(std::abs(tot[0]), 1e-2));
  }
  for (double v : h.at("energy_total")) CHECK(std::isfinite(v));
}

TEST_CASE("two-fluid: the Gauss's-law residual diagnostic", "[unit][twofluid]") {
  ScratchDir dir("tf-gauss");
  auto run = [&](const std::string& initial, const std::string& end) {
    std::ostringstream y;
    y << "units: normalized\n"
      << "normalized: {ion_inertial_length: 1.0, light_speed: 20, mass_ratio: 100}\n"
      << "model: {equations: two-fluid}\n"
      << "plasma: {density: 1, field: 1, electron_temperature: 0.01, ion_temperature: 0.01}\n"
      << "grid: {length: 0.5, cells: 64}\n"
      << "time: {end: " << end << "}\n"
      << "numerics: {limiter: none}\n"
      << "initial: " << initial << "\n"
      << "boundaries: {left: {kind: periodic}, right: {kind: periodic}}\n"
      << "output: {history_interval: " << end << "}\n";
    return run_text(y.str(), {}, dir);
  };
  SECTION("a uniform neutral plasma has none") {
    const RunOutput r = run("{kind: uniform}", "0.01");
    for (const char* c : {"gauss_residual_max", "gauss_residual_relative", "gauss_residual_per_electron_charge"})
      for (double v : r.history.at(c)) CHECK(v == 0.0);
  }
  SECTION("a Langmuir wave set up from Gauss's law starts with a truncation-size residual and keeps it small") {
    // E_x = (q_e n_e a/(eps0 k)) sin kx sampled at cell centres against n_e = n (1 + a cos kx):
    // the face residual eps0 (E_i+1 - E_i)/dx - (rho_i + rho_i+1)/2 is O((k dx)^2) = 1e-2
    // relative: the sampled difference quotient carries sin(k dx/2)/(k dx/2), the face
    // average cos(k dx/2), so the residual is (k dx)^2/12 = 8e-4 at 64 cells per wavelength.
    // The scheme does not enforce Gauss's law; over a few plasma periods with a resolved
    // Debye length (k lambda_De = 0.06) the residual stays at truncation size.
    const RunOutput r = run("{kind: langmuir, amplitude: 1.0e-3}", "0.1");
    const auto& rel = r.history.at("gauss_residual_relative");
    INFO("relative residual: start " << rel.front() << ", end " << rel.back());
    CHECK(rel.front() > 0);
    CHECK(rel.front() < 5e-3);
    CHECK(rel.back() < 5e-2);
    CHECK(r.history.at("gauss_residual_per_electron_charge").back() < 1e-5);
  }
}
