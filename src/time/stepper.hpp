#pragma once
/// One time step: the adaptive step size and the Runge-Kutta stages.
///
/// Contract of `step(m, U, t, dt_cap)`:
/// - evaluates the operator at U^n first; the step is
///     dt = min(cfl * dx / max_speed, cfl * each model limit, dt_max, dt_cap)
///   and the constraint that set it is reported by name; when dt_cap (the distance to the
///   next output time) is finite and larger, dt is lowered to dt_cap / ceil(dt_cap / dt), so
///   the output time is reached in equal steps instead of full steps and a short one;
/// - runs the stages in place on U; every evaluation checks admissibility of the state it
///   reads (the first one checks U^n, the result of the previous step, before it becomes
///   the fallback state); on failure U is restored to the last good state and a
///   StateError is thrown naming the cell, its position, the time and the values;
/// - `validate()` checks a whole state; the time loop calls it before every output, so
///   nothing inadmissible is ever written;
/// - integrates the fluxes through both ends with the scheme's stage weights, so
///   totals + net boundary inflow is conserved to round-off;
/// - models with a stiff local source (M::stiff_source_step) get it applied by Strang
///   splitting: half a step before the stages and half after;
/// - likewise a model's whole-grid split step (M::split_step, see models/model.hpp), when
///   active: S(dt/2) before the stages and S(dt/2) after, nested inside the stiff source
///   (stiff, split, stages, split, stiff). The fluxes it reports through the ends join
///   the boundary-flux integrals. Either split needs the operator again after the first
///   half step (the stages start from the split state). For a model with a stiff source
///   whose primitives are per cell, the step is therefore chosen from a cheaper survey of
///   U^n (the signal speeds of the cell states, not of reconstructed face states;
///   FvOperator::survey); otherwise the first evaluation is a full one.
#include <algorithm>
#include <cmath>
#include <sstream>
#include <string>
#include <vector>

#include "core/error.hpp"
#include "core/parallel.hpp"
#include "core/simd_loops.hpp"
#include "models/model.hpp"
#include "numerics/fv_operator.hpp"
#include "time/integrators.hpp"

namespace tw {

/// Models whose stiff local source is integrated separately (e.g. implicitly per cell).
template <class M>
concept HasStiffSource = requires(const M m, const Grid& g, Field<typename M::State>& U, real t, real dt) {
  { m.stiff_source_step(g, U, t, dt) };
};

/// A non-finite or non-physical state was produced; U holds the last good state.
class StateError : public RunError {
 public:
  StateError(const std::string& what, int cell, real x, real t, real t_good)
      : RunError(what), cell_(cell), x_(x), t_(t), t_good_(t_good) {}
  [[nodiscard]] int cell() const { return cell_; }
  [[nodiscard]] real x() const { return x_; }
  [[nodiscard]] real t() const { return t_; }
  /// Time of the state left in the field after the failure.
  [[nodiscard]] real t_good() const { return t_good_; }

 private:
  int cell_;
  real x_, t_, t_good_;
};

struct TimeControl {
  real cfl = 0.8;
  real dt_max = std::numeric_limits<real>::infinity();
  IntegratorKind integrator = IntegratorKind::ssp_rk2;
};

struct StepInfo {
  real dt = 0;
  std::string limited_by;  ///< "CFL (fastest wave)", a model limit, "max_dt" or the cap's name
  real max_speed = 0;
};

template <Model M>
class Stepper {
 public:
  using State = typename M::State;
  static constexpr int N = M::n_vars;

  Stepper(FvOperator<M> op, TimeControl tc)
      : op_(std::move(op)), tc_(tc), stages_(rk_stages(tc.integrator)),
        U0_(op_.grid()), L_(op_.grid()) {
    if constexpr (HasStiffSource<M> || HasSplitStep<M>) Ubase_ = Field<State>(op_.grid());
  }

