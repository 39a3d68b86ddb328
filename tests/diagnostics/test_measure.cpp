// `tubewave measure` on synthetic run files: signals with known phase speed, wavelength,
// damping and group speed, plus noise, written with the HDF5 writer (io/output.hpp) in the
// run-file layout, measured through the command line and read back from /measurements.
//
// The signals are exact formulas, so the references are the formulas' own parameters; the
// 0.1% tolerance is the requirement. Each figure must also lie within 4 of its
// own one-sigma uncertainties of the truth (the uncertainties are honest), and noise-free
// figures must not claim more precision than they have.
#include <catch2/catch.hpp>
#include <cmath>
#include <complex>
#include <filesystem>
#include <functional>
#include <numbers>
#include <random>
#include <string>
#include <vector>

#include "diagnostics/fft.hpp"
#include "diagnostics/signal.hpp"
#include "io/h5read.hpp"
#include "io/output.hpp"
#include "support/test_support.hpp"

using Catch::Matchers::Contains;
using tw::test::run_tubewave;
using tw::test::ScratchDir;
namespace fs = std::filesystem;
using cplx = std::complex<double>;

namespace {

constexpr double pi = std::numbers::pi;

/// A synthetic run: a field u(x, t) sampled on a grid and at probes, plus the run file
/// text stored as the resolved run file (measure reads probe positions, periodic ends and
/// the drive frequency from it).
struct Synthetic {
  double length = 10;   // [m]
  int cells = 400;
  double t_end = 100e-6;
  double snapshot_dt = 0.5e-6;
  double probe_dt = 0.1e-6;
  std::vector<double> probes;  // [m]
  bool complex_field = false;
  double noise = 0;            // standard deviation of added Gaussian noise
  std::function<cplx(double, double)> u;
  std::string ends = "left: {kind: driven, velocity_amplitude: 1, frequency: 1.0e5}\n  right: {kind: zero-gradient}";
};

std::string run_file_text(const Synthetic& s) {
  std::string probes = "[";
  for (std::size_t i = 0; i < s.probes.size(); ++i) probes += (i ? ", " : "") + std::to_string(s.probes[i]);
  probes += "]";
  return "title: synthetic\nplasma: {density: 1.0e18, field: 0.1}\ngrid: {length: " + std::to_string(s.length) +
         ", cells: " + std::to_string(s.cells) + "}\ntime: {end: " + std::to_string(s.t_end) +
         "}\nboundaries:\n  " + s.ends + "\noutput: {probes: " + probes + "}\n";
}

/// Write `s` as a complete run file at `path` with the run output's writer.
void write_synthetic(const Synthetic& s, const fs::path& path) {
  std::mt19937_64 rng(20240601);
  std::normal_distribution<double> gauss(0.0, 1.0);
  auto sample = [&](double x, double t) {
    cplx v = s.u(x, t);
    if (s.noise > 0) v += cplx(s.noise * gauss(rng), s.complex_field ? s.noise * gauss(rng) : 0.0);
    return v;
  };
  tw::io::OutputFile out(path.string());
  tw::io::Provenance p;
  p.title = "synthetic";
  p.model = "synthetic";
  p.run_file_name = "synthetic.yaml";
  p.run_file_text = p.resolved_run_file = run_file_text(s);
  out.write_provenance(p);
  const double dx = s.length / s.cells;
  std::vector<double> xc, xf;
  for (int i = 0; i <= s.cells; ++i) xf.push_back(i * dx);
  for (int i = 0; i < s.cells; ++i) xc.push_back((i + 0.5) * dx);
  out.write_grid(xc, xf);
  std::vector<tw::io::ColumnInfo> cols;
  for (const char* name : s.complex_field ? std::vector<const char*>{"velocity_y_re", "velocity_y_im"}
                                          : std::vector<const char*>{"velocity_y"}) {
    tw::io::ColumnInfo c;
    c.name = name;
    c.units = "m/s";
    c.description = "transverse velocity";
    cols.push_back(c);
  }
  auto row = [&](const std::vector<double>& xs, double t) {
    std::vector<double> re, im;
    for (double x : xs) {
      const cplx v = sample(x, t);
      re.push_back(v.real());
      im.push_back(v.imag());
    }
    if (s.complex_field) re.insert(re.end(), im.begin(), im.end());
    return re;
  };
  tw::io::Series snaps = out.create_series("snapshots", cols, s.cells, 1, true);
  const long ns = std::lround(s.t_end / s.snapshot_dt);
  for (long k = 0; k <= ns; ++k) snaps.append(k * s.snapshot_dt, k, row(xc, k * s.snapshot_dt));
  if (!s.probes.empty()) {
    tw::io::Series pr = out.create_series("probes", cols, static_cast<int>(s.probes.size()), 256, false);
    const long np = std::lround(s.t_end / s.probe_dt);
    for (long k = 0; k <= np; ++k) pr.append(k * s.probe_dt, k, row(s.probes, k * s.probe_dt));
  }
  out.close_as("completed", "synthetic", ns, s.t_end, 0);
}

struct Measured {
  double value, sigma;
};

Measured stored(const tw::io::H5Reader& h, const std::string& field, const std::string& name) {
  const std::string path = "/measurements/" + field + "/" + name;
  return {h.read_real(path)[0], h.attr_real(path, "uncertainty")};
}

/// Relative error within `rel` and within 4 sigma of the truth.
void check_figure(const Measured& m, double truth, double rel, const char* what) {
  INFO(what << ": measured " << m.value << " +- " << m.sigma << ", true " << truth);
  CHECK(std::abs(m.value - truth) <= rel * std::abs(truth));
  CHECK(std::abs(m.value - truth) <= 4 * m.sigma);
}

std::string measure(const fs::path& dir, const std::string& args) {
  const auto r = run_tubewave("measure run.h5 " + args, dir);
  INFO(r.output);
  REQUIRE(r.exit_code == 0);
  return r.output;
}

}  // namespace

