#pragma once
/// The generic run loop: builds a case for model M from a run file, runs it with output
/// events at exact times, and writes the HDF5 file. Models plug in through
/// ModelSetup<M> (sim/model_setup.hpp); nothing here knows a model's equations.
#include <omp.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <filesystem>
#include <memory>
#include <optional>
#include <sstream>

#include "core/plasma_params.hpp"
#include "drive/boundary.hpp"
#include "io/output.hpp"
#include "io/xdmf.hpp"
#include "sim/cadence.hpp"
#include "sim/case.hpp"
#include "sim/checkpoint.hpp"
#include "sim/drive_setup.hpp"
#include "sim/initial.hpp"
#include "sim/model_setup.hpp"
#include "sim/run.hpp"
#include "sim/wave_output.hpp"
#include "time/stepper.hpp"
#include "tubewave/version.hpp"

namespace tw {

template <Model M>
class CaseRunner {
 public:
  using State = typename M::State;
  static constexpr int N = M::n_vars;

  CaseRunner(const io::RunFile& rf, CaseSetup c)
      : rf_(rf), c_(std::move(c)), model_(ModelSetup<M>::make(rf, c_)), U_(c_.grid) {
    const Grid& g = c_.grid;
    // Initial state: the generic plasma, then the model's own perturbation.
    const auto pts = initial_plasma(rf, c_);
    Field<State> W(g);
    for (int i = 0; i < g.n_cells; ++i)
      W[i] = ModelSetup<M>::primitive(model_, pts[static_cast<std::size_t>(i)], c_);
    if (!ModelSetup<M>::perturb(model_, rf, c_, W))
      rf.fail("initial.kind", "the " + rf.get_string("initial.kind") + " initial state is not available for the " +
                                  std::string(M::name()) + " model");
    for (int i = 0; i < g.n_cells; ++i) {
      if (!model_.admissible(W[i])) {
        std::ostringstream msg;
        msg << "the initial state is not physical at x = " << g.x_centre(i)
            << " m (cell " << i << "): check densities, pressures and temperatures";
        rf.fail("initial", msg.str());
      }
    }
    scheme_ = c_.scheme;
    scheme_.flux = ModelSetup<M>::flux(rf, model_);
    // Ends, antennas and absorbing layers (sim/drive_setup.hpp), and their diagnostics.
    BuiltDrives<M> drives = build_drives<M>(rf, c_, model_, W);
    FvOperator<M> op(g, scheme_, drives.left, drives.right);
    for (auto& s : drives.sources) op.add_source(s);
    stepper_.emplace(std::move(op), c_.time);
    stepper_->set_normalized_units(c_.units.normalized);
    waves_.emplace(rf, c_, std::move(drives.drives), std::move(drives.layer_sources));
    // Conservative variables (over the whole grid, with the ends, for models that need it).
    stepper_->op().conservatives(model_, 0, W, U_);
    prim_ = Field<State>(g);
    // Probe interpolation: between the two cell centres around each probe.
    for (real x : c_.output.probes) {
      real s = (x - g.x_min) / g.dx() - 0.5;
      int i0 = static_cast<int>(std::floor(s));
      i0 = std::clamp(i0, 0, std::max(0, g.n_cells - 2));
      const real w = std::clamp(s - i0, real(0), real(1));
      probe_cell_.push_back(i0);
      probe_weight_.push_back(g.n_cells > 1 ? w : 0);
    }
  }

  [[nodiscard]] const M& model() const { return model_; }
  [[nodiscard]] const Field<State>& state() const { return U_; }

