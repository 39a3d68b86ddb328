#pragma once
/// Antennas inside the tube: a region with a spatial weight w(x) where a drive acts on the
/// plasma, as a SourceTerm added to the finite-volume operator.
///
/// - current: an external current density J_ext(x, t) = J0 w(x) s(t) [A/m^2] in the y-z
///   plane (s the polarized waveform), entered through the model's
///   external_current_source (MHD: the force -J_ext x B and its work). The sheet current
///   is K(t) = integral of J_ext dx [A/m].
/// - velocity, field: the transverse velocity or field is pulled toward the prescribed
///   value v_d(t) (b_d(t) added to the background field) at the rate nu w(x):
///   dU/dt += nu w(x) (U(W_d) - U(W)), where W_d is the cell's primitive state with the
///   transverse quantity replaced and its density and pressure kept. In MHD that is the
///   force nu w rho (v_d - v) with its work plus the frictional heat
///   nu w rho |v_d - v|^2 / 2 (a field drive: the field source nu w (b_d - b) plus
///   nu w |b_d - b|^2 / 2 mu0), so the antenna's power counts that heat too; it is small
///   when the plasma follows the drive closely. This is the force (or induced field) of
///   an antenna that holds the plasma near the prescribed motion; nu is a relaxation rate
///   [1/s] and limits the step to dt < 0.25/(nu max w). How closely the plasma follows: a
///   region of integrated weight W = integral of w dx, short compared with the wavelength,
///   that radiates shear Alfven waves both ways (load 2 rho v_A per unit area) moves at
///   v = v_d / (1 + 2 v_A / (nu W)); the force per area nu rho W (v_d - v) balances the
///   load. Waves passing through the region are damped toward v_d as well: such an
///   antenna also absorbs.
///
/// Spatial weights (centre c, width d):
///   top-hat   1 for |x - c| < d/2 - e/2, 0 beyond d/2 + e/2, a cos^2 edge of width e in
///             between (half height at |x - c| = d/2)
///   gaussian  exp(-4 ln 2 (x - c)^2 / d^2) (d the full width at half maximum)
/// Only cells with w > 1e-9 are visited.
#include <algorithm>
#include <cmath>
#include <string>
#include <vector>

#include "core/constants.hpp"
#include "drive/waveform.hpp"
#include "numerics/fv_operator.hpp"

namespace tw {

enum class DriveQuantity { velocity, field, current };

inline const char* drive_quantity_name(DriveQuantity q) {
  switch (q) {
    case DriveQuantity::velocity: return "velocity";
    case DriveQuantity::field: return "field";
    case DriveQuantity::current: return "current";
  }
  return "";
}

/// Spatial weight of an antenna region.
struct AntennaShape {
  enum class Kind { top_hat, gaussian };
  Kind kind = Kind::top_hat;
  real centre = 0;  ///< [m]
  real width = 0;   ///< [m] full width (top-hat at half height; gaussian FWHM)
  real edge = 0;    ///< [m] top-hat edge width

  [[nodiscard]] real operator()(real x) const {
    const real d = std::abs(x - centre);
    if (kind == Kind::gaussian) {
      const real s = d / width;
      return std::exp(-4 * std::log(2.0) * s * s);
    }
    const real a = 0.5 * width;
    if (edge <= 0) return d < a ? 1.0 : (d == a ? 0.5 : 0.0);
    if (d <= a - 0.5 * edge) return 1;
    if (d >= a + 0.5 * edge) return 0;
    const real c = std::cos(0.5 * constants::pi * (d - (a - 0.5 * edge)) / edge);
    return c * c;
  }
};

/// The cells an antenna touches and their weights.
struct AntennaCells {
  int first = 0;              ///< first cell
  std::vector<real> weight;   ///< w(x_i) for cells first, first + 1, ...
  /// w at the faces of those cells (weight.size() + 1 values), zero at the two outer
  /// faces so that fluxes of the antenna stay inside it.
  std::vector<real> face_weight;
  /// Sum of w dx over the cells [m] (the sheet current per unit J0).
  [[nodiscard]] real integral(real dx) const {
    real s = 0;
    for (real w : weight) s += w;
    return s * dx;
  }
  static AntennaCells sample(const AntennaShape& shape, const Grid& g) {
    AntennaCells c;
    int lo = g.n_cells, hi = -1;
    std::vector<real> w(static_cast<std::size_t>(g.n_cells));
    for (int i = 0; i < g.n_cells; ++i) {
      w[static_cast<std::size_t>(i)] = shape(g.x_centre(i));
      if (w[static_cast<std::size_t>(i)] > 1e-9) {
        lo = std::min(lo, i);
        hi = std::max(hi, i);
      }
    }
    if (hi < lo) return c;
    c.first = lo;
    c.weight.assign(w.begin() + lo, w.begin() + hi + 1);
    c.face_weight.assign(c.weight.size() + 1, 0.0);
    for (std::size_t k = 1; k < c.weight.size(); ++k) c.face_weight[k] = shape(g.x_face(lo + static_cast<int>(k)));
    return c;
  }
};

template <Model M>
  requires HasEnergyDensity<M>
class AntennaSource final : public SourceTerm<M> {
 public:
  using State = typename M::State;
  static constexpr int N = M::n_vars;

