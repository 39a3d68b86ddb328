// Open ends: a shear Alfven tone burst leaves the tube through an open (characteristic)
// end, with or without an absorbing layer, and less than 1% of its amplitude comes back.
//
// Reference: an exactly non-reflecting end returns nothing; the characteristic treatment
// (incoming characteristics set to the background, e.g. Thompson 1987, "Time dependent
// boundary conditions for hyperbolic systems", J. Comput. Phys. 68, 1 [from memory]) is
// exact for linear waves up to the scheme's truncation error. The 1% bound is the
// requirement of the issue. The reflection is measured two ways: the energy of the
// backward (Elsasser) part crossing a plane upstream of the end, relative to the
// incident energy (the region diagnostic), and the largest transverse velocity left in
// the tube after the burst has gone.
#include <catch2/catch.hpp>
#include <cmath>

#include "io/h5read.hpp"
#include "support/run_support.hpp"

using namespace tw::test;

namespace {

const char* kBurst = R"(
title: tone burst leaving through an open end
plasma: {ion: He, density: 1.5e18, electron_temperature: 6, ion_temperature: 1, field: 0.1}
grid: {length: 20.0, cells: 800}
time: {end: 40.0e-6}
boundaries:
  left: {kind: driven, velocity_amplitude: 1000, waveform: tone-burst, frequency: 200.0e3, cycles: 3}
  right: {kind: open}
output:
  snapshot_interval: 4.0e-6
  probe_interval: 0.02e-6
  regions: [{name: end, from: 10.0, to: 19.9}]
)";

double max_abs(const std::vector<double>& v) {
  double m = 0;
  for (double q : v) m = std::max(m, std::abs(q));
  return m;
}

}  // namespace

TEST_CASE("a shear Alfven tone burst leaves through an open end reflecting < 1%", "[validation][open]") {
  // 200 kHz in He+ at 0.1 T, 1.5e18 m^-3: v_A = 0.89 Mm/s, wavelength 4.5 m, 180 cells per
  // wavelength. The burst (3 cycles, 15 us) has left through x = 20 m by t = 40 us.
  for (const char* layer : {"", "1.5"}) {
    INFO("absorbing layer width: " << (*layer ? layer : "none"));
    ScratchDir dir("open-end");
    std::vector<std::string> ov;
    if (*layer) ov.push_back(std::string("boundaries.right.layer_width=") + layer);
    const RunOutput r = run_text(kBurst, ov, dir);
    REQUIRE(r.summary.outcome == "completed");
    tw::io::H5Reader h(r.file);
    const double inc = h.read_real("/regions/end/incident_energy")[0];
    const double refl = h.read_real("/regions/end/reflection")[0];
    REQUIRE(inc > 0);
    INFO("amplitude reflection from energies: " << refl);
    CHECK(refl < 0.01);
    // Transmission through the plane at x = 19.9 m (inside a layer it is absorbed instead).
    if (!*layer) CHECK(h.read_real("/regions/end/transmission")[0] == Approx(1.0).epsilon(0.01));
    // After the burst: what is left in the tube is below 1% of the drive amplitude.
    const double left_over = max_abs(r.last.at("velocity_y"));
    INFO("largest v_y left in the tube: " << left_over << " m/s");
    CHECK(left_over < 0.01 * 1000);
  }
}

TEST_CASE("open ends let compressive waves out as if the tube went on", "[validation][open]") {
  // A pressure jump along an oblique field (30 degrees) splits into fast and slow waves
  // running both ways, leaving flowing intermediate states and a contact. The same
  // problem in a tube six times longer, whose ends the waves never reach, is the
  // reference: inside [0, 10] m the open-ended run must match it after the fast waves
  // have left (80 us). Beyond the ends lies the initial state, which is what the open
  // ends assume. Bound: 1% of the jump in pressure and of the largest flow.
  ScratchDir dir("open-compressive");
  const std::string text = R"(
plasma: {ion: H, density: 1.0e19, electron_temperature: 20, ion_temperature: 20, field: 0.05, field_angle_deg: 30}
grid: {length: 10.0, cells: 200}
time: {end: 80.0e-6}
initial: {kind: riemann, position: 5.0, left: {pressure: 70.0}}
boundaries: {left: {kind: open}, right: {kind: open}}
output: {snapshot_interval: 80.0e-6}
)";
  const RunOutput a = run_text(text, {}, dir, "short.h5");
  const RunOutput b = run_text(text, {"grid.x_min=-25", "grid.length=60", "grid.cells=1200",
                                      "boundaries.left.kind=zero-gradient", "boundaries.right.kind=zero-gradient"},
                               dir, "long.h5");
  REQUIRE(a.summary.outcome == "completed");
  REQUIRE(b.summary.outcome == "completed");
  const double jump = a.first.at("pressure").front() - a.first.at("pressure").back();
  REQUIRE(jump > 1);
  std::size_t i0 = 0;
  while (b.x[i0] < a.x[0] - 1e-9) ++i0;
  REQUIRE(std::abs(b.x[i0] - a.x[0]) < 1e-9);
  double dp = 0, du = 0, umax = 0;
  for (std::size_t i = 0; i < a.x.size(); ++i) {
    dp = std::max(dp, std::abs(a.last.at("pressure")[i] - b.last.at("pressure")[i0 + i]));
    du = std::max(du, std::abs(a.last.at("velocity_x")[i] - b.last.at("velocity_x")[i0 + i]));
    umax = std::max(umax, std::abs(b.last.at("velocity_x")[i0 + i]));
  }
  INFO("pressure difference " << dp / jump << " of the jump; flow difference " << du / umax << " of the flow");
  CHECK(dp < 0.01 * jump);
  CHECK(du < 0.01 * umax);
}
