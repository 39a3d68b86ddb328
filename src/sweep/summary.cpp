#include "sweep/summary.hpp"

#include <unistd.h>

#include <array>
#include <charconv>
#include <cmath>
#include <ctime>
#include <filesystem>
#include <fstream>
#include <limits>

#include "core/error.hpp"
#include "core/time_stamp.hpp"
#include "io/file_ops.hpp"
#include "io/h5table.hpp"
#include "sweep/predict.hpp"
#include "tubewave/version.hpp"

namespace tw::sweep {

namespace fs = std::filesystem;

namespace {

constexpr real nan = std::numeric_limits<real>::quiet_NaN();

std::string number(real v) {
  if (std::isnan(v)) return "nan";
  if (std::isinf(v)) return v > 0 ? "inf" : "-inf";
  char buf[64];
  const auto res = std::to_chars(buf, buf + sizeof buf, v);
  return std::string(buf, res.ptr);
}

std::string csv_field(const std::string& s) {
  if (s.find_first_of(",\"\n\r") == std::string::npos) return s;
  std::string r = "\"";
  for (char c : s) {
    if (c == '"') r += '"';
    r += c;
  }
  return r + "\"";
}

const Quantity* find(const std::vector<Quantity>& qs, const std::string& name) {
  for (const auto& q : qs)
    if (q.name == name) return &q;
  return nullptr;
}

/// The table as columns, in the order of the CSV.
std::vector<io::TableColumn> columns(const Sweep& s, const std::vector<CaseRecord>& records) {
  std::vector<io::TableColumn> cols;
  auto text_col = [&](const std::string& path, const std::string& desc, auto get) {
    io::TableColumn c;
    c.path = path;
    c.text = true;
    c.description = desc;
    for (const auto& r : records) c.texts.push_back(get(r));
    cols.push_back(std::move(c));
  };
  auto real_col = [&](const std::string& path, const std::string& units, const std::string& desc, auto get) {
    io::TableColumn c;
    c.path = path;
    c.units = units;
    c.description = desc;
    for (const auto& r : records) c.reals.push_back(get(r));
    cols.push_back(std::move(c));
  };
  real_col("/cases/index", "1", "case number (expansion order)", [](const CaseRecord& r) { return static_cast<real>(r.index); });
  text_col("/cases/id", "case name; its file is cases/ID.h5", [](const CaseRecord& r) { return r.id; });
  text_col("/cases/status", "completed, failed, interrupted or not run", [](const CaseRecord& r) { return r.status; });
  for (std::size_t j = 0; j < s.parameters.size(); ++j) {
    const Parameter& p = s.parameters[j];
    io::TableColumn c;
    c.path = "/parameters/" + p.label;
    c.text = !p.numeric;
    c.units = p.unit.empty() ? "1" : p.unit;
    c.description = "value of run-file key " + p.key;
    c.attributes.emplace_back("key", p.key);
    for (const auto& r : records) {
      const std::size_t vi = s.cases.at(r.index).value_index[j];
      if (p.numeric) c.reals.push_back(p.numbers[vi]);
      else c.texts.push_back(p.words[vi]);
    }
    cols.push_back(std::move(c));
  }
  for (const auto& m : s.measure)
    for (const auto& q : m.quantities) {
      const std::string name = m.field + "/" + q;
      std::string units;
      for (const auto& r : records)
        if (const Quantity* v = find(r.measured, name); v != nullptr && units.empty()) units = v->units;
      real_col("/measured/" + name, units, q + " of " + m.field + " measured by tubewave measure", [&](const CaseRecord& r) {
        const Quantity* v = find(r.measured, name);
        return v ? v->value : nan;
      });
      real_col("/measured/" + name + "_uncertainty", units, "one-sigma uncertainty of " + q, [&](const CaseRecord& r) {
        const Quantity* v = find(r.measured, name);
        return v ? v->uncertainty : nan;
      });
    }
  for (const auto& p : s.predict)
    for (const auto& q : p.quantities) {
      const std::string name = p.formula + "/" + q;
      std::string units;
      for (const auto& r : records)
        if (const Quantity* v = find(r.predicted, name); v != nullptr && units.empty()) units = v->units;
      const PredictionSource* src = find_prediction_source(p.formula);
      real_col("/predicted/" + name, units, q + " predicted by " + (src ? src->description : p.formula),
               [&](const CaseRecord& r) {
                 const Quantity* v = find(r.predicted, name);
                 return v ? v->value : nan;
               });
    }
  real_col("/cases/wall_seconds", "s", "wall time of the case (run and measurement)",
           [](const CaseRecord& r) { return r.wall_seconds; });
  real_col("/cases/steps", "1", "time steps taken", [](const CaseRecord& r) { return static_cast<real>(r.steps); });
  real_col("/cases/threads", "1", "OpenMP threads the case ran with", [](const CaseRecord& r) { return static_cast<real>(r.threads); });
  text_col("/cases/run_file_hash", "FNV-1a 64-bit hash of the case's resolved run file",
           [](const CaseRecord& r) { return r.run_hash; });
  text_col("/cases/output", "the case file, relative to the sweep's output folder", [&](const CaseRecord& r) {
    return fs::path(s.case_file(s.cases.at(r.index))).lexically_relative(s.output_dir).string();
  });
  text_col("/cases/message", "how the case ended (a failure's reason) and notes", [](const CaseRecord& r) { return r.message; });
  return cols;
}

/// CSV column name of a table column.
std::string csv_name(const io::TableColumn& c) {
  for (const char* prefix : {"/cases/", "/parameters/"}) {
    const std::string p = prefix;
    if (c.path.compare(0, p.size(), p) == 0) return c.path.substr(p.size());
  }
  return c.path.substr(1);
}

void write_csv(const std::string& path, const std::vector<io::TableColumn>& cols, std::size_t rows) {
  std::ostringstream out;
  for (std::size_t k = 0; k < cols.size(); ++k) out << (k ? "," : "") << csv_field(csv_name(cols[k]));
  out << "\n";
  for (std::size_t i = 0; i < rows; ++i) {
    for (std::size_t k = 0; k < cols.size(); ++k)
      out << (k ? "," : "") << csv_field(cols[k].text ? cols[k].texts[i] : number(cols[k].reals[i]));
    out << "\n";
  }
  io::write_text_file(path, out.str());
}

}  // namespace

std::vector<CaseRecord> gather_records(const Sweep& s, const std::vector<CasePlan>& plans,
                                       const std::vector<CaseRecord>& session) {
  std::vector<CaseRecord> out;
  for (const auto& c : s.cases) {
    CaseRecord r;
    r.index = c.index;
    r.id = c.id;
    r.output = s.case_file(c);
    r.run_hash = plans.at(c.index).run_hash;
    const CaseRecord* mine = nullptr;
    for (const auto& x : session)
      if (x.index == c.index) mine = &x;
    if (auto rec = read_record(r.output); rec && rec->run_hash == r.run_hash) {
      r = *rec;
      r.index = c.index;
      r.id = c.id;
    } else if (mine != nullptr) {
      r = *mine;
    }
    out.push_back(std::move(r));
  }
  return out;
}

void write_summary(const Sweep& s, const std::vector<CaseRecord>& records, const SummaryInfo& info) {
  const auto cols = columns(s, records);
  write_csv(s.summary_csv(), cols, records.size());
  io::TableFile t;
  std::size_t done = 0, failed = 0, not_run = 0;
  for (const auto& r : records) {
    if (r.status == "completed") ++done;
    else if (r.status == "failed") ++failed;
    else ++not_run;
  }
  t.text_attributes = {{"format", "tubewave-sweep"},
                       {"title", s.title},
                       {"sweep_file", s.path},
                       {"base_run_file", s.base},
                       {"combine", s.combine},
                       {"created", utc_now_iso8601()},
                       {"tubewave_version", std::string(build::version) + " (git " + build::git_revision + ")"}};
  t.real_attributes = {{"format_version", 1},
                       {"cases", static_cast<real>(records.size())},
                       {"completed", static_cast<real>(done)},
                       {"failed", static_cast<real>(failed)},
                       {"not_run", static_cast<real>(not_run)},
                       {"session_wall_seconds", info.session_wall_seconds >= 0 ? info.session_wall_seconds : nan}};
  t.columns = cols;
  io::write_table_file(s.summary_h5(), t);
}

}  // namespace tw::sweep
