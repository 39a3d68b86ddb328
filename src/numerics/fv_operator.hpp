#pragma once
/// The finite-volume operator: fills dU/dt = -(F_{i+1/2} - F_{i-1/2})/dx + S_i over the
/// grid and records, as it goes, the largest signal speed (for the CFL step), the
/// model's extra step limits, the fluxes through both ends (for budgets) and the first
/// cell with an inadmissible state.
///
/// Passes, each an OpenMP loop over cells or faces inside one parallel region:
///   1. primitive variables of interior cells (and their admissibility); for a model whose
///      conversion couples cells (M::grid_coupled(), e.g. electron inertia), the model's
///      whole-grid recover_primitives() runs between the cell loop and the check;
///   2. ghost cells from the two boundary objects;
///   3. reconstruction of the two face values of each cell;
///   4. numerical flux at each face, plus the model's gradient flux (a face-aware solver or
///      gradient flux is told the face: see FaceAwareSolver, HasFaceGradientFlux);
///   5. flux difference plus sources.
/// When the model registers a block kernel (BlockKernelFor<M>, numerics/fluxes.hpp), pass 1
/// runs as that kernel over blocks of cells (it also keeps a copy of the primitive field as
/// one array per variable), and, where it supports the scheme, passes 3 and 4 run as one
/// kernel over blocks of faces. The kernels give bitwise the same results as the generic
/// passes, only faster (set_block_kernel(false) forces the generic passes, for
/// comparisons); everything else (boundaries, gradient fluxes, sources, limits, checks)
/// is unchanged.
/// No pass has an order-dependent floating-point reduction (max and min are exact), so
/// results are bitwise identical for any thread count.
#include <algorithm>
#include <limits>
#include <memory>
#include <string>
#include <type_traits>
#include <vector>

#include <omp.h>

#include "core/error.hpp"
#include "core/parallel.hpp"
#include "core/simd_loops.hpp"
#include "drive/boundary.hpp"
#include "grid/grid.hpp"
#include "models/model.hpp"
#include "numerics/fluxes.hpp"
#include "numerics/reconstruction.hpp"

namespace tw {

/// An extra contribution to dU/dt that is not part of the model (antenna currents,
/// absorbing layers). Added after the flux difference; must be thread-safe.
template <class M>
class SourceTerm {
 public:
  using State = typename M::State;
  virtual ~SourceTerm() = default;
  /// Add this term's contribution to dUdt for interior cells [0, n).
  virtual void add(const M& model, const Grid& grid, real t, const Field<State>& W,
                   Field<State>& dUdt) const = 0;
  [[nodiscard]] virtual std::string describe() const = 0;
  /// Energy per unit time and cross-section this term puts into the tube at (t, W)
  /// [W/m^2]: the sum over its cells of tw::energy_rate times dx (0 for a term that does
  /// no work). The stepper integrates it with the Runge-Kutta weights, so energy budgets
  /// close to round-off.
  [[nodiscard]] virtual real power(const M& /*model*/, const Grid& /*grid*/, real /*t*/,
                                   const Field<State>& /*W*/) const {
    return 0;
  }
  /// Offer this term's time-step limits (stiff relaxations), unscaled by the CFL number.
  virtual void step_limits(const M& /*model*/, const Grid& /*grid*/, StepLimits& /*limits*/) const {}
};

/// Spatial discretisation choices.
struct SpatialScheme {
  Reconstruction reconstruction = Reconstruction::plm;
  Limiter limiter = Limiter::mc;
  FluxKind flux = FluxKind::hll;
};

/// What one evaluation of the operator found.
template <int N>
struct RhsReport {
  real max_speed = 0;            ///< largest |signal speed| over all faces [m/s]
  int bad_cell = -1;             ///< first interior cell with an inadmissible state, or -1
  Vec<N> bad_state{};            ///< its primitive state
  Vec<N> flux_left{}, flux_right{};  ///< numerical flux through face 0 and face n
  StepLimits limits;             ///< the model's extra limits (when requested)
  /// Energy flux density along +x through face 0 and face n [W/m^2] (models with
  /// energy_flux; 0 otherwise).
  real energy_flux_left = 0, energy_flux_right = 0;
  /// Heating by the model's dissipation, integrated along the tube [W/m^2] (models with
  /// dissipation, when gradient terms are active).
  Dissipation dissipation;
  /// Power of each source term, in the order they were added [W/m^2].
  std::vector<real> source_power;
};

/// A flux solver that needs to know its face (the linearized models' per-face upwind flux):
/// called as solver(m, WL, WR, face) with face = 0 .. n_cells.
template <class S, class M>
concept FaceAwareSolver = requires(const S s, const M m, const typename M::State& w, int face) {
  { s(m, w, w, face) } -> std::same_as<FaceFlux<M::n_vars>>;
};

/// A model whose gradient flux depends on the face (a background varying along x):
/// m.face_gradient_flux(face, W_left_cell, W_right_cell, dx), used instead of gradient_flux.
template <class M>
concept HasFaceGradientFlux = requires(const M m, const typename M::State& s, real dx, int face) {
  { m.face_gradient_flux(face, s, s, dx) } -> std::same_as<typename M::State>;
  { m.gradient_terms_active() } -> std::same_as<bool>;
};

template <Model M>
class FvOperator {
 public:
  using State = typename M::State;
  static constexpr int N = M::n_vars;

