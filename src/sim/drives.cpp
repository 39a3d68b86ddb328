#include "sim/drives.hpp"

#include <algorithm>
#include <cmath>
#include <map>
#include <sstream>

#include "core/constants.hpp"
#include "io/table.hpp"

namespace tw {

namespace {

const std::vector<std::string>& waveform_names() {
  static const std::vector<std::string> n{"continuous", "tone-burst", "chirp", "gaussian-pulse", "tones", "table"};
  return n;
}

/// Keys of each waveform (beyond the common delay, polarization, angle_deg).
const std::map<std::string, std::vector<std::string>>& waveform_keys() {
  static const std::map<std::string, std::vector<std::string>> k{
      {"continuous", {"frequency", "ramp_periods", "phase_deg"}},
      {"tone-burst", {"frequency", "cycles", "window", "taper", "phase_deg"}},
      {"chirp", {"frequency", "frequency_end", "duration", "taper", "phase_deg"}},
      {"gaussian-pulse", {"frequency", "pulse_width", "pulse_centre", "phase_deg"}},
      {"tones", {"tones", "ramp_periods"}},
      {"table", {"file"}},
  };
  return k;
}

/// Keys that must be given for each waveform.
const std::map<std::string, std::vector<std::string>>& waveform_required() {
  static const std::map<std::string, std::vector<std::string>> k{
      {"continuous", {"frequency"}},
      {"tone-burst", {"frequency", "cycles"}},
      {"chirp", {"frequency", "frequency_end", "duration"}},
      {"gaussian-pulse", {"pulse_width"}},
      {"tones", {"tones"}},
      {"table", {"file"}},
  };
  return k;
}

const std::vector<std::string>& amplitude_keys(bool in_domain) {
  static const std::vector<std::string> ends{"velocity_amplitude", "field_amplitude"};
  static const std::vector<std::string> all{"velocity_amplitude", "field_amplitude", "current_density",
                                            "sheet_current"};
  return in_domain ? all : ends;
}

/// Every drive key (for "only a driven end takes ..." checks).
const std::vector<std::string>& all_drive_keys() {
  static const std::vector<std::string> k{
      "velocity_amplitude", "field_amplitude", "waveform", "frequency", "ramp_periods", "cycles",
      "window", "taper", "frequency_end", "duration", "pulse_width", "pulse_centre", "tones",
      "file", "delay", "phase_deg", "polarization", "angle_deg"};
  return k;
}

void declare_drive_common(io::Section& s, bool in_domain) {
  const std::string where = in_domain ? "antenna" : "driven end";
  s.real("velocity_amplitude", "m/s", where + ": drive the transverse velocity with this amplitude")
      .non_negative();
  s.real("field_amplitude", "T",
         where + ": drive the transverse magnetic field (added to the background's) with this amplitude")
      .non_negative();
  if (in_domain) {
    s.real("current_density", "A/m^2", "antenna: external current density J0 at the peak of the shape")
        .non_negative();
    s.real("sheet_current", "A/m",
           "antenna: external sheet current K0 (the current density integrated across the antenna)")
        .non_negative();
  }
  s.choice("waveform", waveform_names(),
           where + ": time dependence: continuous (smooth turn-on), tone-burst (N cycles, Hann or Tukey "
                   "window), chirp (linear sweep), gaussian-pulse, tones (a sum), table (CSV time series)")
      .def("continuous");
  s.real("frequency", "Hz", where + ": carrier frequency (chirp: start frequency; gaussian-pulse: 0 = no carrier)")
      .non_negative();
  s.real("ramp_periods", "", where + ": continuous, tones: length of the sin^2 turn-on in (lowest) carrier periods")
      .non_negative()
      .def(2.0);
  s.real("cycles", "", where + ": tone-burst: number of carrier cycles under the window").positive();
  s.choice("window", {"hann", "tukey"}, where + ": tone-burst: window of the burst").def("hann");
  s.real("taper", "", where + ": tone-burst (tukey), chirp: tapered fraction of the window (0 = rectangle, 1 = Hann; default 0.5 for bursts, 0.1 for chirps)")
      .at_least(0)
      .at_most(1);
  s.real("frequency_end", "Hz", where + ": chirp: frequency at the end of the sweep").non_negative();
  s.real("duration", "s", where + ": chirp: length of the sweep").positive();
  s.real("pulse_width", "s", where + ": gaussian-pulse: full width at half maximum of the envelope").positive();
  s.real("pulse_centre", "s", where + ": gaussian-pulse: time of the peak (default 2.5 pulse widths)").non_negative();
  io::Section& tones = s.section_list("tones", where + ": tones: the components of the sum");
  tones.real("frequency", "Hz", "frequency of this tone").positive().require();
  tones.real("amplitude", "", "relative amplitude of this tone").def(1.0);
  tones.real("phase_deg", "deg", "phase of this tone (sin(w t + phase))").def(0.0);
  s.string("file", where + ": table: CSV file with columns time [s] and value (optionally quadrature, for "
                           "circular polarization), relative to the run file's folder");
  s.real("delay", "s", where + ": the waveform starts this long after t = 0").non_negative().def(0.0);
  s.real("phase_deg", "deg", where + ": carrier phase (sin(w t + phase))").def(0.0);
  s.choice("polarization", {"y", "z", "left", "right", "linear"},
           where + ": linear at angle_deg from y toward z, circular left- or right-handed about +x, "
                   "or linear along y or z")
      .def("linear");
  s.real("angle_deg", "deg", where + ": linear polarization: angle of the drive from y toward z").def(0.0);
}

std::string fmt(real v) {
  std::ostringstream o;
  o << v;
  return o.str();
}

Waveform read_waveform(const io::RunFile& rf, const std::string& key, const std::string& kind,
                       const std::string& who) {
  auto k = [&](const char* n) { return key + "." + n; };
  auto get = [&](const char* n) { return rf.get_real(k(n)); };
  const real phase = get("phase_deg") * constants::pi / 180;
  if (kind == "continuous") {
    const real f = get("frequency");
    if (f <= 0) rf.fail(k("frequency"), who + " needs a drive frequency > 0");
    return Waveform::continuous(f, get("ramp_periods") / f, phase);
  }
  if (kind == "tone-burst") {
    const real f = get("frequency");
    if (f <= 0) rf.fail(k("frequency"), who + " needs a drive frequency > 0 (tone burst)");
    const bool tukey = rf.get_string(k("window")) == "tukey";
    if (!tukey && rf.given(k("taper"))) rf.fail(k("taper"), "only the tukey window takes a taper");
    const real taper = rf.has(k("taper")) ? get("taper") : 0.5;
    return Waveform::tone_burst(f, get("cycles"), tukey ? Window::tukey : Window::hann, taper, phase);
  }
  if (kind == "chirp") {
    const real taper = rf.has(k("taper")) ? get("taper") : 0.1;
    return Waveform::chirp(get("frequency"), get("frequency_end"), get("duration"), taper, phase);
  }
  if (kind == "gaussian-pulse") {
    const real w = get("pulse_width");
    const real f = rf.has(k("frequency")) ? get("frequency") : 0.0;
    const real c = rf.has(k("pulse_centre")) ? get("pulse_centre") : 2.5 * w;
    return Waveform::gaussian_pulse(f, w, c, phase);
  }
  if (kind == "tones") {
    const std::size_t n = rf.count(k("tones"));
    if (n == 0) rf.fail(k("tones"), "a sum of tones needs at least one tone");
    std::vector<Tone> tones;
    for (std::size_t i = 0; i < n; ++i) {
      const std::string t = k("tones") + "[" + std::to_string(i) + "]";
      tones.push_back({rf.get_real(t + ".frequency"), rf.get_real(t + ".amplitude"),
                       rf.get_real(t + ".phase_deg") * constants::pi / 180});
    }
    real fmin = tones.front().frequency;
    for (const auto& t : tones) fmin = std::min(fmin, t.frequency);
    return Waveform::tones(std::move(tones), get("ramp_periods") / fmin);
  }
  // table
  const std::string file = io::path_beside(rf.source_name(), rf.get_string(k("file")));
  const io::CsvTable t = io::CsvTable::read(file, k("file"));
  (void)t.column("time");
  (void)t.column("value");
  t.require_rows(2);
  t.require_increasing("time");
  std::vector<real> q;
  if (t.find("quadrature") >= 0) q = t.column("quadrature");
  for (const auto& name : t.names())
    if (name != "time" && name != "value" && name != "quadrature")
      t.fail_header("unknown column '" + name + "' (a waveform table has time, value and optionally quadrature)");
  return Waveform::table(t.column("time"), t.column("value"), std::move(q));
}

}  // namespace

const char* drive_unit(DriveQuantity q) {
  switch (q) {
    case DriveQuantity::velocity: return "m/s";
    case DriveQuantity::field: return "T";
    case DriveQuantity::current: return "A/m^2";
  }
  return "";
}

void declare_end_drive_keys(io::Section& end) {
  declare_drive_common(end, false);
  end.real("layer_width", "m", "open end: width of the absorbing layer in front of it (0 = none)")
      .non_negative()
      .def(0.0);
  end.choice("layer_profile", {"linear", "quadratic", "cubic"},
             "open end: how the layer's damping rate grows toward the end")
      .def("quadratic");
  end.real("layer_damping", "1/s",
           "open end: damping rate at the end of the layer (default: a wave at the fastest speed is "
           "damped by e^-10 crossing the layer and back)")
      .positive();
}

void declare_drive_keys(io::Schema& schema) {
  io::Section& ant = schema.root().section_list(
      "antennas", "antennas inside the tube: regions where a drive acts (several allowed)");
  ant.string("name", "name of the antenna in the output (default antenna1, antenna2, ...)");
  ant.choice("shape", {"top-hat", "gaussian"}, "spatial shape of the antenna region").def("top-hat");
  ant.real("centre", "m", "centre of the antenna region").require();
  ant.real("width", "m", "full width of the region (top-hat: at half height; gaussian: FWHM)").positive().require();
  ant.real("edge", "m", "top-hat: width of each smooth (cos^2) edge (default width/10)").non_negative();
  ant.real("relaxation_rate", "1/s",
           "velocity and field antennas: rate at which the plasma is pulled to the prescribed value "
           "(default 10 v / W: v the fastest wave speed there, W the integral of the shape)")
      .positive();
  declare_drive_common(ant, true);

  io::Section& out = schema.root().section("output", "what is written to the HDF5 file");
  out.boolean("elsasser", "write the forward/backward Alfven-wave (Elsasser) decomposition at snapshot times")
      .def(true);
  io::Section& reg = out.section_list(
      "regions", "regions whose reflection and transmission of Alfven waves are measured");
  reg.string("name", "name of the region in the output (default region1, ...)");
  reg.real("from", "m", "edge of the region the waves come from (the incident side)").require();
  reg.real("to", "m", "the other edge (the transmitted side)").require();
}

DriveSpec read_drive(const io::RunFile& rf, const std::string& key, bool in_domain) {
  DriveSpec d;
  d.key = key;
  auto k = [&](const std::string& n) { return key + "." + n; };
  std::string amp;
  for (const auto& a : amplitude_keys(in_domain)) {
    if (!rf.given(k(a))) continue;
    if (!amp.empty()) rf.fail(k(a), "give one amplitude only ('" + amp + "' is given too)");
    amp = a;
  }
  const std::string who = in_domain ? "an antenna" : "a driven end";
  if (amp.empty())
    rf.fail(key, who + (in_domain ? " needs velocity_amplitude, field_amplitude, current_density or sheet_current"
                                  : " needs velocity_amplitude or field_amplitude") +
                     " (one amplitude, which also says what is driven)");
  if (amp == "velocity_amplitude") d.quantity = DriveQuantity::velocity;
  if (amp == "field_amplitude") d.quantity = DriveQuantity::field;
  if (amp == "current_density" || amp == "sheet_current") d.quantity = DriveQuantity::current;
  d.signal.amplitude = rf.get_real(k(amp));
  if (amp == "sheet_current") d.sheet_current = d.signal.amplitude;

  const std::string kind = rf.get_string(k("waveform"));
  const auto& allowed = waveform_keys().at(kind);
  for (const auto& [w, keys] : waveform_keys())
    for (const auto& n : keys)
      if (rf.given(k(n)) && std::find(allowed.begin(), allowed.end(), n) == allowed.end())
        rf.fail(k(n), "the " + kind + " waveform does not take '" + n + "'");
  for (const auto& n : waveform_required().at(kind)) {
    if (rf.given(k(n))) continue;
    if (n == "frequency")  // at the drive's section: an absent key has no line of its own
      rf.fail(key, who + " needs a drive frequency: give " + k(n) + " > 0 (" + kind + " waveform)");
    rf.fail(key, "the " + kind + " waveform needs '" + n + "': give " + k(n));
  }
  d.signal.waveform = read_waveform(rf, key, kind, who);
  d.signal.waveform.delayed(rf.get_real(k("delay")));

  const std::string pol = rf.get_string(k("polarization"));
  Polarization& p = d.signal.polarization;
  if (pol == "left" || pol == "right") {
    p.kind = pol == "left" ? Polarization::Kind::left : Polarization::Kind::right;
    if (rf.given(k("angle_deg"))) rf.fail(k("angle_deg"), "only linear polarization takes an angle");
    if (!d.signal.waveform.has_quadrature())
      rf.fail(k("polarization"), "circular polarization needs a waveform with a carrier (a gaussian pulse "
                                 "with a frequency, or a table with a quadrature column)");
  } else {
    p.kind = Polarization::Kind::linear;
    if (pol != "linear" && rf.given(k("angle_deg")))
      rf.fail(k("angle_deg"), "polarization " + pol + " fixes the angle; use polarization: linear");
    const real deg = pol == "y" ? 0.0 : pol == "z" ? 90.0 : rf.get_real(k("angle_deg"));
    p.angle = deg * constants::pi / 180;
  }
  return d;
}

void check_end_keys(const io::RunFile& rf, const EndSpec& end) {
  if (end.kind != "driven")
    for (const auto& n : all_drive_keys())
      if (rf.given(end.key + "." + n))
        rf.fail(end.key + "." + n, "only a driven end takes '" + n + "' (this end is " + end.kind + ")");
  if (end.kind != "open")
    for (const char* n : {"layer_width", "layer_profile", "layer_damping"})
      if (rf.given(end.key + "." + n))
        rf.fail(end.key + "." + n, "only an open end takes '" + std::string(n) + "' (this end is " + end.kind + ")");
}

OpenEndSpec read_open_end(const io::RunFile& rf, const std::string& key) {
  OpenEndSpec o;
  o.layer_width = rf.get_real(key + ".layer_width");
  const std::string prof = rf.get_string(key + ".layer_profile");
  o.layer_power = prof == "linear" ? 1 : prof == "quadratic" ? 2 : 3;
  if (rf.has(key + ".layer_damping")) o.layer_damping = rf.get_real(key + ".layer_damping");
  if (o.layer_width == 0)
    for (const char* n : {"layer_profile", "layer_damping"})
      if (rf.given(key + "." + n)) rf.fail(key + "." + n, "needs an absorbing layer: set layer_width > 0");
  return o;
}

std::vector<AntennaSpec> read_antennas(const io::RunFile& rf, const CaseSetup& c) {
  std::vector<AntennaSpec> out;
  const std::size_t n = rf.count("antennas");
  for (std::size_t i = 0; i < n; ++i) {
    const std::string key = "antennas[" + std::to_string(i) + "]";
    AntennaSpec a;
    a.name = rf.has(key + ".name") ? rf.get_string(key + ".name") : "antenna" + std::to_string(i + 1);
    if (a.name.empty() || a.name.find('/') != std::string::npos)
      rf.fail(key + ".name", "an antenna name must be non-empty and contain no '/'");
    for (const auto& b : out)
      if (b.name == a.name) rf.fail(key + ".name", "two antennas are named '" + a.name + "'");
    a.shape.kind = rf.get_string(key + ".shape") == "gaussian" ? AntennaShape::Kind::gaussian
                                                               : AntennaShape::Kind::top_hat;
    a.shape.centre = rf.get_real(key + ".centre");
    a.shape.width = rf.get_real(key + ".width");
    if (a.shape.kind == AntennaShape::Kind::gaussian && rf.given(key + ".edge"))
      rf.fail(key + ".edge", "only the top-hat shape has edges");
    a.shape.edge = rf.has(key + ".edge") ? rf.get_real(key + ".edge") : 0.1 * a.shape.width;
    if (a.shape.centre < c.grid.x_min || a.shape.centre > c.grid.x_max())
      rf.fail(key + ".centre", "the antenna centre x = " + fmt(a.shape.centre) + " m is outside the tube [" +
                                   fmt(c.grid.x_min) + ", " + fmt(c.grid.x_max()) + "] m");
    if (AntennaCells::sample(a.shape, c.grid).weight.empty())
      rf.fail(key + ".width", "the antenna covers no cell centre; make it wider than a cell (" +
                                  fmt(c.grid.dx()) + " m)");
    a.drive = read_drive(rf, key, true);
    if (a.drive.quantity == DriveQuantity::current) {
      if (rf.given(key + ".relaxation_rate"))
        rf.fail(key + ".relaxation_rate", "a current antenna has no relaxation rate");
    } else if (rf.has(key + ".relaxation_rate")) {
      a.relaxation_rate = rf.get_real(key + ".relaxation_rate");
    }
    out.push_back(std::move(a));
  }
  return out;
}

std::vector<RegionSpec> read_regions(const io::RunFile& rf, const CaseSetup& c) {
  std::vector<RegionSpec> out;
  const std::size_t n = rf.count("output.regions");
  for (std::size_t i = 0; i < n; ++i) {
    const std::string key = "output.regions[" + std::to_string(i) + "]";
    RegionSpec r;
    r.name = rf.has(key + ".name") ? rf.get_string(key + ".name") : "region" + std::to_string(i + 1);
    for (const auto& o : out)
      if (o.name == r.name) rf.fail(key + ".name", "two regions are named '" + r.name + "'");
    r.from = rf.get_real(key + ".from");
    r.to = rf.get_real(key + ".to");
    for (const char* e : {"from", "to"}) {
      const real x = rf.get_real(key + "." + e);
      if (x < c.grid.x_min || x > c.grid.x_max())
        rf.fail(key + "." + e, "x = " + fmt(x) + " m is outside the tube [" + fmt(c.grid.x_min) + ", " +
                                   fmt(c.grid.x_max()) + "] m");
    }
    if (r.from == r.to) rf.fail(key + ".to", "a region needs from != to");
    out.push_back(r);
  }
  return out;
}

}  // namespace tw
