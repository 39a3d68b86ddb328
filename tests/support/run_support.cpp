#include "support/run_support.hpp"

#include <cmath>
#include <filesystem>

#include "io/h5read.hpp"

namespace tw::test {

namespace {

RunOutput read_back(const RunSummary& s) {
  RunOutput r;
  r.summary = s;
  r.file = s.output_file;
  io::H5Reader h(s.output_file);
  r.x = h.read_real("/grid/x");
  r.snapshot_times = h.read_real("/snapshots/time");
  const std::size_t n = r.x.size();
  const std::size_t rows = r.snapshot_times.size();
  for (const auto& name : h.members("/snapshots")) {
    if (name == "time" || name == "step") continue;
    const auto all = h.read_real("/snapshots/" + name);
    r.first[name] = std::vector<double>(all.begin(), all.begin() + static_cast<long>(n));
    r.last[name] = std::vector<double>(all.end() - static_cast<long>(n), all.end());
    (void)rows;
  }
  for (const auto& name : h.members("/history")) r.history[name] = h.read_real("/history/" + name);
  if (h.exists("/probes")) {
    for (const auto& name : h.members("/probes")) {
      std::vector<hsize_t> dims;
      r.probes[name] = h.read_real("/probes/" + name, &dims);
      if (name != "time" && name != "step" && dims.size() == 2) r.n_probes = dims[1];
    }
  }
  return r;
}

}  // namespace

RunOutput run_config(const std::string& config, std::vector<std::string> overrides,
                     const ScratchDir& dir, const std::string& name) {
  const std::string path =
      std::filesystem::path(config).is_absolute() ? config : source_path(config).string();
  RunOptions opt;
  opt.output_override = (dir / name).string();
  const io::RunFile rf = load_run_file(path, overrides);
  return read_back(run_case(rf, opt));
}

RunOutput run_text(const std::string& yaml, std::vector<std::string> overrides,
                   const ScratchDir& dir, const std::string& name) {
  const auto path = dir / (name + ".yaml");
  write_text(path, yaml);
  return run_config(path.string(), std::move(overrides), dir, name);
}

double l1_difference(const std::vector<double>& a, const std::vector<double>& b, double dx) {
  double s = 0;
  for (std::size_t i = 0; i < a.size() && i < b.size(); ++i) s += std::abs(a[i] - b[i]);
  return s * dx;
}

}  // namespace tw::test
