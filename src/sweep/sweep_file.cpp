#include "sweep/sweep_file.hpp"

#include <cctype>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <map>
#include <set>

#include "core/error.hpp"
#include "sim/run.hpp"
#include "sweep/predict.hpp"

namespace tw::sweep {

namespace fs = std::filesystem;

namespace {

io::Schema build_schema() {
  io::Schema s;
  io::Section& r = s.root();
  r.string("title", "one line describing the sweep, stored in the summary").def("");
  r.string("base", "the run file every case starts from (relative to the sweep file's folder)").require();
  r.string("output_dir",
           "folder for the case files and the summary, relative to the sweep file's folder (default: the "
           "sweep file's name without its extension, next to it)")
      .def("");
  r.choice("combine", {"grid", "zip"},
           "how the parameters' values combine: every combination, the first parameter varying slowest "
           "(grid), or the i-th value of each for case i (zip: lists of equal length)")
      .def("grid");
  r.text_list("set", "run-file overrides for every case, as for --set (KEY=VALUE), applied before the parameters")
      .def_words({});

  io::Section& p = r.section_list(
      "parameters", "the run-file keys to vary, each with exactly one of values, words, linear and log");
  p.string("key", "run-file key path, as for --set (e.g. boundaries.left.frequency, output.probes[0])").require();
  p.string("label", "column name in the summary (default: the key)").def("");
  p.real_list("values", "", "explicit numbers, in the run-file key's unit");
  p.text_list("words", "explicit words: choices, booleans or text (passed to --set as written)");
  io::Section& lin = p.section("linear",
                               "evenly spaced numbers from `from` to `to`, both included (rounded to 12 significant "
                               "digits; to whole numbers for whole-number keys)");
  lin.real("from", "", "first value");
  lin.real("to", "", "last value");
  lin.integer("count", "number of values").at_least(2.0);
  io::Section& lg = p.section(
      "log",
      "numbers evenly spaced in the logarithm from `from` to `to`, both included (rounded to 12 significant digits; "
      "to whole numbers for whole-number keys)");
  lg.real("from", "", "first value").positive();
  lg.real("to", "", "last value").positive();
  lg.integer("count", "number of values").at_least(2.0);
  p.string("group",
           "combine: grid only: parameters with the same group name are zipped into one axis of the grid "
           "(equal lengths)")
      .def("");

  io::Section& m = r.section_list("measure", "figures `tubewave measure` collects from each case");
  m.string("field", "the field measured, e.g. velocity_y (a complex NAME_re/NAME_im pair as NAME)").require();
  m.text_list("quantities", "the figures collected into the summary", wave_quantities())
      .def_words({"frequency", "wavelength", "phase_speed"});
  m.real("frequency", "Hz", "measure the component at this frequency (default: the drive's, else the spectral peak)")
      .positive();
  m.real("t_min", "s", "ignore samples before this time");
  m.real("t_max", "s", "ignore samples after this time");
  m.real("x_min", "m", "ignore cells and probes below this position");
  m.real("x_max", "m", "ignore cells and probes above this position");

  io::Section& pr = r.section_list("predict", "analytic predictions put beside the measurements");
  pr.string("formula",
            "prediction source: mhd-fast, mhd-alfven, mhd-slow, mhd-alfven-resistive, hall-right, hall-left "
            "(the closed forms of scripts-post/twdispersion.py), or modes:N (forward branch N of tubewave modes)")
      .require();
  pr.choice("given", {"auto", "frequency", "wavenumber"},
            "evaluate at a frequency (a driven run: the drive's, or `frequency`) or at a wavenumber (an "
            "initial-value run: 2 pi / `wavelength`, initial.wavelength or the tube length); auto: frequency "
            "when the case has a drive frequency or `frequency` is given")
      .def("auto");
  pr.real("frequency", "Hz", "frequency to evaluate at (default: the drive frequency)").positive();
  pr.real("wavelength", "m", "wavelength to evaluate at (default: initial.wavelength, else the tube length)")
      .positive();
  pr.text_list("quantities", "the predicted figures put into the summary", wave_quantities())
      .def_words({"wavelength", "phase_speed"});
  return s;
}

/// Shortest text that reads back as the same double ("1e+18", "0.8", "200").
std::string format_number(real v) {
  char buf[64];
  const auto res = std::to_chars(buf, buf + sizeof buf, v);
  return std::string(buf, res.ptr);
}

std::string format_significant(real v, int digits) {
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.*g", digits, v);
  return buf;
}

std::string yaml_quoted(const std::string& s) {
  std::string r = "\"";
  for (char c : s) {
    if (c == '"' || c == '\\') r += '\\';
    r += c;
  }
  return r + "\"";
}

std::string trimmed(std::string s) {
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.back()))) s.pop_back();
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.front()))) s.erase(0, 1);
  return s;
}

