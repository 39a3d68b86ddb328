// A run that blows up is stopped before any non-finite or non-physical value reaches the
// output (every series: fields, probes, history, budget, drive power); the last good state
// is written as the final snapshot, the file is marked failed and the exit code is 1.
//
// How to force a blow-up honestly: `numerics.cfl` is validated to be at most 1, so no valid
// run file asks for a step beyond the CFL limit, and a hidden override of that check would
// test something users cannot do. What a run file can ask for is a drive far too violent for
// the column. The step is sized from the state at its start (Stepper::step); here the left
// end plate, at rest for 0.5 us, starts turning at 1e8 m/s (about 100 v_A; circular
// polarization, no turn-on, `delay: 0.5e-6`) in the middle of a step sized for the quiet
// column, and drags the field lines so hard that the transverse field near the plate, and
// with it the fast speed, grows many-fold within a step: the waves then cross far more than
// one cell per step (an effective Courant number far above 1) and the state goes
// non-physical within a few steps of the start. Measured: it fails after about 280 good
// steps with 100, 200, 400 and 800 cells, at t = 0.51 to 0.59 us; at 3e7 m/s the runs go
// through.
#include <catch2/catch.hpp>
#include <filesystem>
#include <string>
#include <vector>

#include "io/h5read.hpp"
#include "support/h5compare.hpp"
#include "support/test_support.hpp"

using Catch::Matchers::Contains;
using tw::test::ScratchDir;
using tw::test::source_path;

TEST_CASE("blow-up: a drive far too violent for the column is caught; the last good state is kept",
          "[unit][blowup]") {
  const ScratchDir dir("blowup");
  tw::test::write_text(dir / "column.yaml", R"(title: a drive far too violent for the column
model: {equations: mhd, closure: adiabatic}
plasma: {ion: He, density: 1.5e18, electron_temperature: 6, ion_temperature: 1, field: 0.1}
grid: {length: 16.0, cells: 400}
time: {end: 2.0e-6}
numerics: {reconstruction: plm, limiter: mc, flux: hlld, integrator: ssp-rk2, cfl: 0.8}
boundaries:
  left: {kind: driven, velocity_amplitude: 1.0e8, frequency: 1.0e5, polarization: right,
         ramp_periods: 0, delay: 0.5e-6}
  right: {kind: conducting}
output: {snapshot_interval: 0.1e-6, probe_interval: 0.05e-6, probes: [2.0, 8.0]}
)");
  const auto r = tw::test::run_tubewave("run column.yaml -o blowup.h5 --quiet --threads 1", dir.path());
  INFO(r.output);
  CHECK(r.exit_code == 1);
  CHECK_THAT(r.output, Contains("failed"));
  CHECK_THAT(r.output, Contains("non-physical state in cell"));
  CHECK_THAT(r.output, Contains("The last good state (t = "));
  const std::string file = (dir / "blowup.h5").string();
  REQUIRE(std::filesystem::exists(file));

  const tw::io::H5Reader h(file);
  CHECK(h.attr_int("/", "complete") == 0);
  CHECK(h.attr_string("/status", "outcome") == "failed");
  CHECK_THROWS_WITH(tw::io::H5Reader::open_complete_or_throw(file), Contains("outcome 'failed'"));
  // Nothing non-finite anywhere in the file.
  std::string where;
  const bool finite = tw::test::all_finite(file, &where);
  INFO("non-finite values in " << where);
  CHECK(finite);
  CHECK(h.is_dataset("/budget/total"));  // the budget series is among those checked

  // The final snapshot is the last good state: its time and step are the status's, after the
  // start, and it is physical (positive density and pressure in every cell).
  const double t_good = h.attr_real("/status", "simulated_time");
  const long steps = h.attr_int("/status", "steps");
  CHECK(t_good > 0.5e-6);  // after the drive started: not the initial state
  CHECK(steps > 100);
  const auto times = h.read_real("/snapshots/time");
  const auto step_rows = h.read_real("/snapshots/step");
  REQUIRE(times.size() >= 2);
  CHECK(times.back() == t_good);
  CHECK(step_rows.back() == static_cast<double>(steps));
  const std::size_t n = h.read_real("/grid/x").size();
  const auto rho = h.read_real_rows("/snapshots/mass_density", times.size() - 1, 1);
  const auto p = h.read_real_rows("/snapshots/pressure", times.size() - 1, 1);
  REQUIRE(rho.size() == n);
  for (std::size_t i = 0; i < n; ++i) {
    INFO("cell " << i);
    CHECK(rho[i] > 0);
    CHECK(p[i] > 0);
  }
  // Probe and history rows stop at or before the last good state.
  CHECK(h.read_real("/probes/time").back() <= t_good);
  CHECK(h.read_real("/history/time").back() <= t_good);
}
