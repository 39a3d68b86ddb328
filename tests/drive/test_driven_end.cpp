// A plate-driven end launches a shear Alfvén wave of the plate's velocity amplitude that
// travels at the Alfvén speed.
//
// Reference: linear ideal MHD along B0 (e.g. Goedbloed & Poedts 2004, "Principles of
// Magnetohydrodynamics", ch. 5 — from memory): a transverse velocity imposed on line-tied
// field lines launches v_perp(x, t) = v_plate(t - x / v_A) with v_A = B0 / sqrt(mu0 rho),
// rho = n_i m_i + n_e m_e. Here v_A is computed from CODATA 2018 constants and the He atomic
// weight 4.002602 u, independently of the solver.
#include <catch2/catch.hpp>
#include <cmath>
#include <complex>
#include <numbers>

#include "core/constants.hpp"
#include "support/run_support.hpp"

using namespace tw::test;

TEST_CASE("driven end launches an Alfvén wave at v_A with the plate amplitude", "[validation][drive]") {
  namespace k = tw::constants;
  const double n_e = 1.5e18, B = 0.1, f = 100e3, A = 2000.0;
  const double rho = n_e * 4.002602 * k::u;  // He+ ion plus its electron = the atom
  const double v_A = B / std::sqrt(k::mu0 * rho);
  // Far end open (zero gradient) and far away: probes at 4 m and 8 m see only the
  // outgoing wave until t_end.
  ScratchDir dir("driven");
  const double t_end = 70e-6;  // reflections from the far end reach 8 m after 80 us
  const std::string text = R"(
title: plate-driven shear Alfven wave
plasma: {ion: He, density: 1.5e18, electron_temperature: 6, ion_temperature: 1, field: 0.1}
grid: {length: 40.0, cells: 2000}
time: {end: 70.0e-6}
boundaries:
  left: {kind: driven, velocity_amplitude: 2000.0, frequency: 100.0e3, polarization: y, ramp_periods: 2}
  right: {kind: zero-gradient}
output: {snapshot_interval: 10.0e-6, probe_interval: 2.0e-8, probes: [4.0, 8.0]}
)";
  const RunOutput r = run_text(text, {}, dir);
  REQUIRE(r.summary.outcome == "completed");
  REQUIRE(r.n_probes == 2);
  const auto& t = r.probes.at("time");
  const auto& vy = r.probes.at("velocity_y");
  auto sample = [&](std::size_t it, std::size_t p) { return vy[it * 2 + p]; };

  // Nothing arrives before the Alfvén front (ramp starts at t = 0): at the 8 m probe,
  // |v_y| stays below 1e-3 A until 0.9 x / v_A.
  for (std::size_t it = 0; it < t.size(); ++it)
    if (t[it] < 0.9 * 8.0 / v_A) CHECK(std::abs(sample(it, 1)) < 1e-3 * A);

  // Complex amplitude at the drive frequency over whole periods after the ramp (2
  // periods) has passed the farther probe.
  const double w = 2 * std::numbers::pi * f;
  const double t0 = 8.0 / v_A + 2.5 / f;
  const int periods = static_cast<int>(std::floor((t_end - t0) * f));
  REQUIRE(periods >= 3);
  std::complex<double> a[2];
  int count = 0;
  for (std::size_t it = 0; it < t.size(); ++it) {
    if (t[it] < t0 || t[it] >= t0 + periods / f) continue;
    ++count;
    for (std::size_t p = 0; p < 2; ++p) a[p] += sample(it, p) * std::exp(std::complex<double>(0, -w * t[it]));
  }
  for (auto& q : a) q *= 2.0 / count;
  // Amplitude within 2% of the plate's (the scheme's damping over 8 m is small at
  // 40 cells per wavelength).
  CHECK(std::abs(a[0]) == Approx(A).epsilon(0.02));
  CHECK(std::abs(a[1]) == Approx(A).epsilon(0.02));
  // Phase delay between the probes gives the phase speed: within 1% of v_A.
  const double dphi = std::arg(a[0] / a[1]);  // > 0: the 8 m probe lags
  const double v_meas = w * 4.0 / dphi;
  INFO("measured " << v_meas << " m/s, v_A " << v_A << " m/s");
  CHECK(std::abs(v_meas - v_A) / v_A < 0.01);
}