std::string resolve_path(const std::string& dir, const std::string& p) {
  if (p.empty() || fs::path(p).is_absolute()) return p;
  return (fs::path(dir) / p).lexically_normal().string();
}

/// A run-file error without its position: "run-file key 'K': REASON".
std::string reason_of(const io::ConfigError& e) {
  const std::string prefix = e.pos().str() + ": ";
  const std::string w = e.what();
  std::string r = w.compare(0, prefix.size(), prefix) == 0 ? w.substr(prefix.size()) : w;
  return r.compare(0, 4, "key ") == 0 ? "run-file " + r : r;
}

void read_parameter(const io::RunFile& rf, std::size_t j, Parameter& p) {
  const std::string at = "parameters[" + std::to_string(j) + "]";
  p.path = at;
  p.key = rf.get_string(at + ".key");
  std::string why;
  const io::KeySpec* spec = io::declared_key(run_schema(), p.key, &why);
  if (spec == nullptr) rf.fail(at + ".key", "'" + p.key + "' is not a run-file key: " + why);
  const bool indexed = p.key.back() == ']';
  using io::KeyType;
  const KeyType t = spec->type;
  if (t == KeyType::section || t == KeyType::section_list)
    rf.fail(at + ".key", "'" + p.key + "' is a section; vary one of its keys");
  p.unit = spec->unit;
  p.label = rf.get_string(at + ".label");
  if (p.label.empty()) p.label = p.key;
  if (p.label.find('/') != std::string::npos)
    rf.fail(at + ".label", "a column name may not contain '/' (got '" + p.label + "')");
  p.group = rf.get_string(at + ".group");

  std::vector<std::string> given;
  for (const char* k : {"values", "words", "linear", "log"})
    if (rf.given(at + "." + k)) given.push_back(k);
  if (given.empty()) rf.fail(at, "give the values of '" + p.key + "': one of values, words, linear or log");
  if (given.size() > 1)
    rf.fail(at + "." + given[1], "give only one of values, words, linear and log (" + given[0] + " is given too)");
  const std::string how = given[0];
  const bool numeric_key = t == KeyType::real || t == KeyType::integer || t == KeyType::real_or_section ||
                           (indexed && t == KeyType::real_list);
  p.numeric = how != "words";
  if (p.numeric && !numeric_key)
    rf.fail(at + "." + how, "'" + p.key + "' is not a number: give its values as words");
  p.quote_words = t == KeyType::string;
  const bool integer_key = t == KeyType::integer;

  if (how == "values") {
    p.numbers = rf.get_reals(at + ".values");
    if (p.numbers.empty()) rf.fail(at + ".values", "the list is empty");
    for (std::size_t i = 0; i < p.numbers.size(); ++i) p.value_paths.push_back(at + ".values[" + std::to_string(i) + "]");
  } else if (how == "words") {
    p.words = rf.get_strings(at + ".words");
    if (p.words.empty()) rf.fail(at + ".words", "the list is empty");
    for (std::size_t i = 0; i < p.words.size(); ++i) p.value_paths.push_back(at + ".words[" + std::to_string(i) + "]");
  } else {
    const std::string sec = at + "." + how;
    for (const char* k : {"from", "to", "count"})
      if (!rf.has(sec + "." + k)) rf.fail(sec, std::string("missing '") + k + "' (" + how + " needs from, to and count)");
    const real from = rf.get_real(sec + ".from"), to = rf.get_real(sec + ".to");
    const long n = rf.get_int(sec + ".count");
    if (static_cast<std::size_t>(n) > max_cases) rf.fail(sec + ".count", "is larger than " + std::to_string(max_cases));
    for (long i = 0; i < n; ++i) {
      const real f = static_cast<real>(i) / static_cast<real>(n - 1);
      real v = how == "linear" ? from + (to - from) * f : from * std::pow(10.0, f * std::log10(to / from));
      // 12 significant digits: 1e19, not 9999999999999997952, in overrides and tables.
      v = std::strtod(format_significant(v, 12).c_str(), nullptr);
      if (i == 0) v = from;
      if (i == n - 1) v = to;  // the ends exactly as written
      // A whole-number key (grid.cells) takes the nearest whole number of a range.
      if (integer_key) {
        v = std::round(v);
        if (!p.numbers.empty() && v == p.numbers.back())
          rf.fail(sec, "gives " + format_number(v) + " twice for the whole-number key '" + p.key +
                           "': use fewer values or a wider range");
      }
      p.numbers.push_back(v);
      p.value_paths.push_back(sec);
    }
  }
}

