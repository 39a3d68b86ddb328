/// `tubewave modes`: the linear dispersion relation of a model for a uniform plasma, from the
/// eigenvalues of its Fourier-transformed linearized operator (models/dispersion.hpp): every
/// branch omega(k) at given wavenumbers, or the complex wavenumbers k at a given drive
/// frequency (the inverse problem). The plasma comes from a run file (at one position) or
/// from the same flags as `tubewave plasma`. Everything is computed before anything is
/// printed.
#include <cmath>
#include <cstdio>
#include <iostream>
#include <optional>
#include <string>
#include <vector>

#include "cli/args.hpp"
#include "cli/commands.hpp"
#include "cli/plasma_flags.hpp"
#include "core/constants.hpp"
#include "core/error.hpp"
#include "sim/modes.hpp"
#include "sim/run.hpp"
#include "tubewave/version.hpp"

namespace tw::cli {
namespace {

ArgParser make_parser() {
  ArgParser p("modes",
              "(RUN.yaml [--at X_M] | --model mhd|hall|two-fluid --n N_M3 --B B_T (--ion NAME | --mass-amu M) "
              "[plasma flags] [--angle-deg A]) [--kperp K] (--k K | --k START:STOP:COUNT | --freq F) [--json | --csv]",
              "The linear waves of a uniform plasma: every branch omega(k) of the chosen model at the given\n"
              "wavenumbers along x (--k), from the eigenvalues of its linearized equations, with the damping\n"
              "rate where resistivity, viscosity or collisions are on, the phase and group speeds and, where it\n"
              "is clear, the polarization (R, L: sense of rotation of the transverse field about B0, electron\n"
              "or ion; linear; elliptic) and the character (shear, compressive, electrostatic). With --freq,\n"
              "the inverse problem: the complex wavenumbers k at a real drive frequency, as wavelength and\n"
              "damping length. Perturbations vary as exp(i(k x + k_perp y - omega t)), B0 lies in the x-z\n"
              "plane at --angle-deg from x, k_perp (--kperp) is along y. SI units; frequencies in rad/s and Hz.\n"
              "\n"
              "Branch numbers: forward waves (Re omega > 0 at the given k) 1, 2, ... from the lowest frequency;\n"
              "backward waves -1, -2, ...; non-propagating (purely damped) 0. `initial.mode_number` of a\n"
              "linearized run counts the same way. Static modes (omega = 0: waves at rest, closure\n"
              "constraints, div B) are counted, not listed.\n"
              "\n"
              "The model options (closure, resistivity, electron inertia, reduced light speed or mass ratio,\n"
              "collisions, ...) are the run-file keys: from the run file, or --set KEY=VALUE with the flags.");
  p.positional("RUN.yaml", "a run file to take the model and plasma from (instead of --model and the flags)", false)
      .option("at", "X_M", "with a run file: position along the tube [m] (default: the left end)")
      .option("set", "KEY=VALUE", "override a run-file key, e.g. --set model.resistivity=1e-5", true)
      .option("model", "NAME", "mhd, hall or two-fluid (with the plasma flags)");
  declare_plasma_flags(p);
  p.option("angle-deg", "A", "angle of B0 from x in the x-z plane [deg] (default 0)")
      .option("kperp", "K", "perpendicular wavenumber k_perp [1/m] (default: the run file's, or 0)")
      .option("k", "K|START:STOP:COUNT", "wavenumber(s) along x [1/m]: one value, or COUNT values from START to STOP")
      .option("freq", "F|START:STOP:COUNT", "drive frequency(ies) [Hz] > 0: the inverse problem")
      .flag("json", "print one JSON object")
      .flag("csv", "print CSV (one row per branch or root)");
  return p;
}

/// One value or START:STOP:COUNT (COUNT >= 1 values, evenly spaced, both ends included).
std::vector<real> value_list(const ArgParser& args, const std::string& name) {
  const std::string v = args.value(name);
  auto bad = [&](const std::string& why) {
    throw InputError("option --" + name + ": '" + v + "' " + why + "; " + args.help_hint());
  };
  const auto c1 = v.find(':');
  if (c1 == std::string::npos) {
    double x = 0;
    if (!parse_real(v, x)) bad("is not a number (give K or START:STOP:COUNT)");
    return {x};
  }
  const auto c2 = v.find(':', c1 + 1);
  if (c2 == std::string::npos) bad("needs START:STOP:COUNT");
  double a = 0, b = 0, n = 0;
  if (!parse_real(v.substr(0, c1), a) || !parse_real(v.substr(c1 + 1, c2 - c1 - 1), b) ||
      !parse_real(v.substr(c2 + 1), n))
    bad("is not START:STOP:COUNT with three numbers");
  if (n < 1 || n != std::floor(n) || n > 100000) bad("needs a whole COUNT from 1 to 100000");
  const int count = static_cast<int>(n);
  std::vector<real> out;
  for (int j = 0; j < count; ++j) out.push_back(count == 1 ? a : a + (b - a) * j / (count - 1));
  return out;
}

std::string fmt(real v) {
  char b[40];
  std::snprintf(b, sizeof b, "%.6g", v);
  return b;
}
std::string json_num(real v) {
  if (!std::isfinite(v)) return "null";
  char b[40];
  std::snprintf(b, sizeof b, "%.17g", v);
  return b;
}
std::string json_str(const std::string& s) {
  std::string o = "\"";
  for (char ch : s) {
    if (ch == '"' || ch == '\\') o += '\\';
    o += ch;
  }
  return o + "\"";
}

struct KRow {
  real k;
  int static_modes;
  std::vector<NumberedMode> modes;
};
struct FRow {
  real f;
  std::vector<WaveMode> roots;
};

/// Wavelength, damping length and propagation direction of a complex root.
struct RootFigures {
  real wavelength, damping_length, phase_speed;
  std::string toward;
};
RootFigures root_figures(const WaveMode& m) {
  RootFigures r;
  const real kr = m.k.real(), ki = m.k.imag();
  r.wavelength = kr != 0 ? 2 * constants::pi / std::abs(kr) : INFINITY;
  r.damping_length = ki != 0 ? 1 / std::abs(ki) : INFINITY;
  r.phase_speed = kr != 0 ? m.omega.real() / kr : INFINITY;
  // exp(i k x): the amplitude decays toward +x when Im k > 0; undamped roots go the way
  // of their phase (for these roots the group and phase speeds share their sign except on
  // backward-wave branches, which the sign of Re k alone cannot tell).
  if (std::abs(ki) > 1e-9 * std::abs(m.k)) r.toward = ki > 0 ? "+x" : "-x";
  else r.toward = kr > 0 ? "+x (phase)" : "-x (phase)";
  return r;
}

std::string header_text(const ModesSetup& s) {
  std::string o = "tubewave modes: " + s.equations + " model, uniform plasma at x = " + fmt(s.x) + " m";
  o += ", B0 at " + fmt(s.field_angle_deg) + " deg from x, k_perp = " + fmt(s.input.k_perp) + " 1/m\n";
  if (s.plasma) {
    const PlasmaParameters& p = *s.plasma;
    o += "  n_e = " + fmt(s.plasma_input.n_e) + " m^-3, B = " + fmt(s.plasma_input.B) + " T, T_e = " +
         fmt(s.plasma_input.Te_eV) + " eV, T_i = " + fmt(s.plasma_input.Ti_eV) + " eV; v_A = " + fmt(p.v_A) +
         " m/s, omega_ci = " + fmt(p.omega_ci) + " rad/s, d_i = " + fmt(p.d_i) + " m, d_e = " + fmt(p.d_e) + " m\n";
  }
  if (s.normalized)
    o += "  normalized units: k, omega, gamma and speeds in the run's code units (rad/s, Hz, 1/m, m/s below)\n";
  o += "  omega in rad/s (f = omega/2 pi in Hz), damping rate gamma = -Im omega [1/s], speeds [m/s]\n";
  return o;
}

std::string table_k(const ModesSetup& s, const std::vector<KRow>& rows) {
  std::string o = header_text(s) + "\n";
  char line[512];
  std::snprintf(line, sizeof line, "%13s %6s %14s %14s %13s %13s %13s  %-11s %s\n", "k [1/m]", "branch",
                "omega [rad/s]", "f [Hz]", "gamma [1/s]", "v_phase", "v_group", "polarization", "character");
  o += line;
  for (const KRow& r : rows) {
    for (const NumberedMode& m : r.modes) {
      const real w = m.mode.omega.real();
      std::snprintf(line, sizeof line, "%13s %6d %14s %14s %13s %13s %13s  %-11s %s\n", fmt(r.k).c_str(), m.number,
                    fmt(w).c_str(), fmt(w / (2 * constants::pi)).c_str(), fmt(-m.mode.omega.imag() + 0.0).c_str(),
                    r.k != 0 ? fmt(w / r.k).c_str() : "-", fmt(m.mode.group_speed).c_str(),
                    m.mode.polarization.empty() ? "-" : m.mode.polarization.c_str(),
                    m.mode.character.empty() ? "-" : m.mode.character.c_str());
      o += line;
    }
    if (r.static_modes > 0) o += "              (" + std::to_string(r.static_modes) + " static modes at k = " + fmt(r.k) + ")\n";
  }
  return o;
}

std::string table_f(const ModesSetup& s, const std::vector<FRow>& rows) {
  std::string o = header_text(s) + "\n";
  char line[512];
  std::snprintf(line, sizeof line, "%13s %13s %14s %14s %14s %16s %13s %-11s  %-11s %s\n", "f [Hz]", "omega [rad/s]",
                "Re k [1/m]", "Im k [1/m]", "wavelength [m]", "damping len [m]", "v_phase", "toward", "polarization",
                "character");
  o += line;
  for (const FRow& r : rows)
    for (const WaveMode& m : r.roots) {
      const RootFigures q = root_figures(m);
      std::snprintf(line, sizeof line, "%13s %13s %14s %14s %14s %16s %13s %-11s  %-11s %s\n", fmt(r.f).c_str(),
                    fmt(2 * constants::pi * r.f).c_str(), fmt(m.k.real()).c_str(), fmt(m.k.imag()).c_str(),
                    fmt(q.wavelength).c_str(), fmt(q.damping_length).c_str(), fmt(q.phase_speed).c_str(),
                    q.toward.c_str(), m.polarization.empty() ? "-" : m.polarization.c_str(),
                    m.character.empty() ? "-" : m.character.c_str());
      o += line;
    }
  return o;
}

std::string json_head(const ModesSetup& s) {
  std::string o = "{\n  \"tubewave_version\": " + json_str(build::version) + ",\n  \"model\": " + json_str(s.equations) +
                  ",\n  \"x\": " + json_num(s.x) + ",\n  \"field_angle_deg\": " + json_num(s.field_angle_deg) +
                  ",\n  \"k_perp\": " + json_num(s.input.k_perp) + ",\n  \"variables\": [";
  for (std::size_t j = 0; j < s.variables.size(); ++j)
    o += (j ? ", " : "") + json_str(s.variables[j].name);
  o += "],\n";
  if (s.plasma)
    o += "  \"plasma\": {\"n_e_m3\": " + json_num(s.plasma_input.n_e) + ", \"B_T\": " + json_num(s.plasma_input.B) +
         ", \"Te_eV\": " + json_num(s.plasma_input.Te_eV) + ", \"Ti_eV\": " + json_num(s.plasma_input.Ti_eV) +
         ", \"alfven_speed_m_per_s\": " + json_num(s.plasma->v_A) + ", \"omega_ci_rad_per_s\": " +
         json_num(s.plasma->omega_ci) + ", \"d_i_m\": " + json_num(s.plasma->d_i) + ", \"d_e_m\": " +
         json_num(s.plasma->d_e) + "},\n";
  return o;
}

std::string json_vector(const std::vector<cplx>& v) {
  std::string o = "[";
  for (std::size_t j = 0; j < v.size(); ++j) o += (j ? ", " : "") + std::string("[") + json_num(v[j].real()) + ", " + json_num(v[j].imag()) + "]";
  return o + "]";
}

std::string json_k(const ModesSetup& s, const std::vector<KRow>& rows) {
  std::string o = json_head(s) + "  \"wavenumbers\": [";
  for (std::size_t r = 0; r < rows.size(); ++r) {
    const KRow& row = rows[r];
    o += std::string(r ? "," : "") + "\n    {\"k\": " + json_num(row.k) + ", \"static_modes\": " +
         std::to_string(row.static_modes) + ", \"branches\": [";
    for (std::size_t j = 0; j < row.modes.size(); ++j) {
      const NumberedMode& m = row.modes[j];
      const real w = m.mode.omega.real();
      o += std::string(j ? "," : "") + "\n      {\"number\": " + std::to_string(m.number) + ", \"direction\": " +
           json_str(m.direction) + ", \"angular_frequency\": " + json_num(w) + ", \"frequency\": " +
           json_num(w / (2 * constants::pi)) + ", \"damping_rate\": " + json_num(-m.mode.omega.imag() + 0.0) +
           ", \"phase_speed\": " + json_num(row.k != 0 ? w / row.k : NAN) + ", \"group_speed\": " +
           json_num(m.mode.group_speed) + ", \"polarization\": " + json_str(m.mode.polarization) +
           ", \"character\": " + json_str(m.mode.character) + ", \"vector\": " + json_vector(m.mode.vector) + "}";
    }
    o += "]}";
  }
  return o + "\n  ]\n}\n";
}

std::string json_f(const ModesSetup& s, const std::vector<FRow>& rows) {
  std::string o = json_head(s) + "  \"frequencies\": [";
  for (std::size_t r = 0; r < rows.size(); ++r) {
    const FRow& row = rows[r];
    o += std::string(r ? "," : "") + "\n    {\"frequency\": " + json_num(row.f) + ", \"angular_frequency\": " +
         json_num(2 * constants::pi * row.f) + ", \"roots\": [";
    for (std::size_t j = 0; j < row.roots.size(); ++j) {
      const WaveMode& m = row.roots[j];
      const RootFigures q = root_figures(m);
      o += std::string(j ? "," : "") + "\n      {\"wavenumber\": " + json_num(m.k.real()) + ", \"wavenumber_im\": " +
           json_num(m.k.imag()) + ", \"wavelength\": " + json_num(q.wavelength) + ", \"spatial_damping_rate\": " +
           json_num(std::abs(m.k.imag())) + ", \"damping_length\": " + json_num(q.damping_length) +
           ", \"phase_speed\": " + json_num(q.phase_speed) + ", \"toward\": " + json_str(q.toward) +
           ", \"polarization\": " + json_str(m.polarization) + ", \"character\": " + json_str(m.character) +
           ", \"vector\": " + json_vector(m.vector) + "}";
    }
    o += "]}";
  }
  return o + "\n  ]\n}\n";
}

std::string csv_k(const std::vector<KRow>& rows) {
  std::string o = "k_per_m,branch,direction,omega_rad_per_s,frequency_hz,damping_rate_per_s,phase_speed_m_per_s,"
                  "group_speed_m_per_s,polarization,character\n";
  for (const KRow& r : rows)
    for (const NumberedMode& m : r.modes) {
      const real w = m.mode.omega.real();
      o += json_num(r.k) + "," + std::to_string(m.number) + "," + m.direction + "," + json_num(w) + "," +
           json_num(w / (2 * constants::pi)) + "," + json_num(-m.mode.omega.imag() + 0.0) + "," +
           (r.k != 0 ? json_num(w / r.k) : "") + "," + json_num(m.mode.group_speed) + "," + m.mode.polarization + "," +
           m.mode.character + "\n";
    }
  return o;
}

std::string csv_f(const std::vector<FRow>& rows) {
  std::string o = "frequency_hz,omega_rad_per_s,k_re_per_m,k_im_per_m,wavelength_m,damping_length_m,phase_speed_m_per_s,"
                  "toward,polarization,character\n";
  for (const FRow& r : rows)
    for (const WaveMode& m : r.roots) {
      const RootFigures q = root_figures(m);
      o += json_num(r.f) + "," + json_num(2 * constants::pi * r.f) + "," + json_num(m.k.real()) + "," +
           json_num(m.k.imag()) + "," + json_num(q.wavelength) + "," + json_num(q.damping_length) + "," +
           json_num(q.phase_speed) + "," + q.toward + "," + m.polarization + "," + m.character + "\n";
    }
  return o;
}

}  // namespace

int cmd_modes(std::span<const std::string> argv) {
  ArgParser args = make_parser();
  if (!args.parse(argv)) return exit_code::ok;
  if (args.has("k") == args.has("freq"))
    throw InputError(std::string(args.has("k") ? "options --k and --freq were both given" : "no wavenumber or frequency") +
                     ": give --k K (or START:STOP:COUNT) for omega(k), or --freq F for k(omega); " + args.help_hint());
  if (args.has("json") && args.has("csv"))
    throw InputError("options --json and --csv were both given: choose one output format; " + args.help_hint());
  const bool run_file = args.has("RUN.yaml");
  std::optional<io::RunFile> rf;
  if (run_file) {
    for (const auto& flag : plasma_flag_names())
      if (flag != "lnlambda" && args.has(flag))
        throw InputError("option --" + flag + ": give either a run file or the plasma flags, not both; " + args.help_hint());
    for (const char* flag : {"model", "angle-deg"})
      if (args.has(flag))
        throw InputError(std::string("option --") + flag + ": the run file gives the model and the field angle (use --set to change them); " +
                         args.help_hint());
    rf.emplace(load_run_file(args.positional_value("RUN.yaml"), args.values("set")));
  } else {
    if (args.has("at")) throw InputError("option --at needs a run file; " + args.help_hint());
    if (!args.has("model"))
      throw InputError("no model: give --model mhd, hall or two-fluid with the plasma flags, or a run file; " + args.help_hint());
    const std::string model = args.value("model");
    if (model != "mhd" && model != "hall" && model != "two-fluid")
      throw InputError("option --model: '" + model + "' is not a model; choose mhd, hall or two-fluid; " + args.help_hint());
    const LabelledInput li = input_from_flags(args);
    real angle = 0;
    if (args.has("angle-deg")) {
      angle = args.real_value("angle-deg");
      if (angle < -180 || angle > 180)
        throw InputError("option --angle-deg: '" + args.value("angle-deg") + "' is out of range; it must be from -180 to 180; " +
                         args.help_hint());
    }
    rf.emplace(plasma_run_file(li.input, li.ion, model, angle, args.values("set")));
  }
  std::optional<real> x, kp;
  if (args.has("at")) x = args.real_value("at");
  if (args.has("kperp")) {
    kp = args.real_value("kperp");
    if (*kp < 0) throw InputError("option --kperp: '" + args.value("kperp") + "' must be >= 0; " + args.help_hint());
  }
  if (x) {
    const CaseSetup c = read_case(*rf);
    if (*x < c.grid.x_min || *x > c.grid.x_max())
      throw InputError("option --at: " + args.value("at") + " m is outside the tube [" + fmt(c.grid.x_min) + ", " +
                       fmt(c.grid.x_max()) + "] m; " + args.help_hint());
  }
  const ModesSetup s = modes_setup(*rf, x, kp);
  std::string out;
  if (args.has("k")) {
    std::vector<KRow> rows;
    for (real k : value_list(args, "k")) {
      if (k == 0 && s.input.k_perp == 0)
        throw InputError("option --k: k = 0 with k_perp = 0 has no waves; give k != 0 (or --kperp K); " + args.help_hint());
      const BranchSet b = branches_at(s.input, k);
      rows.push_back({k, b.static_modes, numbered_branches(b)});
    }
    out = args.has("json") ? json_k(s, rows) : args.has("csv") ? csv_k(rows) : table_k(s, rows);
  } else {
    std::vector<FRow> rows;
    for (real f : value_list(args, "freq")) {
      if (!(f > 0)) throw InputError("option --freq: " + fmt(f) + " Hz: the frequency must be > 0; " + args.help_hint());
      rows.push_back({f, wavenumbers_at(s.input, 2 * constants::pi * f)});
    }
    out = args.has("json") ? json_f(s, rows) : args.has("csv") ? csv_f(rows) : table_f(s, rows);
  }
  std::cout << out;
  return exit_code::ok;
}

}  // namespace tw::cli
