// The sweep's closed-form predictions (src/sweep/predict.*) against the check values of
// the project's validation sheet (/work/shared/design/validation.md, whose numbers are
// recomputed by refvalues.py): Hall-MHD parallel branches (section 3), the Boris-corrected
// shear Alfven speed (section 2), resistive and viscous damping (section 6) and the
// ideal-MHD speeds at 45 degrees (section 3, the bracketed ideal values). Normalised
// background: rho0 = B0 = mu0 = 1, so v_A = 1, and with h = v_A d_i = 1, omega_ci = 1.
#include <catch2/catch.hpp>
#include <cmath>
#include <numbers>

#include "sweep/predict.hpp"

using tw::sweep::Background;
using tw::sweep::closed_form_given_frequency;
using tw::sweep::closed_form_given_wavenumber;
using tw::sweep::closed_form_omega;

namespace {

Background hall_background() {
  Background bg;
  bg.normalized = true;
  bg.values = {{"initial_mean_mass_density", 1.0}, {"mu0", 1.0}, {"field_x", 1.0}, {"hall_coefficient", 1.0}};
  return bg;
}

}  // namespace

TEST_CASE("sweep predictions: Hall-MHD R and L branches match the validation sheet (section 3)", "[unit]") {
  // Sheet section 3 (standard Hall-MHD result, e.g. Huba 2003 [from memory]), printed to
  // 6 decimals: the tolerance is half a unit of the last printed digit.
  const Background bg = hall_background();
  struct Row {
    double kdi, wR, wL, vgR, vgL;
  };
  for (const Row r : {Row{0.1, 0.105125, 0.095125, 1.103746, 0.903746}, Row{0.5, 0.640388, 0.390388, 1.591410, 0.591410},
                      Row{1.0, 1.618034, 0.618034, 2.341641, 0.341641}, Row{3.0, 9.908327, 0.908327, 6.050851, 0.050851}}) {
    INFO("k d_i = " << r.kdi);
    CHECK(closed_form_omega("hall-right", bg, r.kdi).real() == Approx(r.wR).margin(5e-7));
    CHECK(closed_form_omega("hall-left", bg, r.kdi).real() == Approx(r.wL).margin(5e-7));
    const auto right = closed_form_given_wavenumber("hall-right", bg, r.kdi);
    const auto left = closed_form_given_wavenumber("hall-left", bg, r.kdi);
    // Group speeds come from a central difference of relative step 1e-6: error ~1e-10.
    CHECK(right.at("group_speed") == Approx(r.vgR).margin(5e-7));
    CHECK(left.at("group_speed") == Approx(r.vgL).margin(5e-7));
    CHECK(left.at("phase_speed") == Approx(r.wL / r.kdi).margin(5e-7));
    CHECK(left.at("damping_rate") == Approx(0).margin(1e-15));
  }
}

TEST_CASE("sweep predictions: at a drive frequency the wavenumber is the branch's root", "[unit]") {
  // Inverting the sheet's k d_i = 1 row: omega_L = (sqrt 5 - 1)/2 and omega_R = (1 + sqrt 5)/2
  // (golden-ratio exact) must give k = 1 back; Newton's method converges to ~1e-14.
  const Background bg = hall_background();
  const double phi = (1 + std::sqrt(5.0)) / 2;
  const auto left = closed_form_given_frequency("hall-left", bg, phi - 1);
  const auto right = closed_form_given_frequency("hall-right", bg, phi);
  CHECK(left.at("wavenumber") == Approx(1.0).epsilon(1e-10));
  CHECK(right.at("wavenumber") == Approx(1.0).epsilon(1e-10));
  CHECK(left.at("wavelength") == Approx(2 * std::numbers::pi).epsilon(1e-10));
  CHECK(left.at("frequency") == Approx((phi - 1) / (2 * std::numbers::pi)).epsilon(1e-14));
  CHECK(left.at("spatial_damping_rate") == Approx(0).margin(1e-12));
  CHECK(std::isinf(left.at("damping_length")));
}

TEST_CASE("sweep predictions: the displacement current slows the Alfven wave by the Boris factor", "[unit]") {
  // Sheet section 2 (Boris 1970; Gombosi et al. 2002 [from memory]): v/v_A = 1/sqrt(1 + (v_A/c)^2)
  // = 0.707107 at c = v_A and 0.894427 at c = 2 v_A (6 printed decimals).
  Background bg = hall_background();
  bg.values["hall_coefficient"] = 0;
  bg.values["displacement_light_speed"] = 1.0;
  CHECK(closed_form_omega("hall-left", bg, 1.0).real() == Approx(0.707107).margin(5e-7));
  bg.values["displacement_light_speed"] = 2.0;
  CHECK(closed_form_omega("hall-right", bg, 1.0).real() == Approx(0.894427).margin(5e-7));
}

