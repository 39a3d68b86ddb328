// Antennas, driven ends and budgets with the two-fluid model (normalized units: d_i = 1,
// v_A ~ 1, omega_ci = 1, a reduced light speed c = 5 and mass ratio 25).
//
// Reference: the cold-plasma R and L waves along B0 (Stix, "Waves in Plasmas", 1992,
// ch. 1-2 [from memory]; validation.md section 4): n^2 = R or L with
//   R = 1 - sum_s w_ps^2 / (w (w + W_s)),  L = 1 - sum_s w_ps^2 / (w (w - W_s)),
// W_s the signed cyclotron frequencies, and v_ph = c / n. The run is nearly cold (T = 0.01,
// c_s = 0.1 v_A) and w = 0.1 w_ci, so the model's waves are these within 0.5%.
#include <catch2/catch.hpp>
#include <cmath>
#include <numbers>

#include "io/h5read.hpp"
#include "support/run_support.hpp"

using namespace tw::test;

namespace {

constexpr double pi = std::numbers::pi;
// Normalized units: n = 1, m_i = 1, e = 1 (d_i = 1 at unit mass density... of the ions),
// eps0 = 1 / c^2, m_e = 1 / 25.
constexpr double c = 5, mr = 25, w = 0.1;

/// Phase speeds of the R and L waves at frequency w.
std::array<double, 2> phase_speeds() {
  const double wpi2 = c * c, wpe2 = mr * c * c, Wi = 1, We = -mr;
  const double R = 1 - wpi2 / (w * (w + Wi)) - wpe2 / (w * (w + We));
  const double L = 1 - wpi2 / (w * (w - Wi)) - wpe2 / (w * (w - We));
  return {c / std::sqrt(R), c / std::sqrt(L)};
}

const char* kBase = R"(
units: normalized
normalized: {ion_inertial_length: 1.0, light_speed: 5.0, mass_ratio: 25}
model: {equations: two-fluid}
plasma: {density: 1.0, field: 1.0, electron_temperature: 0.01, ion_temperature: 0.01}
grid: {length: 270.0, cells: 1080}
time: {end: 189.0}
output: {snapshot_interval: 21.0}
)";

double largest(const std::vector<double>& v) {
  double m = 0;
  for (double q : v) m = std::max(m, std::abs(q));
  return m;
}

}  // namespace

TEST_CASE("two-fluid: a sheet current radiates the power of its R and L waves and the budget closes",
          "[validation][antenna][twofluid]") {
  // As derived in test_hall_drives.cpp: <P> = sum over R and L of mu0 (K0/2)^2 v_ph / 2,
  // each times its gaussian form factor exp(-k^2 sigma^2), k = w / v_ph. The antenna
  // current enters Ampere's law (dE/dt = -J_ext/eps0). Both ends are open with absorbing
  // layers a wavelength wide: a bare characteristic end reflects these waves strongly (they
  // are not characteristics of the flux, which knows only light and sound), see the README.
  // Tolerance 2% (the issue's); at 4 cells per d_i the sheet (FWHM 2 d_i) is resolved
  // (at 2 cells per d_i the power comes out 7% high).
  ScratchDir dir("twofluid-sheet");
  const std::string text = std::string(kBase) + R"(
boundaries: {left: {kind: open, layer_width: 60.0}, right: {kind: open, layer_width: 60.0}}
antennas:
  - {name: sheet, shape: gaussian, centre: 135.0, width: 2.0, sheet_current: 0.01, frequency: 0.015915494309189534, ramp_periods: 1}
)";
  const RunOutput r = run_text(text, {}, dir);
  REQUIRE(r.summary.outcome == "completed");
  tw::io::H5Reader h(r.file);
  const auto v = phase_speeds();
  const double sigma = 2.0 / (2 * std::sqrt(2 * std::log(2.0))), K0 = 0.01;
  double expected = 0;
  for (double vp : v) {
    const double kw = w / vp;
    expected += (K0 / 2) * (K0 / 2) * vp / 2 * std::exp(-kw * kw * sigma * sigma);
  }
  INFO("phase speeds R " << v[0] << ", L " << v[1]);
  CHECK(h.read_real("/antennas/sheet/mean_power")[0] == Approx(expected).epsilon(0.02));
  const double res = largest(h.read_real("/budget/residual")), work = largest(h.read_real("/budget/antenna_work"));
  INFO("budget residual " << res << " of " << work);
  CHECK(res < 1e-6 * work);
}

TEST_CASE("two-fluid: a moving end plate is loaded as its R and L waves predict and the budget closes",
          "[validation][antenna][twofluid]") {
  // The plate moves the plasma at v(t) (both species, and E = -v x B, as a conducting
  // plate does). Each circular component launches E = v B0 and b = E / v_ph, carrying
  // E b / mu0 = B0^2 v^2 / (mu0 v_ph): a linearly polarised plate sees the load
  // <P> / <v^2> = B0^2 (1/v_R + 1/v_L) / (2 mu0) (rho v_A in the MHD limit).
  ScratchDir dir("twofluid-plate");
  const std::string text = std::string(kBase) + R"(
boundaries:
  left: {kind: driven, velocity_amplitude: 0.01, frequency: 0.015915494309189534, ramp_periods: 1}
  right: {kind: open, layer_width: 60.0}
)";
  const RunOutput r = run_text(text, {}, dir);
  REQUIRE(r.summary.outcome == "completed");
  tw::io::H5Reader h(r.file);
  const auto v = phase_speeds();
  const double expected = 0.5 * (1 / v[0] + 1 / v[1]);
  CHECK(h.read_real("/antennas/left_end/load")[0] == Approx(expected).epsilon(0.02));
  const double res = largest(h.read_real("/budget/residual")), in = largest(h.read_real("/budget/inflow_left"));
  INFO("budget residual " << res << " of " << in);
  CHECK(res < 1e-6 * in);
}