  /// `amplitude` in drive.amplitude: J0 [A/m^2], v [m/s] or b [T]; `relaxation_rate`
  /// [1/s] for velocity and field drives; `b0`: background transverse field.
  AntennaSource(std::string name, DriveQuantity q, DriveSignal drive, AntennaCells cells,
                real relaxation_rate, std::array<real, 2> b0)
      : name_(std::move(name)), q_(q), drive_(std::move(drive)), cells_(std::move(cells)),
        nu_(relaxation_rate), b0_(b0) {}

  void add(const M& m, const Grid& g, real t, const Field<State>& W, Field<State>& dUdt) const override {
    const auto d = drive_.at(t);
    for (std::size_t k = 0; k < cells_.weight.size(); ++k) {
      const int i = cells_.first + static_cast<int>(k);
      const State S = source(m, g, W, k, d);
      for (int j = 0; j < N; ++j) dUdt[i][j] += S[j];
    }
  }

  [[nodiscard]] real power(const M& m, const Grid& g, real t, const Field<State>& W) const override {
    const auto d = drive_.at(t);
    real p = 0;
    for (std::size_t k = 0; k < cells_.weight.size(); ++k) {
      const int i = cells_.first + static_cast<int>(k);
      p += energy_rate(m, m.cons_from_prim(W[i]), source(m, g, W, k, d));
    }
    return p * g.dx();
  }

  void step_limits(const M&, const Grid&, StepLimits& limits) const override {
    if (q_ == DriveQuantity::current || nu_ <= 0) return;
    real wmax = 0;
    for (real w : cells_.weight) wmax = std::max(wmax, w);
    // nu dt <= 0.25 at CFL 1 (0.2 at the default 0.8): the relaxation shifts the spatial
    // operator's eigenvalues left, and together they must stay inside the Runge-Kutta
    // stability region (nu dt = 0.8 at CFL 0.8 is measured to be unstable).
    if (wmax > 0) limits.offer("antenna relaxation", 0.25 / (nu_ * wmax));
  }

  [[nodiscard]] std::string describe() const override {
    return name_ + ": " + drive_quantity_name(q_) + " antenna, " + drive_.waveform.describe();
  }
  [[nodiscard]] const std::string& name() const { return name_; }
  [[nodiscard]] DriveQuantity quantity() const { return q_; }
  [[nodiscard]] const DriveSignal& drive() const { return drive_; }
  [[nodiscard]] const AntennaCells& cells() const { return cells_; }

 private:
  /// The source in the k-th cell of the antenna.
  State source(const M& m, const Grid& g, const Field<State>& Wf, std::size_t k, const std::array<real, 2>& d) const {
    const int i = cells_.first + static_cast<int>(k);
    const State& W = Wf[i];
    const real w = cells_.weight[k];
    if (q_ == DriveQuantity::current) {
      State S{};
      if constexpr (HasExternalCurrent<M>) S = m.external_current_source(W, w * d[0], w * d[1]);
      if constexpr (HasExternalCurrentField<M> && HasTransverseField<M>) {
        // The field the model's Ohm's law misses (Hall): the divergence of the face fluxes,
        // applied to the transverse field with everything else held (its magnetic energy).
        const real wl = cells_.face_weight[k], wr = cells_.face_weight[k + 1];
        const auto gl = m.external_current_field_flux(Wf[i - 1], W, wl * d[0], wl * d[1]);
        const auto gr = m.external_current_field_flux(W, Wf[i + 1], wr * d[0], wr * d[1]);
        const real dby = -(gr[0] - gl[0]) / g.dx(), dbz = -(gr[1] - gl[1]) / g.dx();
        // dU along the primitive change (0, .., dB, ..): a central difference, exact for a
        // conservative map quadratic in B.
        State Wp = W, Wm = W;
        const auto b = m.transverse_field(W);
        m.set_transverse_field(Wp, b[0] + dby, b[1] + dbz);
        m.set_transverse_field(Wm, b[0] - dby, b[1] - dbz);
        const State Up = m.cons_from_prim(Wp), Um = m.cons_from_prim(Wm);
        for (int j = 0; j < N; ++j) S[j] += 0.5 * (Up[j] - Um[j]);
      } else {
        (void)g;
      }
      return S;
    }
    State Wd = W;
    if (q_ == DriveQuantity::velocity) {
      if constexpr (HasTransverseVelocity<M>) m.set_transverse_velocity(Wd, d[0], d[1]);
    } else {
      if constexpr (HasTransverseField<M>) m.set_transverse_field(Wd, b0_[0] + d[0], b0_[1] + d[1]);
    }
    // Relax the conservative state toward the one with the prescribed transverse
    // quantity and everything else (density, pressure) unchanged. Unlike a pure force,
    // this never lowers the pressure for nu dt <= 1 (the step limit), whatever the
    // amplitude; the price is the frictional heat described above.
    const State U = m.cons_from_prim(W), Ud = m.cons_from_prim(Wd);
    State S;
    const real r = nu_ * w;
    for (int j = 0; j < N; ++j) S[j] = r * (Ud[j] - U[j]);
    return S;
  }

  std::string name_;
  DriveQuantity q_;
  DriveSignal drive_;
  AntennaCells cells_;
  real nu_;
  std::array<real, 2> b0_;
};

}  // namespace tw
