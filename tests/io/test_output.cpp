// The HDF5 output layer (io/output.hpp) and the reader (io/h5read.hpp): layout, round
// trips, buffering, atomic creation and error messages.
#include <hdf5.h>
#include <unistd.h>

#include <catch2/catch.hpp>
#include <filesystem>
#include <fstream>
#include <functional>
#include <map>
#include <sstream>
#include <string>
#include <vector>

#include "core/error.hpp"
#include "io/h5read.hpp"
#include "io/output.hpp"
#include "support/test_support.hpp"

namespace fs = std::filesystem;
using tw::io::ColumnInfo;
using tw::io::H5Reader;
using tw::io::OutputFile;
using tw::io::ParameterValue;
using tw::io::Provenance;
using tw::io::Series;

namespace {

std::string read_file(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

std::vector<std::string> directory_entries(const fs::path& dir) {
  std::vector<std::string> names;
  for (const auto& e : fs::directory_iterator(dir)) names.push_back(e.path().filename().string());
  return names;
}

/// Value of column c, row r, cell i in the synthetic series below: distinct for every
/// (r, c, i) so a misplaced row or column shows.
double cell_value(int r, int c, int i) { return 1000.0 * r + 100.0 * c + i + 0.25; }

std::vector<double> row_values(int r, int n_columns, int width) {
  std::vector<double> v;
  for (int c = 0; c < n_columns; ++c)
    for (int i = 0; i < width; ++i) v.push_back(cell_value(r, c, i));
  return v;
}

const std::vector<ColumnInfo> two_columns{
    {"density", "m^-3", "ion number density"},
    {"magnetic_field_y", "T", "transverse magnetic field"},
};

/// Visit every object below `group`, depth first, with its full path.
void walk(const H5Reader& r, const std::string& group,
          const std::function<void(const std::string&)>& visit) {
  for (const std::string& name : r.members(group)) {
    const std::string path = (group == "/" ? "" : group) + "/" + name;
    visit(path);
    if (r.is_group(path)) walk(r, path, visit);
  }
}

}  // namespace

TEST_CASE("output: provenance, parameters and grid round-trip", "[unit]") {
  tw::test::ScratchDir dir("output-roundtrip");
  const std::string path = (dir / "run.h5").string();
  {
    OutputFile out(path);
    Provenance p;
    p.title = "Test tube, Alfvén wave";  // non-ASCII on purpose: UTF-8 must survive
    p.model = "hall";
    p.run_file_name = "tube.yaml";
    p.run_file_text = "plasma:\n  density: 1.0e19\n";
    p.overrides = "numerics.cfl=0.4\ntime.end=1e-6";
    p.resolved_run_file = "plasma:\n  density: 1.0e+19\n";
    p.threads = 3;
    out.write_provenance(p);
    out.write_parameters({{"alfven_speed", 2.5e5, "m/s", "Alfvén speed"},
                          {"ion_inertial_length", 0.072, "m", "d_i"}});
    out.write_parameters({{"plasma_beta", 0.01, "1", "thermal over magnetic pressure"}});
    const std::vector<double> x{0.5, 1.5, 2.5};
    const std::vector<double> faces{0.0, 1.0, 2.0, 3.0};
    out.write_grid(x, faces);
    out.close_as("completed", "", 10, 1e-6, 0.5);
  }
  const H5Reader r(path);
  CHECK(r.is_complete());
  CHECK(r.attr_string("/", "format") == "tubewave-run");
  CHECK(r.attr_int("/", "format_version") == 1);
  CHECK(r.attr_string("/", "title") == "Test tube, Alfvén wave");
  CHECK(r.attr_string("/", "model") == "hall");
  const std::string created = r.attr_string("/", "created");
  CHECK(created.size() == 20);  // YYYY-MM-DDTHH:MM:SSZ
  CHECK(created.back() == 'Z');

  CHECK(r.read_string("/provenance/run_file") == "plasma:\n  density: 1.0e19\n");
  CHECK(r.read_string("/provenance/run_file_name") == "tube.yaml");
  CHECK(r.read_string("/provenance/overrides") == "numerics.cfl=0.4\ntime.end=1e-6");
  CHECK(r.read_string("/provenance/resolved_run_file") == "plasma:\n  density: 1.0e+19\n");
  CHECK(r.read_int("/provenance/threads") == 3);
  for (const char* name : {"tubewave_version", "git_revision", "compiler", "build_type"}) {
    INFO(name);
    CHECK(r.is_dataset(std::string("/provenance/") + name));
  }
  CHECK_FALSE(r.read_string("/provenance/tubewave_version").empty());

  std::vector<hsize_t> dims{99};
  CHECK(r.read_real("/parameters/alfven_speed", &dims) == std::vector<double>{2.5e5});
  CHECK(dims.empty());  // scalar
  CHECK(r.attr_string("/parameters/alfven_speed", "units") == "m/s");
  CHECK(r.attr_string("/parameters/alfven_speed", "description") == "Alfvén speed");
  CHECK(r.read_real("/parameters/plasma_beta") == std::vector<double>{0.01});
  // Members come back in the order they were written, not alphabetically.
  CHECK(r.members("/parameters") ==
        std::vector<std::string>{"alfven_speed", "ion_inertial_length", "plasma_beta"});

  CHECK(r.read_real("/grid/x", &dims) == std::vector<double>{0.5, 1.5, 2.5});
  CHECK(dims == std::vector<hsize_t>{3});
  CHECK(r.read_real("/grid/x_faces") == std::vector<double>{0.0, 1.0, 2.0, 3.0});
  CHECK(r.attr_string("/grid/x", "units") == "m");
  CHECK(r.attr_string("/grid/x_faces", "units") == "m");

  CHECK(r.attr_string("/status", "outcome") == "completed");
  CHECK(r.attr_int("/status", "steps") == 10);
  CHECK(r.attr_real("/status", "simulated_time") == 1e-6);
  CHECK(r.attr_real("/status", "wall_seconds") == 0.5);
}

TEST_CASE("output: series round-trip with partial chunks and flush", "[unit]") {
  tw::test::ScratchDir dir("output-series");
  const std::string path = (dir / "run.h5").string();
  const int width = 5;
  const int chunk = 4;
  const int n_rows = 11;
  {
    OutputFile out(path);
    Series s = out.create_series("snapshots", two_columns, width, chunk, true);
    Series h =
        out.create_series("history", {{"total_energy", "J m^-2", "energy per area"}}, 1, 64, false);
    CHECK(s.width() == width);
    CHECK(s.n_columns() == 2);
    CHECK(s.name() == "snapshots");
    for (int r = 0; r < n_rows; ++r) {
      s.append(0.1 * r, 10L * r, row_values(r, 2, width));
      const std::vector<double> e{static_cast<double>(r)};
      h.append(0.1 * r, 10L * r, e);
      // Rows reach HDF5 in blocks of `chunk`, except where flush() forces a partial block.
      if (r == 2) {
        CHECK(s.rows() == 3);
        CHECK(s.rows_written() == 0);
      }
      if (r == 3) CHECK(s.rows_written() == 4);
      if (r == 5) {
        out.flush();  // a partial chunk (rows 4 and 5) goes to the file
        CHECK(s.rows_written() == 6);
        CHECK(h.rows_written() == 6);
      }
      if (r == 8) CHECK(s.rows_written() == 6);   // 3 buffered, fewer than a chunk
      if (r == 9) CHECK(s.rows_written() == 10);  // the 4th buffered row writes the block
    }
    CHECK(s.rows() == n_rows);
    CHECK(s.rows_written() == 10);
    out.close_as("completed", "", n_rows, 1.0, 0.1);
  }
  const H5Reader r(path);
  std::vector<hsize_t> dims;
  const std::vector<double> t = r.read_real("/snapshots/time", &dims);
  CHECK(dims == std::vector<hsize_t>{n_rows});
  const std::vector<double> step = r.read_real("/snapshots/step");
  for (int i = 0; i < n_rows; ++i) {
    CHECK(t[i] == 0.1 * i);
    CHECK(step[i] == 10.0 * i);
  }
  for (int c = 0; c < 2; ++c) {
    const std::string name = "/snapshots/" + two_columns[c].name;
    const std::vector<double> v = r.read_real(name, &dims);
    REQUIRE(dims == std::vector<hsize_t>{n_rows, width});
    for (int row = 0; row < n_rows; ++row)
      for (int i = 0; i < width; ++i) {
        INFO(name << " row " << row << " cell " << i);
        CHECK(v[static_cast<std::size_t>(row * width + i)] == cell_value(row, c, i));
      }
    CHECK(r.attr_string(name, "units") == two_columns[c].units);
    CHECK(r.attr_string(name, "description") == two_columns[c].description);
  }
  CHECK(r.members("/snapshots") ==
        std::vector<std::string>{"time", "step", "density", "magnetic_field_y"});
  CHECK(r.read_real("/history/total_energy", &dims).at(7) == 7.0);
  CHECK(dims == std::vector<hsize_t>{n_rows, 1});

  // A range of rows without reading the table.
  const std::vector<double> rows = r.read_real_rows("/snapshots/density", 9, 2, &dims);
  CHECK(dims == std::vector<hsize_t>{2, width});
  CHECK(rows.front() == cell_value(9, 0, 0));
  CHECK(rows.back() == cell_value(10, 0, width - 1));
  CHECK_THROWS_WITH(r.read_real_rows("/snapshots/density", 10, 2),
                    Catch::Matchers::Contains("which has 11 rows"));
}

TEST_CASE("output: chunk shape and filters follow the series declaration", "[unit]") {
  tw::test::ScratchDir dir("output-chunks");
  const std::string path = (dir / "run.h5").string();
  {
    OutputFile out(path);
    Series s = out.create_series("snapshots", two_columns, 7, 1, true);
    Series p = out.create_series("probes", two_columns, 3, 256, false);
    s.append(0, 0, row_values(0, 2, 7));
    p.append(0, 0, row_values(0, 2, 3));
    out.close_as("completed", "", 1, 0, 0);
  }
  // Checked with the HDF5 C API directly: the reader does not expose storage details.
  const hid_t f = H5Fopen(path.c_str(), H5F_ACC_RDONLY, H5P_DEFAULT);
  REQUIRE(f >= 0);
  auto inspect = [f](const char* name, std::vector<hsize_t>& chunk, std::vector<hsize_t>& max,
                     bool& deflate, bool& shuffle) {
    const hid_t ds = H5Dopen2(f, name, H5P_DEFAULT);
    REQUIRE(ds >= 0);
    const hid_t dcpl = H5Dget_create_plist(ds);
    const hid_t space = H5Dget_space(ds);
    const int rank = H5Sget_simple_extent_ndims(space);
    chunk.assign(static_cast<std::size_t>(rank), 0);
    max.assign(static_cast<std::size_t>(rank), 0);
    H5Pget_chunk(dcpl, rank, chunk.data());
    H5Sget_simple_extent_dims(space, nullptr, max.data());
    deflate = H5Pget_filter_by_id2(dcpl, H5Z_FILTER_DEFLATE, nullptr, nullptr, nullptr, 0, nullptr,
                                   nullptr) >= 0;
    shuffle = H5Pget_filter_by_id2(dcpl, H5Z_FILTER_SHUFFLE, nullptr, nullptr, nullptr, 0, nullptr,
                                   nullptr) >= 0;
    H5Eclear2(H5E_DEFAULT);
    H5Sclose(space);
    H5Pclose(dcpl);
    H5Dclose(ds);
  };
  std::vector<hsize_t> chunk, max;
  bool deflate = false, shuffle = false;
  inspect("/snapshots/density", chunk, max, deflate, shuffle);
  CHECK(chunk == std::vector<hsize_t>{1, 7});
  CHECK(max == std::vector<hsize_t>{H5S_UNLIMITED, 7});
  CHECK(deflate);
  CHECK(shuffle);
  inspect("/probes/magnetic_field_y", chunk, max, deflate, shuffle);
  CHECK(chunk == std::vector<hsize_t>{256, 3});
  CHECK_FALSE(deflate);
  CHECK_FALSE(shuffle);
  inspect("/snapshots/time", chunk, max, deflate, shuffle);
  CHECK(max == std::vector<hsize_t>{H5S_UNLIMITED});
  H5Fclose(f);
}

TEST_CASE("output: the final file appears only after close_as", "[unit]") {
  tw::test::ScratchDir dir("output-atomic");
  const fs::path final_path = dir / "run.h5";
  OutputFile out(final_path.string());
  const fs::path temp = out.temporary_path();
  CHECK(out.final_path() == final_path.string());
  // "<final>.tmp.<pid>.<6 random hex digits>": the random part keeps a new writer clear of a
  // file left by a killed run that had the same PID (common for runs in containers).
  const std::string prefix = final_path.string() + ".tmp." + std::to_string(::getpid()) + ".";
  CHECK_THAT(temp.string(), Catch::Matchers::StartsWith(prefix));
  CHECK(temp.string().size() == prefix.size() + 6);
  CHECK(fs::exists(temp));
  CHECK_FALSE(fs::exists(final_path));
  Series s = out.create_series("history", {{"mass", "kg m^-2", "mass per area"}}, 1, 8, false);
  s.append(0.0, 0, std::vector<double>{1.0});
  out.flush();
  CHECK_FALSE(fs::exists(final_path));
  out.close_as("completed", "", 1, 0.0, 0.0);
  CHECK(fs::exists(final_path));
  CHECK_FALSE(fs::exists(temp));
  CHECK(directory_entries(dir.path()) == std::vector<std::string>{"run.h5"});
  // The object is closed: further use is a programming error, said clearly.
  CHECK_THROWS_AS(out.flush(), tw::InternalError);
  CHECK_THROWS_WITH(s.append(1.0, 1, std::vector<double>{1.0}),
                    Catch::Matchers::Contains("after its output file"));
}

TEST_CASE("output: abandoning a file leaves nothing and keeps the previous file", "[unit]") {
  tw::test::ScratchDir dir("output-abandon");
  const fs::path final_path = dir / "run.h5";

  SECTION("no previous file") {
    {
      OutputFile out(final_path.string());
      Series s = out.create_series("snapshots", two_columns, 4, 1, true);
      s.append(0.0, 0, row_values(0, 2, 4));
      out.flush();
      CHECK(fs::exists(out.temporary_path()));
    }
    CHECK(directory_entries(dir.path()).empty());
  }
  SECTION("a previous file at the final path stays intact") {
    tw::test::write_text(final_path, "previous run\n");
    try {
      OutputFile out(final_path.string());
      out.write_grid(std::vector<double>{0.5}, std::vector<double>{0.0, 1.0});
      throw std::runtime_error("simulated failure during the run");
    } catch (const std::runtime_error&) {
    }
    CHECK(read_file(final_path) == "previous run\n");
    CHECK(directory_entries(dir.path()) == std::vector<std::string>{"run.h5"});
  }
}

TEST_CASE("output: a failed or interrupted run is marked incomplete", "[unit]") {
  tw::test::ScratchDir dir("output-failed");
  const std::string outcome = GENERATE(std::string("failed"), std::string("interrupted"));
  const std::string path = (dir / (outcome + ".h5")).string();
  {
    OutputFile out(path);
    Series s = out.create_series("history", {{"mass", "kg m^-2", "mass per area"}}, 1, 8, false);
    for (int i = 0; i < 3; ++i) s.append(i, i, std::vector<double>{2.0 * i});
    out.close_as(outcome, "non-finite density in cell 17 at x = 0.42 m", 3, 2e-7, 1.5);
  }
  const H5Reader r(path);
  CHECK_FALSE(r.is_complete());
  CHECK(r.attr_int("/", "complete") == 0);
  CHECK(r.attr_string("/status", "outcome") == outcome);
  CHECK(r.attr_string("/status", "message") == "non-finite density in cell 17 at x = 0.42 m");
  // The rows written before the failure are all there.
  CHECK(r.read_real("/history/mass") == std::vector<double>{0.0, 2.0, 4.0});
  CHECK_THROWS_AS(H5Reader::open_complete_or_throw(path), tw::InputError);
  CHECK_THROWS_WITH(H5Reader::open_complete_or_throw(path),
                    Catch::Matchers::StartsWith(path + " is incomplete (the run did not finish or is still running)") &&
                        Catch::Matchers::Contains("outcome '" + outcome + "' at t = ") &&
                        Catch::Matchers::Contains("non-finite density in cell 17"));
}

TEST_CASE("output: every numeric dataset carries units", "[unit]") {
  tw::test::ScratchDir dir("output-units");
  const std::string path = (dir / "run.h5").string();
  {
    OutputFile out(path);
    out.write_provenance(Provenance{});
    out.write_parameters({{"sound_speed", 1.0e4, "m/s", "ion sound speed"}});
    out.write_grid(std::vector<double>{0.5, 1.5}, std::vector<double>{0.0, 1.0, 2.0});
    Series s = out.create_series("probes", two_columns, 2, 16, false);
    s.append(0.0, 0, row_values(0, 2, 2));
    out.close_as("completed", "", 1, 0.0, 0.0);
  }
  const H5Reader r(path);
  int numeric = 0;
  walk(r, "/", [&](const std::string& p) {
    if (!r.is_numeric(p)) return;
    ++numeric;
    INFO(p);
    REQUIRE(r.has_attribute(p, "units"));
    CHECK_FALSE(r.attr_string(p, "units").empty());
    CHECK(r.has_attribute(p, "description"));
  });
  // provenance/threads, 1 parameter, 2 grid, time + step + 2 columns
  CHECK(numeric == 8);
  CHECK(r.attr_string("/probes/time", "units") == "s");
  CHECK(r.attr_string("/probes/step", "units") == "1");
}

TEST_CASE("output: errors name the path and the problem", "[unit]") {
  tw::test::ScratchDir dir("output-errors");

  SECTION("missing directory") {
    const std::string path = (dir / "no-such-dir" / "run.h5").string();
    CHECK_THROWS_AS(OutputFile(path), tw::RunError);
    CHECK_THROWS_WITH(OutputFile(path), Catch::Matchers::Contains(path) &&
                                            Catch::Matchers::Contains("does not exist"));
    CHECK(directory_entries(dir.path()).empty());
  }
  SECTION("an uncreatable file reports the HDF5 cause") {
    // A final name of 250 characters is allowed, its temporary name (20 more) is not.
    const fs::path final_path = dir / (std::string(247, 'r') + ".h5");
    CHECK_THROWS_WITH(OutputFile(final_path.string()),
                      Catch::Matchers::Contains("cannot create file") &&
                          Catch::Matchers::Contains(final_path.string() + ".tmp."));
    CHECK(directory_entries(dir.path()).empty());
  }
  SECTION("a stale temporary file of a killed run with the same PID does not block a new run") {
    const fs::path final_path = dir / "run.h5";
    const std::string stale = final_path.string() + ".tmp." + std::to_string(::getpid());
    tw::test::write_text(stale, "left by a killed run\n");
    OutputFile out(final_path.string());
    out.close_as("completed", "", 0, 0.0, 0.0);
    CHECK(H5Reader(final_path.string()).is_complete());
    CHECK(read_file(stale) == "left by a killed run\n");  // not ours to delete
  }
  SECTION("misuse is an internal error") {
    OutputFile out((dir / "run.h5").string());
    Series s = out.create_series("snapshots", two_columns, 3, 1, false);
    CHECK_THROWS_WITH(s.append(0.0, 0, std::vector<double>{1.0, 2.0}),
                      Catch::Matchers::Contains("expected 6"));
    CHECK_THROWS_AS(out.create_series("snapshots", two_columns, 3, 1, false), tw::InternalError);
    CHECK_THROWS_AS(out.create_series("bad/name", two_columns, 3, 1, false), tw::InternalError);
    CHECK_THROWS_AS(out.close_as("finished", "", 0, 0, 0), tw::InternalError);
  }
}

TEST_CASE("h5read: clear errors for missing files and objects", "[unit]") {
  tw::test::ScratchDir dir("h5read-errors");
  const std::string missing = (dir / "none.h5").string();
  CHECK_THROWS_WITH(H5Reader(missing), "cannot open '" + missing + "': no such file");
  const fs::path text = dir / "notes.txt";
  tw::test::write_text(text, "not hdf5\n");
  CHECK_THROWS_WITH(H5Reader(text.string()), Catch::Matchers::Contains("not an HDF5 file"));

  const std::string path = (dir / "run.h5").string();
  {
    OutputFile out(path);
    out.write_grid(std::vector<double>{0.5}, std::vector<double>{0.0, 1.0});
    out.close_as("completed", "", 0, 0, 0);
  }
  const H5Reader r = H5Reader::open_complete_or_throw(path);
  CHECK(r.exists("/grid/x"));
  CHECK_FALSE(r.exists("/grid/y"));
  CHECK_FALSE(r.exists("/nothing/below"));
  CHECK(r.is_group("/grid"));
  CHECK_FALSE(r.is_dataset("/grid"));
  CHECK_THROWS_AS(r.read_real("/grid/y"), tw::InputError);
  CHECK_THROWS_WITH(r.read_real("/grid/y"), "'/grid/y' not found in file '" + path + "'");
  CHECK_THROWS_WITH(r.read_string("/grid/x"), Catch::Matchers::Contains("is not a string"));
  CHECK_THROWS_WITH(r.attr_string("/grid/x", "colour"),
                    Catch::Matchers::Contains("attribute 'colour'"));
  CHECK_THROWS_WITH(r.read_real("/grid"), Catch::Matchers::Contains("is not a dataset"));
}

// --- Append mode and partial publishing (continuing a run from a checkpoint) ---------------

namespace {

/// A file as a run leaves it when stopped: history (10 rows, chunks of 4) and snapshots (5
/// rows of width 3), a grid, closed as interrupted. Returns its run_id.
std::string interrupted_run(const std::string& path) {
  OutputFile out(path);
  out.write_grid(std::vector<double>{0.5, 1.5, 2.5}, std::vector<double>{0.0, 1.0, 2.0, 3.0});
  Series h = out.create_series("history", {{"mass", "kg m^-2", "mass per area"}}, 1, 4, false);
  Series s = out.create_series("snapshots", two_columns, 3, 1, true);
  for (int r = 0; r < 10; ++r) h.append(0.1 * r, r, std::vector<double>{cell_value(r, 0, 0)});
  for (int r = 0; r < 5; ++r) s.append(0.2 * r, 2 * r, row_values(r, 2, 3));
  out.close_as("interrupted", "stopped on request", 9, 0.9, 1.0);
  return out.run_id();
}

}  // namespace

TEST_CASE("output: append mode continues each series from the resume point", "[unit]") {
  tw::test::ScratchDir dir("output-append");
  const std::string path = (dir / "run.h5").string();
  const std::string id = interrupted_run(path);
  CHECK(id.size() == 32);
  CHECK(H5Reader(path).attr_string("/", "run_id") == id);
  const std::string before = read_file(path);
  {
    OutputFile out(path, tw::io::ResumePoint{id, {{"history", 6}, {"snapshots", 3}}, 1});
    CHECK(out.appending());
    CHECK(out.run_id() == id);
    // The file at the final path is untouched while the continued run writes its copy.
    CHECK(fs::exists(out.temporary_path()));
    CHECK(read_file(path) == before);
    CHECK_THROWS_AS(out.write_grid(std::vector<double>{0.5}, std::vector<double>{0.0, 1.0}),
                    tw::InternalError);
    Series h = out.create_series("history", {{"mass", "kg m^-2", "mass per area"}}, 1, 4, false);
    Series s = out.create_series("snapshots", two_columns, 3, 1, true);
    CHECK(h.rows() == 6);
    CHECK(s.rows() == 3);
    for (int r = 6; r < 12; ++r) h.append(0.1 * r, r, std::vector<double>{-cell_value(r, 0, 0)});
    s.append(0.6, 6, row_values(9, 2, 3));
    CHECK(out.series_rows() == std::map<std::string, std::size_t>{{"history", 12}, {"snapshots", 4}});
    out.close_as("completed", "", 11, 1.1, 2.0);
  }
  CHECK(directory_entries(dir.path()) == std::vector<std::string>{"run.h5"});
  const H5Reader r(path);
  CHECK(r.is_complete());
  CHECK(r.attr_string("/", "run_id") == id);
  CHECK(r.attr_int("/status", "restarts") == 1);
  CHECK(r.read_real("/grid/x") == std::vector<double>{0.5, 1.5, 2.5});
  // Rows before the resume point are the old ones, later rows the new ones.
  const auto mass = r.read_real("/history/mass");
  REQUIRE(mass.size() == 12);
  for (int k = 0; k < 12; ++k) CHECK(mass[static_cast<std::size_t>(k)] == (k < 6 ? 1 : -1) * cell_value(k, 0, 0));
  CHECK(r.read_real("/history/step") == std::vector<double>{0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11});
  std::vector<hsize_t> dims;
  const auto rho = r.read_real("/snapshots/density", &dims);
  CHECK(dims == std::vector<hsize_t>{4, 3});
  CHECK(rho[9] == cell_value(9, 0, 0));  // row 3 is the new one
  CHECK(rho[8] == cell_value(2, 0, 2));  // row 2 the old one
  CHECK(r.read_real("/snapshots/time") == std::vector<double>{0.0, 0.2, 0.4, 0.6});
}

TEST_CASE("output: append mode refuses an output that does not fit the resume point", "[unit]") {
  tw::test::ScratchDir dir("output-append-refused");
  const std::string path = (dir / "run.h5").string();
  const std::string id = interrupted_run(path);
  const std::string before = read_file(path);
  const std::map<std::string, std::size_t> rows{{"history", 6}, {"snapshots", 3}};
  using Catch::Matchers::Contains;

  SECTION("another run") {
    CHECK_THROWS_WITH(OutputFile(path, tw::io::ResumePoint{std::string(32, '0'), rows, 1}),
                      Contains("belongs to another run"));
  }
  SECTION("fewer rows than the resume point") {
    CHECK_THROWS_WITH(OutputFile(path, tw::io::ResumePoint{id, {{"history", 11}}, 1}),
                      Contains("series 'history' has 10 rows, the checkpoint needs 11"));
  }
  SECTION("a series the resume point does not know") {
    OutputFile out(path, tw::io::ResumePoint{id, {{"history", 6}}, 1});
    CHECK_THROWS_AS(out.create_series("snapshots", two_columns, 3, 1, true), tw::InputError);
  }
  SECTION("other columns or width") {
    OutputFile out(path, tw::io::ResumePoint{id, rows, 1});
    CHECK_THROWS_WITH(out.create_series("snapshots", two_columns, 4, 1, true), Contains("has width 3"));
    CHECK_THROWS_WITH(out.create_series("history", {{"energy", "J m^-2", "energy"}}, 1, 4, false),
                      Contains("has no column 'energy'"));
  }
  SECTION("not a run output") {
    const std::string other = (dir / "other.h5").string();
    tw::test::write_text(other, "text\n");
    CHECK_THROWS_AS(OutputFile(other, tw::io::ResumePoint{id, rows, 1}), tw::InputError);
    fs::remove(other);
  }
  SECTION("a missing output") {
    CHECK_THROWS_WITH(OutputFile((dir / "none.h5").string(), tw::io::ResumePoint{id, rows, 1}),
                      Contains("no such file"));
  }
  // Nothing changed and nothing was left behind.
  CHECK(read_file(path) == before);
  CHECK(directory_entries(dir.path()) == std::vector<std::string>{"run.h5"});
}

TEST_CASE("output: publish_partial places an incomplete copy while the run goes on", "[unit]") {
  tw::test::ScratchDir dir("output-publish");
  const std::string path = (dir / "run.h5").string();
  OutputFile out(path);
  Series h = out.create_series("history", {{"mass", "kg m^-2", "mass per area"}}, 1, 256, false);
  for (int r = 0; r < 3; ++r) h.append(r, r, std::vector<double>{1.0 * r});
  out.publish_partial("checkpoint at t = 2 s", 2, 2.0, 0.5);
  {
    const H5Reader r(path);
    CHECK(r.attr_int("/", "complete") == 0);
    CHECK(r.attr_string("/status", "outcome") == "running");
    CHECK(r.attr_string("/status", "message") == "checkpoint at t = 2 s");
    CHECK(r.read_real("/history/mass") == std::vector<double>{0.0, 1.0, 2.0});  // buffered rows too
    CHECK_THROWS_WITH(H5Reader::open_complete_or_throw(path),
                      Catch::Matchers::Contains("outcome 'running'") && Catch::Matchers::Contains("--restart"));
  }
  for (int r = 3; r < 5; ++r) h.append(r, r, std::vector<double>{1.0 * r});
  out.publish_partial("later", 4, 4.0, 1.0);
  CHECK(H5Reader(path).read_real("/history/mass").size() == 5);
  CHECK(directory_entries(dir.path()).size() == 2);  // the published copy and the open file
  out.close_as("completed", "", 4, 4.0, 1.0);
  const H5Reader r(path);
  CHECK(r.is_complete());
  CHECK(r.read_real("/history/mass") == std::vector<double>{0.0, 1.0, 2.0, 3.0, 4.0});
  CHECK(directory_entries(dir.path()) == std::vector<std::string>{"run.h5"});
}

TEST_CASE("h5read: only a complete run output passes the check readers use", "[unit]") {
  tw::test::ScratchDir dir("h5read-complete");
  const std::string path = (dir / "other.h5").string();
  // A file of another kind with complete = 1 (a checkpoint looks like this) is not a run.
  const hid_t f = H5Fcreate(path.c_str(), H5F_ACC_EXCL, H5P_DEFAULT, H5P_DEFAULT);
  REQUIRE(f >= 0);
  const hid_t space = H5Screate(H5S_SCALAR);
  const hid_t a = H5Acreate2(f, "complete", H5T_STD_I32LE, space, H5P_DEFAULT, H5P_DEFAULT);
  const int one = 1;
  H5Awrite(a, H5T_NATIVE_INT, &one);
  H5Aclose(a);
  H5Sclose(space);
  H5Fclose(f);
  CHECK(H5Reader(path).is_complete());
  CHECK_THROWS_WITH(H5Reader::open_complete_or_throw(path), Catch::Matchers::Contains("is not a tubewave run output"));
}
