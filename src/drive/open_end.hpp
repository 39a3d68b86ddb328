#pragma once
/// An open (non-reflecting) end: waves leave through it without returning.
///
/// Characteristic treatment, linearised about a reference state U_ref: the initial state
/// of the end cell, i.e. what lies beyond the end as the run starts (a uniform extension
/// of the initial data). With the flux Jacobian A = dF/dU at U_ref
/// decomposed as A = R Lambda L, the interior cell next to the end carries the
/// characteristic amplitudes a = L (U_int - U_ref). The ghost cells get
///
///     U_ghost = U_ref + sum over outgoing k of a_k r_k,
///
/// i.e. the outgoing waves continue unchanged and every incoming characteristic carries
/// the reference (no wave). At the face, an upwind flux then takes the outgoing part from
/// the interior and the incoming part from the reference: a linear wave leaves with no
/// reflection beyond the scheme's truncation error. Outgoing means lambda < 0 at the left
/// end and lambda > 0 at the right end; modes with lambda = 0 (entropy at rest, a slot the
/// flux ignores) are extrapolated.
///
/// The decomposition is model-generic: it uses only the model's flux and conservative map
/// (numerical Jacobian, models/eigen_modes.hpp), with the model's conserved_scale for the
/// step sizes where it has one. A model whose flux depends on the face (linearized models on
/// a varying background) supplies the projector itself: open_end_projector(side), the
/// N x N row-major matrix P of the end's outgoing characteristics (HasOpenEndProjector). If a ghost state comes out inadmissible (a wave far from
/// linear), the end falls back to copying the interior (zero gradient) for that fill.
#include <cmath>
#include <string>
#include <vector>

#include "drive/boundary.hpp"
#include "models/eigen_modes.hpp"

namespace tw {

/// The characteristic basis of a model at a primitive state (see eigen_modes.hpp).
template <Model M>
CharacteristicBasis characteristic_basis(const M& m, const typename M::State& W) {
  using State = typename M::State;
  constexpr int N = M::n_vars;
  const State U = m.cons_from_prim(W);
  State scale{};
  if constexpr (HasConservedScale<M>) {
    scale = m.conserved_scale(U);
  } else {
    real big = 0;
    for (real q : U) big = std::max(big, std::abs(q));
    for (int k = 0; k < N; ++k) scale[k] = std::abs(U[k]) > 0 ? std::abs(U[k]) : 1e-6 * big;
  }
  std::vector<real> u0(U.begin(), U.end()), s(scale.begin(), scale.end());
  for (auto& q : s)
    if (!(q > 0)) q = 1;
  auto flux = [&m](const real* u, real* f) {
    State Us;
    for (int k = 0; k < N; ++k) Us[k] = u[k];
    const State F = m.flux(m.prim_from_cons(Us));
    for (int k = 0; k < N; ++k) f[k] = F[k];
  };
  return conservative_basis(N, flux, u0, s);
}

/// Models that give the projector onto the outgoing characteristics at an end themselves.
template <class M>
concept HasOpenEndProjector = requires(const M m, Side side) {
  { m.open_end_projector(side) } -> std::same_as<std::vector<real>>;
};

template <Model M>
class OpenBoundary final : public Boundary<M> {
 public:
  using State = typename M::State;
  static constexpr int N = M::n_vars;

  /// `W_ref`: the reference (background) primitive state at this end.
  OpenBoundary(const M& m, Side side, const State& W_ref) : U_ref_(m.cons_from_prim(W_ref)) {
    if constexpr (HasOpenEndProjector<M>) {
      P_ = m.open_end_projector(side);
      real trace = 0;
      for (int k = 0; k < N; ++k) trace += P_[static_cast<std::size_t>(k * N + k)];
      n_outgoing_ = static_cast<int>(std::lround(trace));
      return;
    }
    const CharacteristicBasis b = characteristic_basis(m, W_ref);
    real smax = 0;
    for (real v : b.speeds) smax = std::max(smax, std::abs(v));
    const real tol = 1e-9 * smax;
    // Projector onto the outgoing modes: P = sum_k r_k l_k^T.
    for (int k = 0; k < N; ++k) {
      const real lam = b.speeds[static_cast<std::size_t>(k)];
      const bool outgoing = side == Side::left ? lam < tol : lam > -tol;
      if (!outgoing) continue;
      ++n_outgoing_;
      for (int i = 0; i < N; ++i)
        for (int j = 0; j < N; ++j)
          P_[static_cast<std::size_t>(i * N + j)] +=
              b.right[static_cast<std::size_t>(k)][static_cast<std::size_t>(i)] *
              b.left[static_cast<std::size_t>(k)][static_cast<std::size_t>(j)];
    }
  }

  void fill(const M& m, const Grid& g, Side side, real, Field<State>& W) const override {
    const State& edge = W[side == Side::left ? 0 : g.n_cells - 1];
    const State Ue = m.cons_from_prim(edge);
    State dU;
    for (int i = 0; i < N; ++i) dU[i] = Ue[i] - U_ref_[i];
    State Ug = U_ref_;
    for (int i = 0; i < N; ++i) {
      real s = 0;
      for (int j = 0; j < N; ++j) s += P_[static_cast<std::size_t>(i * N + j)] * dU[j];
      Ug[i] += s;
    }
    State Wg = m.prim_from_cons(Ug);
    if (!m.admissible(Wg)) Wg = edge;
    for (int k = 1; k <= Grid::n_ghost; ++k) W[ghost_index(g, side, k)] = Wg;
  }
  [[nodiscard]] std::string describe() const override { return "open (characteristic)"; }
  /// Number of characteristics that leave through this end.
  [[nodiscard]] int outgoing() const { return n_outgoing_; }

 private:
  State U_ref_;
  std::vector<real> P_ = std::vector<real>(static_cast<std::size_t>(N * N), 0.0);
  int n_outgoing_ = 0;
};

}  // namespace tw
