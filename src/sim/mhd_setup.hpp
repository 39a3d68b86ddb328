#pragma once
/// Building the MHD model from a run file: the `model` keys it reads, its state from a
/// plasma, and its eigenmode initial condition (`initial.kind: wave`).
#include <array>
#include <functional>
#include <string>
#include <vector>

#include "models/mhd.hpp"
#include "sim/model_setup.hpp"
#include "sim/plasma.hpp"

namespace tw {

/// Keys of the `model` section read by MHD (closure, gamma, resistivity, viscosity) and
/// the `initial` keys of its wave kind.
void declare_mhd_keys(io::Schema& schema);

/// The closure, dissipation and displacement-current keys, shared by every single-fluid
/// model (the MHD part of Hall MHD reads them too).
void read_mhd_fluid(const io::RunFile& rf, const CaseSetup& c, Mhd& m);

/// The adiabatic closure needs p > 0 in every cell: fails naming the keys that set the
/// pressure where pressure(i) (cell i) is not positive.
void require_pressure(const io::RunFile& rf, const CaseSetup& c, const std::function<real(int)>& pressure);

/// Light speed of the displacement current of m (0 when it is neglected).
real displacement_light_speed(const Mhd& m);
/// /parameters entries of the displacement current (light speed, its reduction, v_A with it).
std::vector<io::ParameterValue> displacement_parameters(const Mhd& m, const CaseSetup& c);
/// `tubewave check` warnings of a reduced light speed.
std::vector<std::string> displacement_warnings(const Mhd& m, const CaseSetup& c);

/// The exact circularly polarised wave along B0 = B_x x (`initial.kind: circular`):
/// uniform density and pressure, |B_perp| constant, u_perp parallel to B_perp. With a
/// frequency omega(k) from the model's own parallel dispersion relation it is an exact
/// nonlinear solution of ideal MHD (Barnes & Hollweg 1974, JGR 79, 2302 — from memory),
/// of ideal MHD with the displacement current, and of Hall MHD (every nonlinear term
/// vanishes when rho, p and |B_perp| are uniform and u_perp is parallel to B_perp).
struct CircularWave {
  real k = 0;          ///< wavenumber [1/m]
  int direction = 1;   ///< +1 travelling toward +x, -1 toward -x
  bool right = true;   ///< rotation in time in the electron sense about B0 (else the ion sense)
  real db = 0;         ///< |delta B_perp| [T]
  real x0 = 0;         ///< where the phase is zero [m]
  /// (v_y, v_z, B_y, B_z) of the wave at x and t = 0 for frequency omega > 0 [rad/s];
  /// rho_eff is the inertia of u_perp (rho, plus eps B_x^2 with the displacement current).
  [[nodiscard]] std::array<real, 4> at(real x, real bx, real mu0, real rho_eff, real omega) const;
};

/// Reads the circular kind's keys (wavelength, direction, branch, amplitude) and checks
/// that the background W0 has its field along x.
CircularWave read_circular_wave(const io::RunFile& rf, const CaseSetup& c, const Mhd& m, const Mhd::State& W0);

template <>
struct ModelSetup<Mhd> {
  using State = Mhd::State;
  static Mhd make(const io::RunFile& rf, const CaseSetup& c);
  static State primitive(const Mhd& m, const PlasmaPoint& p, const CaseSetup& c);
  static bool perturb(const Mhd& m, const io::RunFile& rf, const CaseSetup& c, Field<State>& W);
  static std::vector<io::ParameterValue> parameters(const Mhd& m, const CaseSetup& c);
  static FluxKind flux(const io::RunFile& rf, const Mhd& m);
  static std::vector<std::string> check_warnings(const Mhd& m, const CaseSetup& c);
};

/// The initial kinds MHD adds to `initial.kind`.
inline std::vector<std::string> mhd_initial_kinds() { return {"wave", "circular"}; }

/// Names of the linear MHD waves and the index of each, travelling forward (+x) or
/// backward, in the ascending list of the seven characteristic speeds
/// u-c_f, u-c_a, u-c_s, u, u+c_s, u+c_a, u+c_f.
int mhd_mode_index(const std::string& mode, bool forward);

/// The seven characteristic speeds and primitive eigenvectors of MHD at W (numerical
/// Jacobian; see models/eigen_modes.hpp). For the isothermal closure the pressure slot is
/// eliminated and its eigenvector entry is filled from the density entry.
struct ModeSet primitive_modes_mhd(const Mhd& m, const Mhd::State& W);

}  // namespace tw