TEST_CASE("measure: FFT of any length matches the direct DFT", "[unit][measure]") {
  for (std::size_t n : {1u, 2u, 12u, 16u, 17u, 100u}) {
    std::vector<cplx> a(n);
    for (std::size_t j = 0; j < n; ++j) a[j] = cplx(std::sin(1.3 * j + 0.2), std::cos(0.7 * j * j));
    std::vector<cplx> ref(n);
    for (std::size_t m = 0; m < n; ++m)
      for (std::size_t j = 0; j < n; ++j) ref[m] += a[j] * std::polar(1.0, -2 * pi * double(m * j) / double(n));
    tw::diag::dft_inplace(a);
    double err = 0, scale = 0;
    for (std::size_t m = 0; m < n; ++m) {
      err = std::max(err, std::abs(a[m] - ref[m]));
      scale = std::max(scale, std::abs(ref[m]));
    }
    INFO("n = " << n);
    CHECK(err <= 1e-12 * std::max(scale, 1.0));
  }
}

TEST_CASE("measure: line fit, unwrapping and a damped tone recover exact parameters", "[unit][measure]") {
  const std::vector<double> x{0, 1, 2, 3, 4}, y{1, 3, 5, 7, 9};
  const auto f = tw::diag::fit_line(x, y);
  CHECK(f.slope == Approx(2).epsilon(1e-14));
  CHECK(f.intercept == Approx(1).epsilon(1e-14));
  CHECK(f.slope_sigma < 1e-12);
  std::vector<double> ph;
  for (int i = 0; i < 50; ++i) ph.push_back(std::remainder(0.9 * i, 2 * pi));
  tw::diag::unwrap(ph);
  CHECK(ph.back() - ph.front() == Approx(0.9 * 49).epsilon(1e-12));
  // Two series of one tone, omega = 3.1, gamma = 0.2, different amplitudes and offsets.
  tw::diag::SeriesSet s;
  s.n_series = 2;
  for (int i = 0; i < 400; ++i) {
    const double t = 0.05 * i;
    s.t.push_back(t);
    s.values.emplace_back(1.5 * std::exp(-0.2 * t) * std::cos(3.1 * t + 0.4) + 0.3, 0);
    s.values.emplace_back(0.5 * std::exp(-0.2 * t) * std::sin(3.1 * t) - 2.0, 0);
  }
  const auto tf = tw::diag::fit_damped_tone(s, tw::diag::spectral_peak(s));
  REQUIRE(tf.ok);
  CHECK(tf.omega == Approx(3.1).epsilon(1e-9));
  CHECK(tf.gamma == Approx(0.2).epsilon(1e-8));
  CHECK(std::abs(tf.amplitude[0]) == Approx(0.75 * std::exp(-0.2 * tf.t_centre)).epsilon(1e-8));
}