  /// Advance U from t by one step no longer than dt_cap (named cap_name in reports).
  StepInfo step(const M& m, Field<State>& U, real t, real dt_cap, const char* cap_name) {
    const Grid& g = op_.grid();
    const int n = g.n_cells;
    StepInfo info;
    real dt = 0;
    const bool split = split_step_active(m);
    split_ = HasStiffSource<M> || split;
    for (std::size_t s = 0; s < stages_.size(); ++s) {
      const RkStage st = stages_[s];
      const real ts = t + st.time * dt;
      // A model with a split stiff source is re-evaluated after its first half step, so
      // the first pass only has to validate U^n and find the step (no fluxes); the survey
      // converts cell by cell, so not for grid-coupled primitives.
      const bool survey = HasStiffSource<M> && s == 0 && !grid_coupled(m);
      auto rep = survey ? op_.survey(m, ts, U, true) : op_.evaluate(m, ts, U, L_, s == 0);
      if (s == 0) {
        // The first evaluation validates U^n, the result of the previous step; only then
        // does it become the state to fall back to.
        if (rep.bad_cell >= 0) fail(m, U, rep.bad_cell, rep.bad_state, t, 0);
        copy_interior(U, U0_);
        t_good_ = t;
        have_good_ = true;
        info = choose_dt(rep, dt_cap, cap_name);
        dt = info.dt;
        if (split_) {
          // Strang splitting: half a step of the split parts first; the operator was
          // evaluated above only to choose dt.
          if constexpr (HasStiffSource<M>) m.stiff_source_step(g, U, t, 0.5 * dt);
          if (split) split_half_step(m, U, t, 0.5 * dt);
          copy_interior(U, Ubase_);
          rep = op_.evaluate(m, ts, U, L_, false);
        }
      }
      if (rep.bad_cell >= 0) fail(m, U, rep.bad_cell, rep.bad_state, ts, s);
      for (int k = 0; k < N; ++k) {
        boundary_flux_[0][k] += st.weight * dt * rep.flux_left[k];
        boundary_flux_[1][k] += st.weight * dt * rep.flux_right[k];
      }
      {
        const real wdt = st.weight * dt;
        energy_in_[0] += wdt * rep.energy_flux_left;
        energy_in_[1] -= wdt * rep.energy_flux_right;
        source_work_.resize(rep.source_power.size(), 0.0);
        for (std::size_t j = 0; j < rep.source_power.size(); ++j) source_work_[j] += wdt * rep.source_power[j];
        dissipated_ += wdt * rep.dissipation;
      }
      const Field<State>& base = rk_base();
      // The stage update on the flat storage (n_cells * N contiguous reals), in chunks that
      // the vectorised loop (core/simd_loops.hpp) takes one at a time.
      real* u = U[0].data();
      const real* u0 = base[0].data();
      const real* l = L_[0].data();
      const long len = static_cast<long>(n) * N;
      const long n_chunks = (len + flat_chunk - 1) / flat_chunk;
#pragma omp parallel for schedule(static) if (run_parallel(n))
      for (long c = 0; c < n_chunks; ++c) {
        const long j0 = c * flat_chunk;
        simd::stage_update(std::min(flat_chunk, len - j0), st.a, st.b, dt, u0 + j0, l + j0, u + j0);
      }
    }
    if (split) split_half_step(m, U, t + 0.5 * dt, 0.5 * dt);
    if constexpr (HasStiffSource<M>) m.stiff_source_step(g, U, t + 0.5 * dt, 0.5 * dt);
    return info;
  }

  /// Check every cell of U (as after a step, before output). On failure U is restored to
  /// the last good state and StateError is thrown.
  void validate(const M& m, Field<State>& U, real t) {
    const int n = op_.grid().n_cells;
    int bad = std::numeric_limits<int>::max();
    if (grid_coupled(m)) {
      // The primitives need the whole grid (and the ends).
      if (Wcheck_.n_cells() != n) Wcheck_ = Field<State>(op_.grid());
      op_.primitives(m, t, U, Wcheck_);
#pragma omp parallel for schedule(static) reduction(min : bad) if (run_parallel(n))
      for (int i = 0; i < n; ++i)
        if (!m.admissible(Wcheck_[i])) bad = std::min(bad, i);
      if (bad != std::numeric_limits<int>::max()) fail(m, U, bad, Wcheck_[bad], t, stages_.size());
      return;
    }
#pragma omp parallel for schedule(static) reduction(min : bad) if (run_parallel(n))
    for (int i = 0; i < n; ++i)
      if (!m.admissible(m.prim_from_cons(U[i]))) bad = std::min(bad, i);
    if (bad != std::numeric_limits<int>::max()) fail(m, U, bad, m.prim_from_cons(U[bad]), t, stages_.size());
  }

