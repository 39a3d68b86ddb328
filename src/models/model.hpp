#pragma once
/// The fixed interface every model implements, as a C++20 concept.
///
/// A model is a small value type (copyable, no mutable scratch, safe to share between
/// threads) describing one system of balance laws in 1D:
///
///     dU/dt + dF(U)/dx = S(U, x, t)
///
/// It is written in two sets of variables: conservative U (what the finite-volume update
/// evolves) and primitive W (what is reconstructed at faces and what boundaries set).
///
/// Required members:
///   static constexpr int n_vars;                 number of variables
///   using State = Vec<n_vars>;
///   State prim_from_cons(const State& U) const;
///   State cons_from_prim(const State& W) const;
///   State flux(const State& W) const;            physical flux from primitive variables
///   SpeedRange signal_speeds(const State& W) const;  slowest and fastest signal speeds
///   bool admissible(const State& W) const;       finite, positive density/pressure, ...
///   bool positive(const State& W) const;         the positivity part only (false for NaN)
///   State wall_mirror(const State& W) const;     ghost state behind a conducting wall
///   static std::vector<VariableInfo> output_info(); output columns (name, units, doc)
///   static std::vector<VariableInfo> conserved_info(); integrals of U (name, units, doc)
///   void to_output(const State& W, real* out) const;  values in SI for those columns
///   static const char* name();
///
/// Optional members, detected with `requires` by the finite-volume operator:
///   State gradient_flux(const State& Wl, const State& Wr, real dx) const;
///   bool gradient_terms_active() const;
///        flux from gradients at the face between two cells (resistivity, viscosity, Hall),
///        skipped entirely when gradient_terms_active() is false
///   State source(const State& W, real x, real t) const;   local source term
///   void step_limits(real dx, const State& W, StepLimits& limits) const;
///        extra time-step limits of one cell (diffusion, whistler, ...)
///   EnergyParts energy_density(const State& W) const;
///        kinetic, thermal, magnetic and electric energy densities (energy budgets)
///   real energy_flux(const State& F, const State& W) const;
///        energy flux density along x [W/m^2] through a face whose numerical flux is F and
///        whose face state is W (the average of the two reconstructed values). A model
///        whose total energy is one conserved component returns that component of F, so
///        budgets close to round-off; others evaluate the physical flux (Poynting plus
///        material) from W. Used for the energy through the ends.
///   Dissipation dissipation(const State& Wl, const State& Wr, real dx) const;
///        heating rates per unit volume [W/m^3] between two neighbouring cells (resistive
///        eta J^2, viscous, collisional), evaluated at every face when gradient terms are
///        active; `retained` says whether that heat stays in the model's thermal energy
///   State external_current_source(const State& W, real jy, real jz) const;
///        the source dU/dt of an external (antenna) current density J_ext = (0, jy, jz)
///        [A/m^2] flowing in conductors inside the cell: in MHD the force -J_ext x B on the
///        plasma and its work; in a model that evolves E, the -J_ext/eps0 term of Ampere's
///        law. The power the antenna delivers, -E.J_ext, follows from energy_density.
///   std::array<real,2> external_current_field_flux(const State& Wl, const State& Wr,
///                                                  real jy, real jz) const;
///        for models whose Ohm's law uses the plasma current but whose field law is built
///        from curl(B) (Hall MHD): the transverse-field fluxes (G_By, G_Bz) [T m/s] at a face
///        where the antenna current is (jy, jz), restoring the field of the plasma current
///        (dB/dt + dG/dx = 0). Antennas apply it with its magnetic energy.
///   std::array<real,2> transverse_velocity(const State& W) const;
///   void set_transverse_velocity(State& W, real vy, real vz) const;
///        the (centre-of-mass) transverse flow of a primitive state; lets drives move it
///   std::array<real,2> transverse_field(const State& W) const;
///   void set_transverse_field(State& W, real by, real bz) const;
///        the transverse magnetic field [T] of a primitive state; lets drives set it
///   AlfvenFields alfven_fields(const State& W) const;
///        what the forward/backward (Elsasser) decomposition along x needs
///   real energy_rate(const State& U, const State& S) const;
///        d(total energy density)/dt [W/m^3] when U changes at the rate S (exact form of
///        the generic tw::energy_rate)
///   State conserved_scale(const State& U) const;
///        typical size of each conservative variable at U (step sizes of numerical
///        Jacobians, e.g. for characteristic open ends); the fallback uses |U_k|
///   static std::vector<VariableInfo> diagnostic_info();
///   void diagnostics(const Grid& grid, const Field<State>& U, real* out) const;
///        whole-tube numbers the runner writes to /history with every record, one column
///        per diagnostic_info() entry (e.g. a constraint residual such as Gauss's law);
///        reads the interior cells of the conservative state only, reduces in a fixed order
///
/// Optional whole-grid members (they need neighbouring cells and the ends; `fill` is a
/// GhostFill that sets the ghost cells of a primitive field as the run's two ends do):
///   bool grid_coupled() const;
///   void recover_primitives(const Grid& g, const Field<State>& U, Field<State>& W,
///                           const GhostFill<State>& fill, real t) const;
///   void complete_conservatives(const Grid& g, Field<State>& W, Field<State>& U,
///                               const GhostFill<State>& fill, real t) const;
///        for models whose conservative variables are not a function of one cell's
///        primitives (electron inertia evolves B - d_e^2 d2B/dx2): the generic code first
///        converts cell by cell, then, when grid_coupled() is true, calls these to finish
///        the conversion over the whole grid (every stage, before any output, and for the
///        initial state). Detected by HasGridRecovery.
///   bool split_step_active() const;
///   std::array<State, 2> split_step(const Grid& g, Field<State>& U, real t, real dt,
///                                   const GhostFill<State>& fill) const;
///        a whole-grid update applied by Strang splitting around the Runge-Kutta stages
///        (half a step before, half after), e.g. an implicit or sub-cycled stiff term
///        such as the Hall electric field. It returns the time-integrated fluxes through
///        face 0 and face n (for budgets), and must leave U admissible. Skipped while
///        split_step_active() is false. Detected by HasSplitStep (below); run by the Stepper.
#include <algorithm>
#include <array>
#include <cmath>
#include <concepts>
#include <functional>
#include <limits>
#include <string>
#include <vector>