/// Indices of the grid axes: parameters grouped by `group` (an ungrouped one alone).
std::vector<std::vector<std::size_t>> grid_axes(const io::RunFile& rf, const std::vector<Parameter>& ps) {
  std::vector<std::vector<std::size_t>> axes;
  std::map<std::string, std::size_t> axis_of_group;
  for (std::size_t j = 0; j < ps.size(); ++j) {
    if (ps[j].group.empty()) {
      axes.push_back({j});
      continue;
    }
    const auto [it, fresh] = axis_of_group.emplace(ps[j].group, axes.size());
    if (fresh) {
      axes.push_back({j});
      continue;
    }
    const Parameter& first = ps[axes[it->second].front()];
    if (first.size() != ps[j].size())
      rf.fail(ps[j].path + ".group", "group '" + ps[j].group + "' zips parameters of equal length: '" + ps[j].key +
                                         "' has " + std::to_string(ps[j].size()) + " values, '" + first.key + "' has " +
                                         std::to_string(first.size()));
    axes[it->second].push_back(j);
  }
  return axes;
}

void expand(Sweep& s) {
  const io::RunFile& rf = s.file;
  const auto& ps = s.parameters;
  std::vector<std::vector<std::size_t>> axes;
  if (s.combine == "zip") {
    for (std::size_t j = 0; j < ps.size(); ++j) {
      if (!ps[j].group.empty()) rf.fail(ps[j].path + ".group", "combine: zip zips every parameter; group applies to combine: grid");
      if (ps[j].size() != ps[0].size())
        rf.fail(ps[j].path, "combine: zip needs lists of equal length: '" + ps[j].key + "' has " +
                                std::to_string(ps[j].size()) + " values, '" + ps[0].key + "' has " +
                                std::to_string(ps[0].size()));
    }
    axes.emplace_back();
    for (std::size_t j = 0; j < ps.size(); ++j) axes.back().push_back(j);
  } else {
    axes = grid_axes(rf, ps);
  }
  std::size_t n = 1;
  for (const auto& a : axes) {
    const std::size_t len = ps[a.front()].size();
    if (n > max_cases / len)
      rf.fail("parameters", "the grid has more than " + std::to_string(max_cases) + " cases");
    n *= len;
  }
  const std::size_t width = std::max<std::size_t>(2, std::to_string(n - 1).size());
  for (std::size_t i = 0; i < n; ++i) {
    Case c;
    c.index = i;
    std::string num = std::to_string(i);
    c.id = "case-" + std::string(width - num.size(), '0') + num;
    c.value_index.assign(ps.size(), 0);
    std::size_t rest = i;
    for (std::size_t a = axes.size(); a-- > 0;) {  // the last axis varies fastest
      const std::size_t len = ps[axes[a].front()].size();
      for (std::size_t j : axes[a]) c.value_index[j] = rest % len;
      rest /= len;
    }
    c.overrides = s.overrides;
    for (std::size_t j = 0; j < ps.size(); ++j) c.overrides.push_back(ps[j].key + "=" + ps[j].yaml_value(c.value_index[j]));
    s.cases.push_back(std::move(c));
  }
}

}  // namespace

const io::Schema& sweep_schema() {
  static const io::Schema s = build_schema();
  return s;
}

std::string Parameter::yaml_value(std::size_t i) const {
  if (numeric) return format_number(numbers.at(i));
  return quote_words ? yaml_quoted(words.at(i)) : words.at(i);
}