  /// Time integrals of the numerical flux through the left (0) and right (1) ends since
  /// the start (per unit cross-section).
  [[nodiscard]] const std::array<State, 2>& boundary_flux_integrals() const { return boundary_flux_; }
  void set_boundary_flux_integrals(const std::array<State, 2>& b) { boundary_flux_ = b; }
  /// Error messages of normalized runs give numbers without SI units.
  void set_normalized_units(bool normalized) { normalized_units_ = normalized; }

  /// Energy per unit area that entered through the left (0) and right (1) ends since the
  /// start [J/m^2] (positive inward; models with energy_flux), with the stage weights.
  [[nodiscard]] const std::array<real, 2>& energy_inflow() const { return energy_in_; }
  /// Work done by each source term since the start [J/m^2] (order of FvOperator::sources).
  [[nodiscard]] const std::vector<real>& source_work() const { return source_work_; }
  /// Heat released by the model's dissipation since the start [J/m^2].
  [[nodiscard]] const Dissipation& dissipated() const { return dissipated_; }
  /// Setters of the integrals above, for continuing a run from a checkpoint.
  void set_energy_inflow(const std::array<real, 2>& e) { energy_in_ = e; }
  void set_source_work(std::vector<real> w) { source_work_ = std::move(w); }
  void set_dissipated(const Dissipation& d) { dissipated_ = d; }

  /// The time step the operator would choose at U (no step taken); for `check`.
  StepInfo probe_dt(const M& m, const Field<State>& U, real t) {
    auto rep = op_.evaluate(m, t, U, L_, true);
    return choose_dt(rep, std::numeric_limits<real>::infinity(), "end time");
  }
  /// All limits at U, scaled by the CFL number (for `check`).
  std::vector<StepLimit> all_limits(const M& m, const Field<State>& U, real t) {
    auto rep = op_.evaluate(m, t, U, L_, true);
    std::vector<StepLimit> out;
    if (rep.max_speed > 0) out.push_back({"CFL (fastest wave)", tc_.cfl * op_.grid().dx() / rep.max_speed});
    for (const auto& l : rep.limits.all()) out.push_back({l.name, tc_.cfl * l.dt});
    return out;
  }

  [[nodiscard]] FvOperator<M>& op() { return op_; }
  [[nodiscard]] const FvOperator<M>& op() const { return op_; }
  [[nodiscard]] const TimeControl& time_control() const { return tc_; }

 private:
  StepInfo choose_dt(const RhsReport<N>& rep, real dt_cap, const char* cap_name) const {
    StepInfo info;
    info.max_speed = rep.max_speed;
    real dt = std::numeric_limits<real>::infinity();
    std::string by;
    if (rep.max_speed > 0) {
      dt = tc_.cfl * op_.grid().dx() / rep.max_speed;
      by = "CFL (fastest wave)";
    }
    const StepLimit tight = rep.limits.tightest();
    if (tc_.cfl * tight.dt < dt) {
      dt = tc_.cfl * tight.dt;
      by = tight.name;
    }
    if (tc_.dt_max < dt) {
      dt = tc_.dt_max;
      by = "max_dt";
    }
    if (dt_cap <= dt) {
      dt = dt_cap;
      by = cap_name;
    } else if (std::isfinite(dt_cap)) {
      // Reach the cap (the next output time) in equal steps rather than full steps and a
      // sliver: the time-centred stiff source of the two-fluid model loses accuracy on slow
      // waves when omega dt >> 1 and the step size jumps (README), and every model avoids a
      // needlessly short step.
      const real n = std::ceil(dt_cap / dt * (1 - 1e-12));
      dt = dt_cap / n;
    }
    TW_CHECK(std::isfinite(dt) && dt > 0, "no finite positive time step");
    info.dt = dt;
    info.limited_by = by;
    return info;
  }