#include "core/types.hpp"
#include "grid/grid.hpp"

namespace tw {

/// Slowest and fastest characteristic speeds of a state [m/s].
struct SpeedRange {
  real min = 0;
  real max = 0;
  [[nodiscard]] real abs_max() const { return std::max(-min, max); }
};

/// Description of one output column of a model.
struct VariableInfo {
  std::string name;         ///< e.g. "density"
  std::string units;        ///< SI unit, e.g. "m^-3"
  std::string description;  ///< one line
};

/// Energy densities of a primitive state [J/m^3]; their sum is the model's total energy
/// density (for energy budgets).
struct EnergyParts {
  real kinetic = 0;   ///< bulk flow, all species
  real thermal = 0;   ///< internal energy, all species
  real magnetic = 0;  ///< |B|^2 / 2 mu0, including the constant B_x
  real electric = 0;  ///< eps0 |E|^2 / 2 (zero where E is not a variable)
  [[nodiscard]] real total() const { return kinetic + thermal + magnetic + electric; }
};

/// Heating per unit volume by the model's dissipation [W/m^3] (energy budgets).
struct Dissipation {
  real resistive = 0;    ///< eta |J|^2
  real viscous = 0;      ///< viscous heating
  real collisional = 0;  ///< friction between species
  /// True when the heat stays in the model's thermal energy (an adiabatic closure); false
  /// when it leaves the modelled energy (an isothermal closure), so a budget must count it.
  bool retained = true;
  [[nodiscard]] real total() const { return resistive + viscous + collisional; }
  friend Dissipation operator*(real s, Dissipation d) {
    d.resistive *= s;
    d.viscous *= s;
    d.collisional *= s;
    return d;
  }
  Dissipation& operator+=(const Dissipation& o) {
    resistive += o.resistive;
    viscous += o.viscous;
    collisional += o.collisional;
    retained = retained && o.retained;
    return *this;
  }
};

/// What the Elsasser (forward/backward Alfven wave) decomposition along x needs from a
/// primitive state, in SI (or the run's code units).
struct AlfvenFields {
  real vy = 0, vz = 0;  ///< transverse (centre-of-mass) velocity [m/s]
  real by = 0, bz = 0;  ///< transverse magnetic field [T]
  real rho = 0;         ///< mass density [kg/m^3]
  real bx = 0;          ///< field along the tube [T]
  real mu0 = 0;         ///< permeability of the unit system
};

/// A named upper bound on the time step [s].
struct StepLimit {
  const char* name = "";
  real dt = std::numeric_limits<real>::infinity();
};

/// The time-step limits gathered in one sweep over the grid; each keeps its minimum.
class StepLimits {
 public:
  /// Offer a bound; kept if smaller than the one of the same name.
  void offer(const char* name, real dt) {
    for (auto& l : limits_)
      if (l.name == name || std::string_view(l.name) == name) {
        l.dt = std::min(l.dt, dt);
        return;
      }
    limits_.push_back({name, dt});
  }
  /// Merge another set (used to combine per-thread results, in fixed order).
  void merge(const StepLimits& other) {
    for (const auto& l : other.limits_) offer(l.name, l.dt);
  }
  [[nodiscard]] const std::vector<StepLimit>& all() const { return limits_; }
  /// The smallest bound (infinite if none).
  [[nodiscard]] StepLimit tightest() const {
    StepLimit best;
    for (const auto& l : limits_)
      if (l.dt < best.dt) best = l;
    return best;
  }
  void clear() { limits_.clear(); }