  FvOperator(const Grid& grid, SpatialScheme scheme,
             std::shared_ptr<const Boundary<M>> left, std::shared_ptr<const Boundary<M>> right)
      : grid_(grid), scheme_(scheme), left_(std::move(left)), right_(std::move(right)),
        W_(grid), Wm_(grid), Wp_(grid), F_(static_cast<std::size_t>(grid.n_cells + 1)),
        D_(static_cast<std::size_t>(grid.n_cells + 1)) {
    TW_CHECK(left_ && right_, "both boundaries must be set");
    TW_CHECK(flux_supported<M>(scheme.flux), "flux not available for this model");
    if constexpr (HasBlockKernel)
      columns_.resize(static_cast<std::size_t>(BlockKernel::columns_size(grid.n_total())));
  }

  /// Use the model's block kernel where it applies (the default), or force the generic
  /// passes (false).
  void set_block_kernel(bool on) { use_block_kernel_ = on; }
  /// True when evaluate() with model m converts to primitive variables with the model's
  /// block kernel.
  [[nodiscard]] bool block_primitives_active(const M& m) const {
    if constexpr (HasBlockKernel) {
      return use_block_kernel_ && BlockKernel::applies(m);
    } else {
      (void)m;
      return false;
    }
  }
  /// True when evaluate() with model m also reconstructs and computes the fluxes with the
  /// model's block kernel.
  [[nodiscard]] bool block_kernel_active(const M& m) const {
    if constexpr (HasBlockKernel) {
      return block_primitives_active(m) &&
             BlockKernel::supports(m, scheme_.reconstruction, scheme_.limiter, scheme_.flux);
    } else {
      (void)m;
      return false;
    }
  }

  void add_source(std::shared_ptr<const SourceTerm<M>> s) { sources_.push_back(std::move(s)); }
  [[nodiscard]] const std::vector<std::shared_ptr<const SourceTerm<M>>>& sources() const { return sources_; }
  [[nodiscard]] const Grid& grid() const { return grid_; }
  [[nodiscard]] const SpatialScheme& scheme() const { return scheme_; }
  [[nodiscard]] const Boundary<M>& boundary(Side s) const { return s == Side::left ? *left_ : *right_; }
  /// Primitive variables (ghosts included) of the last evaluation.
  [[nodiscard]] const Field<State>& primitives() const { return W_; }

  /// Fill the ghost cells of a primitive field at time t, as both ends do.
  void fill_ghosts(const M& m, Field<State>& W, real t) const {
    left_->fill(m, grid_, Side::left, t, W);
    right_->fill(m, grid_, Side::right, t, W);
  }
  /// The ghost fill as a callable for the model's whole-grid members (valid while this
  /// operator and m live).
  [[nodiscard]] GhostFill<State> ghost_fill(const M& m) const {
    return [this, &m](Field<State>& W, real t) { fill_ghosts(m, W, t); };
  }

