// Setting up the two-fluid model from run files: its errors, its `check` warnings and what
// it records in /parameters.
#include <catch2/catch.hpp>
#include <string>
#include <vector>

#include "core/constants.hpp"
#include "core/error.hpp"
#include "io/h5read.hpp"
#include "io/runfile.hpp"
#include "sim/run.hpp"
#include "support/run_support.hpp"

using Catch::Matchers::Contains;
using namespace tw::test;

namespace {

/// A valid two-fluid case in SI units (an invented 2 m helium column).
const char* kBase = R"(title: two-fluid setup case
model:
  equations: two-fluid
plasma:
  ion: He
  density: 1.0e18
  electron_temperature: 5
  ion_temperature: 1
  field: 0.1
grid:
  length: 2.0
  cells: 64
time:
  end: 1.0e-7
boundaries:
  left: {kind: conducting}
  right: {kind: conducting}
)";

/// Set the case up as `tubewave check` does; return the ConfigError message ("" if none).
std::string setup_error(const ScratchDir& dir, const std::vector<std::string>& overrides, const std::string& text = kBase) {
  const auto path = dir / "case.yaml";
  write_text(path, text);
  try {
    const tw::io::RunFile rf = tw::load_run_file(path.string(), overrides);
    (void)tw::check_case(rf, (dir / "case.h5").string());
  } catch (const tw::io::ConfigError& e) {
    CHECK(e.exit_code() == 2);
    return e.what();
  }
  return {};
}

}  // namespace

TEST_CASE("two-fluid setup: bad input names the key and the reason", "[unit][twofluid]") {
  ScratchDir dir("tf-setup-errors");
  REQUIRE(setup_error(dir, {}).empty());
  struct Case {
    std::vector<std::string> set;
    std::vector<std::string> expect;
  };
  const std::vector<Case> cases = {
      {{"plasma.electron_temperature=0"}, {"plasma.electron_temperature", "needs T_e > 0"}},
      {{"model.light_speed=4e8"}, {"model.light_speed", "exceeds the unit system's c = 2.99792e+08", "only be reduced"}},
      {{"model.mass_ratio=1e4"}, {"model.mass_ratio", "exceeds the unit system's 7295.3", "only be reduced"}},
      {{"model.closure=isothermal"}, {"model.closure", "adiabatic closure only"}},
      {{"model.resistivity=1e-6"}, {"model.resistivity", "not used by the two-fluid model"}},
      {{"model.neutral_density=1e19"}, {"model.neutral_density", "needs both"}},
      {{"numerics.flux=hlld"}, {"numerics.flux", "hlld is available for adiabatic MHD only"}},
      {{"initial.kind=wave"}, {"initial.kind", "not available for the two-fluid model"}},
      {{"initial.kind=circular", "plasma.field_angle_deg=30"}, {"plasma.field_angle_deg", "needs B0 along the tube"}},
      {{"initial.kind=circular", "plasma.flow=[0, 1000, 0]"}, {"plasma.flow", "plasma at rest"}},
      {{"initial.kind=langmuir", "initial.amplitude=1.5"}, {"initial.amplitude", "below 1"}},
      {{"initial.kind=langmuir", "initial.direction=backward"}, {"initial.direction", "only the circular kind"}},
      {{"initial.mode=fast"}, {"initial.mode", "MHD's wave kind"}},
      // (Driven ends work for the two-fluid model: tests/drive/test_twofluid_drives.cpp.)
      // The other model must not silently ignore the two-fluid keys.
      {{"model.equations=mhd", "model.mass_ratio=100"}, {"model.mass_ratio", "only the two-fluid model reads this key"}},
      {{"model.equations=mhd", "initial.kind=langmuir"}, {"initial.kind", "not available for the mhd model"}},
      {{"model.equations=hall", "model.electron_ion_friction=spitzer"},
       {"model.electron_ion_friction", "only the two-fluid model reads this key"}},
      {{"model.equations=mhd", "initial.kind=circular", "initial.branch=linear"},
       {"initial.branch", "two-fluid model only"}},
      {{"model.displacement_current=true"}, {"model.displacement_current", "always keeps the displacement current"}},
      {{"model.coulomb_logarithm=10"}, {"model.coulomb_logarithm", "only electron_ion_friction: spitzer"}},
      {{"initial.kind=circular", "initial.direction=standing"}, {"initial.direction", "a circular wave travels"}},
  };
  for (const auto& c : cases) {
    std::string label;
    for (const auto& s : c.set) label += s + " ";
    DYNAMIC_SECTION(label) {
      const std::string msg = setup_error(dir, c.set);
      INFO("message: " << msg);
      REQUIRE_FALSE(msg.empty());
      CHECK_THAT(msg, Contains("case.yaml"));
      for (const auto& e : c.expect) CHECK_THAT(msg, Contains(e));
    }
  }
  SECTION("normalized units: the constants may be reduced below the `normalized` ones only; no Spitzer friction") {
    const std::string text = R"(units: normalized
normalized: {light_speed: 10}
model: {equations: two-fluid, light_speed: 20}
plasma: {density: 1, field: 1, electron_temperature: 0.01, ion_temperature: 0.01}
grid: {length: 1, cells: 16}
time: {end: 0.1}
boundaries: {left: {kind: periodic}, right: {kind: periodic}}
)";
    const std::string msg = setup_error(dir, {}, text);
    CHECK_THAT(msg, Contains("case.yaml:3:") && Contains("model.light_speed") && Contains("exceeds the unit system's c = 10"));
    CHECK(setup_error(dir, {"model.light_speed=5"}, text).empty());
    const std::string msg2 = setup_error(dir, {"model.light_speed=5", "model.electron_ion_friction=spitzer"}, text);
    CHECK_THAT(msg2, Contains("model.electron_ion_friction") && Contains("needs SI units"));
  }
}