 private:
  std::vector<StepLimit> limits_;
};

template <class M>
concept Model = requires(const M m, const typename M::State& s, real* out) {
  { M::n_vars } -> std::convertible_to<int>;
  { m.prim_from_cons(s) } -> std::same_as<typename M::State>;
  { m.cons_from_prim(s) } -> std::same_as<typename M::State>;
  { m.flux(s) } -> std::same_as<typename M::State>;
  { m.signal_speeds(s) } -> std::same_as<SpeedRange>;
  { m.admissible(s) } -> std::same_as<bool>;
  { m.positive(s) } -> std::same_as<bool>;
  { m.wall_mirror(s) } -> std::same_as<typename M::State>;
  { M::output_info() } -> std::same_as<std::vector<VariableInfo>>;
  { M::conserved_info() } -> std::same_as<std::vector<VariableInfo>>;
  { m.to_output(s, out) };
  { M::name() } -> std::convertible_to<const char*>;
};

template <class M>
concept HasGradientFlux = requires(const M m, const typename M::State& s, real dx) {
  { m.gradient_flux(s, s, dx) } -> std::same_as<typename M::State>;
  { m.gradient_terms_active() } -> std::same_as<bool>;
};

template <class M>
concept HasSource = requires(const M m, const typename M::State& s, real x, real t) {
  { m.source(s, x, t) } -> std::same_as<typename M::State>;
};

template <class M>
concept HasEnergyDensity = requires(const M m, const typename M::State& s) {
  { m.energy_density(s) } -> std::same_as<EnergyParts>;
};

/// Sets the ghost cells of a primitive field at time t from its interior, as the two ends
/// of the run do (both boundary objects); handed to a model's whole-grid members.
template <class State>
using GhostFill = std::function<void(Field<State>& W, real t)>;

template <class M>
concept HasGridRecovery = requires(const M m, const Grid& g, const Field<typename M::State>& Uc,
                                   Field<typename M::State>& W, Field<typename M::State>& U,
                                   const GhostFill<typename M::State>& fill, real t) {
  { m.grid_coupled() } -> std::same_as<bool>;
  { m.recover_primitives(g, Uc, W, fill, t) };
  { m.complete_conservatives(g, W, U, fill, t) };
};

template <class M>
concept HasSplitStep = requires(const M m, const Grid& g, Field<typename M::State>& U, real t, real dt,
                                const GhostFill<typename M::State>& fill) {
  { m.split_step_active() } -> std::same_as<bool>;
  { m.split_step(g, U, t, dt, fill) } -> std::same_as<std::array<typename M::State, 2>>;
};

/// True when the model's whole-grid conversion must run (false for models without it).
template <class M>
bool grid_coupled(const M& m) {
  if constexpr (HasGridRecovery<M>) return m.grid_coupled();
  (void)m;
  return false;
}

/// True when the model's split step must run.
template <class M>
bool split_step_active(const M& m) {
  if constexpr (HasSplitStep<M>) return m.split_step_active();
  (void)m;
  return false;
}

template <class M>
concept HasEnergyFlux = requires(const M m, const typename M::State& s) {
  { m.energy_flux(s, s) } -> std::same_as<real>;
};

template <class M>
concept HasDissipation = requires(const M m, const typename M::State& s, real dx) {
  { m.dissipation(s, s, dx) } -> std::same_as<Dissipation>;
};

template <class M>
concept HasExternalCurrent = requires(const M m, const typename M::State& s, real j) {
  { m.external_current_source(s, j, j) } -> std::same_as<typename M::State>;
};

template <class M>
concept HasExternalCurrentField = requires(const M m, const typename M::State& s, real j) {
  { m.external_current_field_flux(s, s, j, j) } -> std::same_as<std::array<real, 2>>;
};

template <class M>
concept HasTransverseVelocity = requires(const M m, typename M::State& W, real v) {
  { m.transverse_velocity(W) } -> std::same_as<std::array<real, 2>>;
  { m.set_transverse_velocity(W, v, v) };
};

template <class M>
concept HasTransverseField = requires(const M m, typename M::State& W, real b) {
  { m.transverse_field(W) } -> std::same_as<std::array<real, 2>>;
  { m.set_transverse_field(W, b, b) };
};

template <class M>
concept HasAlfvenFields = requires(const M m, const typename M::State& s) {
  { m.alfven_fields(s) } -> std::same_as<AlfvenFields>;
};

template <class M>
concept HasConservedScale = requires(const M m, const typename M::State& s) {
  { m.conserved_scale(s) } -> std::same_as<typename M::State>;
};

template <class M>
concept HasEnergyRate = requires(const M m, const typename M::State& s) {
  { m.energy_rate(s, s) } -> std::same_as<real>;
};

/// Rate of change of the model's total energy density [W/m^3] when the conservative state
/// U changes at the rate S (a source term): the model's own energy_rate(U, S) where it
/// has one (exact), else the derivative of energy_density along S by a central
/// difference (exact to round-off where the energy is linear or quadratic in U). Used for
/// the power of antennas and absorbing layers.
template <class M>
  requires HasEnergyDensity<M>
real energy_rate(const M& m, const typename M::State& U, const typename M::State& S) {
  if constexpr (HasEnergyRate<M>) {
    return m.energy_rate(U, S);
  } else {
    real h = std::numeric_limits<real>::infinity();
    real smax = 0;
    for (std::size_t k = 0; k < U.size(); ++k) {
      smax = std::max(smax, std::abs(S[k]));
      if (S[k] != 0 && U[k] != 0) h = std::min(h, std::abs(U[k] / S[k]));
    }
    if (smax == 0) return 0;
    h = std::isfinite(h) ? 1e-3 * h : 1e-3 / smax;
    typename M::State up = U, um = U;
    for (std::size_t k = 0; k < U.size(); ++k) {
      up[k] += h * S[k];
      um[k] -= h * S[k];
    }
    const real ep = m.energy_density(m.prim_from_cons(up)).total();
    const real em = m.energy_density(m.prim_from_cons(um)).total();
    return (ep - em) / (2 * h);
  }
}

template <class M>
concept HasDiagnostics = requires(const M m, const Grid& g, const Field<typename M::State>& U, real* out) {
  { M::diagnostic_info() } -> std::same_as<std::vector<VariableInfo>>;
  { m.diagnostics(g, U, out) };
};

template <class M>
concept HasStepLimits = requires(const M m, const typename M::State& s, real dx, StepLimits& l) {
  { m.step_limits(dx, s, l) };
};

}  // namespace tw
