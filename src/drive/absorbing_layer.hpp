#pragma once
/// An absorbing layer in front of an open end: inside it the state is pulled back to the
/// background at a rate that grows smoothly toward the end,
///
///     dU/dt += -sigma(x) (U - U_ref(x)),   sigma = sigma_max s^p,
///
/// with s = (distance into the layer) / width in [0, 1] and p = 1, 2 or 3 (linear,
/// quadratic, cubic profile); U_ref is the initial state (the background of a driven run). A wave crossing the
/// layer and back is damped by about exp(-2 sigma_max width / ((p + 1) v)); the smooth
/// onset keeps the layer's own reflection small. The step is limited to dt < 1/sigma_max.
/// The energy it removes is reported (power < 0) so budgets still close.
#include <cmath>
#include <string>
#include <vector>

#include "numerics/fv_operator.hpp"

namespace tw {

template <Model M>
  requires HasEnergyDensity<M>
class AbsorbingLayer final : public SourceTerm<M> {
 public:
  using State = typename M::State;
  static constexpr int N = M::n_vars;

  /// `U_ref`: conservative background of every interior cell; the layer covers
  /// [x_end - width, x_end] (right) or [x_end, x_end + width] (left).
  AbsorbingLayer(Side side, const Grid& g, real width, int power, real sigma_max,
                 const Field<State>& U_ref)
      : side_(side), sigma_max_(sigma_max), width_(width), power_(power) {
    for (int i = 0; i < g.n_cells; ++i) {
      const real depth = side == Side::left ? g.x_min + width - g.x_centre(i) : g.x_centre(i) - (g.x_max() - width);
      if (depth <= 0) continue;
      const real s = std::min(depth / width, real(1));
      cells_.push_back(i);
      sigma_.push_back(sigma_max * std::pow(s, power));
      ref_.push_back(U_ref[i]);
    }
  }

  void add(const M& m, const Grid&, real, const Field<State>& W, Field<State>& dUdt) const override {
    for (std::size_t k = 0; k < cells_.size(); ++k) {
      const State S = source(m, W[cells_[k]], k);
      for (int j = 0; j < N; ++j) dUdt[cells_[k]][j] += S[j];
    }
  }
  [[nodiscard]] real power(const M& m, const Grid& g, real, const Field<State>& W) const override {
    real p = 0;
    for (std::size_t k = 0; k < cells_.size(); ++k) {
      const State& Wi = W[cells_[k]];
      p += energy_rate(m, m.cons_from_prim(Wi), source(m, Wi, k));
    }
    return p * g.dx();
  }
  void step_limits(const M&, const Grid&, StepLimits& limits) const override {
    if (!cells_.empty()) limits.offer("absorbing layer", 1 / sigma_max_);
  }
  [[nodiscard]] std::string describe() const override {
    return std::string("absorbing layer at the ") + side_name(side_) + " end";
  }
  [[nodiscard]] Side side() const { return side_; }
  [[nodiscard]] int cell_count() const { return static_cast<int>(cells_.size()); }

 private:
  State source(const M& m, const State& W, std::size_t k) const {
    const State U = m.cons_from_prim(W);
    State S;
    for (int j = 0; j < N; ++j) S[j] = -sigma_[k] * (U[j] - ref_[k][j]);
    return S;
  }
  Side side_;
  real sigma_max_, width_;
  int power_;
  std::vector<int> cells_;
  std::vector<real> sigma_;
  std::vector<State> ref_;
};

}  // namespace tw