  CheckReport check() {
    (void)read_checkpoint_spec(rf_, c_.output.file);  // its keys are validated here too
    CheckReport r;
    const Grid& g = c_.grid;
    r.model = M::name();
    r.cells = g.n_cells;
    r.dx = g.dx();
    const StepInfo info = stepper_->probe_dt(model_, U_, 0);
    r.dt = info.dt;
    r.limited_by = info.limited_by;
    for (const auto& l : stepper_->all_limits(model_, U_, 0)) r.limits.emplace_back(l.name, l.dt);
    if (c_.time.dt_max < std::numeric_limits<real>::infinity()) r.limits.emplace_back("max_dt", c_.time.dt_max);
    r.t_end = c_.t_end;
    // As a double first: t_end / dt can exceed the range of long (found by fuzzing).
    const double steps = std::ceil(c_.t_end / r.dt);
    r.estimated_steps = steps < 9e18 ? static_cast<long>(steps) : std::numeric_limits<long>::max();
    r.memory_bytes = 7.0 * g.n_total() * sizeof(State);
    const auto outs = M::output_info();
    r.snapshots = Cadence(c_.output.snapshot_interval).count(c_.t_end) + 1;
    r.probe_samples = c_.output.probes.empty() ? 0 : Cadence(c_.output.probe_interval).count(c_.t_end) + 1;
    r.history_samples = Cadence(c_.output.history_interval).count(c_.t_end) + 1;
    r.output_bytes = 8.0 * (static_cast<double>(r.snapshots) * outs.size() * g.n_cells +
                            static_cast<double>(r.probe_samples) * outs.size() * c_.output.probes.size() +
                            static_cast<double>(r.history_samples) * 2 * N);
    r.output_file = c_.output.file;
    if (r.estimated_steps > c_.max_steps)
      r.warnings.push_back("the run needs about " + std::to_string(r.estimated_steps) +
                           " steps, more than time.max_steps = " + std::to_string(c_.max_steps));
    if (!c_.output.probes.empty() && c_.output.probe_interval < r.dt)
      r.warnings.push_back("output.probe_interval is shorter than the time step: steps will be "
                           "shortened to land on probe times");
    if (scheme_.reconstruction == Reconstruction::weno5 && c_.time.integrator == IntegratorKind::ssp_rk2)
      r.warnings.push_back("weno5 is fifth order in space; ssp-rk3 keeps its time error comparable");
    if (scheme_.reconstruction == Reconstruction::plm && scheme_.limiter == Limiter::none)
      r.warnings.push_back("unlimited slopes oscillate at discontinuities; use them for smooth waves only");
    if constexpr (HasCheckWarnings<M>)
      for (auto& w : ModelSetup<M>::check_warnings(model_, c_)) r.warnings.push_back(std::move(w));
    return r;
  }