  static void copy_interior(const Field<State>& from, Field<State>& to) {
    const int n = from.n_cells();
#pragma omp parallel for schedule(static) if (run_parallel(n))
    for (int i = 0; i < n; ++i) to[i] = from[i];
  }

  /// The state the Runge-Kutta stages combine with (U^n, or U^n after the first half
  /// step of a stiff source or split step).
  const Field<State>& rk_base() const { return split_ ? Ubase_ : U0_; }

  /// Half a split step; its end fluxes join the boundary-flux integrals.
  void split_half_step(const M& m, Field<State>& U, real t, real dt) {
    if constexpr (HasSplitStep<M>) {
      const auto f = m.split_step(op_.grid(), U, t, dt, op_.ghost_fill(m));
      for (int k = 0; k < N; ++k) {
        boundary_flux_[0][k] += f[0][k];
        boundary_flux_[1][k] += f[1][k];
      }
      if constexpr (HasEnergyFlux<M>) {
        // The energy in these time-integrated end fluxes (exact where the energy is a
        // conserved component; the edge cells' states stand in for the face states).
        const int n = op_.grid().n_cells;
        energy_in_[0] += m.energy_flux(f[0], m.prim_from_cons(U[0]));
        energy_in_[1] -= m.energy_flux(f[1], m.prim_from_cons(U[n - 1]));
      }
    } else {
      (void)m, (void)U, (void)t, (void)dt;
    }
  }

  /// Restore the last good state and throw. `stage` is 0-based; stages_.size() means
  /// "after the step".
  [[noreturn]] void fail(const M& m, Field<State>& U, int cell, const State& W, real t_bad,
                         std::size_t stage) {
    const Grid& g = op_.grid();
    const auto info = M::output_info();
    std::vector<real> out(info.size());
    m.to_output(W, out.data());
    std::ostringstream msg;
    msg.precision(6);
    const bool si = !normalized_units_;
    auto with_unit = [si](const std::string& u) { return si && u != "1" ? " " + u : std::string(); };
    msg << "non-physical state in cell " << cell << " (x = " << g.x_centre(cell) << with_unit("m")
        << ") at t = " << t_bad << with_unit("s");
    if (stage < stages_.size()) msg << " (Runge-Kutta stage " << stage + 1 << ")";
    msg << (si ? ":" : " (normalized units):");
    for (std::size_t k = 0; k < info.size(); ++k)
      msg << (k ? ", " : " ") << info[k].name << " = " << out[k] << with_unit(info[k].units);
    if (have_good_) {
      copy_interior(U0_, U);
      msg << ". The last good state (t = " << t_good_ << with_unit("s") << ") was kept.";
    } else {
      msg << ". The initial state itself is not admissible.";
    }
    msg << " Likely causes: a time step too large (lower numerics.cfl), an unlimited or "
           "high-order reconstruction at a discontinuity (use plm with minmod or mc), or a "
           "drive too strong for the background (lower its amplitude).";
    throw StateError(msg.str(), cell, g.x_centre(cell), t_bad, have_good_ ? t_good_ : t_bad);
  }

  FvOperator<M> op_;
  TimeControl tc_;
  std::vector<RkStage> stages_;
  Field<State> U0_, L_;  ///< last good state U^n; stage right-hand side
  Field<State> Ubase_;   ///< Runge-Kutta base state when a stiff source or split step is split off
  Field<State> Wcheck_;  ///< primitives for validate() of grid-coupled models
  bool split_ = false;   ///< this step is split (stiff source or active split step)
  real t_good_ = 0;
  bool have_good_ = false;
  bool normalized_units_ = false;
  std::array<State, 2> boundary_flux_{};
  std::array<real, 2> energy_in_{};
  std::vector<real> source_work_;
  Dissipation dissipated_;
};

}  // namespace tw
