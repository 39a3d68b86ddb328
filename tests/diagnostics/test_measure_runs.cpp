// `tubewave measure` on real runs agrees with the validation suite's analytic references,
// to the tolerances of its case files (validation/cases/mhd_*.toml), with the references
// written out again here, independently of scripts-post/twdispersion.py.
//
// References: the ideal-MHD phase speeds along x (Goedbloed & Poedts 2004, "Principles of
// Magnetohydrodynamics", ch. 5 — from memory), evaluated from the run's own background;
// and for the driven column v_A = B / sqrt(mu0 rho) with rho the He atom mass density from
// CODATA 2018 and the He atomic weight 4.002602 (IUPAC), as in tests/drive.
#include <catch2/catch.hpp>
#include <cmath>
#include <numbers>
#include <string>

#include "core/constants.hpp"
#include "io/h5read.hpp"
#include "support/test_support.hpp"

using tw::test::run_tubewave;
using tw::test::ScratchDir;
using tw::test::source_path;

namespace {

struct Stored {
  double value, sigma;
};

Stored stored(const tw::io::H5Reader& h, const std::string& field, const std::string& name) {
  const std::string p = "/measurements/" + field + "/" + name;
  return {h.read_real(p)[0], h.attr_real(p, "uncertainty")};
}

/// `tubewave run CONFIG -o run.h5 ARGS` on one thread, then `tubewave measure run.h5
/// --no-spectrum`, in `dir`; both must succeed. Returns what measure printed.
std::string run_and_measure(const std::string& config, const std::string& args, const ScratchDir& dir) {
  const auto r = run_tubewave("run '" + source_path(config).string() + "' -o run.h5 --quiet --threads 1 " + args,
                              dir.path());
  INFO(r.output);
  REQUIRE(r.exit_code == 0);
  const auto mr = run_tubewave("measure run.h5 --no-spectrum", dir.path());
  INFO(mr.output);
  REQUIRE(mr.exit_code == 0);
  CHECK_THAT(mr.output, Catch::Contains("stored in run.h5:/measurements/"));
  return mr.output;
}

double mean(const std::vector<double>& v, std::size_t n) {
  double s = 0;
  for (std::size_t i = 0; i < n; ++i) s += v[i];
  return s / static_cast<double>(n);
}

}  // namespace

TEST_CASE("measure agrees with ideal MHD on periodic eigenmodes at 128 cells (validation table tolerance)",
          "[validation][measure]") {
  struct Mode {
    const char* mode;
    const char* field;
    const char* end;
    const char* snap;
    const char* probe;
  };
  // The a30-n128 variants of validation/cases/mhd_{fast,alfven,slow}.toml.
  const Mode modes[] = {{"fast", "mass_density", "1.24", "0.025", "0.012"},
                        {"alfven", "magnetic_field_y", "1.54", "0.031", "0.015"},
                        {"slow", "mass_density", "2.48", "0.05", "0.025"}};
  const ScratchDir dir("measure-runs");
  for (const auto& m : modes) {
    DYNAMIC_SECTION(m.mode) {
      const std::string run = "run '" + source_path("validation/runs/mhd_periodic_wave.yaml").string() +
                              "' -o run.h5 --quiet --threads 1 --set initial.mode=" + m.mode +
                              " --set plasma.field_angle_deg=30 --set grid.cells=128 --set time.end=" + m.end +
                              " --set output.snapshot_interval=" + m.snap + " --set output.probe_interval=" + m.probe;
      const auto r = run_tubewave(run, dir.path());
      INFO(r.output);
      REQUIRE(r.exit_code == 0);
      const auto mr = run_tubewave(std::string("measure run.h5 --no-spectrum --field ") + m.field, dir.path());
      INFO(mr.output);
      REQUIRE(mr.exit_code == 0);
      const tw::io::H5Reader h((dir / "run.h5").string());
      const std::size_t n = 128;
      const double rho = mean(h.read_real("/snapshots/mass_density"), n);
      const double p = mean(h.read_real("/snapshots/pressure"), n);
      const double bx = h.read_real("/parameters/field_x")[0];
      const double bz = mean(h.read_real("/snapshots/magnetic_field_z"), n);
      const double gamma = h.read_real("/parameters/gamma")[0];
      const double a2 = gamma * p / rho, b2 = (bx * bx + bz * bz) / rho, bx2 = bx * bx / rho;  // mu0 = 1
      const double d = std::sqrt((a2 + b2) * (a2 + b2) - 4 * a2 * bx2);
      const std::string mode = m.mode;
      const double c = mode == "fast" ? std::sqrt(0.5 * (a2 + b2 + d)) : mode == "alfven" ? std::sqrt(bx2)
                                                                                            : std::sqrt(0.5 * (a2 + b2 - d));
      const Stored v = stored(h, m.field, "phase_speed");
      INFO("measured " << v.value << " +- " << v.sigma << ", ideal MHD " << c);
      // 4e-4: the case files' tolerance at 128 cells per wavelength (2.5 x the scheme's
      // phase error there).
      CHECK(std::abs(v.value - c) / c < 4e-4);
      // The wavelength is the tube's (one wavelength in a tube of length 1).
      CHECK(stored(h, m.field, "wavelength").value == Approx(1.0).epsilon(1e-4));
    }
  }
}

TEST_CASE("measure agrees with v_A on the driven column: wavelength, phase and group speed", "[validation][measure]") {
  namespace k = tw::constants;
  const double v_A = 0.1 / std::sqrt(k::mu0 * 1.5e18 * 4.002602 * k::u);
  const ScratchDir dir("measure-driven-run");
  (void)run_and_measure("validation/runs/mhd_driven_column.yaml", "--set grid.cells=1000", dir);
  const tw::io::H5Reader h((dir / "run.h5").string());
  const Stored vph = stored(h, "velocity_y", "phase_speed");
  const Stored vg = stored(h, "velocity_y", "group_speed");
  const Stored lam = stored(h, "velocity_y", "wavelength");
  INFO("v_A " << v_A << ", phase " << vph.value << ", group " << vg.value << ", wavelength " << lam.value);
  // Tolerances of validation/cases/mhd_driven.toml: 5e-4 for the phase, 5e-3 for the group.
  CHECK(std::abs(vph.value - v_A) / v_A < 5e-4);
  CHECK(std::abs(lam.value - v_A / 1e5) / (v_A / 1e5) < 5e-4);
  CHECK(std::abs(vg.value - v_A) / v_A < 5e-3);
  CHECK(stored(h, "velocity_y", "frequency").value == 1e5);
}

TEST_CASE("measure takes the drive frequency from an antenna inside the tube", "[unit][measure]") {
  // The demo column: no driven end, a tone-burst loop antenna at 100 kHz. The frequency is
  // the run file's, not a fit (its uncertainty is zero), and the probe positions come from
  // /grid/probe_x (the group speed from envelope arrivals at the probes needs them).
  const ScratchDir dir("measure-antenna");
  const std::string printed = run_and_measure("configs/demo_column.yaml", "--set grid.cells=600", dir);
  CHECK_THAT(printed, Catch::Contains("drive frequency (run file)"));
  const tw::io::H5Reader h((dir / "run.h5").string());
  const Stored f = stored(h, "velocity_y", "frequency");
  CHECK(f.value == 1e5);
  CHECK(f.sigma == 0);  // given by the run file, not fitted
  CHECK(h.read_real("/grid/probe_x").size() == 4);
  CHECK(std::isfinite(stored(h, "velocity_y", "group_speed").value));
}
