// The drive waveform library (drive/waveform.hpp): each shape against its defining
// formula, polarization, mean squares and averaging windows; and the run-file errors of
// drives (tables with file and row, inconsistent keys).
#include <catch2/catch.hpp>
#include <cmath>
#include <numbers>

#include "drive/waveform.hpp"
#include "sim/case.hpp"
#include "sim/drives.hpp"
#include "sim/run.hpp"
#include "support/test_support.hpp"

using Catch::Matchers::Contains;
using namespace tw;
using namespace tw::test;

namespace {
constexpr double pi = std::numbers::pi;

/// Zero crossings of the in-phase signal on (t0, t1), sampled finely.
int zero_crossings(const Waveform& w, double t0, double t1, int n = 200000) {
  int c = 0;
  double prev = w.at(t0).in_phase;
  for (int k = 1; k <= n; ++k) {
    const double v = w.at(t0 + (t1 - t0) * k / n).in_phase;
    if ((v > 0) != (prev > 0) && v != 0 && prev != 0) ++c;
    if (v != 0) prev = v;
  }
  return c;
}
}  // namespace

TEST_CASE("continuous waveform: sin^2 turn-on, then a unit sine", "[unit][waveform]") {
  const double f = 1e5, T = 1 / f;
  const Waveform w = Waveform::continuous(f, 2 * T);
  CHECK(w.at(-1e-9).in_phase == 0);
  CHECK(w.at(0).in_phase == 0);
  // Half-way through the ramp the envelope is sin^2(pi/4) = 1/2.
  const double tq = 1.25 * T;  // sin(2 pi f t) = 1 there
  CHECK(w.at(tq).in_phase == Approx(std::pow(std::sin(0.5 * pi * tq / (2 * T)), 2)));
  CHECK(w.at(5.25 * T).in_phase == Approx(1.0));
  CHECK(w.at(5.25 * T).quadrature == Approx(0.0).margin(1e-12));
  CHECK(w.at(5.0 * T).quadrature == Approx(-1.0));  // sin -> -cos, a quarter period behind
  CHECK(w.is_continuous());
  CHECK(std::isinf(w.end_time()));
  CHECK(w.settled_time() == Approx(2 * T));
}

TEST_CASE("tone bursts: N cycles under a Hann or Tukey window, nothing after", "[unit][waveform]") {
  const double f = 2e5;
  const Waveform h = Waveform::tone_burst(f, 5, Window::hann);
  CHECK(h.end_time() == Approx(5 / f));
  CHECK(zero_crossings(h, 1e-12, 5 / f - 1e-12) == 9);  // 5 cycles of sin: 9 inner zeros
  CHECK(h.at(5 / f + 1e-9).in_phase == 0);
  // Hann: W(u) = sin^2(pi u); at the middle of the burst the carrier phase is 5 pi.
  const double tm = 2.25 / f;
  CHECK(h.at(tm).in_phase == Approx(std::pow(std::sin(pi * tm * f / 5), 2) * std::sin(2 * pi * f * tm)));
  // Tukey with taper 0.4: flat between 20% and 80% of the burst, Hann-like tapers.
  const Waveform t = Waveform::tone_burst(f, 5, Window::tukey, 0.4);
  CHECK(t.at(1.25 / f).in_phase == Approx(1.0));  // u = 0.25, phase pi/2 + 2 pi
  CHECK(t.at(0.25 / f).in_phase == Approx(0.5 * (1 - std::cos(2 * pi * 0.05 / 0.4))));
  // Taper 1 is Hann, taper 0 a rectangle.
  const Waveform t1 = Waveform::tone_burst(f, 5, Window::tukey, 1.0);
  CHECK(t1.at(tm).in_phase == Approx(h.at(tm).in_phase));
  const Waveform t0 = Waveform::tone_burst(f, 5, Window::tukey, 0.0);
  CHECK(t0.at(0.25 / f).in_phase == Approx(1.0));
}

TEST_CASE("chirp sweeps the frequency linearly", "[unit][waveform]") {
  const double f0 = 1e5, f1 = 3e5, T = 100e-6;
  const Waveform c = Waveform::chirp(f0, f1, T, 0.0);
  // Number of cycles = integral of f dt = (f0 + f1) T / 2 = 20: 2 * 20 - 1 inner zeros.
  CHECK(zero_crossings(c, 1e-12, T - 1e-12, 400000) == 39);
  // Instantaneous frequency from the phase atan2(s, -q) (s = sin phi, q = -cos phi under
  // the flat window): f(t) = f0 + (f1 - f0) t / T.
  auto phase = [&](double t) { return std::atan2(c.at(t).in_phase, -c.at(t).quadrature); };
  for (double t : {0.1 * T, 0.5 * T, 0.9 * T}) {
    const double h = 1e-9;
    const double dphi = std::remainder(phase(t + h) - phase(t - h), 2 * pi);
    CHECK(dphi / (2 * h) / (2 * pi) == Approx(f0 + (f1 - f0) * t / T).epsilon(1e-6));
  }
  CHECK(c.at(T + 1e-9).in_phase == 0);
}