  /// Primitive variables of U into W (interior and ghosts, at time t): the conversion
  /// evaluate() makes, for output and validation.
  void primitives(const M& m, real t, const Field<State>& U, Field<State>& W) const {
    const int n = grid_.n_cells;
#pragma omp parallel for schedule(static) if (run_parallel(n))
    for (int i = 0; i < n; ++i) W[i] = m.prim_from_cons(U[i]);
    if constexpr (HasGridRecovery<M>)
      if (m.grid_coupled()) m.recover_primitives(grid_, U, W, ghost_fill(m), t);
    fill_ghosts(m, W, t);
  }

  /// Conservative variables of the interior of W into U (the ghosts of W are filled at
  /// time t on the way): for initial states.
  void conservatives(const M& m, real t, Field<State>& W, Field<State>& U) const {
    const int n = grid_.n_cells;
    for (int i = 0; i < n; ++i) U[i] = m.cons_from_prim(W[i]);
    if constexpr (HasGridRecovery<M>)
      if (m.grid_coupled()) m.complete_conservatives(grid_, W, U, ghost_fill(m), t);
    fill_ghosts(m, W, t);
  }

  /// Evaluate dU/dt at time t. `want_limits` also gathers the model's step limits.
  RhsReport<N> evaluate(const M& m, real t, const Field<State>& U, Field<State>& dUdt,
                        bool want_limits) {
    RhsReport<N> rep;
    const int n = grid_.n_cells;
    const real dx = grid_.dx();
    int bad = std::numeric_limits<int>::max();
    real smax = 0;
    std::vector<StepLimits> thread_limits;
    const bool coupled = grid_coupled(m);
    const bool blocked = !coupled && block_primitives_active(m);
    const bool fused = blocked && block_kernel_active(m);

#pragma omp parallel if (run_parallel(n))
    {
      if (blocked) {
        primitives_pass_blocked(m, U, bad);
      } else if (!coupled) {
#pragma omp for schedule(static) reduction(min : bad)
        for (int i = 0; i < n; ++i) {
          W_[i] = m.prim_from_cons(U[i]);
          if (!m.admissible(W_[i])) bad = std::min(bad, i);
        }
      } else {
#pragma omp for schedule(static)
        for (int i = 0; i < n; ++i) W_[i] = m.prim_from_cons(U[i]);
        if constexpr (HasGridRecovery<M>) {
#pragma omp single
          m.recover_primitives(grid_, U, W_, ghost_fill(m), t);
        }
#pragma omp for schedule(static) reduction(min : bad)
        for (int i = 0; i < n; ++i)
          if (!m.admissible(W_[i])) bad = std::min(bad, i);
      }
#pragma omp single
      {
        left_->fill(m, grid_, Side::left, t, W_);
        right_->fill(m, grid_, Side::right, t, W_);
        if (blocked) ghosts_to_columns();
      }
      if (fused) {
        fused_face_pass(m, dx, smax);
      } else {
        reconstruct_pass(m, -1, n + 1);
        switch (scheme_.flux) {
          case FluxKind::rusanov: face_pass<FluxKind::rusanov>(m, dx, smax); break;
          case FluxKind::hll: face_pass<FluxKind::hll>(m, dx, smax); break;
          case FluxKind::hlld: face_pass<FluxKind::hlld>(m, dx, smax); break;
          case FluxKind::upwind: face_pass<FluxKind::upwind>(m, dx, smax); break;
        }
      }
      const real inv_dx = 1 / dx;
      if constexpr (HasSource<M>) {
#pragma omp for schedule(static)
        for (int i = 0; i < n; ++i) {
          const auto& fl = F_[static_cast<std::size_t>(i)];
          const auto& fr = F_[static_cast<std::size_t>(i + 1)];
          State d;
          for (int k = 0; k < N; ++k) d[k] = -(fr[k] - fl[k]) * inv_dx;
          const State s = m.source(W_[i], grid_.x_centre(i), t);
          for (int k = 0; k < N; ++k) d[k] += s[k];
          dUdt[i] = d;
        }
      } else {
        // Without a local source the difference runs over the flat storage: element j of
        // face i+1 is element j + N of face i (same operations, and it vectorises).
        const real* fl = F_[0].data();
        real* d = dUdt[0].data();
        const long len = static_cast<long>(n) * N;
        const long n_chunks = (len + flat_chunk - 1) / flat_chunk;
#pragma omp for schedule(static)
        for (long c = 0; c < n_chunks; ++c) {
          const long j0 = c * flat_chunk;
          simd::flux_difference(std::min(flat_chunk, len - j0), N, inv_dx, fl + j0, d + j0);
        }
      }
      if constexpr (HasDissipation<M>) {
        if (gradient_active(m)) {
#pragma omp for schedule(static)
          for (int f = 0; f <= n; ++f) D_[static_cast<std::size_t>(f)] = m.dissipation(W_[f - 1], W_[f], dx);
        }
      }
      if (want_limits) step_limits_pass(m, dx, thread_limits);
    }
    rep.source_power.resize(sources_.size());
    for (std::size_t j = 0; j < sources_.size(); ++j) {
      sources_[j]->add(m, grid_, t, W_, dUdt);
      rep.source_power[j] = sources_[j]->power(m, grid_, t, W_);
    }
    for (const auto& l : thread_limits) rep.limits.merge(l);  // fixed order: exact (min)
    if (want_limits)
      for (const auto& s : sources_) s->step_limits(m, grid_, rep.limits);
    if constexpr (HasEnergyFlux<M>) {
      if (fused) {
        // The block kernel keeps no face values; the two end faces' are reconstructed here
        // by the generic code (which the kernel reproduces bitwise).
        reconstruct_pass(m, -1, 1);
        reconstruct_pass(m, n - 1, n + 1);
      }
      rep.energy_flux_left = m.energy_flux(F_.front(), face_state(Wp_[-1], Wm_[0]));
      rep.energy_flux_right = m.energy_flux(F_.back(), face_state(Wp_[n - 1], Wm_[n]));
    }
    if constexpr (HasDissipation<M>) {
      if (gradient_active(m)) {
        // Serial sum in a fixed order (reproducible); the end faces count half.
        Dissipation d = 0.5 * D_.front();
        for (int f = 1; f < n; ++f) d += D_[static_cast<std::size_t>(f)];
        d += 0.5 * D_.back();
        rep.dissipation = dx * d;
      }
    }
    rep.max_speed = smax;
    rep.flux_left = F_.front();
    rep.flux_right = F_.back();
    if (bad != std::numeric_limits<int>::max()) {
      rep.bad_cell = bad;
      rep.bad_state = W_[bad];
    }
    return rep;
  }

