#include "diagnostics/run_measure.hpp"

#include <algorithm>
#include <cmath>
#include <ctime>
#include <array>

#include "core/error.hpp"
#include "core/time_stamp.hpp"
#include "io/h5update.hpp"
#include "tubewave/version.hpp"

namespace tw::diag {

namespace {

bool ends_with(const std::string& s, const std::string& tail) {
  return s.size() >= tail.size() && s.compare(s.size() - tail.size(), tail.size(), tail) == 0;
}

std::vector<std::string> raw_fields(const io::H5Reader& r) {
  std::vector<std::string> out;
  if (!r.is_group("/snapshots")) return out;
  for (const auto& n : r.members("/snapshots"))
    if (n != "time" && n != "step") out.push_back(n);
  return out;
}

bool contains(const std::vector<std::string>& v, const std::string& s) {
  return std::find(v.begin(), v.end(), s) != v.end();
}

/// Levenshtein distance, for "did you mean" suggestions.
std::size_t distance(const std::string& a, const std::string& b) {
  std::vector<std::size_t> prev(b.size() + 1), cur(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) prev[j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i) {
    cur[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j)
      cur[j] = std::min({prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + (a[i - 1] == b[j - 1] ? 0 : 1)});
    std::swap(prev, cur);
  }
  return prev[b.size()];
}

/// Read /GROUP/NAME (or the NAME_re/NAME_im pair) as complex values; `dims` gets [rows, cols].
std::vector<cplx> read_complex(const io::H5Reader& r, const std::string& group, const std::string& name,
                               bool is_complex, std::vector<hsize_t>& dims) {
  std::vector<cplx> out;
  if (!is_complex) {
    const auto v = r.read_real(group + "/" + name, &dims);
    out.reserve(v.size());
    for (real q : v) out.emplace_back(q, 0);
    return out;
  }
  std::vector<hsize_t> dims_im;
  const auto re = r.read_real(group + "/" + name + "_re", &dims);
  const auto im = r.read_real(group + "/" + name + "_im", &dims_im);
  if (dims != dims_im)
    throw InputError("'" + group + "/" + name + "_re' and '_im' in file '" + r.file_name() + "' differ in shape");
  out.reserve(re.size());
  for (std::size_t i = 0; i < re.size(); ++i) out.emplace_back(re[i], im[i]);
  return out;
}

}  // namespace

std::vector<std::string> field_names(const io::H5Reader& r) {
  const auto raw = raw_fields(r);
  std::vector<std::string> out;
  for (const auto& n : raw) {
    if (ends_with(n, "_re") && contains(raw, n.substr(0, n.size() - 3) + "_im")) {
      out.push_back(n.substr(0, n.size() - 3));
      continue;
    }
    if (ends_with(n, "_im") && contains(raw, n.substr(0, n.size() - 3) + "_re")) continue;
    out.push_back(n);
  }
  return out;
}

std::string default_field(const io::H5Reader& r) {
  const auto raw = raw_fields(r);
  std::string best;
  real best_ratio = -1;
  for (const auto& name : field_names(r)) {
    const bool cx = !contains(raw, name);
    std::vector<hsize_t> dims;
    const auto v = read_complex(r, "/snapshots", name, cx, dims);
    if (v.empty()) continue;
    cplx mean(0, 0);
    for (const auto& q : v) mean += q;
    mean /= static_cast<real>(v.size());
    real var = 0;
    for (const auto& q : v) var += std::norm(q - mean);
    var /= static_cast<real>(v.size());
    const real denom = std::sqrt(std::norm(mean) + var);
    if (!(denom > 0)) continue;
    const real ratio = std::sqrt(var) / denom;
    if (ratio > best_ratio * (1 + 1e-9)) {
      best_ratio = ratio;
      best = name;
    }
  }
  if (best.empty()) throw InputError("'" + r.file_name() + "' has no field that varies: name one with --field");
  return best;
}

WaveData load_wave_data(const io::H5Reader& r, const std::string& field, const RunLayout& layout) {
  const auto raw = raw_fields(r);
  const bool is_real = contains(raw, field);
  const bool is_complex = !is_real && contains(raw, field + "_re") && contains(raw, field + "_im");
  if (!is_real && !is_complex) {
    const auto names = field_names(r);
    std::string list, near;
    std::size_t best = 3;
    for (const auto& n : names) {
      list += (list.empty() ? "" : ", ") + n;
      const std::size_t dd = distance(field, n);
      if (dd < best) {
        best = dd;
        near = n;
      }
    }
    throw InputError("no field '" + field + "' in '" + r.file_name() + "'" +
                     (near.empty() ? std::string() : " (did you mean '" + near + "'?)") + "; fields: " + list);
  }
  WaveData d;
  d.field = field;
  const std::string units_of = "/snapshots/" + (is_complex ? field + "_re" : field);
  d.field_units = r.has_attribute(units_of, "units") ? r.attr_string(units_of, "units") : "";
  if (r.has_attribute("/snapshots/time", "units")) d.time_units = r.attr_string("/snapshots/time", "units");
  if (r.has_attribute("/grid/x", "units")) d.length_units = r.attr_string("/grid/x", "units");
  if (layout.normalized) d.time_units = d.length_units = "1";
  d.x = r.read_real("/grid/x");

  std::vector<hsize_t> dims;
  d.snapshots.t = r.read_real("/snapshots/time");
  d.snapshots.values = read_complex(r, "/snapshots", field, is_complex, dims);
  if (dims.size() != 2 || dims[0] != d.snapshots.t.size() || dims[1] != d.x.size())
    throw InputError("'/snapshots/" + field + "' in '" + r.file_name() + "' is not [snapshots, cells]");
  d.snapshots.n_series = d.x.size();
  d.snapshots.real_valued = !is_complex;

  const std::string probe_name = is_complex ? field + "_re" : field;
  if (r.is_group("/probes") && r.exists("/probes/" + probe_name)) {
    d.probes.t = r.read_real("/probes/time");
    d.probes.values = read_complex(r, "/probes", field, is_complex, dims);
    if (dims.size() != 2 || dims[0] != d.probes.t.size())
      throw InputError("'/probes/" + field + "' in '" + r.file_name() + "' is not [samples, probes]");
    d.probes.n_series = dims[1];
    d.probes.real_valued = !is_complex;
    if (layout.probe_x.size() == d.probes.n_series) d.probe_x = layout.probe_x;
  }
  d.periodic = layout.periodic;
  d.drive_frequency = layout.drive_frequency;
  return d;
}

void store_measurement(const std::string& path, const WaveMeasurement& m, const std::string& window) {
  io::replace_group(path, "/measurements/" + m.field, [&](io::GroupWriter& g) { fill_measurement(g, m, window); });
}

void fill_measurement(io::GroupWriter& g, const WaveMeasurement& m, const std::string& window) {
  {
    g.attribute("", "field", m.field);
    g.attribute("", "complex", std::string(m.complex_field ? "yes" : "no"));
    g.attribute("", "created", utc_now_iso8601());
    g.attribute("", "tubewave_version", std::string(build::version) + " (git " + build::git_revision + ")");
    g.attribute("", "window", window);
    std::string notes;
    for (const auto& n : m.notes) notes += (notes.empty() ? "" : "\n") + n;
    g.attribute("", "notes", notes);
    for (const Figure& f : m.figures) {
      g.scalar(f.name, f.value, f.units, f.description);
      g.attribute(f.name, "uncertainty", f.uncertainty);
      g.attribute(f.name, "method", f.method);
    }
    const std::string& lu = m.figures.empty() ? std::string("m") : m.figure("wavelength").units;
    const std::string& ku = m.figures.empty() ? std::string("rad/m") : m.figure("wavenumber").units;
    const std::string& wu = m.figures.empty() ? std::string("rad/s") : m.figure("angular_frequency").units;
    const std::string tu = lu == "1" ? "1" : "s";
    if (!m.profile.x.empty()) {
      io::GroupWriter p = g.subgroup("profile");
      p.vector("x", m.profile.x, lu, "cell centres");
      p.vector("amplitude", m.profile.amplitude, m.field_units, "amplitude of the measured component (real amplitude for a real field)");
      p.vector("phase", m.profile.phase, "rad", "phase of the exp(-i omega t) component, unwrapped over the fitted cells");
      std::vector<real> used(m.profile.used.begin(), m.profile.used.end());
      p.vector("used", used, "1", "1 for the cells the wavenumber and decay were fitted to");
      p.attribute("", "t_start", m.profile.t_start);
      p.attribute("", "t_end", m.profile.t_end);
    }
    if (!m.arrivals.x.empty()) {
      io::GroupWriter a = g.subgroup("arrivals");
      a.vector("probe_x", m.arrivals.x, lu, "probe positions");
      a.vector("time", m.arrivals.time, tu, "arrival time of the envelope (NaN: none complete)");
      std::vector<real> burst(m.arrivals.burst.begin(), m.arrivals.burst.end());
      a.vector("burst", burst, "1", "1: the peak of a burst, 0: the half-rise of a front");
    }
    if (m.spectrum && !m.spectrum->k.empty()) {
      const OmegaK& s = *m.spectrum;
      io::GroupWriter o = g.subgroup("omega_k");
      o.vector("k", s.k, ku, "wavenumber of each column");
      o.vector("omega", s.omega, wu, "angular frequency of each row");
      o.matrix("power", s.power, s.omega.size(), s.k.size(), "1", "windowed power |S(k, omega)|^2 divided by its maximum");
      o.vector("ridge_k", s.ridge_k, ku, "wavenumbers of the ridge");
      o.vector("ridge_omega", s.ridge_omega, wu, "angular frequency of the strongest power at each ridge wavenumber");
      o.vector("ridge_omega_uncertainty", s.ridge_omega_sigma, wu, "half a frequency bin");
      o.vector("ridge_power", s.ridge_power, "1", "relative power on the ridge");
      o.attribute("", "x_stride", static_cast<real>(s.x_stride));
      o.attribute("", "note", s.note);
    }
  }
}

}  // namespace tw::diag