std::string Parameter::text(std::size_t i) const { return numeric ? format_number(numbers.at(i)) : words.at(i); }

std::string Case::describe(const std::vector<Parameter>& params) const {
  std::string r;
  for (std::size_t j = 0; j < params.size(); ++j)
    r += (j ? ", " : "") + params[j].label + "=" + params[j].text(value_index[j]);
  return r;
}

std::string Sweep::cases_dir() const { return (fs::path(output_dir) / "cases").string(); }
std::string Sweep::case_file(const Case& c) const { return (fs::path(output_dir) / "cases" / (c.id + ".h5")).string(); }
std::string Sweep::summary_csv() const { return (fs::path(output_dir) / "summary.csv").string(); }
std::string Sweep::summary_h5() const { return (fs::path(output_dir) / "summary.h5").string(); }

std::string Sweep::results_key() const {
  auto opt = [](const char* name, const std::optional<real>& v) {
    return v ? std::string(" ") + name + "=" + format_number(*v) : std::string();
  };
  std::string k;
  for (const auto& m : measure) {
    k += "measure " + m.field + ":";
    for (const auto& q : m.quantities) k += " " + q;
    k += opt("frequency", m.frequency) + opt("t_min", m.t_min) + opt("t_max", m.t_max) + opt("x_min", m.x_min) +
         opt("x_max", m.x_max) + "\n";
  }
  for (const auto& p : predict) {
    k += "predict " + p.formula + " given " + p.given + ":";
    for (const auto& q : p.quantities) k += " " + q;
    k += opt("frequency", p.frequency) + opt("wavelength", p.wavelength) + "\n";
  }
  return k;
}

void Sweep::fail_case(const Case& c, const io::ConfigError& e) const {
  const std::string what = "case " + c.id + " (" + c.describe(parameters) + ")";
  // An error of one parameter's override is reported at that value in the sweep file.
  const std::string& origin = e.pos().origin;
  for (std::size_t i = 0; i < overrides.size(); ++i) {
    if (origin != "--set " + overrides[i]) continue;
    if (i < n_fixed) file.fail("set[" + std::to_string(i) + "]", "'" + overrides[i] + "': " + reason_of(e));
    throw e;  // an override from the command line: the message names it
  }
  for (std::size_t j = 0; j < parameters.size(); ++j) {
    const Parameter& p = parameters[j];
    const std::string set = p.key + "=" + p.yaml_value(c.value_index[j]);
    if (origin == "--set " + set)
      file.fail(p.value_paths[c.value_index[j]], what + " sets " + set + ": " + reason_of(e));
  }
  file.fail("base", what + ": " + e.what());
}

