// Predictions from numerical eigenmodes (`tubewave modes`): the hook.
//
// The sources "modes:1" ... "modes:8": forward branch N as `tubewave modes` numbers them
// (ascending Re omega) for the case's own background at x_min (its resolved run file through modes_setup), so any model
// and option the modes library linearizes is predicted without a closed form:
//
// - at a wavenumber k (an initial-value run): omega of branch N at k; phase speed
//   Re omega / k, damping rate -Im omega, group speed d Re omega / dk (central difference);
// - at a drive frequency omega: the real k where branch N has Re omega(k) = omega (the
//   fixed point k = omega / v(k), as the closed forms start), then the complex root of the
//   inverse problem (wavenumbers_at) nearest it, whose imaginary part is the spatial decay.
//
// Sweep files name the ids under predict[].formula, and the summary gets the columns.
#include <cmath>
#include <limits>
#include <numbers>

#include "core/error.hpp"
#include "models/dispersion.hpp"
#include "sim/modes.hpp"
#include "sweep/predict.hpp"

namespace tw::sweep {

namespace {

/// Forward branches offered as sources.
constexpr int max_branch = 8;

PredictionValues modes_prediction(const PredictionInput& in, int branch) {
  if (in.run == nullptr) throw InputError("modes:" + std::to_string(branch) + ": the case's run file is not available");
  const ModesSetup setup = modes_setup(*in.run, std::nullopt, std::nullopt);
  const std::string id = "modes:" + std::to_string(branch);
  auto omega_at = [&](real k) -> cplx {
    const auto f = forward_branches(setup.input, k);
    if (static_cast<int>(f.size()) < branch)
      throw InputError(id + ": the model has " + std::to_string(f.size()) + " forward branches at k = " +
                       std::to_string(k) + " rad/m");
    return f[static_cast<std::size_t>(branch - 1)].omega;
  };
  auto group_speed = [&](real k) {
    const real h = 1e-6 * std::abs(k);
    return (omega_at(k + h).real() - omega_at(k - h).real()) / (2 * h);
  };
  const real two_pi = 2 * std::numbers::pi;
  if (in.k) {
    const real k = *in.k;
    const cplx w = omega_at(k);
    return {{"wavenumber", k},          {"wavelength", two_pi / k},        {"angular_frequency", w.real()},
            {"frequency", w.real() / two_pi}, {"phase_speed", w.real() / k}, {"group_speed", group_speed(k)},
            {"damping_rate", -w.imag()}};
  }
  if (!in.omega) return {};
  const real w = *in.omega;
  // Start from the Alfven speed along x of the background.
  const real va = std::abs(in.bg.need("field_x")) / std::sqrt(in.bg.need("mu0") * in.bg.need("initial_mean_mass_density"));
  real k = w / va;
  for (int it = 0; it < 100; ++it) {
    const real next = k * w / omega_at(k).real();
    if (!(next > 0) || !std::isfinite(next)) throw InputError(id + ": no real wavenumber of this branch at the frequency");
    const bool done = std::abs(next - k) < 1e-12 * k;
    k = next;
    if (done) break;
  }
  cplx kc = k;
  for (const auto& root : wavenumbers_at(setup.input, w))
    if (root.k.real() > 0 && std::abs(root.k - cplx(k)) < std::abs(kc - cplx(k)) + 1e-3 * k &&
        std::abs(root.k.real() - k) < 1e-3 * k)
      kc = root.k;
  const real kappa = kc.imag();
  return {{"angular_frequency", w},
          {"frequency", w / two_pi},
          {"wavenumber", kc.real()},
          {"wavelength", two_pi / kc.real()},
          {"phase_speed", w / kc.real()},
          {"spatial_damping_rate", kappa},
          {"damping_length", kappa > 0 ? 1 / kappa : std::numeric_limits<real>::infinity()},
          {"group_speed", group_speed(kc.real())}};
}

}  // namespace

std::vector<PredictionSource> modes_prediction_sources() {
  std::vector<PredictionSource> out;
  for (int n = 1; n <= max_branch; ++n)
    out.push_back({"modes:" + std::to_string(n),
                   "forward branch " + std::to_string(n) +
                       " of tubewave modes: eigenvalues of the model's linearized equations on the case's background",
                   [n](const PredictionInput& in) { return modes_prediction(in, n); }});
  return out;
}

}  // namespace tw::sweep
