// `tubewave measure`: frequency, wavelength, phase and group speed, damping and the
// omega-k spectrum of one field of a finished run (src/diagnostics/wave_measure.hpp).
#include <cmath>
#include <cstdio>
#include <iostream>
#include <sstream>

#include "cli/args.hpp"
#include "cli/commands.hpp"
#include "core/error.hpp"
#include "diagnostics/run_layout.hpp"
#include "diagnostics/run_measure.hpp"
#include "io/h5read.hpp"
#include "io/runfile.hpp"
#include "io/schema.hpp"
#include "sim/run.hpp"
#include "tubewave/version.hpp"

namespace tw::cli {

namespace {

std::string json_string(const std::string& s) {
  std::string out = "\"";
  for (char c : s) {
    switch (c) {
      case '"': out += "\\\""; break;
      case '\\': out += "\\\\"; break;
      case '\n': out += "\\n"; break;
      case '\t': out += "\\t"; break;
      default:
        if (static_cast<unsigned char>(c) < 0x20) {
          char buf[8];
          std::snprintf(buf, sizeof buf, "\\u%04x", c);
          out += buf;
        } else {
          out += c;
        }
    }
  }
  return out + "\"";
}

std::string json_number(real v) {
  if (!std::isfinite(v)) return "null";
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.17g", v);
  return buf;
}

std::string format_json(const std::string& file, const diag::WaveMeasurement& m, const std::string& stored) {
  std::ostringstream o;
  o << "{\n  \"file\": " << json_string(file) << ",\n  \"field\": " << json_string(m.field)
    << ",\n  \"field_units\": " << json_string(m.field_units) << ",\n  \"complex\": " << (m.complex_field ? "true" : "false")
    << ",\n  \"tubewave_version\": " << json_string(build::version) << ",\n  \"figures\": {";
  for (std::size_t i = 0; i < m.figures.size(); ++i) {
    const auto& f = m.figures[i];
    o << (i ? "," : "") << "\n    " << json_string(f.name) << ": {\"value\": " << json_number(f.value)
      << ", \"uncertainty\": " << json_number(f.uncertainty) << ", \"units\": " << json_string(f.units)
      << ", \"method\": " << json_string(f.method) << "}";
  }
  o << "\n  },\n  \"omega_k\": ";
  if (m.spectrum && !m.spectrum->k.empty()) {
    const auto& s = *m.spectrum;
    o << "{\"n_k\": " << s.k.size() << ", \"n_omega\": " << s.omega.size() << ", \"dk\": " << json_number(s.dk)
      << ", \"domega\": " << json_number(s.domega) << ", \"peak_k\": " << json_number(s.peak_k)
      << ", \"peak_omega\": " << json_number(s.peak_omega) << ", \"ridge_points\": " << s.ridge_k.size() << "}";
  } else {
    o << "null";
  }
  o << ",\n  \"notes\": [";
  for (std::size_t i = 0; i < m.notes.size(); ++i) o << (i ? ", " : "") << json_string(m.notes[i]);
  o << "],\n  \"stored\": " << (stored.empty() ? std::string("null") : json_string(stored)) << "\n}\n";
  return o.str();
}

std::string format_text(const std::string& file, const diag::WaveMeasurement& m, const std::string& stored) {
  std::ostringstream o;
  o << file << ": field " << m.field << " [" << m.field_units << "]" << (m.complex_field ? ", complex (re/im pair)" : "")
    << "\n";
  for (const auto& f : m.figures) {
    char line[160];
    if (f.valid()) {
      std::snprintf(line, sizeof line, "  %-21s %14.7g +- %-11.3g %-7s ", f.name.c_str(), f.value, f.uncertainty,
                    f.units.c_str());
    } else {
      std::snprintf(line, sizeof line, "  %-21s %14s    %-11s %-7s ", f.name.c_str(), "-", "", f.units.c_str());
    }
    o << line << f.method << "\n";
  }
  if (m.spectrum && !m.spectrum->k.empty()) {
    const auto& s = *m.spectrum;
    o << "  omega-k spectrum: " << s.omega.size() << " x " << s.k.size() << " bins, strongest at k = " << s.peak_k
      << ", omega = " << s.peak_omega << "; ridge of " << s.ridge_k.size() << " points\n";
  }
  for (const auto& n : m.notes) o << "  note: " << n << "\n";
  if (!stored.empty()) o << "  stored in " << stored << "\n";
  return o.str();
}

}  // namespace

int cmd_measure(std::span<const std::string> args) {
  ArgParser a("measure", "RUN.h5 [--field NAME] [--json] [--frequency HZ] [--t-min T] [--t-max T] [--x-min X] [--x-max X]",
              "Measure the wave in one field of a finished run: frequency (the drive's, or the spectral "
              "peak refined by a damped-tone fit), wavenumber, wavelength and phase speed (from the phase "
              "of that frequency's component along x), spatial and temporal damping, group speed (envelope "
              "arrival at the probes) and the omega-k spectrum with its ridge, each with a one-sigma "
              "uncertainty. A complex field is a NAME_re / NAME_im pair, named NAME. Results are printed and "
              "stored in the run file under /measurements/FIELD (the file is replaced atomically). An "
              "incomplete run file is refused (exit code 2).");
  a.positional("RUN.h5", "a complete run file");
  a.option("field", "NAME", "the field (default: the one whose fluctuations dominate its mean)");
  a.flag("json", "print one JSON object instead of a table");
  a.option("frequency", "HZ", "measure the component at this frequency (default: the drive's, else the spectral peak)");
  a.option("t-min", "T", "ignore samples before T [s]");
  a.option("t-max", "T", "ignore samples after T [s]");
  a.option("x-min", "X", "ignore cells and probes below X [m]");
  a.option("x-max", "X", "ignore cells and probes above X [m]");
  a.flag("no-spectrum", "skip the omega-k spectrum");
  a.flag("no-store", "do not write the results into the run file");
  if (!a.parse(args)) return 0;

  const std::string file = a.positional_value("RUN.h5");
  std::vector<std::string> notes;
  std::string field;
  diag::WaveData data;
  {
    const io::H5Reader h = io::H5Reader::open_complete_or_throw(file);
    const diag::RunLayout layout = diag::read_run_layout(h, notes);
    field = a.has("field") ? a.value("field") : diag::default_field(h);
    data = diag::load_wave_data(h, field, layout);
  }  // the file is closed before it is replaced

  diag::MeasureOptions opt;
  if (a.has("frequency")) {
    const double f = a.real_value("frequency");
    if (!(f > 0)) throw InputError("option --frequency: must be > 0 (got " + a.value("frequency") + ");" + a.help_hint());
    opt.frequency = f;
  }
  std::string window;
  for (const char* k : {"t-min", "t-max", "x-min", "x-max"}) {
    if (!a.has(k)) continue;
    const double v = a.real_value(k);
    window += std::string(window.empty() ? "" : ", ") + "--" + k + " " + a.value(k);
    if (std::string(k) == "t-min") opt.t_min = v;
    if (std::string(k) == "t-max") opt.t_max = v;
    if (std::string(k) == "x-min") opt.x_min = v;
    if (std::string(k) == "x-max") opt.x_max = v;
  }
  if (opt.t_min && opt.t_max && !(*opt.t_min < *opt.t_max))
    throw InputError("options --t-min and --t-max: the window is empty (" + a.value("t-min") + " to " + a.value("t-max") + ");" + a.help_hint());
  if (opt.x_min && opt.x_max && !(*opt.x_min < *opt.x_max))
    throw InputError("options --x-min and --x-max: the window is empty (" + a.value("x-min") + " to " + a.value("x-max") + ");" + a.help_hint());
  opt.spectrum = !a.has("no-spectrum");

  diag::WaveMeasurement m = diag::measure_wave(data, opt);
  m.notes.insert(m.notes.begin(), notes.begin(), notes.end());
  std::string stored;
  if (!a.has("no-store")) {
    diag::store_measurement(file, m, window.empty() ? "all samples" : window);
    stored = file + ":/measurements/" + m.field;
  }
  std::cout << (a.has("json") ? format_json(file, m, stored) : format_text(file, m, stored));
  return exit_code::ok;
}

}  // namespace tw::cli
