#pragma once
/// The linear dispersion relation of a model for a uniform background, from the
/// eigenvalues of its Fourier-transformed linearized operator (the matrices of
/// models/linear_form.hpp, the same ones the linearized runs discretise).
///
/// For perturbations ~ exp(i (k_x x + k_perp y - omega t)) the linear balance laws become
///
///   -i omega M(k) w = L(k) w,
///   M(k) = M0 + k_x^2 N_xx + k_x k_perp (N_xy + N_yx) + k_perp^2 N_yy - i k_x N_x0 - i k_perp N_y0,
///   L(k) = S - i k_x (G_x + K_x0) - i k_perp (G_y + K_y0)
///            + k_x^2 K_xx + k_x k_perp (K_xy + K_yx) + k_perp^2 K_yy + Q_0 + i k_x Q_x + i k_perp Q_y,
///
/// so the branches at real k_x are omega = i eig(M^-1 L) (complex: Im omega < 0 is
/// damping, from resistivity, viscosity or collisions), and w the eigenvector (primitive
/// perturbation). The inverse problem fixes a real omega (an antenna's frequency) and asks
/// for the complex k_x: P(k) w = 0 with P(k) = -i omega M(k) - L(k) = P0 + k P1 + k^2 P2, a
/// quadratic eigenvalue problem, solved through k = sigma + 1/mu (sigma a point where P is
/// regular), which turns it into the companion eigenproblem of mu^2 + mu B1 + B0 with
/// B1 = P(sigma)^-1 (P1 + 2 sigma P2), B0 = P(sigma)^-1 P2; mu = 0 are infinite roots (the
/// degree of det P is below 2n for ideal models) and are dropped.
///
/// Labels, where clear: the polarization of the transverse magnetic field (sense of
/// rotation in time about B0: R = electron sense, L = ion sense; circular, elliptic or
/// linear; Stix 1992, "Waves in Plasmas", ch. 1 for the convention) and the character
/// (shear: the field across the k-B0 plane; compressive: density and field in the k-B0
/// plane; electrostatic: no magnetic perturbation). Eigen stays in dispersion.cpp.
#include <array>
#include <complex>
#include <string>
#include <vector>

#include "core/types.hpp"
#include "models/linear_form.hpp"

namespace tw {

using cplx = std::complex<real>;

/// A uniform background and its linearization.
struct DispersionInput {
  LinearCoefficients coeffs;   ///< at the background (no gradients)
  VariableRoles roles;
  std::vector<real> background;  ///< W0 (n)
  std::vector<real> scales;      ///< typical size of each variable (n), for normalising vectors
  real k_perp = 0;             ///< [1/m]
  real mu0 = 1;                ///< permeability of the unit system (for the labels' weights)
};

/// One branch at one wavenumber.
struct WaveMode {
  cplx omega;                     ///< angular frequency [rad/s] (Im < 0: damped)
  cplx k;                         ///< wavenumber along x [1/m] (complex for the inverse problem)
  std::vector<cplx> vector;       ///< primitive eigenvector, largest relative component 1
  std::string polarization;       ///< "R", "L", "elliptic R", "elliptic L", "linear" or "" (not clear)
  std::string character;          ///< "shear", "compressive", "electrostatic", "mixed" or ""
  real group_speed = 0;           ///< d Re(omega)/dk along x [m/s] (0 where not computed)
};

/// Every branch at real k_x, sorted by Re(omega). Static modes (|omega| below
/// 1e-9 of the fastest rate: waves at rest, closure constraints, div B) are left out and
/// counted in `static_modes`.
struct BranchSet {
  std::vector<WaveMode> modes;
  int static_modes = 0;
};
BranchSet branches_at(const DispersionInput& in, real kx, bool group_speeds = true);

/// The complex wavenumbers k_x at real angular frequency omega > 0, sorted by decreasing
/// damping length |Re k|/|Im k| (the least damped first). Roots larger than `k_max` in
/// magnitude (default: 1e6 times omega over the fastest speed) are left out.
std::vector<WaveMode> wavenumbers_at(const DispersionInput& in, real omega, real k_max = 0);

/// Labels of a primitive eigenvector at wavenumber (kx, k_perp) and frequency omega.
void label_mode(const DispersionInput& in, WaveMode& mode);

/// A branch with its number as `tubewave modes` lists it: forward waves (Re omega > 0)
/// 1, 2, ... in ascending Re(omega); backward waves (Re omega < 0) -1, -2, ... in ascending
/// |Re omega|; non-propagating ones (|Re omega| below 1e-6 |omega|: purely damped or
/// growing) 0.
struct NumberedMode {
  WaveMode mode;
  int number = 0;
  std::string direction;  ///< "forward", "backward", "damped" or "growing"
};
std::vector<NumberedMode> numbered_branches(const BranchSet& set);

/// The forward branches (Re omega > 0) at real kx, in ascending Re(omega): number N of
/// `tubewave modes` and of `initial.mode_number` is entry N - 1.
std::vector<WaveMode> forward_branches(const DispersionInput& in, real kx);

}  // namespace tw
