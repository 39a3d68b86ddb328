#pragma once
/// How the ends couple two variables of the first ghost cells to the interior, for
/// implicit and whole-grid solves that must treat the ghost values as unknowns.
///
/// The ends are boundary objects that fill ghost cells of a primitive field (GhostFill);
/// a linear solve needs them as an affine map instead:
///
///   g_left  = L_first x_0 + L_last x_{n-1} + l,   g_right = R_first x_0 + R_last x_{n-1} + r,
///
/// where x_i is the pair of variables (k0, k1) of cell i and g the pair in the first ghost
/// cell on each side. The map is found by filling the ghosts of the actual field five
/// times: once as it is and once with each of the four values nudged by `delta`. It is
/// exact for every end whose first ghost is an affine function of the two cells next to
/// the ends (periodic, mirrors, copies, driven plates: all ends of this code) and a secant
/// approximation otherwise; dependence on cells further in is frozen at their current
/// values (in the offsets). Costs five ghost fills, O(1) each.
#include <cmath>

#include "core/block_tridiagonal.hpp"
#include "models/model.hpp"

namespace tw {

struct GhostMap {
  M2 left_first, left_last, right_first, right_last;  ///< d(ghost)/d(x_0), d(ghost)/d(x_{n-1})
  V2 left_offset, right_offset;                        ///< the affine parts
  /// Ghost pairs for given end values.
  [[nodiscard]] V2 left(V2 x_first, V2 x_last) const { return left_first * x_first + left_last * x_last + left_offset; }
  [[nodiscard]] V2 right(V2 x_first, V2 x_last) const {
    return right_first * x_first + right_last * x_last + right_offset;
  }
};

/// Probe the ends of W (interior filled; ghosts are overwritten, interior left unchanged)
/// at time t for the variable pair (k0, k1). delta > 0 is the nudge, of the size of the
/// values (any size is exact for affine ends).
template <class State>
GhostMap probe_ghost_map(Field<State>& W, const GhostFill<State>& fill, real t, int k0, int k1, real delta) {
  const int n = W.n_cells();
  const int last = n - 1;
  auto pair = [&](int i) { return V2{W[i][static_cast<std::size_t>(k0)], W[i][static_cast<std::size_t>(k1)]}; };
  fill(W, t);
  const V2 gl0 = pair(-1), gr0 = pair(n);
  GhostMap g;
  // Column j of d(ghost)/d(x_cell): nudge component j of the cell.
  auto column = [&](int cell, int k, V2& dl, V2& dr) {
    real& v = W[cell][static_cast<std::size_t>(k)];
    const real keep = v;
    v = keep + delta;
    fill(W, t);
    dl = (1 / delta) * (pair(-1) - gl0);
    dr = (1 / delta) * (pair(n) - gr0);
    v = keep;
  };
  V2 l0a, r0a, l0b, r0b, lna, rna, lnb, rnb;
  column(0, k0, l0a, r0a);
  column(0, k1, l0b, r0b);
  column(last, k0, lna, rna);
  column(last, k1, lnb, rnb);
  // The secants of an exact affine map carry round-off; whole-number coefficients (the
  // 0 and 1 of copies, mirrors and periodic ends) are restored exactly, so that periodic
  // ends see bitwise the same values at both ends.
  auto snap = [](real c) {
    const real r = std::round(c);
    return std::abs(c - r) < 1e-10 ? r : c;
  };
  auto mat = [&](V2 ca, V2 cb) { return M2{snap(ca.x), snap(cb.x), snap(ca.y), snap(cb.y)}; };
  g.left_first = mat(l0a, l0b);
  g.right_first = mat(r0a, r0b);
  g.left_last = mat(lna, lnb);
  g.right_last = mat(rna, rnb);
  const V2 x0 = pair(0), xn = pair(last);
  g.left_offset = gl0 - g.left_first * x0 - g.left_last * xn;
  g.right_offset = gr0 - g.right_first * x0 - g.right_last * xn;
  fill(W, t);  // leave the ghosts of the unperturbed field
  return g;
}

}  // namespace tw
