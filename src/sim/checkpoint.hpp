#pragma once
/// Checkpoints of a running case and continuing from them (restart).
///
/// When: at a simulated-time interval (`checkpoint.interval`), at a wall-clock interval
/// (`checkpoint.wall_interval`), and when the run is asked to stop (SIGTERM, SIGINT or
/// SIGUSR1 set RunOptions::stop). A checkpoint is taken between steps, after the step that
/// reaches its time: checkpoints never shorten a step, so a run with checkpoints takes exactly
/// the steps of a run without.
///
/// What: the conservative state, t, the step count, the index of the next time of every
/// output cadence, the counters and accumulators of the loop (the Stepper's boundary-flux
/// integrals included), the state of drives that have one (drive/drive_state.hpp), the rows
/// of every output series, and the run file (as read, with its overrides, and resolved). The
/// layout is io/checkpoint_file.hpp's.
///
/// Order, so that a crash at any moment leaves a consistent pair: the output first (published
/// as an incomplete copy at its final path, or closed as "interrupted"), then the checkpoint
/// (built under a temporary name, renamed over the previous one). A checkpoint therefore
/// never names rows its output lacks; rows the output has beyond the checkpoint are dropped
/// when the run continues.
///
/// Restart: the checkpoint's build (version and git revision) must be this one, and the case
/// must be the same: the run file given with the restart (or the one stored in the
/// checkpoint) may differ only in `checkpoint.*`, `time.max_steps`, `title`, `description`
/// and `output.file`. The continued run appends to the output recorded in the checkpoint (or
/// the one given with -o), which must carry the checkpoint's run_id. Everything the continued
/// run computes is then bitwise what the uninterrupted run computes.
#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <map>
#include <span>
#include <string>
#include <vector>

#include "core/error.hpp"
#include "drive/drive_state.hpp"
#include "grid/grid.hpp"
#include "io/checkpoint_file.hpp"
#include "io/output.hpp"
#include "io/runfile.hpp"
#include "io/schema.hpp"
#include "numerics/fv_operator.hpp"
#include "sim/cadence.hpp"
#include "sim/loop_state.hpp"
#include "time/stepper.hpp"

namespace tw {

/// Where and how often checkpoints are written (the `checkpoint` section).
struct CheckpointSpec {
  std::string file;                                             ///< checkpoint path
  real interval = std::numeric_limits<real>::infinity();       ///< simulated time [s]
  double wall_interval = std::numeric_limits<double>::infinity();  ///< wall-clock time [s]
};

void declare_checkpoint_keys(io::Schema& schema);

/// The `checkpoint` section; the default file is default_checkpoint_path(output_file).
CheckpointSpec read_checkpoint_spec(const io::RunFile& rf, const std::string& output_file);

/// "DIR/NAME.checkpoint.h5" for the output "DIR/NAME.h5" (any other extension is kept:
/// "run.out" -> "run.out.checkpoint.h5").
std::string default_checkpoint_path(const std::string& output_file);

/// "SIGTERM", "SIGINT", "SIGUSR1", else "signal N".
std::string signal_name(int signal);

/// When the next periodic checkpoint is due. The simulated-time schedule is k * interval
/// (k >= 1), computed from t, so a continued run keeps the schedule of the first.
class CheckpointClock {
 public:
  CheckpointClock(const CheckpointSpec& spec, real t, double wall_now);
  /// After the step that reached the next checkpoint time or wall interval: why a
  /// checkpoint is due ("simulated-time interval", "wall-clock interval"); else nullptr.
  [[nodiscard]] const char* due(real t, double wall_now) const;
  /// A checkpoint was written at (t, wall_now): schedule the next.
  void taken(real t, double wall_now);