TEST_CASE("gaussian pulse: envelope of the given full width at half maximum", "[unit][waveform]") {
  const Waveform g = Waveform::gaussian_pulse(0, 2e-6, 5e-6);
  CHECK(g.at(5e-6).in_phase == Approx(1.0));
  CHECK(g.at(6e-6).in_phase == Approx(0.5));
  CHECK(g.at(4e-6).in_phase == Approx(0.5));
  CHECK_FALSE(g.has_quadrature());
  const Waveform gc = Waveform::gaussian_pulse(1e6, 2e-6, 5e-6);
  CHECK(gc.has_quadrature());
  CHECK(gc.at(5e-6 + 0.25e-6).in_phase == Approx(std::exp(-4 * std::log(2.0) / 64)));
}

TEST_CASE("sum of tones and tabulated waveforms", "[unit][waveform]") {
  const Waveform s = Waveform::tones({{1e5, 1.0, 0.0}, {3e5, 0.5, pi / 2}}, 0.0);
  const double t = 3.3e-6;
  CHECK(s.at(t).in_phase == Approx(std::sin(2 * pi * 1e5 * t) + 0.5 * std::sin(2 * pi * 3e5 * t + pi / 2)));
  CHECK(s.frequency() == 1e5);
  Waveform tab = Waveform::table({0, 1e-6, 3e-6}, {0, 2, -2});
  tab.delayed(1e-6);
  CHECK(tab.at(0.5e-6).in_phase == 0);
  CHECK(tab.at(1.5e-6).in_phase == Approx(1.0));
  CHECK(tab.at(3e-6).in_phase == Approx(0.0).margin(1e-12));
  CHECK(tab.at(5e-6).in_phase == 0);  // after the table
  CHECK_FALSE(tab.has_quadrature());
  CHECK(tab.end_time() == Approx(4e-6));
}

TEST_CASE("polarization: linear at an angle, circular of constant magnitude and known sense",
          "[unit][waveform]") {
  const double f = 1e5, A = 3.0;
  DriveSignal d{Waveform::continuous(f, 0.0), {Polarization::Kind::linear, pi / 6}, A};
  const auto v = d.at(0.25 / f);
  CHECK(v[0] == Approx(A * std::cos(pi / 6)));
  CHECK(v[1] == Approx(A * std::sin(pi / 6)));
  d.polarization = {Polarization::Kind::right, 0};
  // Right-handed about +x: the angle from +y toward +z grows with time.
  double prev_angle = std::atan2(d.at(0.1 / f)[1], d.at(0.1 / f)[0]);
  for (int k = 1; k < 4; ++k) {
    const auto a = d.at((0.1 + 0.1 * k) / f);
    CHECK(std::hypot(a[0], a[1]) == Approx(A));
    const double ang = std::atan2(a[1], a[0]);
    CHECK(std::remainder(ang - prev_angle, 2 * pi) == Approx(2 * pi * 0.1));
    prev_angle = ang;
  }
  d.polarization = {Polarization::Kind::left, 0};
  const auto l0 = d.at(0.1 / f), l1 = d.at(0.2 / f);
  CHECK(std::remainder(std::atan2(l1[1], l1[0]) - std::atan2(l0[1], l0[0]), 2 * pi) == Approx(-2 * pi * 0.1));
}

TEST_CASE("mean squares and averaging windows of drives", "[unit][waveform]") {
  const double f = 1e5, A = 2.0;
  DriveSignal lin{Waveform::continuous(f, 2 / f), {}, A};
  const auto w = lin.averaging_window(10.3 / f);
  // Whole periods after the turn-on, ending at t_end: 8 periods.
  CHECK(w[1] == Approx(10.3 / f));
  CHECK((w[1] - w[0]) * f == Approx(8.0));
  CHECK(lin.mean_square(w[0], w[1]) == Approx(A * A / 2).epsilon(1e-6));
  DriveSignal circ{Waveform::continuous(f, 0), {Polarization::Kind::right, 0}, A};
  CHECK(circ.mean_square(0, 3 / f) == Approx(A * A).epsilon(1e-9));
  DriveSignal burst{Waveform::tone_burst(f, 4, Window::hann), {}, A};
  const auto wb = burst.averaging_window(1.0);
  CHECK(wb[0] == 0);
  CHECK(wb[1] == Approx(4 / f));
  // Hann: mean of sin^4(pi u) = 3/8, times the carrier's 1/2.
  CHECK(burst.mean_square(wb[0], wb[1]) == Approx(A * A * 3.0 / 16).epsilon(1e-4));
}

