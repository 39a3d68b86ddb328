// What a checkpoint captures of a running case and puts back (sim/checkpoint.hpp): the
// state, the loop's variables, the Stepper's boundary-flux integrals and the state of drives
// that have one; mismatches are refused by name.
#include <catch2/catch.hpp>
#include <memory>
#include <span>
#include <vector>

#include "core/error.hpp"
#include "drive/boundary.hpp"
#include "drive/drive_state.hpp"
#include "models/mhd.hpp"
#include "numerics/fluxes.hpp"
#include "sim/cadence.hpp"
#include "sim/checkpoint.hpp"
#include "time/stepper.hpp"

using Catch::Matchers::Contains;
using tw::Mhd;
using tw::real;

namespace {

/// A conducting end with an internal state (as an antenna circuit would have): two numbers
/// that only change when restored.
class StatefulEnd final : public tw::Boundary<Mhd>, public tw::DriveState {
 public:
  void fill(const Mhd& m, const tw::Grid& g, tw::Side side, real t, tw::Field<State>& W) const override {
    inner_.fill(m, g, side, t, W);
  }
  [[nodiscard]] std::string describe() const override { return "stateful test end"; }
  [[nodiscard]] std::vector<real> drive_state() const override { return state_; }
  void restore_drive_state(std::span<const real> s) const override {
    if (s.size() != state_.size()) throw tw::InputError("wrong drive state size");
    state_.assign(s.begin(), s.end());
  }
  mutable std::vector<real> state_{0.5, -1.25};

 private:
  tw::ConductingBoundary<Mhd> inner_;
};

struct Rig {
  tw::Grid grid{16, 0.0, 1.0};
  Mhd model{};
  std::shared_ptr<StatefulEnd> left = std::make_shared<StatefulEnd>();
  tw::Stepper<Mhd> stepper{tw::FvOperator<Mhd>(grid, tw::SpatialScheme{}, left,
                                               std::make_shared<tw::ZeroGradientBoundary<Mhd>>()),
                           tw::TimeControl{}};
  tw::Field<Mhd::State> U{grid};
  real t = 0, t_snap_last = -1;
  long step = 0, snapshots = 0;
  tw::Cadence snaps{0.1};
  std::vector<real> energy_in{0, 0};
  tw::LoopVariables loop() {
    return {&t, &step, &t_snap_last, {{"snapshots", &snaps}}, {{"snapshots", &snapshots}},
            {{"energy_in", tw::accumulator_over(std::span<real>(energy_in))}}};
  }
};

}  // namespace

TEST_CASE("checkpoint state: capture and restore are exact inverses", "[unit][checkpoint]") {
  Rig a;
  for (int i = 0; i < a.grid.n_cells; ++i)
    for (int k = 0; k < Mhd::n_vars; ++k) a.U[i][k] = 1.0 + 0.01 * i + 0.1 * k;
  a.t = 0.123;
  a.step = 77;
  a.t_snap_last = 0.1;
  a.snapshots = 2;
  REQUIRE(a.snaps.due(0.123));
  a.energy_in = {1.5, -2.5};
  std::array<Mhd::State, 2> bf{};
  bf[0][0] = 3.25;
  bf[1][Mhd::n_vars - 1] = -1e-9;
  a.stepper.set_boundary_flux_integrals(bf);
  a.stepper.set_energy_inflow({2.5, -0.125});
  a.stepper.set_source_work({1e-3, 7.0});
  tw::Dissipation heat;
  heat.resistive = 0.5;
  heat.collisional = 1e-12;
  heat.retained = false;
  a.stepper.set_dissipated(heat);
  a.left->state_ = {0.75, 42.0};

  tw::io::CheckpointData d;
  tw::capture_run_state(a.U, a.stepper, a.loop(), d);
  CHECK(d.drives.at("left_end") == std::vector<real>{0.75, 42.0});
  CHECK(d.accumulators.at("boundary_flux").size() == 2 * Mhd::n_vars);
  CHECK(d.accumulators.count("energy_inflow") == 1);
  CHECK(d.accumulators.count("source_work") == 1);
  CHECK(d.accumulators.count("dissipated") == 1);

  Rig b;
  tw::restore_run_state(d, "ck.h5", b.U, b.stepper, b.loop());
  for (int i = 0; i < a.grid.n_cells; ++i) CHECK(b.U[i] == a.U[i]);
  CHECK(b.t == a.t);
  CHECK(b.step == 77);
  CHECK(b.t_snap_last == 0.1);
  CHECK(b.snapshots == 2);
  CHECK(b.snaps.next_index() == a.snaps.next_index());
  CHECK(b.energy_in == a.energy_in);
  CHECK(b.stepper.boundary_flux_integrals() == bf);
  CHECK(b.stepper.energy_inflow() == std::array<real, 2>{2.5, -0.125});
  CHECK(b.stepper.source_work() == std::vector<real>{1e-3, 7.0});
  CHECK(b.stepper.dissipated().resistive == 0.5);
  CHECK(b.stepper.dissipated().collisional == 1e-12);
  CHECK_FALSE(b.stepper.dissipated().retained);
  CHECK(b.left->state_ == std::vector<real>{0.75, 42.0});
}