TEST_CASE("two-fluid setup: check warns about reduced constants and unresolved plasma oscillations", "[unit][twofluid]") {
  ScratchDir dir("tf-setup-check");
  const auto path = dir / "case.yaml";
  write_text(path, kBase);
  auto warnings = [&](const std::vector<std::string>& set) {
    const tw::io::RunFile rf = tw::load_run_file(path.string(), set);
    return tw::check_case(rf, (dir / "case.h5").string()).warnings;
  };
  auto joined = [](const std::vector<std::string>& w) {
    std::string s;
    for (const auto& x : w) s += x + "\n";
    return s;
  };
  // Physical constants, 64 cells over 2 m: dt = 0.8 dx/c = 8.3e-11 s, omega_pe = 5.6e10 1/s:
  // omega_pe dt = 4.7 (warned), no reduction (not warned).
  const std::string plain = joined(warnings({}));
  CHECK_THAT(plain, Contains("omega_pe dt"));
  CHECK_THAT(plain, !Contains("reduces the speed of light") && !Contains("model.mass_ratio"));
  const std::string reduced = joined(warnings({"model.light_speed=2997924.58", "model.mass_ratio=100"}));
  CHECK_THAT(reduced, Contains("reduces the speed of light by a factor 100"));
  CHECK_THAT(reduced, Contains("model.mass_ratio = 100 replaces the physical m_i/m_e = 7295.3"));
  // Resolved: 64 cells over 2 mm gives omega_pe dt = 4.7e-3, no plasma-oscillation warning.
  CHECK_THAT(joined(warnings({"grid.length=0.002"})), !Contains("omega_pe dt"));
}

TEST_CASE("two-fluid setup: the reduced constants are recorded in /parameters", "[unit][twofluid]") {
  ScratchDir dir("tf-setup-params");
  const RunOutput r = run_text(kBase, {"model.light_speed=2997924.58", "model.mass_ratio=100", "time.end=1e-9"}, dir);
  REQUIRE(r.summary.outcome == "completed");
  tw::io::H5Reader h(r.file);
  CHECK(h.read_real("/parameters/model_light_speed")[0] == Approx(2997924.58));
  CHECK(h.read_real("/parameters/light_speed_reduction")[0] == Approx(0.01));
  CHECK(h.read_real("/parameters/mass_ratio")[0] == Approx(100));
  const double m_he = 4.002602 * tw::constants::u - tw::constants::m_e;
  CHECK(h.read_real("/parameters/mass_ratio_unreduced")[0] == Approx(m_he / tw::constants::m_e));
  CHECK(h.read_real("/parameters/model_electron_mass")[0] == Approx(m_he / 100));
  CHECK(h.read_real("/parameters/model_permittivity")[0] ==
        Approx(1 / (tw::constants::mu0 * 2997924.58 * 2997924.58)));
  // The run's history carries the model's diagnostics.
  for (const char* c : {"charge_total", "energy_total", "gauss_residual_max", "gauss_residual_relative",
                        "gauss_residual_per_electron_charge"})
    CHECK(r.history.count(c) == 1);
}