Sweep load_sweep(const std::string& path, const LoadOptions& options) {
  Sweep s{io::RunFile::load(path, sweep_schema()), path, {}, {}, {}, {}, {}, {}, {}, {}, 0, {}};
  const io::RunFile& rf = s.file;
  const std::string dir = fs::path(path).parent_path().string();
  s.title = rf.get_string("title");
  s.base = resolve_path(dir, rf.get_string("base"));
  if (s.base.empty()) rf.fail("base", "name the base run file");
  std::error_code ec;
  if (!fs::is_regular_file(s.base, ec)) rf.fail("base", "the run file '" + s.base + "' does not exist");
  if (!options.output_dir.empty()) {
    s.output_dir = options.output_dir;
  } else {
    const std::string od = rf.get_string("output_dir");
    s.output_dir = od.empty() ? (fs::path(dir) / fs::path(path).stem()).lexically_normal().string()
                              : resolve_path(dir, od);
  }
  if (fs::exists(s.output_dir, ec) && !fs::is_directory(s.output_dir, ec))
    rf.fail("output_dir", "'" + s.output_dir + "' exists and is not a folder");
  s.combine = rf.get_string("combine");
  const std::vector<std::string> fixed = rf.get_strings("set");
  for (std::size_t i = 0; i < fixed.size(); ++i)
    if (fixed[i].find('=') == std::string::npos)
      rf.fail("set[" + std::to_string(i) + "]", "expected KEY=VALUE, e.g. numerics.flux=hll (got '" + fixed[i] + "')");
  s.overrides = fixed;
  s.n_fixed = fixed.size();
  s.overrides.insert(s.overrides.end(), options.overrides.begin(), options.overrides.end());

  const std::size_t np = rf.count("parameters");
  if (np == 0) rf.fail("parameters", "list at least one run-file key to vary");
  std::map<std::string, std::string> seen_key, seen_label;
  for (std::size_t j = 0; j < np; ++j) {
    Parameter p;
    read_parameter(rf, j, p);
    if (const auto it = seen_key.find(p.key); it != seen_key.end())
      rf.fail(p.path + ".key", "'" + p.key + "' is varied twice (also by " + it->second + ")");
    if (const auto it = seen_label.find(p.label); it != seen_label.end())
      rf.fail(p.path + ".label", "the column name '" + p.label + "' is used twice (also by " + it->second + ")");
    seen_key[p.key] = p.path;
    seen_label[p.label] = p.path;
    for (std::size_t i = 0; i < fixed.size(); ++i)
      if (trimmed(fixed[i].substr(0, fixed[i].find('='))) == p.key)
        rf.fail("set[" + std::to_string(i) + "]", "'" + p.key + "' is varied by " + p.path + "; it cannot be set too");
    for (const auto& o : options.overrides)
      if (trimmed(o.substr(0, o.find('='))) == p.key)
        throw io::ConfigError(io::SourcePos{path, 0, 0, "--set " + o}, p.key,
                              "is varied by the sweep (" + p.path + "); --set cannot fix it");
    s.parameters.push_back(std::move(p));
  }

  std::set<std::string> fields;
  for (std::size_t i = 0; i < rf.count("measure"); ++i) {
    const std::string at = "measure[" + std::to_string(i) + "]";
    Measurement m;
    m.field = rf.get_string(at + ".field");
    if (m.field.empty() || m.field.find('/') != std::string::npos)
      rf.fail(at + ".field", "must be a field name such as velocity_y (got '" + m.field + "')");
    if (!fields.insert(m.field).second) rf.fail(at + ".field", "field '" + m.field + "' is measured twice");
    m.quantities = rf.get_strings(at + ".quantities");
    if (m.quantities.empty()) rf.fail(at + ".quantities", "the list is empty");
    auto opt = [&](const char* k) { return rf.has(at + "." + k) ? std::optional<real>(rf.get_real(at + "." + k)) : std::nullopt; };
    m.frequency = opt("frequency");
    m.t_min = opt("t_min");
    m.t_max = opt("t_max");
    m.x_min = opt("x_min");
    m.x_max = opt("x_max");
    if (m.t_min && m.t_max && !(*m.t_min < *m.t_max)) rf.fail(at + ".t_max", "the time window is empty (t_max <= t_min)");
    if (m.x_min && m.x_max && !(*m.x_min < *m.x_max)) rf.fail(at + ".x_max", "the window along x is empty (x_max <= x_min)");
    s.measure.push_back(std::move(m));
  }
  std::set<std::string> formulas;
  for (std::size_t i = 0; i < rf.count("predict"); ++i) {
    const std::string at = "predict[" + std::to_string(i) + "]";
    Prediction p;
    p.formula = rf.get_string(at + ".formula");
    if (find_prediction_source(p.formula) == nullptr) {
      std::string known;
      for (const auto& src : prediction_sources()) known += (known.empty() ? "" : ", ") + src.id;
      rf.fail(at + ".formula", "unknown prediction source '" + p.formula + "'; known: " + known);
    }
    if (!formulas.insert(p.formula).second) rf.fail(at + ".formula", "'" + p.formula + "' is named twice");
    p.given = rf.get_string(at + ".given");
    if (rf.has(at + ".frequency")) p.frequency = rf.get_real(at + ".frequency");
    if (rf.has(at + ".wavelength")) p.wavelength = rf.get_real(at + ".wavelength");
    if (p.given == "frequency" && p.wavelength) rf.fail(at + ".wavelength", "given: frequency takes no wavelength");
    if (p.given == "wavenumber" && p.frequency) rf.fail(at + ".frequency", "given: wavenumber takes no frequency");
    p.quantities = rf.get_strings(at + ".quantities");
    if (p.quantities.empty()) rf.fail(at + ".quantities", "the list is empty");
    s.predict.push_back(std::move(p));
  }
  expand(s);
  return s;
}

}  // namespace tw::sweep
