#pragma once
/// Boundary conditions: each end of the tube fills its ghost cells with primitive states
/// before reconstruction. A boundary is an object per end, so new kinds (open
/// characteristic ends, absorbing layers, antennas at an end) plug in without touching
/// the finite-volume operator.
///
/// Contract: fill() writes W[-1 .. -n_ghost] (left) or W[n .. n+n_ghost-1] (right) from
/// the interior values W[0 .. n-1] and the time t. It must not throw and must not read
/// other ghost cells than its own side's (periodic ends read the opposite interior).
#include <memory>
#include <string>

#include "grid/grid.hpp"
#include "models/model.hpp"

namespace tw {

template <class M>
class Boundary {
 public:
  using State = typename M::State;
  virtual ~Boundary() = default;
  virtual void fill(const M& model, const Grid& grid, Side side, real t, Field<State>& W) const = 0;
  /// Short description for logs and the output file, e.g. "conducting".
  [[nodiscard]] virtual std::string describe() const = 0;
};

/// Ghost index k = 1 .. n_ghost away from the end on `side`, and its mirror interior cell.
inline int ghost_index(const Grid& g, Side side, int k) {
  return side == Side::left ? -k : g.n_cells - 1 + k;
}
inline int mirror_index(const Grid& g, Side side, int k) {
  return side == Side::left ? k - 1 : g.n_cells - k;
}

/// Both ends joined: the tube is a ring.
template <class M>
class PeriodicBoundary final : public Boundary<M> {
 public:
  using State = typename M::State;
  void fill(const M&, const Grid& g, Side side, real, Field<State>& W) const override {
    for (int k = 1; k <= Grid::n_ghost; ++k) {
      if (side == Side::left)
        W[-k] = W[g.n_cells - k];
      else
        W[g.n_cells - 1 + k] = W[k - 1];
    }
  }
  [[nodiscard]] std::string describe() const override { return "periodic"; }
};

/// Zero gradient: ghost cells copy the last interior cell. Lets simple waves leave with
/// small reflection; a proper non-reflecting end is the "open" kind.
template <class M>
class ZeroGradientBoundary final : public Boundary<M> {
 public:
  using State = typename M::State;
  void fill(const M&, const Grid& g, Side side, real, Field<State>& W) const override {
    const State& edge = W[side == Side::left ? 0 : g.n_cells - 1];
    for (int k = 1; k <= Grid::n_ghost; ++k) W[ghost_index(g, side, k)] = edge;
  }
  [[nodiscard]] std::string describe() const override { return "zero-gradient"; }
};

/// Perfectly conducting, line-tied end: ghost cells mirror the interior with the
/// model's wall parity (M::wall_mirror), so the end reflects shear Alfvén waves with
/// v_perp -> -v_perp.
template <class M>
class ConductingBoundary final : public Boundary<M> {
 public:
  using State = typename M::State;
  void fill(const M& m, const Grid& g, Side side, real, Field<State>& W) const override {
    for (int k = 1; k <= Grid::n_ghost; ++k)
      W[ghost_index(g, side, k)] = m.wall_mirror(W[mirror_index(g, side, k)]);
  }
  [[nodiscard]] std::string describe() const override { return "conducting"; }
};

}  // namespace tw