TEST_CASE("sweep predictions: resistive and viscous damping of the shear Alfven wave (section 6)", "[unit]") {
  // Sheet section 6 (Landau & Lifshitz, Electrodynamics of Continuous Media [from memory]):
  // omega = -i (eta_m + nu) k^2/2 + sqrt(k^2 v_A^2 - ((eta_m - nu) k^2/2)^2); 6 printed decimals.
  Background bg = hall_background();
  bg.values.erase("hall_coefficient");
  bg.values["gamma"] = 5.0 / 3.0;
  bg.values["initial_mean_pressure"] = 0.3;
  struct Row {
    double k, eta_m, nu, gamma, w;
  };
  const double tau = 2 * std::numbers::pi;
  for (const Row r : {Row{tau, 0.01, 0, 0.197392, 6.280084}, Row{tau, 0.01, 0.01, 0.394784, 6.283185},
                      Row{tau, 0.05, 0, 0.986960, 6.205185}, Row{2 * tau, 0.01, 0, 0.789568, 12.541541}}) {
    bg.values["resistivity"] = r.eta_m;  // mu0 = 1: eta = eta_m
    bg.values["viscosity"] = r.nu;
    const auto q = closed_form_given_wavenumber("mhd-alfven-resistive", bg, r.k);
    CHECK(q.at("damping_rate") == Approx(r.gamma).margin(5e-7));
    CHECK(q.at("angular_frequency") == Approx(r.w).margin(5e-7));
  }
  // A driven wave: the complex k with omega(k) = omega real (Newton's method, to round-off),
  // whose imaginary part, the spatial decay, is about gamma / v_g for weak damping (the
  // relation holds to first order; gamma/omega = 0.031 here, so 1% is allowed).
  bg.values["resistivity"] = 0.01;
  bg.values["viscosity"] = 0;
  const double w = closed_form_omega("mhd-alfven-resistive", bg, tau).real();
  const auto d = closed_form_given_frequency("mhd-alfven-resistive", bg, w);
  const auto root = closed_form_omega("mhd-alfven-resistive", bg, {d.at("wavenumber"), d.at("spatial_damping_rate")});
  CHECK(root.real() == Approx(w).epsilon(1e-12));
  CHECK(root.imag() == Approx(0).margin(1e-12));
  CHECK(d.at("spatial_damping_rate") == Approx(0.197392 / d.at("group_speed")).epsilon(1e-2));
  CHECK(d.at("damping_length") == Approx(1 / d.at("spatial_damping_rate")));
}

TEST_CASE("sweep predictions: ideal-MHD speeds at 45 degrees with c_s^2 = v_A^2 / 2", "[unit]") {
  // Sheet section 3, ideal MHD in brackets at k d_i = 0.1: omega/omega_ci = 0.043702 (slow),
  // 0.070711 (Alfven), 0.114412 (fast), i.e. speeds 10x those (Goedbloed & Poedts 2004, ch. 5
  // [from memory]). |B| = 1 at 45 degrees from x; a^2 = gamma p / rho = 0.5.
  Background bg;
  const double c = std::sqrt(0.5);
  bg.values = {{"initial_mean_mass_density", 1.0}, {"mu0", 1.0}, {"field_x", c}, {"initial_mean_magnetic_field_z", c},
               {"gamma", 5.0 / 3.0}, {"initial_mean_pressure", 0.3}};
  CHECK(closed_form_omega("mhd-slow", bg, 0.1).real() == Approx(0.043702).margin(5e-7));
  CHECK(closed_form_omega("mhd-alfven", bg, 0.1).real() == Approx(0.070711).margin(5e-7));
  CHECK(closed_form_omega("mhd-fast", bg, 0.1).real() == Approx(0.114412).margin(5e-7));
  // An isothermal closure uses its sound speed instead of gamma p / rho.
  bg.values["isothermal_sound_speed"] = c;
  bg.values["initial_mean_pressure"] = 99.0;
  CHECK(closed_form_omega("mhd-fast", bg, 0.1).real() == Approx(0.114412).margin(5e-7));
}

TEST_CASE("sweep predictions: every closed form is a registered source and a missing value is an input error", "[unit]") {
  for (const char* id : {"mhd-fast", "mhd-alfven", "mhd-slow", "mhd-alfven-resistive", "hall-right", "hall-left"})
    CHECK(tw::sweep::find_prediction_source(id) != nullptr);
  CHECK(tw::sweep::find_prediction_source("no-such-branch") == nullptr);
  Background empty;
  CHECK_THROWS_AS(closed_form_omega("mhd-alfven", empty, 1.0), tw::InputError);
  CHECK(tw::sweep::quantity_unit("phase_speed", false) == "m/s");
  CHECK(tw::sweep::quantity_unit("phase_speed", true) == "1");
}

#include "io/h5read.hpp"
#include "sim/run.hpp"
#include "sweep/sweep_support.hpp"

TEST_CASE("sweep predictions: one forward branch of tubewave modes is the closed-form shear Alfven wave", "[unit]") {
  // The tiny column (ideal MHD, B along x), run once for its background: the eigenvalues of
  // its linearized equations at k = 0.7 rad/m include the shear Alfven wave omega = v_A k
  // (validation sheet section 2), the closed form mhd-alfven on the same background. The
  // eigen-solve is accurate to round-off; 1e-6 allows for the Jacobians' finite differences.
  const tw::test::ScratchDir dir("sweep-modes");
  tw::test::write_text(dir / "base.yaml", tw::test::tiny_column_yaml());
  const tw::io::RunFile rf = tw::load_run_file((dir / "base.yaml").string());
  tw::RunOptions opt;
  opt.output_override = (dir / "run.h5").string();
  REQUIRE(tw::run_case(rf, opt).outcome == "completed");
  const Background bg = tw::sweep::read_background(tw::io::H5Reader((dir / "run.h5").string()), false);
  const double expected = closed_form_given_wavenumber("mhd-alfven", bg, 0.7).at("phase_speed");
  tw::sweep::PredictionInput in{bg, &rf, "", std::nullopt, 0.7};
  int matches = 0;
  for (int n = 1; n <= 8; ++n) {
    const auto* src = tw::sweep::find_prediction_source("modes:" + std::to_string(n));
    REQUIRE(src != nullptr);
    try {
      if (std::abs(src->predict(in).at("phase_speed") / expected - 1) < 1e-6) ++matches;
    } catch (const tw::InputError&) {  // fewer forward branches than n
    }
  }
  CHECK(matches >= 1);
}