TEST_CASE("checkpoint state: a checkpoint of another loop is refused by name", "[unit][checkpoint]") {
  Rig a;
  tw::io::CheckpointData d;
  tw::capture_run_state(a.U, a.stepper, a.loop(), d);
  Rig b;
  SECTION("a missing cadence") {
    d.cadences.erase("snapshots");
    d.cadences["probes"] = 3;
    CHECK_THROWS_WITH(tw::restore_run_state(d, "ck.h5", b.U, b.stepper, b.loop()),
                      Contains("checkpoint 'ck.h5' does not fit this run") && Contains("no cadence 'snapshots'"));
  }
  SECTION("an accumulator of another size") {
    d.accumulators["energy_in"] = {1.0};
    CHECK_THROWS_WITH(tw::restore_run_state(d, "ck.h5", b.U, b.stepper, b.loop()),
                      Contains("accumulator 'energy_in': it holds 1 values, this run 2"));
  }
  SECTION("no state for a stateful drive") {
    d.drives.clear();
    CHECK_THROWS_AS(tw::restore_run_state(d, "ck.h5", b.U, b.stepper, b.loop()), tw::InputError);
  }
  SECTION("another grid") {
    d.n_cells = 8;
    CHECK_THROWS_WITH(tw::restore_run_state(d, "ck.h5", b.U, b.stepper, b.loop()), Contains("8 cells"));
  }
}

TEST_CASE("checkpoint state: the checkpoint schedule follows simulated and wall-clock time", "[unit][checkpoint]") {
  tw::CheckpointSpec s;
  s.interval = 0.25;
  tw::CheckpointClock c(s, 0.0, 0.0);
  CHECK(c.due(0.2, 1e9) == nullptr);
  REQUIRE(c.due(0.3, 0.0) != nullptr);
  CHECK(std::string(c.due(0.3, 0.0)) == "simulated-time interval");
  c.taken(0.3, 0.0);
  CHECK(c.due(0.45, 0.0) == nullptr);
  CHECK(c.due(0.5, 0.0) != nullptr);
  // A continued run keeps the schedule: from t = 0.6 the next checkpoint is at 0.75.
  tw::CheckpointClock resumed(s, 0.6, 0.0);
  CHECK(resumed.due(0.7, 0.0) == nullptr);
  CHECK(resumed.due(0.75, 0.0) != nullptr);
  tw::CheckpointSpec w;
  w.wall_interval = 10;
  tw::CheckpointClock wall(w, 0.0, 100.0);
  CHECK(wall.due(5.0, 109.0) == nullptr);
  CHECK(std::string(wall.due(5.0, 110.0)) == "wall-clock interval");
  wall.taken(5.0, 110.0);
  CHECK(wall.due(5.0, 119.0) == nullptr);
}

TEST_CASE("checkpoint state: the default checkpoint sits next to the output", "[unit][checkpoint]") {
  CHECK(tw::default_checkpoint_path("runs/column.h5") == "runs/column.checkpoint.h5");
  CHECK(tw::default_checkpoint_path("column") == "column.checkpoint.h5");
  CHECK(tw::default_checkpoint_path("out/run.hdf") == "out/run.hdf.checkpoint.h5");
}