  /// A cheaper pass than evaluate() for choosing the step: primitive variables and their
  /// admissibility, ghost cells, the largest signal speed of the cell states (interior and
  /// the first ghost layer, not of reconstructed face states) and, on request, the model's
  /// step limits. No fluxes. Used by the stepper for models with a split stiff source,
  /// whose operator must be evaluated again after the first half step anyway.
  RhsReport<N> survey(const M& m, real t, const Field<State>& U, bool want_limits) {
    RhsReport<N> rep;
    const int n = grid_.n_cells;
    const real dx = grid_.dx();
    int bad = std::numeric_limits<int>::max();
    real smax = 0;
    std::vector<StepLimits> thread_limits;
#pragma omp parallel if (run_parallel(n))
    {
#pragma omp for schedule(static) reduction(min : bad)
      for (int i = 0; i < n; ++i) {
        W_[i] = m.prim_from_cons(U[i]);
        if (!m.admissible(W_[i])) bad = std::min(bad, i);
      }
#pragma omp single
      {
        left_->fill(m, grid_, Side::left, t, W_);
        right_->fill(m, grid_, Side::right, t, W_);
      }
      if (bad == std::numeric_limits<int>::max()) {
#pragma omp for schedule(static) reduction(max : smax)
        for (int i = -1; i <= n; ++i) smax = std::max(smax, m.signal_speeds(W_[i]).abs_max());
      }
      if (want_limits) step_limits_pass(m, dx, thread_limits);
    }
    for (const auto& l : thread_limits) rep.limits.merge(l);
    rep.max_speed = smax;
    if (bad != std::numeric_limits<int>::max()) {
      rep.bad_cell = bad;
      rep.bad_state = W_[bad];
    }
    (void)dx;
    return rep;
  }

 private:
  static State face_state(const State& a, const State& b) {
    State w;
    for (int k = 0; k < N; ++k) w[k] = 0.5 * (a[k] + b[k]);
    return w;
  }
  static int omp_threads() { return omp_get_num_threads(); }
  static int omp_thread() { return omp_get_thread_num(); }

