#pragma once
/// The discrete linearized equations on a grid: everything a linearized run needs, derived
/// once from the per-point linearizations (models/linear_form.hpp) at the cell centres and
/// faces of a static background.
///
/// State per cell: the complex amplitudes of the n primitive perturbations w (stored as
/// 2n reals: the n real parts, then the n imaginary parts), perturbations varying as
/// exp(i k_perp y). The conserved perturbation is U = M0 w (per cell), or with electron
/// inertia U_i = Mc_i w_i - (P_{i+1/2} - P_{i-1/2})/dx. The semi-discrete equations are
///
///   dU_i/dt = -(F_{i+1/2} - F_{i-1/2})/dx - (H_{i+1/2} - H_{i-1/2})/dx + L_i w_i [+ S_i w_i],
///
///   F_f = G+_f w_L + G-_f w_R                  exact upwind flux of the ideal part (below)
///   H_f = A_f (w_{f-1} + w_f)/2 + D_f (w_f - w_{f-1})   gradient terms across the face:
///         A = K_x0 + i k (K_xy + K_yx),  D = K_xx/dx
///   L_i = -i k (G_y + K_y0) + k^2 K_yy + i k dK_yx/dx + Q_0 + i k Q_y - dQ_x/dx [+ S]
///         the k_perp terms, Powell's terms (with the face flux -Q_x w in A) and a non-stiff
///         source, local to the cell: explicit, in the Runge-Kutta stages
///
/// A stiff source (two-fluid: plasma and cyclotron frequencies) is integrated by the
/// implicit midpoint rule per cell, Strang split around the stages, and then the k_perp
/// terms go with it (L_i + S_i in one implicit local step): the parallel electric field of
/// inertial and kinetic Alfvén waves comes from a near-balance of J_x/eps0 (source) and
/// c^2 i k B_z (k_perp term), each of order omega_pe, which splitting them apart destroys
/// (measured: an inertial Alfvén wave at k_perp d_e = 1 decays at a rate above its
/// frequency at CFL 0.8 when split, and runs within 0.5% of `tubewave modes` when not).
///
/// with k = k_perp. The cross terms -i k K_yx dw/dx are written as the face flux i k K_yx w
/// plus the local i k (dK_yx/dx) w (product rule), so every x-derivative is a difference of
/// face fluxes; second order in dx, exact for a uniform background in the continuum limit.
///
/// Exact upwind flux: with A = G_x M0^-1 (the Jacobian dF_x/dU at the face background),
/// A = R Lambda R^-1, A+- = R max/min(Lambda, 0) R^-1 and G+- = A+- M0: the Godunov flux of
/// the linear system, each characteristic taken from its upwind side (e.g. Toro 2009,
/// "Riemann Solvers and Numerical Methods for Fluid Dynamics", ch. 2 on linear
/// hyperbolic systems). The decomposition uses Eigen's eigen-solver; where the eigenvector
/// matrix is ill-conditioned (nearly degenerate waves, e.g. MHD along B0 with c_s = v_A)
/// the same projector is computed as A+ = A (I + sign(A))/2 with the matrix sign function
/// by Newton's iteration (Higham 2008, "Functions of Matrices", ch. 5), which needs no
/// eigenvectors. Computed once per face (the background is static).
///
/// Everything is precomputed (per face: G+-, A, D and the largest wave speed; per cell:
/// M0 and its inverse, L, S); applying it is a few small dense products per cell. Eigen
/// stays in linear_system.cpp.
#include <memory>
#include <vector>

#include "core/types.hpp"
#include "models/linear_form.hpp"
#include "models/model.hpp"

namespace tw {

/// Ghost cells of a 2n-component field as an affine map of the first and last interior
/// cells: g_left = L0 w_0 + Ln w_{n-1} + l, g_right = R0 w_0 + Rn w_{n-1} + r (2n x 2n
/// matrices row-major, 2n offsets). Exact for every end of this code (periodic, copies,
/// mirrors, the driven plate).
struct GhostAffine {
  std::vector<real> L0, Ln, R0, Rn;
  std::vector<real> l, r;
};

/// Inputs of LinearSystem.
struct LinearSystemSpec {
  int n = 0;                                 ///< complex variables per cell
  real dx = 1;                               ///< cell size [m]
  real k_perp = 0;                           ///< perpendicular wavenumber [1/m]
  bool stiff_source = false;                 ///< integrate the source implicitly (stiff_update)
  std::vector<LinearCoefficients> cell;      ///< at the cell centres (n_cells)
  std::vector<LinearCoefficients> face;      ///< at the faces (n_cells + 1)
  const char* gradient_limit_name = "gradient terms";
};

class LinearSystem {
 public:
  explicit LinearSystem(const LinearSystemSpec& spec);
  ~LinearSystem();
  LinearSystem(const LinearSystem&) = delete;
  LinearSystem& operator=(const LinearSystem&) = delete;

