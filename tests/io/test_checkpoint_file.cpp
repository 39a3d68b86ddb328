// The checkpoint file (io/checkpoint_file.hpp): an exact round trip of every field, atomic
// replacement of the previous checkpoint, and clear refusals of files that are not complete
// checkpoints of this format.
#include <hdf5.h>

#include <catch2/catch.hpp>
#include <cmath>
#include <cstring>
#include <filesystem>
#include <limits>
#include <string>
#include <vector>

#include "core/error.hpp"
#include "io/checkpoint_file.hpp"
#include "io/output.hpp"
#include "support/test_support.hpp"
#include "tubewave/version.hpp"

using Catch::Matchers::Contains;
using tw::io::CheckpointData;
namespace fs = std::filesystem;

namespace {

CheckpointData sample() {
  CheckpointData d;
  d.reason = "stopped by SIGTERM";
  d.model = "mhd (nonlinear)";
  d.n_vars = 3;
  d.n_cells = 4;
  d.x_min = -0.1;
  d.length = 16.0 / 3.0;
  d.run_id = "0123456789abcdef0123456789abcdef";
  d.run_file_name = "column.yaml";
  d.run_file_text = "title: \"Alfvén column\"\ngrid: {cells: 4}\n";
  d.resolved_run_file = "title: Alfvén column\n";
  d.overrides = {"time.end=1e-6", "output.probes=[1,\n 2]"};  // a value may hold a newline
  d.output_file = "/data/runs/column.h5";
  d.t = 1.0 / 3.0 * 1e-6;
  d.step = 123456789012L;
  d.t_snap_last = 0.3e-6;
  d.wall_seconds = 12.5;
  d.restarts = 2;
  // Values whose bits must survive: negative zero, a subnormal, extremes, round-off tails.
  d.state = {-0.0, std::numeric_limits<double>::denorm_min(), 1e308, -1e-308, 0.1, 0.2, 0.30000000000000004,
             1.0 / 3.0, std::nextafter(1.0, 2.0), -7.25, 2.5e19, 6.02214076e23};
  d.cadences = {{"snapshots", 7}, {"probes", 70}, {"history", 700}};
  d.counters = {{"snapshots", 7}, {"probe_samples", 71}};
  d.series_rows = {{"snapshots", 8}, {"probes", 71}, {"history", 701}};
  d.accumulators = {{"boundary_flux", {1e-3, -0.0, 3.5, -2.25, 0.0, 1e-300}}, {"empty", {}}};
  d.drives = {{"left_end", {0.25, 6.283185307179586}}};
  return d;
}

bool same_bits(const std::vector<double>& a, const std::vector<double>& b) {
  return a.size() == b.size() && (a.empty() || std::memcmp(a.data(), b.data(), a.size() * sizeof(double)) == 0);
}

void set_root_int(const fs::path& file, const char* name, long long value) {
  const hid_t f = H5Fopen(file.c_str(), H5F_ACC_RDWR, H5P_DEFAULT);
  REQUIRE(f >= 0);
  const hid_t a = H5Aopen(f, name, H5P_DEFAULT);
  REQUIRE(a >= 0);
  REQUIRE(H5Awrite(a, H5T_NATIVE_LLONG, &value) >= 0);
  H5Aclose(a);
  H5Fclose(f);
}

}  // namespace

TEST_CASE("checkpoint file: every field round-trips exactly", "[unit][checkpoint]") {
  const tw::test::ScratchDir dir("checkpoint-file");
  const std::string path = (dir / "run.checkpoint.h5").string();
  const CheckpointData d = sample();
  tw::io::write_checkpoint_file(path, d);
  const CheckpointData r = tw::io::read_checkpoint_file(path);
  CHECK(r.tubewave_version == tw::build::version);
  CHECK(r.git_revision == tw::build::git_revision);
  CHECK(r.reason == d.reason);
  CHECK(r.model == d.model);
  CHECK(r.n_vars == d.n_vars);
  CHECK(r.n_cells == d.n_cells);
  CHECK(same_bits({r.x_min, r.length, r.t, r.t_snap_last, r.wall_seconds},
                  {d.x_min, d.length, d.t, d.t_snap_last, d.wall_seconds}));
  CHECK(r.run_id == d.run_id);
  CHECK(r.run_file_name == d.run_file_name);
  CHECK(r.run_file_text == d.run_file_text);
  CHECK(r.resolved_run_file == d.resolved_run_file);
  CHECK(r.overrides == d.overrides);
  CHECK(r.output_file == d.output_file);
  CHECK(r.step == d.step);
  CHECK(r.restarts == d.restarts);
  CHECK(same_bits(r.state, d.state));
  CHECK(std::signbit(r.state[0]));
  CHECK(r.cadences == d.cadences);
  CHECK(r.counters == d.counters);
  CHECK(r.series_rows == d.series_rows);
  REQUIRE(r.accumulators.size() == 2);
  CHECK(same_bits(r.accumulators.at("boundary_flux"), d.accumulators.at("boundary_flux")));
  CHECK(r.accumulators.at("empty").empty());
  CHECK(same_bits(r.drives.at("left_end"), d.drives.at("left_end")));
  // Only the checkpoint: the temporary file was renamed.
  CHECK(fs::exists(path));
  CHECK(std::distance(fs::directory_iterator(dir.path()), fs::directory_iterator()) == 1);
}

TEST_CASE("checkpoint file: a failed write keeps the previous checkpoint", "[unit][checkpoint]") {
  const tw::test::ScratchDir dir("checkpoint-atomic");
  const std::string path = (dir / "run.checkpoint.h5").string();
  CheckpointData d = sample();
  tw::io::write_checkpoint_file(path, d);
  CheckpointData bad = sample();
  bad.t = 2e-6;
  bad.accumulators["not/a/name"] = {1.0};  // found only halfway through writing
  CHECK_THROWS_AS(tw::io::write_checkpoint_file(path, bad), tw::InternalError);
  CHECK(tw::io::read_checkpoint_file(path).t == d.t);
  CHECK(std::distance(fs::directory_iterator(dir.path()), fs::directory_iterator()) == 1);
  // A good write replaces it.
  d.t = 3e-6;
  tw::io::write_checkpoint_file(path, d);
  CHECK(tw::io::read_checkpoint_file(path).t == 3e-6);
}

TEST_CASE("checkpoint file: what is not a complete checkpoint of this format is refused", "[unit][checkpoint]") {
  const tw::test::ScratchDir dir("checkpoint-refused");
  const fs::path path = dir / "run.checkpoint.h5";
  tw::io::write_checkpoint_file(path.string(), sample());
  SECTION("incomplete") {
    set_root_int(path, "complete", 0);
    CHECK_THROWS_WITH(tw::io::read_checkpoint_file(path.string()), Contains("is incomplete"));
  }
  SECTION("another format version") {
    set_root_int(path, "format_version", 99);
    CHECK_THROWS_WITH(tw::io::read_checkpoint_file(path.string()),
                      Contains("format version 99") && Contains("reads version 1"));
  }
  SECTION("a run output") {
    const std::string out = (dir / "run.h5").string();
    {
      tw::io::OutputFile f(out);
      f.close_as("completed", "", 0, 0.0, 0.0);
    }
    CHECK_THROWS_WITH(tw::io::read_checkpoint_file(out),
                      Contains("is not a tubewave checkpoint (format 'tubewave-run')") && Contains("run output"));
  }
  SECTION("a missing file") {
    CHECK_THROWS_AS(tw::io::read_checkpoint_file((dir / "none.h5").string()), tw::InputError);
  }
}