TEST_CASE("measure: a noisy, spatially damped driven wave: wavelength, phase speed, damping length to 0.1%",
          "[unit][measure]") {
  // u = a e^{-kappa x} cos(k x - omega t) + 0.3% noise; f = 100 kHz (the drive's),
  // lambda = 2.5 m, so v_ph = 250 km/s; kappa = 0.05 /m (damping length 20 m).
  const double f = 1e5, w = 2 * pi * f, lambda = 2.5, k = 2 * pi / lambda, kappa = 0.05, a = 3.0;
  Synthetic s;
  s.noise = 0.003 * a;
  s.u = [=](double x, double t) { return cplx(a * std::exp(-kappa * x) * std::cos(k * x - w * t), 0); };
  const ScratchDir dir("measure-driven");
  write_synthetic(s, dir / "run.h5");
  const std::string out = measure(dir.path(), "--field velocity_y");
  CHECK_THAT(out, Contains("drive frequency (run file)"));
  const tw::io::H5Reader h((dir / "run.h5").string());
  CHECK(h.is_complete());
  check_figure(stored(h, "velocity_y", "wavelength"), lambda, 1e-3, "wavelength");
  check_figure(stored(h, "velocity_y", "wavenumber"), k, 1e-3, "wavenumber");
  check_figure(stored(h, "velocity_y", "phase_speed"), f * lambda, 1e-3, "phase speed");
  check_figure(stored(h, "velocity_y", "damping_length"), 1 / kappa, 1e-3, "damping length");
  check_figure(stored(h, "velocity_y", "spatial_damping_rate"), kappa, 1e-3, "spatial damping rate");
  CHECK(stored(h, "velocity_y", "frequency").value == f);
  CHECK(h.attr_string("/measurements/velocity_y/phase_speed", "units") == "m/s");
  CHECK_THAT(h.attr_string("/measurements/velocity_y/wavenumber", "method"), Contains("unwrapped phase"));
}

TEST_CASE("measure: a noisy decaying mode in a periodic tube: frequency and damping rate from a tone fit to 0.1%",
          "[unit][measure]") {
  // u = a e^{-gamma t} cos(k x - omega t) + 0.3% noise, four wavelengths in a periodic
  // tube, no drive: the frequency is found from the probes' spectrum and refined.
  const double f = 1.37e5, w = 2 * pi * f, k = 2 * pi / 2.5, gamma = 2e4, a = 1.0;
  Synthetic s;
  s.noise = 0.003 * a;
  s.probes = {1.0, 4.2, 7.7};
  s.ends = "left: {kind: periodic}\n  right: {kind: periodic}";
  s.u = [=](double x, double t) { return cplx(a * std::exp(-gamma * t) * std::cos(k * x - w * t), 0); };
  const ScratchDir dir("measure-mode");
  write_synthetic(s, dir / "run.h5");
  const std::string out = measure(dir.path(), "");  // the field is found without --field
  CHECK_THAT(out, Contains("velocity_y"));
  CHECK_THAT(out, Contains("damped-tone fit"));
  const tw::io::H5Reader h((dir / "run.h5").string());
  check_figure(stored(h, "velocity_y", "frequency"), f, 1e-3, "frequency");
  check_figure(stored(h, "velocity_y", "damping_rate"), gamma, 1e-3, "damping rate");
  check_figure(stored(h, "velocity_y", "phase_speed"), w / k, 1e-3, "phase speed");
  check_figure(stored(h, "velocity_y", "wavelength"), 2.5, 1e-3, "wavelength");
  // The omega-k spectrum peaks at (k, omega) within a bin.
  const auto kk = h.read_real("/measurements/velocity_y/omega_k/k");
  const auto ww = h.read_real("/measurements/velocity_y/omega_k/omega");
  std::vector<hsize_t> dims;
  const auto p = h.read_real("/measurements/velocity_y/omega_k/power", &dims);
  REQUIRE(dims.size() == 2);
  REQUIRE(dims[0] == ww.size());
  REQUIRE(dims[1] == kk.size());
  std::size_t best = 0;
  for (std::size_t i = 0; i < p.size(); ++i)
    if (p[i] > p[best]) best = i;
  CHECK(std::abs(kk[best % kk.size()] - k) <= 0.5 * (kk[1] - kk[0]));
  CHECK(std::abs(ww[best / kk.size()] - w) <= 1.0 * (ww[1] - ww[0]));
}

TEST_CASE("measure: a complex (re/im pair) wave travelling toward -x", "[unit][measure]") {
  // u = a e^{i(-k x - omega t)}: the exp(-i omega t) component has phase -k x, so the
  // wavenumber is -k and the phase speed -omega/k (toward -x).
  const double f = 1e5, w = 2 * pi * f, k = 2 * pi / 3.0, a = 2.0;
  Synthetic s;
  s.complex_field = true;
  s.noise = 0.003 * a;
  s.u = [=](double x, double t) { return a * std::exp(cplx(0, -k * x - w * t)); };
  const ScratchDir dir("measure-complex");
  write_synthetic(s, dir / "run.h5");
  const std::string out = measure(dir.path(), "--field velocity_y");
  CHECK_THAT(out, Contains("complex"));
  const tw::io::H5Reader h((dir / "run.h5").string());
  CHECK(h.attr_string("/measurements/velocity_y", "complex") == "yes");
  check_figure(stored(h, "velocity_y", "wavenumber"), -k, 1e-3, "wavenumber");
  check_figure(stored(h, "velocity_y", "phase_speed"), -w / k, 1e-3, "phase speed");
  check_figure(stored(h, "velocity_y", "wavelength"), 3.0, 1e-3, "wavelength");
}