  [[nodiscard]] int n() const { return n_; }
  [[nodiscard]] int cells() const { return cells_; }
  [[nodiscard]] real k_perp() const { return k_; }
  [[nodiscard]] bool has_gradient() const { return gradient_; }
  [[nodiscard]] bool has_inertia() const { return inertia_; }
  [[nodiscard]] bool has_local() const { return local_; }
  [[nodiscard]] bool stiff() const { return stiff_; }

  /// Upwind flux at face f from the reconstructed states (2n reals each) into out (2n);
  /// returns the largest wave speed at the face [m/s].
  real upwind_flux(int f, const real* wl, const real* wr, real* out) const;
  /// Gradient flux H_f from the cell values left (cell f-1) and right (cell f) of face f.
  void gradient_flux(int f, const real* wl, const real* wr, real* out) const;
  /// The explicit local terms L_i w_i of cell i.
  void local_rhs(int i, const real* w, real* out) const;
  /// The stiff local step over dt for every cell (u: cells x 2n reals): the implicit
  /// midpoint rule for dU/dt = (S_i + L_i) M0_i^-1 U, i.e. U <- (I - dt A/2)^-1 (I + dt A/2) U.
  /// The matrices are kept for the last dt (steps are mostly of one length).
  void stiff_step(real dt, real* u) const;

  /// Per-cell conversions (no electron inertia): w = M0^-1 U and U = M0 w.
  void to_primitive(int i, const real* u, real* w) const;
  void to_conservative(int i, const real* w, real* u) const;
  /// With electron inertia: U_i = Mc_i w_i - (P_{i+1/2} - P_{i-1/2})/dx over the interior,
  /// for w with its ghost cells (w points at cell -1, cells stored consecutively, 2n each).
  void to_conservative_coupled(const real* w_with_ghosts, real* u) const;
  /// The inverse: w (interior) from U, with the ghost cells given by `ends`. The sparse LU
  /// factorization is kept and reused while the linear part of `ends` is unchanged.
  void to_primitive_coupled(const real* u, const GhostAffine& ends, real* w) const;

  /// Projector (n x n, row-major, acting on w) onto the characteristics of the ideal flux
  /// that leave through the left (side 0, speeds <= 0) or right end (side 1, speeds >= 0),
  /// at the end face's background: for non-reflecting (open) ends.
  [[nodiscard]] const std::vector<real>& outgoing_projector(int side) const { return out_[side]; }
  /// Largest wave speed along x over all faces [m/s].
  [[nodiscard]] real max_speed() const { return max_speed_; }
  /// Step limits of the linear terms, without the CFL factor [s]: the k_perp terms with
  /// the flux along x, the gradient terms, a non-stiff source.
  [[nodiscard]] const std::vector<StepLimit>& step_limits() const { return limits_; }

 private:
  struct Factorization;
  int n_ = 0, cells_ = 0;
  real dx_ = 1, k_ = 0;
  bool gradient_ = false, inertia_ = false, local_ = false, stiff_ = false;
  real max_speed_ = 0;
  std::vector<StepLimit> limits_;
  // per face (n x n each, row-major, contiguous by face)
  std::vector<real> gp_, gm_, speed_;
  std::vector<real> out_[2];               // outgoing projectors at faces 0 and n
  std::vector<real> ga_re_, ga_im_, gd_;   // gradient: A (complex), D (real)
  std::vector<real> na_re_, na_im_, nd_;   // inertia:  A (complex), D (real)
  // per cell
  std::vector<real> m0_, m0inv_;
  std::vector<real> l_re_, l_im_;          // local explicit operator (complex)
  std::vector<real> su_re_, su_im_;        // stiff local operator on U: (S + L) M0^-1 (complex)
  struct StiffCache;
  mutable std::shared_ptr<StiffCache> stiff_cache_;
  std::vector<real> mc_re_, mc_im_;        // inertia: cell part of the mass operator (complex)
  mutable std::shared_ptr<Factorization> lu_;
};

}  // namespace tw