  /// Run the case, or continue it from a checkpoint (`restart`, checked by plan_restart):
  /// the output is then reopened for appending and the loop starts where the checkpoint left.
  RunSummary run(const RunOptions& opt, const RestartPlan* restart = nullptr) {
    using clock = std::chrono::steady_clock;
    const Grid& g = c_.grid;
    const auto t0 = clock::now();
    const CheckpointSpec ckpt = read_checkpoint_spec(rf_, c_.output.file);
    if (restart) check_checkpoint_case(restart->data, restart->checkpoint_path, model_label(), N, g);
    io::OutputFile out = restart ? io::OutputFile(c_.output.file, resume_point(restart->data))
                                 : io::OutputFile(c_.output.file);
    out.set_axis_units(c_.units.unit("m"), c_.units.unit("s"));
    if (!out.appending()) write_header(out);
    const auto outs = M::output_info();
    const auto cons = M::conserved_info();
    std::vector<io::ColumnInfo> cols, hist;
    for (const auto& v : outs) cols.push_back({v.name, c_.units.unit(v.units), v.description});
    for (const auto& v : cons) {
      hist.push_back({v.name + "_total", c_.units.unit(v.units), "integral over the tube: " + v.description});
      hist.push_back({v.name + "_inflow", c_.units.unit(v.units),
                      "time-integrated net flux in through both ends (total - initial total, if conserved)"});
    }
    if constexpr (HasDiagnostics<M>)
      for (const auto& v : M::diagnostic_info()) hist.push_back({v.name, c_.units.unit(v.units), v.description});
    io::Series snaps = out.create_series("snapshots", cols, g.n_cells, 1, true);
    std::optional<io::Series> probes;
    if (!c_.output.probes.empty())
      probes = out.create_series("probes", cols, static_cast<int>(c_.output.probes.size()), 256, false);
    io::Series history = out.create_series("history", hist, 1, 256, false);
    waves_->create(out);

    Cadence snap_c(c_.output.snapshot_interval), probe_c(c_.output.probe_interval),
        hist_c(c_.output.history_interval), region_c(c_.output.probe_interval);
    const bool regions = waves_->has_regions();
    if (!restart) waves_->after_step(0, *stepper_);
    RunSummary sum;
    sum.output_file = c_.output.file;
    sum.normalized = c_.units.normalized;
    real t = 0, t_snap_last = -1;
    long step = 0;
    // What checkpoints save and a restart puts back, by name (sim/checkpoint.hpp).
    LoopVariables loop{&t, &step, &t_snap_last,
                       {{"snapshots", &snap_c}, {"probes", &probe_c}, {"history", &hist_c}, {"regions", &region_c}},
                       {{"snapshots", &sum.snapshots}, {"probe_samples", &sum.probe_samples}},
                       {}};
    waves_->add_checkpoint_state(loop.accumulators);
    double wall_before = 0;  // wall time of the run's earlier segments
    if (restart) {
      restore_run_state(restart->data, restart->checkpoint_path, U_, *stepper_, loop);
      wall_before = restart->data.wall_seconds;
      sum.restarts = restart->data.restarts + 1;
    }
    const long step0 = step;
    auto wall_now = [&] { return std::chrono::duration<double>(clock::now() - t0).count(); };
    CheckpointClock ckpt_clock(ckpt, t, 0.0);
    auto checkpoint_data = [&](const std::string& reason) {
      io::CheckpointData d;
      d.reason = reason;
      d.model = model_label();
      d.x_min = g.x_min;
      d.length = g.length;
      d.run_id = out.run_id();
      d.run_file_name = rf_.source_name();
      d.run_file_text = rf_.source_text();
      d.resolved_run_file = rf_.resolved_yaml();
      d.overrides = rf_.overrides();
      d.output_file = std::filesystem::absolute(c_.output.file).string();
      d.wall_seconds = wall_before + wall_now();
      d.restarts = sum.restarts;
      capture_run_state(U_, *stepper_, loop, d);
      d.series_rows = out.series_rows();
      return d;
    };
    auto write_outputs = [&](bool force_snapshot) {
      const bool s = snap_c.due(t) || force_snapshot;
      const bool p = probes && probe_c.due(t);
      const bool h = hist_c.due(t);
      const bool r = regions && region_c.due(t);
      if (!(s || p || h || r)) return;
      stepper_->validate(model_, U_, t);
      stepper_->op().primitives(model_, t, U_, prim_);
      if (s && t != t_snap_last) {
        append_snapshot(snaps, t, step);
        waves_->snapshot(t, step, model_, prim_);
        t_snap_last = t;
        ++sum.snapshots;
      }
      if (p) {
        append_probes(*probes, t, step);
        ++sum.probe_samples;
      }
      if (h) {
        append_history(history, t, step);
        waves_->history(t, step, model_, prim_, *stepper_);
      }
      if (r) waves_->region_sample(t, step, model_, prim_);
    };
    Progress prog;
    prog.t_end = c_.t_end;
    prog.normalized = c_.units.normalized;
    auto report = [&](bool final) {
      if (!opt.progress) return;
      prog.t = t;
      prog.step = step;
      prog.wall_seconds = std::chrono::duration<double>(clock::now() - t0).count();
      prog.cell_updates_per_second = prog.wall_seconds > 0 ? g.n_cells * static_cast<double>(step - step0) / prog.wall_seconds : 0;
      prog.final = final;
      opt.progress(prog);
    };

    std::string outcome = "completed", message = "the run reached its end time";
    std::optional<io::CheckpointData> stop_checkpoint;
    auto last_report = clock::now();
    try {
      if (!restart) write_outputs(true);
      while (t < c_.t_end) {
        if (opt.stop != nullptr && opt.stop->load()) {
          const int sig = opt.stop_signal != nullptr ? opt.stop_signal->load() : 0;
          outcome = "interrupted";
          message = std::string("stopped on request") + (sig != 0 ? " (" + signal_name(sig) + ")" : "") +
                    "; checkpoint " + ckpt.file;
          // Taken before the snapshot of the stop time below: a continued run drops that row.
          stepper_->validate(model_, U_, t);
          stop_checkpoint = checkpoint_data(sig != 0 ? "stopped by " + signal_name(sig) : "stopped on request");
          break;
        }
        if (step >= c_.max_steps) {
          outcome = "failed";
          message = "time.max_steps = " + std::to_string(c_.max_steps) + " reached at t = " + std::to_string(t) + " s";
          break;
        }
        real next = c_.t_end;
        const char* cap = "end time";
        for (const auto* cd : {&snap_c, &probe_c, &hist_c, &region_c}) {
          if (cd == &probe_c && !probes) continue;
          if (cd == &region_c && !regions) continue;
          // An output time within round-off of the end is the end (no sliver steps).
          if (cd->next_time() < next && cd->next_time() < c_.t_end * (1 - 1e-12)) {
            next = cd->next_time();
            cap = "output time";
          }
        }
        const StepInfo info = stepper_->step(model_, U_, t, next - t, cap);
        t = info.dt == next - t ? next : t + info.dt;
        ++step;
        waves_->after_step(t, *stepper_);
        prog.dt = info.dt;
        prog.limited_by = info.limited_by;
        write_outputs(false);
        const char* why = t < c_.t_end ? ckpt_clock.due(t, wall_now()) : nullptr;
        if (why != nullptr) {  // between steps: a checkpoint never shortens a step
          stepper_->validate(model_, U_, t);
          const io::CheckpointData d = checkpoint_data(why);
          std::ostringstream note;
          note << "partial output published with the checkpoint at t = " << t << " s; the run went on";
          out.publish_partial(note.str(), step, t, d.wall_seconds);
          io::write_checkpoint_file(ckpt.file, d);
          ckpt_clock.taken(t, wall_now());
          ++sum.checkpoints;
        }
        if (opt.progress && clock::now() - last_report > std::chrono::duration<double>(opt.progress_interval_s)) {
          report(false);
          last_report = clock::now();
        }
      }
      if (outcome != "failed") {
        stepper_->validate(model_, U_, t);
        stepper_->op().primitives(model_, t, U_, prim_);
        if (t != t_snap_last) {
          append_snapshot(snaps, t, step);
          waves_->snapshot(t, step, model_, prim_);
          t_snap_last = t;
          ++sum.snapshots;
        }
      }
    } catch (const StateError& e) {
      outcome = "failed";
      message = e.what();
      if (e.t_good() < t) --step;  // caught after the step (before output): its start is kept
      t = e.t_good();
      stepper_->op().primitives(model_, t, U_, prim_);
      if (t != t_snap_last) {  // the last good state, unless it is already the last snapshot
        append_snapshot(snaps, t, step);
        waves_->snapshot(t, step, model_, prim_);
        ++sum.snapshots;
      }
    }
    sum.notes = waves_->finish(out, t);
    const double wall = std::chrono::duration<double>(clock::now() - t0).count();
    out.close_as(outcome, message, step, t, wall_before + wall);
    io::write_xdmf_sidecar(c_.output.file);  // RUN.xmf: the snapshots for XDMF viewers
    if (stop_checkpoint) {  // after the output is in place (sim/checkpoint.hpp, "Order")
      io::write_checkpoint_file(ckpt.file, *stop_checkpoint);
      sum.checkpoint_file = ckpt.file;
      ++sum.checkpoints;
    }
    report(true);
    sum.outcome = outcome;
    sum.message = message;
    sum.steps = step;
    sum.t = t;
    sum.wall_seconds = wall;
    sum.cell_updates_per_second = wall > 0 ? g.n_cells * static_cast<double>(step - step0) / wall : 0;
    return sum;
  }