 private:
  real interval_;
  double wall_interval_;
  long next_index_ = 1;
  double last_wall_ = 0;
};

/// What `tubewave run --restart` was given.
struct RestartRequest {
  std::string checkpoint;               ///< path of the checkpoint
  std::string run_file;                 ///< optional: must describe the same case
  std::vector<std::string> overrides;   ///< --set given with the restart
  std::string output_override;          ///< -o: the output to continue (default: recorded)
};

/// A checked restart: the checkpoint, the run file to continue with, and the output path.
struct RestartPlan {
  io::CheckpointData data;
  io::RunFile run_file;
  std::string output_file;
  std::string checkpoint_path;  ///< where `data` came from, for messages
};

/// Read the checkpoint and check it belongs to this build and to the case. Throws
/// InputError (exit code 2) naming what differs; nothing is written.
RestartPlan plan_restart(const RestartRequest& request, const io::Schema& schema);

/// Refuse a checkpoint whose model, number of variables or grid differ from the case's
/// (InputError naming both).
void check_checkpoint_case(const io::CheckpointData& data, const std::string& checkpoint_path,
                           const std::string& model, int n_vars, const Grid& grid);

/// What a continued run keeps of its output.
io::ResumePoint resume_point(const io::CheckpointData& data);

/// The stateful drives among the operator's ends and sources, by checkpoint name.
template <Model M>
std::vector<std::pair<std::string, const DriveState*>> stateful_drives(const FvOperator<M>& op) {
  std::vector<std::pair<std::string, const DriveState*>> d;
  if (const auto* s = dynamic_cast<const DriveState*>(&op.boundary(Side::left))) d.emplace_back("left_end", s);
  if (const auto* s = dynamic_cast<const DriveState*>(&op.boundary(Side::right))) d.emplace_back("right_end", s);
  for (std::size_t k = 0; k < op.sources().size(); ++k)
    if (const auto* s = dynamic_cast<const DriveState*>(op.sources()[k].get()))
      d.emplace_back("source_" + std::to_string(k), s);
  return d;
}

/// The Stepper's time integrals as named accumulators: the flux through each end of every
/// conserved variable ("boundary_flux": left end's N values, then the right end's), the
/// energy in through the ends, the work of every source term and the dissipated heat.
template <Model M>
std::vector<std::pair<std::string, Accumulator>> stepper_accumulators(const Stepper<M>& stepper) {
  constexpr int N = M::n_vars;
  auto* st = const_cast<Stepper<M>*>(&stepper);  // restore() writes; save() only reads
  const auto size_error = [](std::size_t got, std::size_t want) {
    return InputError("it holds " + std::to_string(got) + " values, this run " + std::to_string(want));
  };
  std::vector<std::pair<std::string, Accumulator>> a;
  a.emplace_back("boundary_flux",
                 Accumulator{[st] {
                               std::vector<real> v;
                               for (const auto& side : st->boundary_flux_integrals()) v.insert(v.end(), side.begin(), side.end());
                               return v;
                             },
                             [st, size_error](std::span<const real> v) {
                               if (v.size() != 2 * static_cast<std::size_t>(N)) throw size_error(v.size(), 2 * N);
                               std::array<typename M::State, 2> b{};
                               for (int s = 0; s < 2; ++s)
                                 for (int k = 0; k < N; ++k) b[static_cast<std::size_t>(s)][k] = v[static_cast<std::size_t>(s) * N + k];
                               st->set_boundary_flux_integrals(b);
                             }});
  a.emplace_back("energy_inflow", Accumulator{[st] {
                                                const auto& e = st->energy_inflow();
                                                return std::vector<real>(e.begin(), e.end());
                                              },
                                              [st, size_error](std::span<const real> v) {
                                                if (v.size() != 2) throw size_error(v.size(), 2);
                                                st->set_energy_inflow({v[0], v[1]});
                                              }});
  a.emplace_back("source_work", Accumulator{[st] { return st->source_work(); },
                                            [st](std::span<const real> v) {
                                              st->set_source_work(std::vector<real>(v.begin(), v.end()));
                                            }});
  a.emplace_back("dissipated", Accumulator{[st] {
                                             const Dissipation& d = st->dissipated();
                                             return std::vector<real>{d.resistive, d.viscous, d.collisional,
                                                                      d.retained ? 1.0 : 0.0};
                                           },
                                           [st, size_error](std::span<const real> v) {
                                             if (v.size() != 4) throw size_error(v.size(), 4);
                                             Dissipation d;
                                             d.resistive = v[0];
                                             d.viscous = v[1];
                                             d.collisional = v[2];
                                             d.retained = v[3] != 0;
                                             st->set_dissipated(d);
                                           }});
  return a;
}

/// Fill the loop part of a checkpoint: state, loop variables, the Stepper's time integrals
/// (stepper_accumulators), drive states.
template <Model M>
void capture_run_state(const Field<typename M::State>& U, const Stepper<M>& stepper,
                       const LoopVariables& loop, io::CheckpointData& d) {
  constexpr int N = M::n_vars;
  const int n = U.n_cells();
  d.n_vars = N;
  d.n_cells = n;
  d.state.resize(static_cast<std::size_t>(n) * N);
  for (int i = 0; i < n; ++i)
    for (int k = 0; k < N; ++k) d.state[static_cast<std::size_t>(i) * N + k] = U[i][k];
  d.t = *loop.t;
  d.step = *loop.step;
  d.t_snap_last = *loop.t_snap_last;
  for (const auto& [name, c] : loop.cadences) d.cadences[name] = c->next_index();
  for (const auto& [name, v] : loop.counters) d.counters[name] = *v;
  for (const auto& [name, a] : loop.accumulators) d.accumulators[name] = a.save();
  for (const auto& [name, a] : stepper_accumulators(stepper)) d.accumulators[name] = a.save();
  for (const auto& [name, s] : stateful_drives(stepper.op())) d.drives[name] = s->drive_state();
}

/// Put a checkpoint's loop part back (the inverse of capture_run_state). Every name the
/// loop registers must be in the checkpoint and vice versa, with the same sizes; otherwise
/// InputError (the checkpoint was written by another run loop).
template <Model M>
void restore_run_state(const io::CheckpointData& d, const std::string& path, Field<typename M::State>& U,
                       Stepper<M>& stepper, const LoopVariables& loop) {
  constexpr int N = M::n_vars;
  const auto refuse = [&](const std::string& what) {
    throw InputError("checkpoint '" + path + "' does not fit this run: " + what);
  };
  const int n = U.n_cells();
  if (d.n_cells != n || d.n_vars != N || d.state.size() != static_cast<std::size_t>(n) * N)
    refuse("its state has " + std::to_string(d.n_cells) + " cells x " + std::to_string(d.n_vars) + " variables");
  for (int i = 0; i < n; ++i)
    for (int k = 0; k < N; ++k) U[i][k] = d.state[static_cast<std::size_t>(i) * N + k];
  *loop.t = d.t;
  *loop.step = d.step;
  *loop.t_snap_last = d.t_snap_last;
  const auto take = [&](const auto& stored, const std::string& kind, const std::string& name) {
    const auto it = stored.find(name);
    if (it == stored.end()) refuse("it has no " + kind + " '" + name + "'");
    return it->second;
  };
  const auto same_names = [&](const auto& stored, const auto& registered, const std::string& kind,
                              std::size_t extra) {
    if (stored.size() != registered.size() + extra) {
      std::string names;
      for (const auto& e : stored) names += (names.empty() ? "" : ", ") + e.first;
      refuse("its " + kind + "s are {" + names + "}, this run has " + std::to_string(registered.size() + extra));
    }
  };
  same_names(d.cadences, loop.cadences, "cadence", 0);
  for (const auto& [name, c] : loop.cadences) c->set_next_index(take(d.cadences, "cadence", name));
  same_names(d.counters, loop.counters, "counter", 0);
  for (const auto& [name, v] : loop.counters) *v = take(d.counters, "counter", name);
  auto accumulators = loop.accumulators;
  for (auto& a : stepper_accumulators(stepper)) accumulators.push_back(std::move(a));
  same_names(d.accumulators, accumulators, "accumulator", 0);
  for (const auto& [name, a] : accumulators) {
    const auto v = take(d.accumulators, "accumulator", name);
    try {
      a.restore(v);
    } catch (const InputError& e) {
      refuse("accumulator '" + name + "': " + e.what());
    }
  }
  const auto drives = stateful_drives(stepper.op());
  same_names(d.drives, drives, "drive state", 0);
  for (const auto& [name, s] : drives) s->restore_drive_state(take(d.drives, "drive state", name));
}

}  // namespace tw
