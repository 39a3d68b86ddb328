/// `tubewave plasma`: the derived parameters of a uniform plasma, as a text table or JSON.
///
/// The input comes from flags or from a run file's `plasma` section (at one position along
/// the tube): input_from_flags() / input_from_run_file() -> derive_plasma_parameters() ->
/// format_table() or format_json(). Everything is computed and validated before anything
/// is printed.
#include <algorithm>
#include <charconv>
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
#include "core/plasma_params.hpp"
#include "core/species.hpp"
#include "sim/case.hpp"
#include "sim/run.hpp"
#include "tubewave/version.hpp"

namespace tw::cli {
namespace {

ArgParser make_parser() {
  ArgParser p("plasma", "(--n N_M3 --B B_T (--ion NAME | --mass-amu M) [options] | RUN.yaml [--at X_M])",
              "Print the derived parameters of a uniform, quasi-neutral plasma with one ion\n"
              "species: Alfvén speeds, cyclotron, plasma and lower hybrid frequencies (rad/s\n"
              "and Hz), inertial lengths, gyroradii, Debye length, beta, Coulomb logarithm,\n"
              "Braginskii collision time and resistivities. SI units; temperatures in eV.\n"
              "Thermal speeds are sqrt(kT/m). A zero temperature is allowed (cold plasma):\n"
              "thermal quantities are then 0 and the collisional ones are omitted.\n"
              "\n"
              "Instead of the flags, a run file gives the plasma of its `plasma` section at the\n"
              "position --at (default: the left end of the tube).\n"
              "\n"
              "ions: " + known_species_list() + ".");
  p.positional("RUN.yaml", "a run file to take the plasma from (instead of the flags)", false)
      .option("at", "X_M", "with a run file: position along the tube [m] (default: the left end)");
  declare_plasma_flags(p);
  p.flag("json", "print one JSON object instead of a table");
  return p;
}

/// The plasma of a run file's `plasma` section at one position.
LabelledInput input_from_run_file(const ArgParser& args) {
  for (const auto& flag : plasma_flag_names())
    if (flag != "lnlambda" && args.has(flag))
      throw InputError(std::string("option --") + flag +
                       ": give either a run file or the plasma flags, not both; " + args.help_hint());
  const io::RunFile rf = load_run_file(args.positional_value("RUN.yaml"));
  const CaseSetup c = read_case(rf);
  if (c.units.normalized)
    throw InputError(rf.source_name() + ": the run uses normalized units; derived SI parameters need an SI run file");
  real x = c.grid.x_min;
  if (args.has("at")) {
    x = args.real_value("at");
    if (x < c.grid.x_min || x > c.grid.x_max())
      throw InputError("option --at: " + args.value("at") + " m is outside the tube [" + std::to_string(c.grid.x_min) +
                       ", " + std::to_string(c.grid.x_max()) + "] m; " + args.help_hint());
  }
  const PlasmaPoint pt = c.plasma.at(x, c.units);
  LabelledInput out;
  out.ion = c.plasma.ion_name == "custom" ? "" : c.plasma.ion_name;
  out.input.n_e = pt.n_e;
  out.input.B = std::sqrt(pt.field[0] * pt.field[0] + pt.field[1] * pt.field[1] + pt.field[2] * pt.field[2]);
  out.input.ion_mass = c.plasma.ion_mass;
  out.input.Z = c.plasma.charge;
  out.input.Te_eV = pt.t_e / c.units.energy_per_eV;
  out.input.Ti_eV = pt.t_i / c.units.energy_per_eV;
  if (args.has("lnlambda")) out.input.ln_lambda = args.real_value("lnlambda");
  if (!(out.input.B > 0))
    throw InputError(rf.source_name() + ": the plasma has no magnetic field; derived parameters need B > 0");
  validate_plasma_input(out.input);
  return out;
}

// ---- text table ------------------------------------------------------------------------

/// Display width of UTF-8 text (code points; every character here is one column wide).
std::size_t display_width(const std::string& s) {
  return static_cast<std::size_t>(std::count_if(
      s.begin(), s.end(), [](char ch) { return (static_cast<unsigned char>(ch) & 0xC0) != 0x80; }));
}

std::string pad(const std::string& s, std::size_t width) {
  const std::size_t w = display_width(s);
  return s + std::string(w < width ? width - w : 0, ' ');
}

std::string text_number(real v) {
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.6g", v);
  return buf;
}

void print_rows(std::string& out, const std::vector<PlasmaParameterRow>& rows) {
  std::size_t wd = 0, ws = 0, wv = 0;
  for (const auto& r : rows) {
    wd = std::max(wd, display_width(r.description));
    ws = std::max(ws, display_width(r.symbol));
    wv = std::max(wv, text_number(r.value).size());
  }
  for (const auto& r : rows) {
    const std::string num = text_number(r.value);
    out += "  " + pad(r.description, wd) + "  " + pad(r.symbol, ws) + "  " +
           std::string(wv - num.size(), ' ') + num + "  " + r.units + "\n";
  }
}

std::string format_table(const LabelledInput& li, const PlasmaParameters& p) {
  std::string out = "plasma parameters (SI; thermal speeds sqrt(kT/m))\n\ninput";
  out += li.ion.empty() ? ":\n" : " (ion " + li.ion + "):\n";
  print_rows(out, plasma_input_rows(li.input));
  out += "\nderived:\n";
  print_rows(out, plasma_parameter_rows(p));
  out += "\nAlfvén wave regime: " + std::string(alfven_regime_name(p.regime)) + " (v_te/v_A = " +
         text_number(p.v_te_over_v_A) + (p.v_te_over_v_A > 1 ? " > 1)" : " <= 1)") + "\n";
  if (!p.notes.empty()) {
    out += "\nnotes:\n";
    for (const auto& n : p.notes) out += "  - " + n + "\n";
  }
  return out;
}

// ---- JSON ------------------------------------------------------------------------------

std::string json_string(const std::string& s) {
  std::string out = "\"";
  for (const char ch : s) {
    const auto u = static_cast<unsigned char>(ch);
    if (ch == '"') out += "\\\"";
    else if (ch == '\\') out += "\\\\";
    else if (ch == '\n') out += "\\n";
    else if (u < 0x20) {
      char buf[8];
      std::snprintf(buf, sizeof buf, "\\u%04x", u);
      out += buf;
    } else out += ch;
  }
  return out + "\"";
}

/// Shortest text that reads back to the same double (values are always finite here).
std::string json_number(real v) {
  char buf[40];
  const auto res = std::to_chars(buf, buf + sizeof buf, v);
  return std::string(buf, res.ptr);
}

void json_object(std::string& out, const char* name, const std::vector<PlasmaParameterRow>& rows,
                 bool units, const std::string& first_member = {}) {
  out += "  " + json_string(name) + ": {";
  bool first = true;
  if (!first_member.empty()) {
    out += "\n    " + first_member;
    first = false;
  }
  for (const auto& r : rows) {
    out += first ? "\n    " : ",\n    ";
    out += json_string(r.key) + ": " + (units ? json_string(r.units) : json_number(r.value));
    first = false;
  }
  out += "\n  }";
}

std::string format_json(const LabelledInput& li, const PlasmaParameters& p) {
  const auto in_rows = plasma_input_rows(li.input);
  const auto rows = plasma_parameter_rows(p);
  std::string out = "{\n";
  out += "  \"tubewave_version\": " + json_string(build::version) + ",\n";
  json_object(out, "inputs", in_rows, false,
              "\"ion\": " + (li.ion.empty() ? std::string("null") : json_string(li.ion)));
  out += ",\n";
  json_object(out, "derived", rows, false);
  out += ",\n";
  std::vector<PlasmaParameterRow> all = in_rows;
  all.insert(all.end(), rows.begin(), rows.end());
  json_object(out, "units", all, true);
  out += ",\n  \"alfven_wave_regime\": " + json_string(alfven_regime_name(p.regime)) + ",\n";
  out += "  \"notes\": [";
  for (std::size_t k = 0; k < p.notes.size(); ++k) {
    out += (k ? ", " : "") + json_string(p.notes[k]);
  }
  out += "]\n}\n";
  return out;
}

}  // namespace

int cmd_plasma(std::span<const std::string> argv) {
  ArgParser args = make_parser();
  if (!args.parse(argv)) return exit_code::ok;
  if (args.has("at") && !args.has("RUN.yaml"))
    throw InputError("option --at needs a run file; " + args.help_hint());
  const LabelledInput li = args.has("RUN.yaml") ? input_from_run_file(args) : input_from_flags(args);
  const PlasmaParameters p = derive_plasma_parameters(li.input);
  std::cout << (args.has("json") ? format_json(li, p) : format_table(li, p));
  return exit_code::ok;
}

}  // namespace tw::cli
