#include "sim/profiles.hpp"

#include <algorithm>
#include <cmath>
#include <map>
#include <memory>
#include <sstream>

#include "io/table.hpp"

namespace tw {

namespace {

const std::vector<std::string>& shape_names() {
  static const std::vector<std::string> n{"uniform", "linear", "tanh", "exponential", "gaussian", "table"};
  return n;
}

/// The keys each shape takes (besides `shape`).
const std::map<std::string, std::vector<std::string>>& shape_keys() {
  static const std::map<std::string, std::vector<std::string>> k{
      {"uniform", {"value"}},
      {"linear", {"left", "right"}},
      {"tanh", {"left", "right", "centre", "width"}},
      {"exponential", {"value", "centre", "scale_length"}},
      {"gaussian", {"background", "peak", "centre", "width"}},
      {"table", {"file"}},
  };
  return k;
}

std::shared_ptr<io::Section> profile_section(const std::string& unit, const std::string& doc) {
  auto s = std::make_shared<io::Section>(doc + ", as a profile along x");
  s->choice("shape", shape_names(),
            "profile shape: uniform, linear, tanh step, exponential, gaussian bump or well, or a CSV table")
      .require();
  s->real("value", unit, "uniform: the value; exponential: the value at centre");
  s->real("left", unit, "linear: value at x_min; tanh: value far left of centre");
  s->real("right", unit, "linear: value at x_max; tanh: value far right of centre");
  s->real("centre", "m", "tanh, exponential, gaussian: reference position (default: middle of the tube)");
  s->real("width", "m", "tanh: width of the step (tanh((x - centre)/width)); gaussian: full width at half maximum")
      .positive();
  s->real("scale_length", "m", "exponential: e-folding length (negative: decaying along +x)");
  s->real("background", unit, "gaussian: value far from centre");
  s->real("peak", unit, "gaussian: value at centre (below background for a well)");
  s->string("file", "table: CSV file with columns x, n, T_e, T_i (relative to the run file's folder)");
  return s;
}

std::string fmt(real v) {
  std::ostringstream o;
  o << v;
  return o.str();
}

}  // namespace

io::KeySpec& declare_profile_key(io::Section& parent, const std::string& name, const std::string& unit,
                                 const std::string& doc) {
  return parent.real_or_section(name, unit, doc + " (a number, or a profile along x: see the map keys)",
                                profile_section(unit, doc));
}

Profile read_profile(const io::RunFile& rf, const std::string& key, const Grid& grid,
                     const std::string& table_column, ProfileSign sign) {
  Profile p;
  if (!rf.is_section(key)) {
    p = Profile::constant(rf.get_real(key));
  } else {
    const std::string shape = rf.get_string(key + ".shape");
    const auto& allowed = shape_keys().at(shape);
    for (const auto& [s, keys] : shape_keys())
      for (const auto& k : keys)
        if (rf.given(key + "." + k) && std::find(allowed.begin(), allowed.end(), k) == allowed.end())
          rf.fail(key + "." + k, "the " + shape + " shape does not take '" + k + "'");
    for (const auto& k : allowed)
      if (k != "centre" && !rf.given(key + "." + k))
        rf.fail(key, "the " + shape + " shape needs '" + k + "'");
    auto get = [&](const char* k) { return rf.get_real(key + "." + k); };
    const real centre = rf.given(key + ".centre") ? get("centre") : grid.x_min + 0.5 * grid.length;
    std::ostringstream d;
    d << shape;
    if (shape == "uniform") {
      p = Profile::constant(get("value"));
    } else if (shape == "linear") {
      const real a = get("left"), b = get("right"), x0 = grid.x_min, len = grid.length;
      p.f = [=](real x) { return a + (b - a) * (x - x0) / len; };
      d << " from " << a << " at x_min to " << b << " at x_max";
    } else if (shape == "tanh") {
      const real a = get("left"), b = get("right"), w = get("width");
      p.f = [=](real x) { return a + (b - a) * 0.5 * (1 + std::tanh((x - centre) / w)); };
      d << " step from " << a << " to " << b << " at x = " << centre << " m, width " << w << " m";
    } else if (shape == "exponential") {
      const real v = get("value"), l = get("scale_length");
      if (l == 0) rf.fail(key + ".scale_length", "must not be zero");
      p.f = [=](real x) { return v * std::exp((x - centre) / l); };
      d << ": " << v << " at x = " << centre << " m, scale length " << l << " m";
    } else if (shape == "gaussian") {
      const real bg = get("background"), pk = get("peak"), w = get("width");
      const real c4 = 4 * std::log(2.0) / (w * w);
      p.f = [=](real x) { return bg + (pk - bg) * std::exp(-c4 * (x - centre) * (x - centre)); };
      d << (pk >= bg ? " bump" : " well") << ": " << bg << " with " << pk << " at x = " << centre
        << " m, full width at half maximum " << w << " m";
    } else {  // table
      const std::string file = io::path_beside(rf.source_name(), rf.get_string(key + ".file"));
      const io::CsvTable t = io::CsvTable::read(file, key + ".file");
      (void)t.column("x");
      for (const char* c : {"n", "T_e", "T_i"}) (void)t.column(c);
      t.require_rows(2);
      t.require_increasing("x");
      t.require_non_negative("n", true);
      t.require_non_negative("T_e");
      t.require_non_negative("T_i");
      const auto& xs = t.column("x");
      const real tol = 1e-9 * grid.length;
      if (xs.front() > grid.x_min + tol || xs.back() < grid.x_max() - tol)
        t.fail_header("the table covers x from " + fmt(xs.front()) + " to " + fmt(xs.back()) +
                      " m, but the tube runs from " + fmt(grid.x_min) + " to " + fmt(grid.x_max()) +
                      " m (no extrapolation)");
      auto xv = std::make_shared<const std::vector<real>>(xs);
      auto yv = std::make_shared<const std::vector<real>>(t.column(table_column));
      p.f = [xv, yv](real x) { return io::interpolate(*xv, *yv, x); };
      d << " " << file << " (column " << table_column << ", " << t.rows() << " rows)";
    }
    if (shape != "uniform") {
      p.description = d.str();
      p.uniform = false;
    }
  }
  for (int i = 0; i < grid.n_cells; ++i) {
    const real x = grid.x_centre(i);
    const real v = p(x);
    const bool ok = std::isfinite(v) && (sign == ProfileSign::positive ? v > 0 : v >= 0);
    if (!ok)
      rf.fail(key, "the profile must be " + std::string(sign == ProfileSign::positive ? "> 0" : ">= 0") +
                       " along the whole tube; at x = " + fmt(x) + " m it is " + fmt(v));
  }
  return p;
}

}  // namespace tw