  /// Face values Wm_[i] (at i-1/2) and Wp_[i] (at i+1/2) for cells lo .. hi-1 (all
  /// that the faces need: -1 .. n).
  void reconstruct_pass(const M& m, int lo, int hi) {
    switch (scheme_.reconstruction) {
      case Reconstruction::first_order: recon_loop<0, Limiter::none>(m, lo, hi); break;
      case Reconstruction::weno5: recon_loop<2, Limiter::none>(m, lo, hi); break;
      case Reconstruction::plm:
        switch (scheme_.limiter) {
          case Limiter::minmod: recon_loop<1, Limiter::minmod>(m, lo, hi); break;
          case Limiter::mc: recon_loop<1, Limiter::mc>(m, lo, hi); break;
          case Limiter::van_leer: recon_loop<1, Limiter::van_leer>(m, lo, hi); break;
          case Limiter::none: recon_loop<1, Limiter::none>(m, lo, hi); break;
        }
        break;
    }
  }

  template <int Order, Limiter L>
  void recon_loop(const M& m, int lo_cell, int hi_cell) {
#pragma omp for schedule(static)
    for (int i = lo_cell; i < hi_cell; ++i) {
      const State& c = W_[i];
      State lo, hi;
      if constexpr (Order == 0) {
        lo = c;
        hi = c;
      } else if constexpr (Order == 1) {
        const State& a = W_[i - 1];
        const State& b = W_[i + 1];
        for (int k = 0; k < N; ++k) {
          const real s = 0.5 * limited_slope<L>(c[k] - a[k], b[k] - c[k]);
          lo[k] = c[k] - s;
          hi[k] = c[k] + s;
        }
      } else {
        const State& a = W_[i - 2];
        const State& b = W_[i - 1];
        const State& d = W_[i + 1];
        const State& e = W_[i + 2];
        for (int k = 0; k < N; ++k) {
          hi[k] = weno5z_right_face(a[k], b[k], c[k], d[k], e[k]);
          lo[k] = weno5z_right_face(e[k], d[k], c[k], b[k], a[k]);
        }
      }
      if constexpr (Order > 0) {
        if (!m.positive(lo) || !m.positive(hi)) {
          lo = c;
          hi = c;
        }
      }
      Wm_[i] = lo;
      Wp_[i] = hi;
    }
  }

  template <FluxKind K>
  void face_pass(const M& m, real dx, real& smax) {
    if constexpr (flux_supported_v<M, K>) {
      using FluxT = flux_type_t<M, K>;
      const FluxT solver{};
      const int n = grid_.n_cells;
      const bool grad = gradient_active(m);
      // Each thread's largest speed, merged below. (A reduction clause on the reference
      // `smax` in this orphaned loop is accepted by GCC but not by clang; max is exact, so
      // the merge order does not matter.)
      real mine = 0;
#pragma omp for schedule(static)
      for (int f = 0; f <= n; ++f) {
        auto ff = [&] {
          if constexpr (FaceAwareSolver<FluxT, M>) return solver(m, Wp_[f - 1], Wm_[f], f);
          else return solver(m, Wp_[f - 1], Wm_[f]);
        }();
        if constexpr (HasFaceGradientFlux<M>) {
          if (grad) {
            const State g = m.face_gradient_flux(f, W_[f - 1], W_[f], dx);
            for (int k = 0; k < N; ++k) ff.flux[k] += g[k];
          }
        } else if constexpr (HasGradientFlux<M>) {
          if (grad) {
            const State g = m.gradient_flux(W_[f - 1], W_[f], dx);
            for (int k = 0; k < N; ++k) ff.flux[k] += g[k];
          }
        }
        F_[static_cast<std::size_t>(f)] = ff.flux;
        mine = std::max(mine, ff.speed);
      }
#pragma omp critical(tubewave_face_speed)
      smax = std::max(smax, mine);
    } else {
      (void)m;
      (void)dx;
      (void)smax;
    }
  }

  /// The block kernel's copy of the primitive field, one array per variable.
  auto columns() {
    if constexpr (HasBlockKernel) {
      return typename BlockKernel::Columns{columns_.data() + Grid::n_ghost, grid_.n_total()};
    }
  }

