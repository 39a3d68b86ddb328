// Linear MHD waves in a periodic box: phase speeds against the ideal-MHD dispersion
// relation and the convergence order of the scheme.
//
// Reference: the phase speeds along x of the three ideal-MHD waves,
//   c_a = |B_x| / sqrt(mu0 rho),
//   c_f,s^2 = ( a^2 + b^2 +- sqrt((a^2 + b^2)^2 - 4 a^2 b_x^2) ) / 2,
//   a^2 = gamma p / rho, b^2 = |B|^2 / (mu0 rho), b_x^2 = B_x^2 / (mu0 rho)
// (e.g. J. P. Goedbloed and S. Poedts 2004, "Principles of Magnetohydrodynamics",
// Cambridge, ch. 5 — chapter from memory). Evaluated here from the run's own background,
// read back from its output file, independently of the solver's code.
#include <catch2/catch.hpp>
#include <cmath>
#include <numbers>

#include "support/run_support.hpp"

using namespace tw::test;

namespace {

constexpr double pi = std::numbers::pi;

struct MhdSpeeds {
  double fast, alfven, slow;
};

/// Ideal-MHD speeds along x in normalized units (mu0 = 1).
MhdSpeeds ideal_mhd_speeds(double rho, double p, double gamma, double bx, double by, double bz) {
  const double a2 = gamma * p / rho;
  const double b2 = (bx * bx + by * by + bz * bz) / rho;
  const double bx2 = bx * bx / rho;
  const double d = std::sqrt((a2 + b2) * (a2 + b2) - 4 * a2 * bx2);
  return {std::sqrt(0.5 * (a2 + b2 + d)), std::sqrt(bx2), std::sqrt(0.5 * (a2 + b2 - d))};
}

constexpr const char* kConfig = "configs/mhd_linear_wave.yaml";

/// The background of the test config, as the run's first snapshot records it.
MhdSpeeds config_speeds(const RunOutput& r) {
  const double rho = r.first.at("mass_density")[0];
  const double p = r.first.at("pressure")[0];
  const double bx = 1.5 * std::cos(pi / 6);
  const double bz = 1.5 * std::sin(pi / 6);
  return ideal_mhd_speeds(rho, p, 5.0 / 3.0, bx, 0.0, bz);
}

/// Phase speed of a sinusoid of wavenumber k (one wavelength in a unit box) in field f,
/// from the phase of its Fourier component after time t; the branch nearest `expect`.
double measured_speed(const RunOutput& r, const std::string& f, double t, double expect) {
  const auto& x = r.x;
  const auto& v0 = r.first.at(f);
  const auto& v1 = r.last.at(f);
  auto phase = [&](const std::vector<double>& v) {
    double mean = 0;
    for (double q : v) mean += q;
    mean /= static_cast<double>(v.size());
    double s = 0, c = 0;
    for (std::size_t i = 0; i < v.size(); ++i) {
      s += (v[i] - mean) * std::sin(2 * pi * x[i]);
      c += (v[i] - mean) * std::cos(2 * pi * x[i]);
    }
    return std::atan2(-c, s);  // v - mean = a sin(2 pi x - phi)
  };
  const double dphi = phase(v1) - phase(v0);
  const double k = 2 * pi;
  // dphi = k c t (mod 2 pi): pick the branch closest to the expected speed.
  const double m = std::round((k * expect * t - dphi) / (2 * pi));
  return (dphi + 2 * pi * m) / (k * t);
}

}  // namespace

TEST_CASE("linear MHD waves travel at the ideal-MHD speeds within 0.1%", "[validation][mhd]") {
  struct Case {
    const char* mode;
    const char* direction;
    const char* field;  // the component that carries the wave
  };
  const Case cases[] = {{"fast", "forward", "mass_density"},
                        {"alfven", "forward", "magnetic_field_y"},
                        {"slow", "forward", "mass_density"},
                        {"fast", "backward", "mass_density"},
                        {"alfven", "backward", "velocity_y"}};
  ScratchDir dir("mhd-speeds");
  for (const auto& c : cases) {
    DYNAMIC_SECTION(c.mode << " " << c.direction) {
      const RunOutput bg = run_config(kConfig, {"time.end=1e-6", std::string("initial.mode=") + c.mode,
                                                std::string("initial.direction=") + c.direction},
                                      dir, "bg.h5");
      const MhdSpeeds s = config_speeds(bg);
      const double c_exact = std::string(c.mode) == "fast" ? s.fast : std::string(c.mode) == "alfven" ? s.alfven : s.slow;
      const double sign = std::string(c.direction) == "forward" ? 1 : -1;
      const double t = 1.0 / c_exact;  // one crossing
      const RunOutput r = run_config(kConfig,
                                     {"grid.cells=256", "time.end=" + std::to_string(t),
                                      "output.snapshot_interval=" + std::to_string(t),
                                      std::string("initial.mode=") + c.mode,
                                      std::string("initial.direction=") + c.direction},
                                     dir);
      REQUIRE(r.summary.outcome == "completed");
      const double t_run = r.snapshot_times.back();
      const double c_meas = sign * measured_speed(r, c.field, t_run, sign * c_exact);
      INFO("measured " << c_meas << ", ideal MHD " << c_exact);
      CHECK(std::abs(c_meas - c_exact) / c_exact < 1e-3);
    }
  }
}

TEST_CASE("linear MHD waves converge at second order with unlimited PLM", "[validation][mhd]") {
  // Design order 2 (PLM + SSP-RK2/3); require the observed order >= 1.8 between 64 and
  // 128 cells per wavelength (margin for the pre-asymptotic range).
  ScratchDir dir("mhd-order");
  for (const char* mode : {"fast", "alfven", "slow"}) {
    DYNAMIC_SECTION(mode) {
      const RunOutput bg = run_config(kConfig, {"time.end=1e-6", std::string("initial.mode=") + mode}, dir, "bg.h5");
      const MhdSpeeds s = config_speeds(bg);
      const double c = std::string(mode) == "fast" ? s.fast : std::string(mode) == "alfven" ? s.alfven : s.slow;
      const double t = 1.0 / c;
      double err[3];
      const int cells[3] = {32, 64, 128};
      for (int j = 0; j < 3; ++j) {
        const RunOutput r = run_config(kConfig,
                                       {"grid.cells=" + std::to_string(cells[j]), "time.end=" + std::to_string(t),
                                        "output.snapshot_interval=" + std::to_string(t), "numerics.limiter=none",
                                        "numerics.integrator=ssp-rk3", std::string("initial.mode=") + mode},
                                       dir);
        REQUIRE(r.summary.outcome == "completed");
        // Error of every primitive field against the exact solution (the initial state,
        // shifted by exactly one wavelength), normalized by the field's amplitude.
        double e = 0;
        for (const auto& [name, v1] : r.last) {
          const auto& v0 = r.first.at(name);
          double amp = 0, mean = 0;
          for (double q : v0) mean += q / static_cast<double>(v0.size());
          for (double q : v0) amp = std::max(amp, std::abs(q - mean));
          if (amp < 1e-12 * (std::abs(mean) + 1)) continue;  // this field carries no wave
          e += l1_difference(v1, v0, 1.0 / cells[j]) / amp;
        }
        err[j] = e;
      }
      const double p1 = observed_order(err[0], err[1]), p2 = observed_order(err[1], err[2]);
      INFO("errors " << err[0] << " " << err[1] << " " << err[2] << ", orders " << p1 << " " << p2);
      CHECK(p2 >= 1.8);
      CHECK(err[2] < err[1]);
      CHECK(err[1] < err[0]);
    }
  }
}