TEST_CASE("drive keys: errors name the key, tables name file and row", "[unit][waveform][drive]") {
  ScratchDir dir("drivekeys");
  auto err = [&](const std::string& left, const std::string& extra = {}) {
    write_text(dir / "d.yaml", "plasma: {ion: He, field: 0.1, density: 1.0e18, electron_temperature: 5}\n"
                               "grid: {length: 10.0, cells: 100}\ntime: {end: 1.0e-6}\n"
                               "boundaries:\n  left: " + left + "\n  right: {kind: open}\n" + extra);
    try {
      const io::RunFile rf = load_run_file((dir / "d.yaml").string());
      (void)check_case(rf);
    } catch (const io::ConfigError& e) {
      CHECK(e.exit_code() == 2);
      return std::string(e.what());
    }
    FAIL("no error for " << left << extra);
    return std::string();
  };
  CHECK_THAT(err("{kind: driven, frequency: 1.0e5}"),
             Contains("boundaries.left") && Contains("a driven end needs velocity_amplitude or field_amplitude"));
  CHECK_THAT(err("{kind: driven, velocity_amplitude: 1, field_amplitude: 1.0e-3, frequency: 1.0e5}"),
             Contains("give one amplitude only"));
  CHECK_THAT(err("{kind: driven, velocity_amplitude: 1}"),
             Contains("a driven end needs a drive frequency: give boundaries.left.frequency > 0"));
  CHECK_THAT(err("{kind: driven, velocity_amplitude: 1, waveform: tone-burst, frequency: 1.0e5}"),
             Contains("the tone-burst waveform needs 'cycles'"));
  CHECK_THAT(err("{kind: driven, velocity_amplitude: 1, frequency: 1.0e5, cycles: 3}"),
             Contains("boundaries.left.cycles") && Contains("the continuous waveform does not take 'cycles'"));
  CHECK_THAT(err("{kind: driven, velocity_amplitude: 1, waveform: tone-burst, frequency: 1.0e5, cycles: 3, taper: 0.3}"),
             Contains("only the tukey window takes a taper"));
  CHECK_THAT(err("{kind: driven, velocity_amplitude: 1, waveform: gaussian-pulse, pulse_width: 1.0e-6, polarization: left}"),
             Contains("boundaries.left.polarization") && Contains("circular polarization needs a waveform with a carrier"));
  CHECK_THAT(err("{kind: driven, velocity_amplitude: 1, frequency: 1.0e5, polarization: z, angle_deg: 10}"),
             Contains("fixes the angle"));
  CHECK_THAT(err("{kind: conducting, frequency: 1.0e5}"),
             Contains("boundaries.left.frequency") && Contains("only a driven end takes 'frequency' (this end is conducting)"));
  CHECK_THAT(err("{kind: conducting, layer_width: 1.0}"), Contains("only an open end takes 'layer_width'"));
  CHECK_THAT(err("{kind: open, layer_damping: 1.0e6}"), Contains("needs an absorbing layer"));
  CHECK_THAT(err("{kind: driven, current_density: 5, frequency: 1.0e5}"), Contains("current_density"));

  write_text(dir / "wave.csv", "time,value\n0,0\n1e-6,1\n0.5e-6,0\n");
  CHECK_THAT(err("{kind: driven, velocity_amplitude: 1, waveform: table, file: wave.csv}"),
             Contains("wave.csv:4:1") && Contains("row 3: column 'time' must increase") &&
                 Contains("boundaries.left.file"));
  write_text(dir / "wave2.csv", "t,value\n0,0\n1e-6,1\n");
  CHECK_THAT(err("{kind: driven, velocity_amplitude: 1, waveform: table, file: wave2.csv}"),
             Contains("wave2.csv:1:1") && Contains("missing column 'time'"));
  write_text(dir / "wave3.csv", "time,value\n0,0\n1e-6,oops\n");
  CHECK_THAT(err("{kind: driven, velocity_amplitude: 1, waveform: table, file: wave3.csv}"),
             Contains("wave3.csv:3:") && Contains("row 2") && Contains("'oops'"));
  write_text(dir / "wave4.csv", "time,value,extra\n0,0,1\n1e-6,1,1\n");
  CHECK_THAT(err("{kind: driven, velocity_amplitude: 1, waveform: table, file: wave4.csv}"),
             Contains("unknown column 'extra'"));

  const std::string ant = "antennas:\n  - {centre: 5.0, width: 0.5, frequency: 1.0e5, ";
  CHECK_THAT(err("{kind: open}", ant + "sheet_current: 1, current_density: 2}\n"), Contains("give one amplitude only"));
  CHECK_THAT(err("{kind: open}", ant + "sheet_current: 1, relaxation_rate: 1.0e6}\n"),
             Contains("a current antenna has no relaxation rate"));
  CHECK_THAT(err("{kind: open}", "antennas:\n  - {centre: 50.0, width: 0.5, frequency: 1.0e5, sheet_current: 1}\n"),
             Contains("antennas[0].centre") && Contains("outside the tube"));
  CHECK_THAT(err("{kind: open}", "antennas:\n  - {centre: 5.0, width: 0.01, edge: 0, frequency: 1.0e5, sheet_current: 1}\n"),
             Contains("covers no cell centre"));
  CHECK_THAT(err("{kind: open}", "antennas:\n  - {name: a, centre: 5.0, width: 0.5, frequency: 1.0e5, sheet_current: 1}\n"
                                  "  - {name: a, centre: 6.0, width: 0.5, frequency: 1.0e5, sheet_current: 1}\n"),
             Contains("two antennas are named 'a'"));
  CHECK_THAT(err("{kind: open}", "output: {regions: [{from: 3.0, to: 3.0}]}\n"), Contains("a region needs from != to"));
}