  /// Copies the ghost cells just filled by the boundaries into the columns.
  void ghosts_to_columns() {
    if constexpr (HasBlockKernel) {
      const auto cols = columns();
      const int n = grid_.n_cells;
      for (int g = 1; g <= Grid::n_ghost; ++g)
        for (int c : {-g, n - 1 + g})
          for (int k = 0; k < N; ++k) cols.data[k * cols.stride + c] = W_[c][k];
    }
  }

  /// The model's own step limits, one record per thread (merged by the caller in thread
  /// order). Inside a parallel region.
  void step_limits_pass(const M& m, real dx, std::vector<StepLimits>& thread_limits) const {
    if constexpr (HasStepLimits<M>) {
#pragma omp single
      thread_limits.resize(static_cast<std::size_t>(omp_threads()));
      StepLimits& mine = thread_limits[static_cast<std::size_t>(omp_thread())];
#pragma omp for schedule(static)
      for (int i = 0; i < grid_.n_cells; ++i) m.step_limits(dx, W_[i], mine);
    } else {
      (void)m;
      (void)dx;
      (void)thread_limits;
    }
  }

  /// Pass 1 as the model's block kernel, over whole blocks of cells.
  void primitives_pass_blocked(const M& m, const Field<State>& U, int& bad) {
    if constexpr (HasBlockKernel) {
      const int n = grid_.n_cells;
      constexpr int block = BlockKernel::block_faces;
      const int n_blocks = (n + block - 1) / block;
      // Each thread's first bad cell, merged below (no reduction clause on a reference in an
      // orphaned loop: clang refuses it; min is exact, so the merge order does not matter).
      int mine = bad;
#pragma omp for schedule(static)
      for (int b = 0; b < n_blocks; ++b) {
        const int i0 = b * block;
        const int k = BlockKernel::primitives(m, &U[0], &W_[0], columns(), i0, std::min(i0 + block, n));
        if (k >= 0) mine = std::min(mine, k);
      }
#pragma omp critical(tubewave_first_bad_cell)
      bad = std::min(bad, mine);
    } else {
      (void)m;
      (void)U;
      (void)bad;
    }
  }

  /// Passes 3 and 4 as the model's block kernel, over whole blocks of faces, plus the
  /// gradient flux as in face_pass. Needs the columns of pass 1 (block kernel) and pass 2.
  void fused_face_pass(const M& m, real dx, real& smax) {
    if constexpr (HasBlockKernel) {
      constexpr int block = BlockKernel::block_faces;
      const int n = grid_.n_cells;
      const int n_blocks = (n + 1 + block - 1) / block;
      const bool grad = gradient_active(m);
      real mine = 0;  // merged below, as in face_pass
#pragma omp for schedule(static)
      for (int b = 0; b < n_blocks; ++b) {
        const int f0 = b * block, f1 = std::min(f0 + block, n + 1);
        mine = std::max(mine, BlockKernel::faces(m, scheme_.reconstruction, scheme_.limiter, scheme_.flux,
                                                columns(), f0, f1, F_.data()));
        if constexpr (HasGradientFlux<M>) {
          if (grad) {
            for (int f = f0; f < f1; ++f) {
              const State g = m.gradient_flux(W_[f - 1], W_[f], dx);
              for (int k = 0; k < N; ++k) F_[static_cast<std::size_t>(f)][k] += g[k];
            }
          }
        }
      }
#pragma omp critical(tubewave_face_speed)
      smax = std::max(smax, mine);
    } else {
      (void)m;
      (void)dx;
      (void)smax;
    }
  }

  static bool gradient_active(const M& m) {
    if constexpr (HasGradientFlux<M> || HasFaceGradientFlux<M>) return m.gradient_terms_active();
    (void)m;
    return false;
  }

  using BlockKernel = block_kernel_t<M>;
  static constexpr bool HasBlockKernel = !std::is_void_v<BlockKernel>;

  Grid grid_;
  SpatialScheme scheme_;
  bool use_block_kernel_ = true;
  std::shared_ptr<const Boundary<M>> left_, right_;
  std::vector<std::shared_ptr<const SourceTerm<M>>> sources_;
  Field<State> W_, Wm_, Wp_;
  std::vector<State> F_;
  std::vector<real> columns_;  ///< primitive field as one array per variable (block kernel)
  std::vector<Dissipation> D_;  ///< heating at each face (when active)
};

}  // namespace tw

