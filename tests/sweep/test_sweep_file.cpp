// Sweep files (src/sweep/sweep_file.*): expansion into cases (grid, zip, groups, ranges),
// and the errors of broken sweep files: file:line:column, the key, the reason, exit code 2,
// and nothing written.
#include <catch2/catch.hpp>
#include <cmath>
#include <filesystem>
#include <string>

#include "io/runfile.hpp"
#include "sweep/case_run.hpp"
#include "sweep/sweep_file.hpp"
#include "sweep/sweep_support.hpp"

using Catch::Matchers::Contains;
using tw::sweep::load_sweep;
using tw::test::ScratchDir;
using tw::test::write_sweep;

namespace {

/// Load a sweep (and, with `plan`, validate its cases) and return the error message.
std::string sweep_error(const std::string& text, bool plan = false) {
  const ScratchDir dir("sweep-error");
  const auto path = write_sweep(dir, text);
  try {
    const auto s = load_sweep(path.string());
    if (plan) (void)tw::sweep::plan_cases(s, true);
  } catch (const tw::io::ConfigError& e) {
    CHECK(e.exit_code() == 2);
    // Bad input never creates the output folder.
    CHECK_FALSE(std::filesystem::exists(dir / "sweep"));
    return e.what();
  }
  FAIL("the sweep file loaded:\n" << text);
  return {};
}

}  // namespace

