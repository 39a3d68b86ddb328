// The two-fluid shock tube of Hakim, Loverich & Shumlak (2006, J. Comput. Phys. 219, 418,
// "A high resolution wave propagation scheme for ideal Two-Fluid plasma equations"; the
// states as restated in the validation sheet §9): Brio & Wu's MHD shock tube (1988,
// J. Comput. Phys. 75, 400) rescaled to rho_i = 1 | 0.125, p_i = p_e = 5e-5 | 5e-6,
// B = (0.0075, 0.01 | -0.01, 0), c = 1, m_i/m_e = 1836.2, t = 10, on [0, 1].
// gamma = 5/3 (the sheet marks it as unverified; the comparison below uses the same gamma
// for both models, so it does not depend on it). No exact solution exists; as the ion
// inertial length d_i = 1/(q_i/m_i) shrinks, the two-fluid solution must approach the
// ideal-MHD one.
#include <catch2/catch.hpp>
#include <cmath>
#include <sstream>

#include "support/run_support.hpp"

using namespace tw::test;

namespace {

std::string shock_tube(const std::string& model_lines, int cells) {
  std::ostringstream y;
  y << "units: normalized\n"
    << model_lines << "plasma: {density: 1, field: 0.0075, electron_temperature: 5.0e-5, ion_temperature: 5.0e-5}\n"
    << "grid: {length: 1.0, cells: " << cells << "}\n"
    << "time: {end: 10}\n"
    << "initial:\n"
    << "  kind: riemann\n"
    << "  left: {density: 1.0, pressure: 1.0e-4, field_y: 1.0e-2}\n"
    << "  right: {density: 0.125, pressure: 1.0e-5, field_y: -1.0e-2}\n"
    << "boundaries: {left: {kind: zero-gradient}, right: {kind: zero-gradient}}\n"
    << "output: {snapshot_interval: 10, history_interval: 1}\n";
  return y.str();
}

/// Average a fine profile onto `cells` coarse cells.
std::vector<double> restrict_to(const std::vector<double>& fine, std::size_t cells) {
  const std::size_t f = fine.size() / cells;
  std::vector<double> out(cells, 0.0);
  for (std::size_t i = 0; i < fine.size(); ++i) out[i / f] += fine[i] / static_cast<double>(f);
  return out;
}

}  // namespace

TEST_CASE("two-fluid shock tube runs stably and approaches the MHD solution as d_i shrinks",
          "[validation][twofluid][riemann]") {
  // Reference: the MHD model's own solution of the same problem (HLLD, 3200 cells). Norm:
  // the L1 distance per unit length of the total mass density rho_i + rho_e, restricted to
  // the two-fluid grid. Expected: the distance falls as d_i goes 0.1 -> 0.01 -> 0.001
  // (dispersive whistler and ion-cyclotron structure shrinks with d_i), and at d_i = 0.001
  // (800 cells, dx = 1.25 d_i, omega_pe dt = 43, Omega_ce dt = 23: the stiff source at work)
  // it is below 0.01, i.e. about 1% of the density range and within a few times the MHD
  // model's own 800-cell error (~0.0015 with HLL, 0.0011 with HLLD), which it cannot beat:
  // its fluid flux is HLL and it still carries finite-d_i structure. The two larger d_i run
  // on 400 cells (their distance is set by physics, not resolution: 0.054 and 0.020 at 400
  // cells against 0.053 and 0.022 at 800).
  ScratchDir dir("tf-shock");
  const RunOutput mhd = run_text(shock_tube("model: {equations: mhd, gamma: 1.6666666666666667}\nnumerics: {flux: hlld}\n", 3200),
                                 {}, dir, "mhd.h5");
  REQUIRE(mhd.summary.outcome == "completed");
  struct Case {
    const char* di;
    int cells;
  };
  std::vector<double> dist;
  for (const Case cs : {Case{"0.1", 400}, Case{"0.01", 400}, Case{"0.001", 800}}) {
    const std::string model = std::string("normalized: {ion_inertial_length: ") + cs.di +
                              ", light_speed: 1.0, mass_ratio: 1836.2}\n"
                              "model: {equations: two-fluid, gamma: 1.6666666666666667}\n";
    const RunOutput r = run_text(shock_tube(model, cs.cells), {}, dir, std::string("tf") + cs.di + ".h5");
    INFO("d_i = " << cs.di << ": " << r.summary.message);
    REQUIRE(r.summary.outcome == "completed");
    REQUIRE(r.snapshot_times.back() == Approx(10.0));
    const auto ref = restrict_to(mhd.last.at("mass_density"), static_cast<std::size_t>(cs.cells));
    dist.push_back(l1_difference(r.last.at("mass_density"), ref, 1.0 / cs.cells));
    // Energy: total(t) - total(0) is the net inflow through the ends (budget to round-off).
    const auto& e = r.history.at("energy_total");
    const auto& ei = r.history.at("ion_energy_inflow");
    const auto& ee = r.history.at("electron_and_field_energy_inflow");
    for (std::size_t k = 0; k < e.size(); ++k) CHECK(std::abs(e[k] - e[0] - ei[k] - ee[k]) < 1e-12 * e[0]);
    if (std::string(cs.di) == "0.001") {
      // Near the MHD limit the states beyond the fast rarefaction heads (x = 0.32 and 0.87
      // in the scaled Brio-Wu solution) are still the initial ones, within the small
      // whistler precursors that finite d_i allows.
      const auto& rho = r.last.at("mass_density");
      const double rl = 1 + 1 / 1836.2, rr = 0.125 * rl;
      for (std::size_t i = 0; i < r.x.size(); ++i) {
        if (r.x[i] < 0.25) CHECK(std::abs(rho[i] / rl - 1) < 0.01);
        if (r.x[i] > 0.95) CHECK(std::abs(rho[i] / rr - 1) < 0.01);
      }
    }
  }
  INFO("L1 distance to MHD: d_i = 0.1: " << dist[0] << ", 0.01: " << dist[1] << ", 0.001: " << dist[2]);
  CHECK(dist[1] < 0.7 * dist[0]);
  CHECK(dist[2] < 0.5 * dist[1]);
  CHECK(dist[2] < 0.01);
}