TEST_CASE("measure: the group speed of a tone burst from its arrival at probes", "[unit][measure]") {
  // A Gaussian burst (1/e half-width 15 us) whose envelope moves at v_g = 0.6 v_ph while the
  // carrier moves at v_ph = 250 km/s.
  const double f = 1e5, w = 2 * pi * f, k = 2 * pi / 2.5, vg = 0.6 * w / k, tau = 15e-6, t0 = 30e-6;
  Synthetic s;
  s.t_end = 140e-6;
  s.noise = 0.003;
  s.probes = {1.0, 3.0, 5.0, 7.0};
  s.u = [=](double x, double t) {
    const double e = (t - t0 - x / vg) / tau;
    return cplx(std::exp(-e * e) * std::cos(k * x - w * t), 0);
  };
  const ScratchDir dir("measure-burst");
  write_synthetic(s, dir / "run.h5");
  measure(dir.path(), "--field velocity_y --no-spectrum");
  const tw::io::H5Reader h((dir / "run.h5").string());
  const Measured m = stored(h, "velocity_y", "group_speed");
  INFO("group speed " << m.value << " +- " << m.sigma << ", true " << vg);
  // 0.5%: the arrival times are read off a sampled envelope (0.1 us samples over 30 us
  // of travel between the outer probes, about 0.3%).
  CHECK(std::abs(m.value - vg) <= 5e-3 * vg);
  CHECK(std::abs(m.value - vg) <= 4 * m.sigma);
  const auto burst = h.read_real("/measurements/velocity_y/arrivals/burst");
  CHECK(burst == std::vector<double>(4, 1.0));
}

TEST_CASE("measure: storing is atomic and keeps other results; bad input exits 2", "[unit][measure]") {
  const double w = 2 * pi * 1e5, k = 2 * pi / 2.5;
  Synthetic s;
  s.cells = 100;
  s.t_end = 40e-6;
  s.complex_field = true;
  s.u = [=](double x, double t) { return std::exp(cplx(0, k * x - w * t)); };
  const ScratchDir dir("measure-store");
  write_synthetic(s, dir / "run.h5");
  measure(dir.path(), "--field velocity_y_re --no-spectrum");
  measure(dir.path(), "--field velocity_y --json");
  measure(dir.path(), "--field velocity_y --json");  // replaces its own group
  {
    const tw::io::H5Reader h((dir / "run.h5").string());
    CHECK(h.is_complete());
    CHECK(h.is_group("/measurements/velocity_y_re"));
    CHECK(h.is_group("/measurements/velocity_y/omega_k"));
    CHECK(h.is_dataset("/snapshots/velocity_y_re"));
    CHECK(h.attr_string("/status", "outcome") == "completed");
  }
  // No temporary copy left behind.
  std::vector<std::string> names;
  for (const auto& e : fs::directory_iterator(dir.path())) names.push_back(e.path().filename().string());
  CHECK(names == std::vector<std::string>{"run.h5"});

  SECTION("--json prints one object with every figure") {
    const std::string out = measure(dir.path(), "--field velocity_y --json --no-store");
    CHECK_THAT(out, Contains("\"phase_speed\": {\"value\": "));
    CHECK_THAT(out, Contains("\"stored\": null"));
  }
  SECTION("an unknown field names the fields and the nearest one") {
    const auto r = run_tubewave("measure run.h5 --field velocity_z", dir.path());
    CHECK(r.exit_code == 2);
    CHECK_THAT(r.output, Contains("no field 'velocity_z'"));
    CHECK_THAT(r.output, Contains("did you mean 'velocity_y'"));
  }
  SECTION("an incomplete run file is refused with exit code 2 and left untouched") {
    Synthetic bad = s;
    const fs::path p = dir / "unfinished.h5";
    {
      tw::io::OutputFile out(p.string());
      tw::io::Provenance prov;
      prov.resolved_run_file = run_file_text(bad);
      out.write_provenance(prov);
      out.close_as("failed", "stopped", 1, 1e-6, 0);
    }
    const auto before = fs::file_size(p);
    const auto r = run_tubewave("measure unfinished.h5", dir.path());
    CHECK(r.exit_code == 2);
    CHECK_THAT(r.output, Contains("unfinished.h5 is incomplete"));
    const tw::io::H5Reader h(p.string());
    CHECK_FALSE(h.is_complete());
    CHECK_FALSE(h.exists("/measurements"));
    CHECK(fs::file_size(p) == before);
  }
  SECTION("a missing file exits 2") {
    const auto r = run_tubewave("measure nothing.h5", dir.path());
    CHECK(r.exit_code == 2);
    CHECK_THAT(r.output, Contains("nothing.h5"));
  }
}
