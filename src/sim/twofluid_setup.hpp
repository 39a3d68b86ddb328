#pragma once
/// Building the two-fluid model from a run file: its `model` keys (light speed and mass
/// ratio options, electron gamma, collisions), its state from a plasma (both species with
/// the background flow, E = -u x B), its initial kinds and its check warnings.
///
/// Initial kinds it takes besides uniform and riemann:
///   circular (shared with MHD and Hall MHD) — an exact electromagnetic wave along B0
///     (B0 along x, uniform plasma at rest), `initial.branch`: right, circularly polarised
///     R (electron sense about B0: the whistler branch); left, L (ion sense: the
///     ion-cyclotron branch); or linear (two-fluid only), R and L of half the amplitude
///     each, polarised along y, crests moving at the mean of the two phase speeds.
///     omega(k) is the lowest root of the cold-plasma relation n^2 = R or L (Stix 1992,
///     "Waves in Plasmas", ch. 1-2) for exactly the run's constants (light speed, masses,
///     charges). Both fluids and the fields are set from the eigenvector; densities and
///     pressures stay uniform, which makes the wave an exact solution of the nonlinear
///     equations at any amplitude (pressure does not enter it).
///   langmuir — a standing electron density wave n_e = n_e0 (1 + a cos kx) (adiabatic
///     pressure p_e ~ n_e^gamma_e) with E_x from Gauss's law and both fluids at rest.
#include <string>
#include <vector>

#include "models/twofluid.hpp"
#include "sim/model_setup.hpp"
#include "sim/plasma.hpp"

namespace tw {

/// Keys of the `model` section read only by the two-fluid model. Reuses model.gamma,
/// model.light_speed, model.coulomb_logarithm and initial.amplitude / wavelength / direction
/// / branch, declared with MHD's keys.
void declare_twofluid_keys(io::Schema& schema);

/// The initial kinds the two-fluid model adds to `initial.kind`.
inline std::vector<std::string> twofluid_initial_kinds() { return {"langmuir"}; }

/// Fails (ConfigError naming the key) if a key only the two-fluid model reads is given to
/// another model.
void reject_two_fluid_keys(const io::RunFile& rf, const std::string& model_name);

/// Branch of a parallel electromagnetic wave.
enum class ParallelBranch { right, left };

/// omega(|k|) [rad/s] of the parallel R or L wave of a uniform plasma at rest with the
/// model's constants: the lowest positive root of omega^2 R(omega) = k^2 c^2 (R) or
/// omega^2 L(omega) = k^2 c^2 (L), found by bracketing below the cyclotron resonance
/// (|Omega_e| for R, Omega_i for L). Densities in m^-3, b0 = |B0| [T], k > 0.
real parallel_wave_frequency(const TwoFluid& m, real n_i, real n_e, real b0, real k, ParallelBranch branch);

template <>
struct ModelSetup<TwoFluid> {
  using State = TwoFluid::State;
  static TwoFluid make(const io::RunFile& rf, const CaseSetup& c);
  static State primitive(const TwoFluid& m, const PlasmaPoint& p, const CaseSetup& c);
  static bool perturb(const TwoFluid& m, const io::RunFile& rf, const CaseSetup& c, Field<State>& W);
  static std::vector<io::ParameterValue> parameters(const TwoFluid& m, const CaseSetup& c);
  static FluxKind flux(const io::RunFile& rf, const TwoFluid& m);
  /// `tubewave check` warnings: reduced light speed or mass ratio, and unresolved plasma
  /// or cyclotron oscillations at the light-speed step cfl dx / c.
  static std::vector<std::string> check_warnings(const TwoFluid& m, const CaseSetup& c);
};

}  // namespace tw
