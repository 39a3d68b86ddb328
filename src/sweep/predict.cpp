#include "sweep/predict.hpp"

#include <cmath>
#include <limits>
#include <numbers>

#include "core/error.hpp"

namespace tw::sweep {

namespace {

// ---------------------------------------------------------------------------------------
// Ideal and resistive MHD (scripts-post/twdispersion.py, same formulas and sources).
//
// Background: mass density rho, pressure p, field (B_x, B_y, B_z), mu0 of the unit system,
// gamma (or the isothermal sound speed a when the closure is isothermal), resistivity eta
// and kinematic viscosity nu. The three ideal-MHD speeds along x are
//   c_a = |B_x| / sqrt(mu0 rho),
//   c_f,s^2 = ( a^2 + b^2 +- sqrt((a^2 + b^2)^2 - 4 a^2 b_x^2) ) / 2,
// a^2 = gamma p / rho, b^2 = |B|^2 / (mu0 rho), b_x^2 = B_x^2 / (mu0 rho)
// (J. P. Goedbloed and S. Poedts 2004, "Principles of Magnetohydrodynamics", Cambridge,
// ch. 5 [from memory]); omega = c k, no dispersion.

struct MhdSpeeds {
  real fast, alfven, slow, rho, mu0;
};

MhdSpeeds mhd_speeds(const Background& bg) {
  const real rho = bg.need("initial_mean_mass_density");
  const real mu0 = bg.need("mu0");
  const real bx = bg.need("field_x");
  const real by = bg.get("initial_mean_magnetic_field_y", 0.0);
  const real bz = bg.get("initial_mean_magnetic_field_z", 0.0);
  const real a_iso = bg.get("isothermal_sound_speed", 0.0);
  const real a2 = a_iso > 0 ? a_iso * a_iso : bg.need("gamma") * bg.need("initial_mean_pressure") / rho;
  const real b2 = (bx * bx + by * by + bz * bz) / (mu0 * rho);
  const real bx2 = bx * bx / (mu0 * rho);
  const real disc = std::sqrt(std::max((a2 + b2) * (a2 + b2) - 4 * a2 * bx2, 0.0));
  return {std::sqrt(0.5 * (a2 + b2 + disc)), std::sqrt(bx2), std::sqrt(std::max(0.5 * (a2 + b2 - disc), 0.0)), rho,
          mu0};
}

// The linear shear Alfven wave with resistive and viscous diffusion (standard; e.g. L. D.
// Landau and E. M. Lifshitz, "Electrodynamics of Continuous Media", MHD chapter [from
// memory]; the project's validation sheet, section 6):
//   omega = -i (eta_m + nu) k^2 / 2 + sqrt(k^2 c_a^2 - ((eta_m - nu) k^2 / 2)^2).
cplx alfven_resistive(const Background& bg, cplx k) {
  const MhdSpeeds m = mhd_speeds(bg);
  const real eta_m = bg.get("resistivity", 0.0) / m.mu0;
  const real nu = bg.get("viscosity", 0.0);
  const cplx d = (eta_m - nu) * k * k / 2.0;
  const cplx root = std::sqrt(k * k * m.alfven * m.alfven - d * d);
  return cplx(0, -0.5) * (eta_m + nu) * k * k + root;
}

// Hall MHD: parallel circularly polarised waves along B0 = B_x x (src/models/hall.hpp; the
// validation sheet, section 3; J. D. Huba 2003, Lect. Notes Phys. 615, 166 [from memory]).
// With the Hall coefficient h = v_A d_i, the magnetic diffusivity eta_m = eta/mu0, the
// electron inertial length d_e (0 without electron inertia) and the Alfven speed along x
// with the displacement current's inertia, v^2 = v_A^2/(1 + v_A^2/c^2), b = B_y + i B_z obeys
//   (1 + k^2 d_e^2) w^2 + (|h| + i eta_m) k^2 w - k^2 v^2 = 0.
// The left-hand (ion-cyclotron) branch is the root (-b + s)/(2g); the right-hand
// (whistler) wave toward +x is the mirror image of the root with negative real part.
cplx hall(const Background& bg, cplx k, bool right) {
  const real rho = bg.need("initial_mean_mass_density");
  const real mu0 = bg.need("mu0");
  const real bx = bg.need("field_x");
  const real h = std::abs(bg.get("hall_coefficient", 0.0));
  real va2 = bx * bx / (mu0 * rho);
  const real c = bg.get("displacement_light_speed", 0.0);
  if (c > 0) va2 = va2 / (1 + va2 / (c * c));
  const real de = bg.get("electron_inertial_length", 0.0);
  const real eta_m = bg.get("resistivity", 0.0) / mu0;
  const cplx g = 1.0 + k * k * de * de;
  const cplx b = cplx(h, eta_m) * k * k;
  const cplx s = std::sqrt(b * b + 4.0 * g * k * k * va2);
  if (right) return -std::conj((-b - s) / (2.0 * g));
  return (-b + s) / (2.0 * g);
}

struct ClosedForm {
  const char* id;
  const char* description;
  cplx (*omega)(const Background&, cplx);
};

const ClosedForm closed_forms[] = {
    {"mhd-fast", "ideal-MHD fast magnetosonic wave, omega = c_f k (Goedbloed & Poedts 2004, ch. 5)",
     [](const Background& bg, cplx k) { return mhd_speeds(bg).fast * k; }},
    {"mhd-alfven", "ideal-MHD shear Alfven wave, omega = |B_x| k / sqrt(mu0 rho)",
     [](const Background& bg, cplx k) { return mhd_speeds(bg).alfven * k; }},
    {"mhd-slow", "ideal-MHD slow magnetosonic wave, omega = c_s k (Goedbloed & Poedts 2004, ch. 5)",
     [](const Background& bg, cplx k) { return mhd_speeds(bg).slow * k; }},
    {"mhd-alfven-resistive",
     "shear Alfven wave with magnetic diffusivity eta/mu0 and viscosity nu (Landau & Lifshitz, "
     "Electrodynamics of Continuous Media)",
     alfven_resistive},
    {"hall-right",
     "Hall MHD right-hand (whistler) wave along B0, with electron inertia, resistivity and the "
     "displacement current when the run has them",
     [](const Background& bg, cplx k) { return hall(bg, k, true); }},
    {"hall-left",
     "Hall MHD left-hand (ion-cyclotron) wave along B0, with electron inertia, resistivity and the "
     "displacement current when the run has them",
     [](const Background& bg, cplx k) { return hall(bg, k, false); }},
};

const ClosedForm& closed_form(const std::string& id) {
  for (const auto& f : closed_forms)
    if (id == f.id) return f;
  fail_internal("no closed-form dispersion relation '" + id + "'");
}

real group_speed(const ClosedForm& f, const Background& bg, real k) {
  const real h = k != 0 ? 1e-6 * std::abs(k) : 1e-9;
  return std::real(f.omega(bg, k + h) - f.omega(bg, k - h)) / (2 * h);
}

PredictionValues given_wavenumber(const ClosedForm& f, const Background& bg, real k) {
  const cplx w = f.omega(bg, k);
  const real two_pi = 2 * std::numbers::pi;
  return {{"wavenumber", k},
          {"wavelength", two_pi / k},
          {"angular_frequency", w.real()},
          {"frequency", w.real() / two_pi},
          {"phase_speed", w.real() / k},
          {"group_speed", group_speed(f, bg, k)},
          {"damping_rate", -w.imag()}};
}

PredictionValues given_frequency(const ClosedForm& f, const Background& bg, real w) {
  // A real starting point: the fixed point k = w / v(k) (converges for weak dispersion),
  // then Newton's method on the complex k with omega(k) = w (as twdispersion.given_frequency).
  real k0 = 1.0;
  for (int it = 0; it < 60; ++it) {
    const real v = std::real(f.omega(bg, k0)) / k0;
    if (!(v > 0) || !std::isfinite(v)) break;
    k0 = w / v;
  }
  cplx k = k0;
  for (int it = 0; it < 100; ++it) {
    const cplx r = f.omega(bg, k) - w;
    const real h = 1e-7 * std::abs(k);
    const cplx df = (f.omega(bg, k + h) - f.omega(bg, k - h)) / (2 * h);
    const cplx step = r / df;
    k -= step;
    if (std::abs(step) < 1e-14 * std::abs(k)) break;
  }
  const real kr = k.real(), ki = k.imag();
  const real two_pi = 2 * std::numbers::pi;
  const real kappa = ki * (kr > 0 ? 1.0 : -1.0);
  return {{"angular_frequency", w},
          {"frequency", w / two_pi},
          {"wavenumber", kr},
          {"wavelength", two_pi / std::abs(kr)},
          {"phase_speed", w / kr},
          {"spatial_damping_rate", kappa},
          {"damping_length", kappa > 0 ? 1 / kappa : std::numeric_limits<real>::infinity()},
          {"group_speed", group_speed(f, bg, kr)}};
}

std::vector<PredictionSource> build_sources() {
  std::vector<PredictionSource> out;
  for (const auto& f : closed_forms) {
    const ClosedForm* form = &f;
    out.push_back({f.id, f.description, [form](const PredictionInput& in) -> PredictionValues {
                     if (in.omega) return given_frequency(*form, in.bg, *in.omega);
                     if (in.k) return given_wavenumber(*form, in.bg, *in.k);
                     return {};
                   }});
  }
  for (auto& s : modes_prediction_sources()) out.push_back(std::move(s));
  return out;
}

}  // namespace

real Background::get(const std::string& name, real fallback) const {
  const auto it = values.find(name);
  return it == values.end() ? fallback : it->second;
}

real Background::need(const std::string& name) const {
  const auto it = values.find(name);
  if (it == values.end()) throw InputError("the run file has no background value '" + name + "'");
  return it->second;
}

Background read_background(const io::H5Reader& h, bool normalized) {
  Background bg;
  bg.normalized = normalized;
  if (h.is_group("/parameters"))
    for (const auto& name : h.members("/parameters")) {
      const std::string p = "/parameters/" + name;
      if (!h.is_numeric(p)) continue;
      std::vector<hsize_t> dims;
      const auto v = h.read_real(p, &dims);
      if (dims.empty() && v.size() == 1) bg.values[name] = v[0];
    }
  if (h.is_group("/snapshots"))
    for (const auto& name : h.members("/snapshots")) {
      if (name == "time" || name == "step") continue;
      const std::string p = "/snapshots/" + name;
      if (!h.is_numeric(p)) continue;
      std::vector<hsize_t> dims;
      const auto row = h.read_real_rows(p, 0, 1, &dims);
      if (row.empty()) continue;
      real sum = 0;
      for (real x : row) sum += x;
      std::string field = name;
      // A complex field's real part stands for the field (as twrun.background()).
      if (field.size() > 3 && field.compare(field.size() - 3, 3, "_re") == 0) field.resize(field.size() - 3);
      else if (field.size() > 3 && field.compare(field.size() - 3, 3, "_im") == 0) continue;
      bg.values["initial_mean_" + field] = sum / static_cast<real>(row.size());
    }
  return bg;
}

const std::vector<std::string>& wave_quantities() {
  static const std::vector<std::string> q{"frequency",    "angular_frequency", "wavenumber",
                                          "wavelength",   "phase_speed",       "group_speed",
                                          "damping_rate", "spatial_damping_rate", "damping_length"};
  return q;
}

std::string quantity_unit(const std::string& q, bool normalized) {
  if (normalized) return "1";
  if (q == "frequency") return "Hz";
  if (q == "angular_frequency") return "rad/s";
  if (q == "wavenumber") return "rad/m";
  if (q == "wavelength" || q == "damping_length") return "m";
  if (q == "phase_speed" || q == "group_speed") return "m/s";
  if (q == "damping_rate") return "s^-1";
  if (q == "spatial_damping_rate") return "m^-1";
  return "1";
}

const std::vector<PredictionSource>& prediction_sources() {
  static const std::vector<PredictionSource> s = build_sources();
  return s;
}

const PredictionSource* find_prediction_source(const std::string& id) {
  for (const auto& s : prediction_sources())
    if (s.id == id) return &s;
  return nullptr;
}

cplx closed_form_omega(const std::string& id, const Background& bg, cplx k) { return closed_form(id).omega(bg, k); }

PredictionValues closed_form_given_wavenumber(const std::string& id, const Background& bg, real k) {
  return given_wavenumber(closed_form(id), bg, k);
}

PredictionValues closed_form_given_frequency(const std::string& id, const Background& bg, real omega) {
  return given_frequency(closed_form(id), bg, omega);
}

}  // namespace tw::sweep