TEST_CASE("sweep file: a grid takes every combination with the first parameter varying slowest", "[unit]") {
  const ScratchDir dir("sweep-grid");
  const auto s = load_sweep(write_sweep(dir, R"(base: base.yaml
parameters:
  - key: boundaries.left.frequency
    values: [1.0e5, 2.0e5, 3.0e5]
  - key: numerics.reconstruction
    words: [plm, weno5]
)").string());
  REQUIRE(s.cases.size() == 6);
  CHECK(s.cases[0].id == "case-00");
  CHECK(s.cases[5].id == "case-05");
  CHECK(s.cases[1].overrides == std::vector<std::string>{"boundaries.left.frequency=1e+05", "numerics.reconstruction=weno5"});
  CHECK(s.cases[2].overrides == std::vector<std::string>{"boundaries.left.frequency=2e+05", "numerics.reconstruction=plm"});
  CHECK(s.cases[5].describe(s.parameters) == "boundaries.left.frequency=3e+05, numerics.reconstruction=weno5");
  CHECK(s.parameters[0].unit == "Hz");
  CHECK(s.output_dir == (dir / "sweep").lexically_normal().string());
  CHECK(s.case_file(s.cases[3]) == (dir / "sweep" / "cases" / "case-03.h5").lexically_normal().string());
}

TEST_CASE("sweep file: zip and groups and linear and log ranges and fixed overrides", "[unit]") {
  const ScratchDir dir("sweep-zip");
  const auto z = load_sweep(write_sweep(dir, R"(base: base.yaml
combine: zip
set: [numerics.flux=hll]
parameters:
  - key: grid.cells
    label: cells
    log: {from: 100, to: 400, count: 4}
  - key: plasma.density
    log: {from: 1.0e17, to: 1.0e20, count: 4}
  - key: numerics.cfl
    linear: {from: 0.2, to: 0.8, count: 4}
)").string(),
                            {"", {"time.end=1e-6"}});
  REQUIRE(z.cases.size() == 4);
  // Range ends are exact; a count from a range is a whole number; log steps are equal ratios.
  CHECK(z.parameters[0].numbers == std::vector<double>{100, 159, 252, 400});  // 100 x 4^(i/3), whole
  CHECK(z.parameters[1].numbers[0] == 1e17);
  CHECK(z.parameters[1].numbers[3] == 1e20);
  CHECK(z.parameters[1].numbers[1] == Approx(1e18).epsilon(1e-14));
  CHECK(z.parameters[2].numbers == std::vector<double>{0.2, 0.4, 0.6, 0.8});
  CHECK(z.cases[2].overrides == std::vector<std::string>{"numerics.flux=hll", "time.end=1e-6", "grid.cells=252",
                                                         "plasma.density=1e+19", "numerics.cfl=0.6"});

  const ScratchDir dir2("sweep-group");
  const auto g = load_sweep(write_sweep(dir2, R"(base: base.yaml
parameters:
  - key: grid.cells
    values: [64, 128, 256]
    group: resolution
  - key: boundaries.left.frequency
    values: [1.0e5, 2.0e5]
  - key: numerics.cfl
    values: [0.8, 0.4, 0.2]
    group: resolution
)").string());
  REQUIRE(g.cases.size() == 6);  // the group is one axis of 3, times 2 frequencies
  CHECK(g.cases[1].describe(g.parameters) == "grid.cells=64, boundaries.left.frequency=2e+05, numerics.cfl=0.8");
  CHECK(g.cases[4].describe(g.parameters) == "grid.cells=256, boundaries.left.frequency=1e+05, numerics.cfl=0.2");
}

TEST_CASE("sweep file: errors name the file and line and column and key and reason", "[unit]") {
  CHECK_THAT(sweep_error("base: base.yaml\nparamters: []\n"),
             Contains("sweep.yaml:2:1") && Contains("key 'paramters'") && Contains("did you mean 'parameters'"));
  CHECK_THAT(sweep_error("base: nowhere.yaml\nparameters:\n  - {key: grid.cells, values: [8]}\n"),
             Contains("sweep.yaml:1:7") && Contains("key 'base'") && Contains("nowhere.yaml' does not exist"));
  CHECK_THAT(sweep_error("base: base.yaml\nparameters:\n  - key: grid.cells\n"),
             Contains("key 'parameters[0]'") && Contains("one of values, words, linear or log"));
  CHECK_THAT(sweep_error("base: base.yaml\nparameters:\n  - key: grid.cells\n    values: [8]\n    words: [a]\n"),
             Contains("sweep.yaml:5:12") && Contains("key 'parameters[0].words'") && Contains("give only one"));
  CHECK_THAT(sweep_error("base: base.yaml\nparameters:\n  - key: plasma.densty\n    values: [1.0e18]\n"),
             Contains("sweep.yaml:3:10") && Contains("'plasma.densty' is not a run-file key") &&
                 Contains("did you mean 'plasma.density'"));
  CHECK_THAT(sweep_error("base: base.yaml\nparameters:\n  - key: numerics.reconstruction\n    values: [1, 2]\n"),
             Contains("key 'parameters[0].values'") && Contains("is not a number: give its values as words"));
  CHECK_THAT(sweep_error("base: base.yaml\nparameters:\n  - key: grid.cells\n    linear: {from: 10, to: 20}\n"),
             Contains("key 'parameters[0].linear'") && Contains("missing 'count'"));
  CHECK_THAT(sweep_error("base: base.yaml\ncombine: zip\nparameters:\n  - {key: grid.cells, values: [8, 16]}\n"
                         "  - {key: numerics.cfl, values: [0.5]}\n"),
             Contains("key 'parameters[1]'") && Contains("equal length"));
  CHECK_THAT(sweep_error("base: base.yaml\nparameters:\n  - {key: grid.cells, values: [8]}\n  - {key: grid.cells, values: [9]}\n"),
             Contains("key 'parameters[1].key'") && Contains("varied twice"));
  CHECK_THAT(sweep_error("base: base.yaml\nparameters:\n  - {key: grid.cells, values: [8]}\npredict:\n  - formula: mhd-alfvn\n"),
             Contains("key 'predict[0].formula'") && Contains("unknown prediction source 'mhd-alfvn'") &&
                 Contains("mhd-alfven"));
  CHECK_THAT(sweep_error("base: base.yaml\nparameters:\n  - {key: grid.cells, values: [8]}\nmeasure:\n"
                         "  - {field: velocity_y, quantities: [wavelength, speed]}\n"),
             Contains("key 'measure[0].quantities[1]'") && Contains("phase_speed"));
  CHECK_THAT(sweep_error("base: base.yaml\nset: [grid.cells=8]\nparameters:\n  - {key: grid.cells, values: [8]}\n"),
             Contains("key 'set[0]'") && Contains("varied by parameters[0]"));
}

TEST_CASE("sweep file: a case whose run file is invalid is reported at the value that makes it so", "[unit]") {
  // Every case is validated before anything runs; the run-file error is reported at the
  // sweep-file value (line 4, column 22: the second density), naming the case.
  const std::string m = sweep_error("base: base.yaml\nparameters:\n  - key: plasma.density\n    values: [1.0e18, -1.0e18]\n",
                                    true);
  CHECK_THAT(m, Contains("sweep.yaml:4:22") && Contains("key 'parameters[0].values[1]'") && Contains("case case-01") &&
                    Contains("plasma.density=-1e+18") && Contains("must be > 0"));
  // A fractional count.
  CHECK_THAT(sweep_error("base: base.yaml\nparameters:\n  - key: grid.cells\n    values: [64, 64.5]\n", true),
             Contains("key 'parameters[0].values[1]'") && Contains("grid.cells=64.5") && Contains("whole number"));
  // A range of counts is rounded to whole numbers, and must not repeat one.
  CHECK_THAT(sweep_error("base: base.yaml\nparameters:\n  - key: grid.cells\n    linear: {from: 64, to: 65, count: 4}\n"),
             Contains("key 'parameters[0].linear'") && Contains("gives 64 twice"));
  // A bad fixed override, at its place in `set`.
  CHECK_THAT(sweep_error("base: base.yaml\nset: [numerics.flx=hll]\nparameters:\n  - {key: grid.cells, values: [64]}\n",
                         true),
             Contains("key 'set[0]'") && Contains("did you mean 'numerics.flux'"));
  // A cross-key check of the base file (probes outside a shortened tube), at `base`.
  CHECK_THAT(sweep_error("base: base.yaml\nparameters:\n  - {key: grid.length, values: [16.0, 5.0]}\n", true),
             Contains("key 'base'") && Contains("case case-01 (grid.length=5)") && Contains("outside the tube"));
}

TEST_CASE("sweep command: a broken sweep file exits 2 with the message and writes nothing", "[unit]") {
  const ScratchDir dir("sweep-cli-broken");
  write_sweep(dir, "base: base.yaml\nparameters:\n  - key: grid.cells\n    values: [64, 0]\n");
  const auto r = tw::test::run_tubewave("sweep sweep.yaml", dir.path());
  INFO(r.output);
  CHECK(r.exit_code == 2);
  CHECK_THAT(r.output, Contains("tubewave: error: sweep.yaml:4:18: key 'parameters[0].values[1]'") &&
                           Contains("grid.cells=0"));
  CHECK_FALSE(std::filesystem::exists(dir / "sweep"));
  const auto missing = tw::test::run_tubewave("sweep no_such_sweep.yaml", dir.path());
  CHECK(missing.exit_code == 2);
  CHECK_THAT(missing.output, Contains("no_such_sweep.yaml") && Contains("does not exist"));
  // An override for every case from the command line is named as such.
  write_sweep(dir, "base: base.yaml\nparameters:\n  - key: grid.cells\n    values: [64]\n");
  const auto set = tw::test::run_tubewave("sweep sweep.yaml --set time.end=-1", dir.path());
  CHECK(set.exit_code == 2);
  CHECK_THAT(set.output, Contains("(--set time.end=-1): key 'time.end': must be > 0"));
  CHECK_FALSE(std::filesystem::exists(dir / "sweep"));
  const auto modes = tw::test::run_tubewave("sweep sweep.yaml --merge --list", dir.path());
  CHECK(modes.exit_code == 2);
  CHECK_THAT(modes.output, Contains("exclude each other"));
}