 private:
  /// The model as checkpoints name it: "mhd (nonlinear)".
  [[nodiscard]] std::string model_label() const { return std::string(M::name()) + " (" + c_.form + ")"; }

  void write_header(io::OutputFile& out) {
    io::Provenance p;
    p.title = c_.title;
    p.model = model_label();
    p.run_file_name = rf_.source_name();
    p.run_file_text = rf_.source_text();
    for (const auto& o : rf_.overrides()) p.overrides += o + "\n";
    p.resolved_run_file = rf_.resolved_yaml();
    p.threads = omp_get_max_threads();
    out.write_provenance(p);
    std::vector<io::ParameterValue> params{
        {"cells", static_cast<real>(c_.grid.n_cells), "1", "number of cells"},
        {"cell_size", c_.grid.dx(), c_.units.unit("m"), "cell size dx"},
        {"end_time", c_.t_end, c_.units.unit("s"), "simulated end time"},
        {"cfl", c_.time.cfl, "1", "Courant number"},
        {"runge_kutta_order", static_cast<real>(rk_order(c_.time.integrator)), "1", "order of the SSP-RK scheme"},
        {"light_speed", c_.units.c, c_.units.unit("m/s"), "speed of light of the unit system"},
        {"ion_mass", c_.plasma.ion_mass, c_.units.unit("kg"), "ion mass"},
        {"ion_charge", static_cast<real>(c_.plasma.charge), "1", "ion charge number Z"},
    };
    for (auto& mp : ModelSetup<M>::parameters(model_, c_)) params.push_back(mp);
    // Derived parameters of the background at the left end (SI runs with a field only).
    const PlasmaInput in = c_.plasma.formulary_input(c_.grid.x_min, c_.units);
    if (!c_.units.normalized && in.B > 0 && in.n_e > 0) {
      for (const auto& row : plasma_parameter_rows(derive_plasma_parameters(in)))
        params.push_back({"background_" + row.key, row.value, row.units, row.description + " (background at the left end)"});
    }
    out.write_parameters(params);
    const auto xc = c_.grid.centres(), xf = c_.grid.faces();
    out.write_grid(xc, xf, c_.output.probes);
  }

