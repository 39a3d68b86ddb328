#include "sim/checkpoint.hpp"

#include <csignal>
#include <filesystem>
#include <optional>
#include <sstream>

#include "tubewave/version.hpp"

namespace tw {

namespace fs = std::filesystem;

void declare_checkpoint_keys(io::Schema& schema) {
  io::Section& s = schema.root().section(
      "checkpoint", "checkpoints for continuing a run (tubewave run --restart); one is always written when the run is stopped by SIGTERM, SIGINT or SIGUSR1");
  s.string("file", "checkpoint file (default: the output's name with .checkpoint.h5, next to it)").def("");
  s.real("interval", "s", "simulated time between checkpoints (default: none at a simulated-time interval)")
      .positive();
  s.real("wall_interval", "s",
         "wall-clock time between checkpoints (default: none at a wall-clock interval); each also publishes the output so far")
      .positive();
}

std::string default_checkpoint_path(const std::string& output_file) {
  fs::path p(output_file);
  if (p.extension() == ".h5") p.replace_extension();
  return p.string() + ".checkpoint.h5";
}

CheckpointSpec read_checkpoint_spec(const io::RunFile& rf, const std::string& output_file) {
  CheckpointSpec s;
  s.file = rf.get_string("checkpoint.file");
  if (s.file.empty()) s.file = default_checkpoint_path(output_file);
  if (fs::absolute(s.file).lexically_normal() == fs::absolute(output_file).lexically_normal())
    rf.fail("checkpoint.file", "the checkpoint cannot be the output file '" + output_file + "'");
  if (rf.has("checkpoint.interval")) {
    s.interval = rf.get_real("checkpoint.interval");
    if (rf.get_real("time.end") / s.interval > 1e9)
      rf.fail("checkpoint.interval", "gives more than 1e9 checkpoints before time.end (is the unit right?)");
  }
  if (rf.has("checkpoint.wall_interval")) s.wall_interval = rf.get_real("checkpoint.wall_interval");
  return s;
}

std::string signal_name(int signal) {
  switch (signal) {
    case SIGTERM:
      return "SIGTERM";
    case SIGINT:
      return "SIGINT";
    case SIGUSR1:
      return "SIGUSR1";
    default:
      return "signal " + std::to_string(signal);
  }
}

// --- CheckpointClock -------------------------------------------------------------------

CheckpointClock::CheckpointClock(const CheckpointSpec& spec, real t, double wall_now)
    : interval_(spec.interval), wall_interval_(spec.wall_interval), last_wall_(wall_now) {
  if (std::isfinite(interval_)) next_index_ = static_cast<long>(std::floor(t / interval_ * (1 + 1e-12))) + 1;
}

const char* CheckpointClock::due(real t, double wall_now) const {
  if (std::isfinite(interval_) && t >= static_cast<real>(next_index_) * interval_ * (1 - 1e-12))
    return "simulated-time interval";
  if (wall_now - last_wall_ >= wall_interval_) return "wall-clock interval";
  return nullptr;
}

void CheckpointClock::taken(real t, double wall_now) {
  if (std::isfinite(interval_)) next_index_ = static_cast<long>(std::floor(t / interval_ * (1 + 1e-12))) + 1;
  last_wall_ = wall_now;
}

// --- Restart ---------------------------------------------------------------------------

namespace {

/// Keys a continued run may change: they steer the bookkeeping, not the computation.
bool may_differ(const std::string& key) {
  return key.rfind("checkpoint.", 0) == 0 || key == "time.max_steps" || key == "title" ||
         key == "description" || key == "output.file";
}

}  // namespace

RestartPlan plan_restart(const RestartRequest& req, const io::Schema& schema) {
  io::CheckpointData d = io::read_checkpoint_file(req.checkpoint);
  const std::string& ck = req.checkpoint;

  // The same build: a continued run must compute what the uninterrupted one would have, bit
  // for bit, and any change to the code may change the numbers.
  if (d.tubewave_version != build::version || d.git_revision != build::git_revision)
    throw InputError("checkpoint '" + ck + "' was written by tubewave " + d.tubewave_version + " (git " +
                     d.git_revision + "); this is tubewave " + build::version + " (git " + build::git_revision +
                     "). A run continues only with the build that started it; use that build, or rerun "
                     "from the start");

  // The case as it was set up when the checkpoint was written.
  std::optional<io::RunFile> recorded;
  try {
    recorded = io::RunFile::parse(d.run_file_text, d.run_file_name, schema, d.overrides);
  } catch (const io::ConfigError& e) {
    throw InputError("checkpoint '" + ck + "': its run file no longer loads: " + e.what());
  }
  if (recorded->resolved_yaml() != d.resolved_run_file)
    throw InputError("checkpoint '" + ck + "': its run file resolves differently in this build than when "
                     "the checkpoint was written (the defaults changed); rerun from the start");

  // The case to continue with: a run file given now, or the recorded one, with overrides.
  std::optional<io::RunFile> now;
  if (!req.run_file.empty()) {
    now = io::RunFile::load(req.run_file, schema, req.overrides);
  } else {
    std::vector<std::string> o = d.overrides;
    o.insert(o.end(), req.overrides.begin(), req.overrides.end());
    now = io::RunFile::parse(d.run_file_text, d.run_file_name, schema, o);
  }
  const auto before = recorded->values();
  const auto after = now->values();
  std::map<std::string, std::string> old_values(before.begin(), before.end());
  for (const auto& [key, value] : after) {
    if (may_differ(key)) continue;
    const auto it = old_values.find(key);
    const std::string was = it == old_values.end() ? std::string("absent") : "'" + it->second + "'";
    if (it == old_values.end() || it->second != value) {
      std::string reason = "differs from the run in checkpoint '" + ck + "' ('" + value + "' here, " + was +
                           " in the checkpoint)";
      if (key == "model.equations" || key == "model.form")
        reason += ": the checkpoint holds another model";
      else if (key.rfind("grid.", 0) == 0)
        reason += ": the checkpoint holds another grid";
      reason += ". A continued run must be the same case; only checkpoint.*, time.max_steps, title, "
                "description and output.file may change";
      now->fail(key, reason);
    }
    old_values.erase(it);
  }
  for (const auto& [key, value] : old_values)
    if (!may_differ(key))
      throw InputError("checkpoint '" + ck + "': its run has '" + key + "' = '" + value +
                       "', which the run file given now does not; a continued run must be the same case");

  std::string output = req.output_override.empty() ? d.output_file : req.output_override;
  return RestartPlan{std::move(d), std::move(*now), std::move(output), ck};
}

void check_checkpoint_case(const io::CheckpointData& d, const std::string& path, const std::string& model,
                           int n_vars, const Grid& g) {
  if (d.model != model || d.n_vars != n_vars)
    throw InputError("checkpoint '" + path + "' holds a run of the " + d.model + " model (" +
                     std::to_string(d.n_vars) + " variables); this case is " + model + " (" +
                     std::to_string(n_vars) + " variables)");
  if (d.n_cells != g.n_cells || d.x_min != g.x_min || d.length != g.length) {
    std::ostringstream m;
    m.precision(17);
    m << "checkpoint '" << path << "' holds a run on another grid: " << d.n_cells << " cells on [" << d.x_min
      << ", " << d.x_min + d.length << "] m; this case has " << g.n_cells << " cells on [" << g.x_min << ", "
      << g.x_max() << "] m";
    throw InputError(m.str());
  }
}

io::ResumePoint resume_point(const io::CheckpointData& d) {
  io::ResumePoint r;
  r.run_id = d.run_id;
  r.series_rows = d.series_rows;
  r.restarts = d.restarts + 1;
  return r;
}

}  // namespace tw
