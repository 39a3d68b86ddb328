#include "sweep/case_run.hpp"

#include <omp.h>

#include <array>
#include <chrono>
#include <cmath>
#include <ctime>
#include <filesystem>
#include <numbers>

#include "core/error.hpp"
#include "core/time_stamp.hpp"
#include "diagnostics/run_layout.hpp"
#include "diagnostics/run_measure.hpp"
#include "diagnostics/wave_measure.hpp"
#include "io/h5read.hpp"
#include "io/h5update.hpp"
#include "io/output.hpp"
#include "sim/run.hpp"
#include "sweep/predict.hpp"
#include "tubewave/version.hpp"

namespace tw::sweep {

namespace fs = std::filesystem;

namespace {

constexpr real nan = std::numeric_limits<real>::quiet_NaN();

/// Relative cost of one cell-update of each model against ideal MHD (HLLD + PLM + SSP-RK2),
/// from the per-step timings in the README's performance table (Hall MHD 8.3e-4 s, two-fluid
/// 7.4e-4 s, MHD 3.2e-4 s per step on the same case). Only the ordering and the ETA use it.
double model_cost_factor(const std::string& model) {
  if (model == "hall") return 2.6;
  if (model == "two-fluid") return 2.3;
  return 1.0;
}

/// Remove temporary files a killed run of this case left behind ("ID.h5.tmp.<pid>"). The
/// case is this process's now, so any temporary of it belongs to a dead run.
void remove_stale_temporaries(const std::string& file) {
  const fs::path p(file);
  std::error_code ec;
  const std::string prefix = p.filename().string() + ".tmp.";
  for (const auto& e : fs::directory_iterator(p.parent_path().empty() ? fs::path(".") : p.parent_path(), ec)) {
    const std::string name = e.path().filename().string();
    if (name.compare(0, prefix.size(), prefix) == 0) fs::remove(e.path(), ec);
  }
}

std::string text_attr(const io::H5Reader& h, const std::string& obj, const std::string& name) {
  return h.has_attribute(obj, name) ? h.attr_string(obj, name) : std::string();
}

double real_attr(const io::H5Reader& h, const std::string& obj, const std::string& name) {
  return h.has_attribute(obj, name) ? h.attr_real(obj, name) : nan;
}

/// The figures of /sweep/measured or /sweep/predicted: GROUP/NAME/QUANTITY scalars.
std::vector<Quantity> read_quantities(const io::H5Reader& h, const std::string& group) {
  std::vector<Quantity> out;
  if (!h.is_group(group)) return out;
  for (const auto& name : h.members(group)) {
    const std::string g = group + "/" + name;
    if (!h.is_group(g)) continue;
    for (const auto& q : h.members(g)) {
      const std::string d = g + "/" + q;
      if (!h.is_numeric(d)) continue;
      Quantity v;
      v.name = name + "/" + q;
      const auto x = h.read_real(d);
      v.value = x.empty() ? nan : x[0];
      v.uncertainty = real_attr(h, d, "uncertainty");
      v.units = text_attr(h, d, "units");
      v.method = text_attr(h, d, "method");
      out.push_back(std::move(v));
    }
  }
  return out;
}

/// The frequency or wavenumber a prediction is evaluated at (PredictionInput::omega / k).
void prediction_point(const Prediction& p, const diag::RunLayout& layout, const io::RunFile& rf,
                      PredictionInput& in) {
  const real two_pi = 2 * std::numbers::pi;
  const std::optional<real> f = p.frequency ? p.frequency : layout.drive_frequency;
  const bool by_frequency = p.given == "frequency" || (p.given == "auto" && f && !p.wavelength);
  if (by_frequency) {
    if (f) in.omega = two_pi * *f;
    return;
  }
  real lambda = 0;
  if (p.wavelength) lambda = *p.wavelength;
  else if (rf.has("initial.wavelength")) lambda = rf.get_real("initial.wavelength");
  else lambda = rf.get_real("grid.length");
  in.k = two_pi / lambda;
}

/// Measure and predict for a finished run; notes go to `notes`.
void collect(const Sweep& s, const std::string& file, const io::RunFile& rf, CaseRecord& rec,
             std::vector<diag::WaveMeasurement>& measurements, std::vector<std::string>& notes) {
  const io::H5Reader h = io::H5Reader::open_complete_or_throw(file);
  std::vector<std::string> layout_notes;
  const diag::RunLayout layout = diag::read_run_layout(h, layout_notes);
  for (const Measurement& m : s.measure) {
    diag::WaveData data = diag::load_wave_data(h, m.field, layout);
    diag::MeasureOptions opt;
    opt.frequency = m.frequency;
    opt.t_min = m.t_min;
    opt.t_max = m.t_max;
    opt.x_min = m.x_min;
    opt.x_max = m.x_max;
    opt.spectrum = false;  // the summary holds figures only; `tubewave measure` gives the spectrum
    diag::WaveMeasurement wm = diag::measure_wave(data, opt);
    wm.notes.insert(wm.notes.begin(), layout_notes.begin(), layout_notes.end());
    for (const auto& q : m.quantities) {
      const diag::Figure& f = wm.figure(q);
      rec.measured.push_back({m.field + "/" + q, f.value, f.uncertainty, f.units, f.method});
    }
    measurements.push_back(std::move(wm));
  }
  if (s.predict.empty()) return;
  const Background bg = read_background(h, layout.normalized);
  for (const Prediction& p : s.predict) {
    const PredictionSource* src = find_prediction_source(p.formula);
    PredictionInput in{bg, &rf, file, std::nullopt, std::nullopt};
    prediction_point(p, layout, rf, in);
    PredictionValues v;
    std::string why;
    if (!in.omega && !in.k) {
      why = "no frequency to evaluate at: the case has no drive frequency and the predict entry gives none";
    } else {
      try {
        v = src->predict(in);
      } catch (const Error& e) {
        why = e.what();
      }
    }
    if (!why.empty()) notes.push_back(p.formula + ": " + why);
    for (const auto& q : p.quantities) {
      Quantity out{p.formula + "/" + q, nan, nan, quantity_unit(q, layout.normalized), src->description};
      if (const auto it = v.find(q); it != v.end()) out.value = it->second;
      else out.method = why.empty() ? "not given by " + p.formula + (in.omega ? " at a frequency" : " at a wavenumber") : why;
      rec.predicted.push_back(std::move(out));
    }
  }
}

/// Write the measurements and the record into the case file in one update.
void write_record(const Sweep& s, const Case& c, const CaseRecord& rec,
                  const std::vector<diag::WaveMeasurement>& measurements) {
  std::vector<io::GroupFill> groups;
  for (const auto& m : measurements)
    groups.push_back({"/measurements/" + m.field, [&m](io::GroupWriter& g) { diag::fill_measurement(g, m, "all samples (sweep)"); }});
  groups.push_back({"/sweep", [&](io::GroupWriter& g) {
                      g.attribute("", "format", std::string("tubewave-sweep-case"));
                      g.attribute("", "case_id", rec.id);
                      g.attribute("", "case_index", static_cast<real>(rec.index));
                      g.attribute("", "status", rec.status);
                      g.attribute("", "message", rec.message);
                      g.attribute("", "run_file_hash", rec.run_hash);
                      g.attribute("", "results_hash", rec.results_hash);
                      g.attribute("", "wall_seconds", rec.wall_seconds);
                      g.attribute("", "steps", static_cast<real>(rec.steps));
                      g.attribute("", "threads", static_cast<real>(rec.threads));
                      g.attribute("", "finished", rec.finished);
                      g.attribute("", "sweep_file", s.path);
                      std::string ov;
                      for (const auto& o : c.overrides) ov += o + "\n";
                      g.attribute("", "overrides", ov);
                      g.attribute("", "tubewave_version",
                                  std::string(build::version) + " (git " + build::git_revision + ")");
                      auto write = [](io::GroupWriter& parent, const char* name, const std::vector<Quantity>& qs,
                                      bool measured) {
                        if (qs.empty()) return;
                        io::GroupWriter top = parent.subgroup(name);
                        std::vector<std::pair<std::string, io::GroupWriter>> subs;
                        for (const auto& q : qs) {
                          const std::string group = q.name.substr(0, q.name.find('/'));
                          const std::string leaf = q.name.substr(q.name.find('/') + 1);
                          io::GroupWriter* w = nullptr;
                          for (auto& [n, gw] : subs)
                            if (n == group) w = &gw;
                          if (w == nullptr) {
                            subs.emplace_back(group, top.subgroup(group));
                            w = &subs.back().second;
                          }
                          w->scalar(leaf, q.value, q.units, measured ? "measured by tubewave measure" : "predicted");
                          if (measured) w->attribute(leaf, "uncertainty", q.uncertainty);
                          w->attribute(leaf, "method", q.method);
                        }
                      };
                      write(g, "measured", rec.measured, true);
                      write(g, "predicted", rec.predicted, false);
                    }});
  io::replace_groups(s.case_file(c), groups);
}

}  // namespace

std::string fnv1a_hex(std::string_view text) {
  std::uint64_t h = 14695981039346656037ull;
  for (unsigned char ch : text) {
    h ^= ch;
    h *= 1099511628211ull;
  }
  static const char* digits = "0123456789abcdef";
  std::string out(16, '0');
  for (int i = 15; i >= 0; --i, h >>= 4) out[static_cast<std::size_t>(i)] = digits[h & 0xf];
  return out;
}

std::optional<CaseRecord> read_record(const std::string& file) {
  std::error_code ec;
  if (!fs::is_regular_file(file, ec)) return std::nullopt;
  try {
    const io::H5Reader h(file);
    if (!h.is_group("/sweep") || text_attr(h, "/sweep", "format") != "tubewave-sweep-case") return std::nullopt;
    CaseRecord r;
    r.id = text_attr(h, "/sweep", "case_id");
    r.index = static_cast<std::size_t>(real_attr(h, "/sweep", "case_index"));
    r.status = text_attr(h, "/sweep", "status");
    r.message = text_attr(h, "/sweep", "message");
    r.run_hash = text_attr(h, "/sweep", "run_file_hash");
    r.results_hash = text_attr(h, "/sweep", "results_hash");
    r.wall_seconds = real_attr(h, "/sweep", "wall_seconds");
    r.steps = static_cast<long>(real_attr(h, "/sweep", "steps"));
    r.threads = static_cast<int>(real_attr(h, "/sweep", "threads"));
    r.finished = text_attr(h, "/sweep", "finished");
    r.output = file;
    r.measured = read_quantities(h, "/sweep/measured");
    r.predicted = read_quantities(h, "/sweep/predicted");
    r.recorded = true;
    // The record must describe this file's run: its stored run file hashes the same.
    if (h.exists("/provenance/resolved_run_file") &&
        fnv1a_hex(h.read_string("/provenance/resolved_run_file")) != r.run_hash)
      return std::nullopt;
    if (r.status == "completed" && !h.is_complete()) return std::nullopt;
    return r;
  } catch (const Error&) {
    return std::nullopt;  // not a readable HDF5 file: the case runs again
  }
}

CasePlan plan_case(const Sweep& s, const Case& c, bool check) {
  CasePlan p;
  const std::string file = s.case_file(c);
  try {
    const io::RunFile rf = load_run_file(s.base, c.overrides);
    p.run_hash = fnv1a_hex(rf.resolved_yaml());
    if (check) {
      const CheckReport r = check_case(rf, file);
      p.cost = static_cast<double>(r.cells) * static_cast<double>(std::max(1L, r.estimated_steps)) *
               model_cost_factor(r.model);
    }
  } catch (const io::ConfigError& e) {
    s.fail_case(c, e);
  }
  const auto rec = read_record(file);
  if (!rec) {
    std::error_code ec;
    p.why = fs::exists(file, ec) ? "no completion record in the case file" : "not run yet";
    return p;
  }
  if (rec->run_hash != p.run_hash) {
    p.why = "its run file changed";
    return p;
  }
  p.record = *rec;
  p.record.index = c.index;
  if (rec->status == "completed") {
    p.state = rec->results_hash == fnv1a_hex(s.results_key()) ? CasePlan::State::done : CasePlan::State::remeasure;
    p.why = p.state == CasePlan::State::done ? "complete" : "the measurements asked for changed";
  } else {
    p.state = CasePlan::State::failed;
    p.why = "failed before";
  }
  return p;
}

std::vector<CasePlan> plan_cases(const Sweep& s, bool check) {
  std::vector<CasePlan> out;
  out.reserve(s.cases.size());
  for (const auto& c : s.cases) out.push_back(plan_case(s, c, check));
  return out;
}

CaseRecord run_one_case(const Sweep& s, const Case& c, const std::string& run_hash, const CaseOptions& opt) {
  using clock = std::chrono::steady_clock;
  const auto t0 = clock::now();
  CaseRecord rec;
  rec.index = c.index;
  rec.id = c.id;
  rec.output = s.case_file(c);
  rec.run_hash = run_hash;
  rec.results_hash = fnv1a_hex(s.results_key());
  rec.threads = opt.threads;
  omp_set_num_threads(std::max(1, opt.threads));
  std::vector<diag::WaveMeasurement> measurements;
  std::vector<std::string> notes;
  bool file_written = false;
  double earlier_wall = 0;  // a measure-only pass adds to the run's time
  try {
    const io::RunFile rf = load_run_file(s.base, c.overrides);
    if (fnv1a_hex(rf.resolved_yaml()) != run_hash)
      throw RunError("the case's run file changed since the sweep was planned (" + s.base + ")");
    if (opt.measure_only) {
      const auto old = read_record(rec.output);
      rec.steps = old ? old->steps : 0;
      rec.status = "completed";
      rec.message = old ? old->message.substr(0, old->message.find("; note: ")) : "";
      if (old && std::isfinite(old->wall_seconds)) earlier_wall = old->wall_seconds;
      file_written = true;
    } else {
      remove_stale_temporaries(rec.output);
      RunOptions ro;
      ro.output_override = rec.output;
      ro.stop = opt.stop;
      const RunSummary sum = run_case(rf, ro);
      file_written = true;
      rec.steps = sum.steps;
      rec.status = sum.outcome;
      rec.message = sum.message;
    }
    if (rec.status == "completed") {
      try {
        collect(s, rec.output, rf, rec, measurements, notes);
      } catch (const Error& e) {
        rec.status = "failed";
        rec.message = std::string("the run completed, but measuring it failed: ") + e.what();
        rec.measured.clear();
        rec.predicted.clear();
        measurements.clear();
      }
    }
  } catch (const Error& e) {
    rec.status = "failed";
    rec.message = e.what();
  } catch (const std::exception& e) {
    rec.status = "failed";
    rec.message = std::string("unexpected error: ") + e.what();
  }
  for (const auto& n : notes) rec.message += "; note: " + n;
  rec.wall_seconds = earlier_wall + std::chrono::duration<double>(clock::now() - t0).count();
  rec.finished = utc_now_iso8601();
  if (rec.status == "interrupted") return rec;  // not recorded: it runs again next time
  try {
    std::error_code ec;
    if (!file_written || !fs::is_regular_file(rec.output, ec)) {
      remove_stale_temporaries(rec.output);
      // The run failed before its file existed: a file with only the status, for the record.
      io::OutputFile stub(rec.output);
      stub.close_as("failed", rec.message, 0, 0, rec.wall_seconds);
    }
    write_record(s, c, rec, measurements);
    rec.recorded = true;
  } catch (const Error& e) {
    rec.message += std::string("; the record could not be written: ") + e.what();
  }
  return rec;
}

}  // namespace tw::sweep
