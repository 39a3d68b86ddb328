// The demo run file (configs/demo_column.yaml) runs as written and shows what it claims:
// an antenna's tone burst partly reflected by the density rise.
//
// References: the antenna is a sheet current short against the wavelength, so its
// radiation resistance is mu0 v_A / 2 (test_antennas.cpp derives it), v_A from CODATA 2018
// and the He atomic mass at the antenna's density (4e18 m^-3, 0.15 T); the tanh rise of
// width 0.5 m reflects |R| = sinh(pi (k2 - k1) w / 2) / sinh(pi (k1 + k2) w / 2) at
// 100 kHz (Epstein's profile, Landau & Lifshitz, "Quantum Mechanics", section 25,
// problem 2 [from memory]; see test_reflection.cpp). Tolerances 3%: a 3-cycle burst has
// a wide band (R varies across it by a few per cent) and the top-hat antenna is 0.05
// wavelengths wide.
#include <catch2/catch.hpp>
#include <cmath>
#include <numbers>

#include "core/constants.hpp"
#include "io/h5read.hpp"
#include "support/run_support.hpp"

using namespace tw::test;
namespace k = tw::constants;

TEST_CASE("the demo column runs and shows reflection, transmission and coupled power", "[validation][demo]") {
  ScratchDir dir("demo");
  const RunOutput r = run_config("configs/demo_column.yaml", {}, dir);
  REQUIRE(r.summary.outcome == "completed");
  tw::io::H5Reader h(r.file);
  const double rho1 = 4e18 * 4.002602 * k::u;
  const double va1 = 0.15 / std::sqrt(k::mu0 * rho1);
  CHECK(h.read_real("/antennas/loop/radiation_resistance")[0] == Approx(k::mu0 * va1 / 2).epsilon(0.03));
  const double k1 = 2 * std::numbers::pi * 100e3 / va1, k2 = 2 * k1, w = 0.5;
  const double R = std::sinh(std::numbers::pi * (k2 - k1) * w / 2) / std::sinh(std::numbers::pi * (k1 + k2) * w / 2);
  CHECK(h.read_real("/regions/gradient/reflection")[0] == Approx(R).epsilon(0.03));
  CHECK(h.read_real("/regions/gradient/velocity_reflection")[0] < 0);
  CHECK(h.read_real("/regions/gradient/transmission")[0] == Approx(1 - R * R).epsilon(0.03));
  // The summary lines the command prints.
  REQUIRE(r.summary.notes.size() == 2);
  CHECK(r.summary.notes[0].find("loop") != std::string::npos);
  CHECK(r.summary.notes[1].find("region gradient") != std::string::npos);
}