  void append_snapshot(io::Series& s, real t, long step) {
    const int n = c_.grid.n_cells;
    const auto nout = M::output_info().size();
    buf_.assign(nout * static_cast<std::size_t>(n), 0);
    std::vector<real> o(nout);
    for (int i = 0; i < n; ++i) {
      model_.to_output(prim_[i], o.data());
      for (std::size_t k = 0; k < nout; ++k) buf_[k * static_cast<std::size_t>(n) + static_cast<std::size_t>(i)] = o[k];
    }
    s.append(t, step, buf_);
  }

  void append_probes(io::Series& s, real t, long step) {
    const std::size_t np = c_.output.probes.size();
    const auto nout = M::output_info().size();
    buf_.assign(nout * np, 0);
    std::vector<real> a(nout), b(nout);
    const int n = c_.grid.n_cells;
    for (std::size_t p = 0; p < np; ++p) {
      const int i0 = probe_cell_[p];
      const real w = probe_weight_[p];
      model_.to_output(prim_[i0], a.data());
      model_.to_output(prim_[std::min(i0 + 1, n - 1)], b.data());
      for (std::size_t k = 0; k < nout; ++k) buf_[k * np + p] = (1 - w) * a[k] + w * b[k];
    }
    s.append(t, step, buf_);
  }

  void append_history(io::Series& s, real t, long step) {
    const real dx = c_.grid.dx();
    Vec<N> total{};
    for (int i = 0; i < c_.grid.n_cells; ++i)  // serial, fixed order: reproducible sums
      for (int k = 0; k < N; ++k) total[k] += U_[i][k];
    const auto& bf = stepper_->boundary_flux_integrals();
    buf_.clear();
    for (int k = 0; k < N; ++k) {
      buf_.push_back(total[k] * dx);
      buf_.push_back(bf[0][k] - bf[1][k]);
    }
    if constexpr (HasDiagnostics<M>) {
      std::vector<real> d(M::diagnostic_info().size());
      model_.diagnostics(c_.grid, U_, d.data());
      buf_.insert(buf_.end(), d.begin(), d.end());
    }
    s.append(t, step, buf_);
  }

  const io::RunFile& rf_;
  CaseSetup c_;
  M model_;
  Field<State> U_;
  Field<State> prim_;  ///< primitives of U_ at the time of the latest output
  SpatialScheme scheme_;
  std::optional<Stepper<M>> stepper_;
  std::optional<WaveOutput<M>> waves_;  ///< budgets, antenna power, Elsasser parts, regions
  std::vector<int> probe_cell_;
  std::vector<real> probe_weight_;
  std::vector<real> buf_;
};

}  // namespace tw
