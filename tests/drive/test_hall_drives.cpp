// Drives, open ends and budgets with the Hall MHD model.
#include <catch2/catch.hpp>
#include <cmath>
#include <numbers>

#include "core/constants.hpp"
#include "io/h5read.hpp"
#include "support/run_support.hpp"

using namespace tw::test;
namespace k = tw::constants;

namespace {

const char* kSheet = R"(
title: sheet current in Hall MHD
model: {equations: hall}
plasma: {ion: He, density: 1.5e18, electron_temperature: 6, ion_temperature: 1, field: 0.1}
grid: {length: 90.0, cells: 300}
time: {end: 250.0e-6}
boundaries: {left: {kind: open}, right: {kind: open}}
antennas:
  - {name: sheet, shape: gaussian, centre: 45.0, width: 1.2, sheet_current: 100.0, frequency: 20.0e3, ramp_periods: 2}
output: {snapshot_interval: 10.0e-6}
)";

double largest(const std::vector<double>& v) {
  double m = 0;
  for (double q : v) m = std::max(m, std::abs(q));
  return m;
}

}  // namespace

TEST_CASE("Hall MHD: a sheet current radiates the power of its R and L waves and the budget closes",
          "[validation][antenna][hall]") {
  // A linearly polarised sheet current K0 cos(w t) is the sum of a right- and a
  // left-handed one of K0/2 each. Each launches circularly polarised waves both ways with
  // field b = mu0 K/2 (Ampere's law across the sheet); Faraday's law gives the transverse
  // E = (w/k) b = v_ph b of each wave, continuous across the sheet, so the antenna's power
  // -E.J_ext is v_ph mu0 K^2/2 for each handedness. With the Hall-MHD phase speeds at fixed
  // frequency, v_ph^2 = v_A^2 (1 +- w/w_ci) (Hall MHD n^2 = (c^2/v_A^2)/(1 +- w/w_ci),
  // validation.md section 4), the total is
  //   <P> = mu0 K0^2 (v_R + v_L) / 8 = mu0 v_A K0^2 / 4 * (sqrt(1 + e) + sqrt(1 - e)) / 2,
  // e = w / w_ci, times the gaussian's form factor exp(-k^2 sigma^2) as in the MHD test.
  // Here e = 0.052 (the Hall correction is 0.03%, the form factor 0.5%). Tolerance 2% (the
  // issue's). The energy budget closes to 1e-6 of the work for every Hall stepping mode.
  const double rho = 1.5e18 * 4.002602 * k::u, mi = 4.002602 * k::u - k::m_e;
  const double va = 0.1 / std::sqrt(k::mu0 * rho), wci = k::e * 0.1 / mi, w = 2 * std::numbers::pi * 20e3;
  const double e = w / wci, kw = w / va, sigma = 1.2 / (2 * std::sqrt(2 * std::log(2.0)));
  const double expected = k::mu0 * va * 100.0 * 100.0 / 4 * std::exp(-kw * kw * sigma * sigma) * 0.5 *
                          (std::sqrt(1 + e) + std::sqrt(1 - e));
  for (const char* stepping : {"implicit", "subcycled", "explicit"}) {
    INFO("hall_stepping " << stepping);
    ScratchDir dir("hall-sheet");
    std::vector<std::string> ov{std::string("model.hall_stepping=") + stepping};
    if (std::string(stepping) == "explicit") ov.push_back("numerics.integrator=ssp-rk3");
    const RunOutput r = run_text(kSheet, ov, dir);
    REQUIRE(r.summary.outcome == "completed");
    tw::io::H5Reader h(r.file);
    CHECK(h.read_real("/antennas/sheet/mean_power")[0] == Approx(expected).epsilon(0.02));
    const double res = largest(h.read_real("/budget/residual")), work = largest(h.read_real("/budget/antenna_work"));
    INFO("budget residual " << res << " of " << work);
    CHECK(res < 1e-6 * work);
  }
}

TEST_CASE("Hall MHD: open ends with a wavelength-wide absorbing layer reflect < 1%", "[validation][open][hall]") {
  // A right- and a left-handed tone burst at 60 kHz (w/w_ci = 0.16, k d_i ~ 0.2, so the
  // waves are dispersive) leave through an open end with a 15 m absorbing layer (about a
  // wavelength). Reference: the same run in a tube twice as long, from whose far end
  // nothing can come back to x < 45 m in time; there the two must agree within 1% of the
  // drive.
  // (A bare characteristic end, built on the ideal flux, reflects about 6% of these
  // waves: the Hall field across the end is not characteristic; see the README.)
  const std::string text = R"(
model: {equations: hall}
plasma: {ion: He, density: 1.5e18, electron_temperature: 6, ion_temperature: 1, field: 0.1}
grid: {length: 60.0, cells: 400}
time: {end: 110.0e-6}
boundaries:
  left: {kind: driven, velocity_amplitude: 1000, waveform: tone-burst, frequency: 60.0e3, cycles: 3}
  right: {kind: open, layer_width: 15.0}
output: {snapshot_interval: 10.0e-6}
)";
  for (const char* pol : {"right", "left"}) {
    INFO("polarization " << pol);
    ScratchDir dir("hall-open");
    const std::string p = std::string("boundaries.left.polarization=") + pol;
    const RunOutput a = run_text(text, {p}, dir, "short.h5");
    const RunOutput b = run_text(text, {p, "grid.length=120", "grid.cells=800"}, dir, "long.h5");
    REQUIRE(a.summary.outcome == "completed");
    REQUIRE(b.summary.outcome == "completed");
    double worst = 0;
    for (const char* q : {"velocity_y", "velocity_z"})
      for (std::size_t i = 0; i < a.x.size(); ++i)
        if (a.x[i] < 45.0) worst = std::max(worst, std::abs(a.last.at(q)[i] - b.last.at(q)[i]));
    INFO("largest difference " << worst << " m/s");
    CHECK(worst < 0.01 * 1000);
  }
}
