#include "io/output.hpp"

#include <unistd.h>

#include <algorithm>
#include <array>
#include <ctime>
#include <filesystem>
#include <random>
#include <set>
#include <system_error>
#include <utility>

#include "core/error.hpp"
#include "core/time_stamp.hpp"
#include "io/file_ops.hpp"
#include "io/h5handle.hpp"
#include "io/h5read.hpp"
#include "tubewave/version.hpp"

namespace tw::io {

namespace fs = std::filesystem;
using h5::Handle;
using h5::Kind;

namespace {

/// Version of the layout documented in output.hpp; bump when it changes incompatibly.
constexpr int layout_version = 1;
/// Rows per chunk of the 1-D time and step datasets when the series' own chunk is smaller:
/// 1024 rows = 8 KiB, so per-row snapshot series do not get 8-byte chunks on their time axis.
constexpr hsize_t min_axis_chunk = 1024;

Handle own(hid_t id, Kind kind, const std::string& file, std::string_view op,
           std::string_view object = {}) {
  return h5::own<RunError>(id, kind, file, op, object);
}
void check(herr_t status, const std::string& file, std::string_view op,
           std::string_view object = {}) {
  h5::check<RunError>(status, file, op, object);
}

/// Variable-length UTF-8 string type: h5py reads such attributes as str.
Handle utf8_string_type(const std::string& file) {
  Handle t = own(H5Tcopy(H5T_C_S1), Kind::datatype, file, "create a string type");
  check(H5Tset_size(t.get(), H5T_VARIABLE), file, "create a string type");
  check(H5Tset_cset(t.get(), H5T_CSET_UTF8), file, "create a string type");
  return t;
}

Handle scalar_space(const std::string& file) {
  return own(H5Screate(H5S_SCALAR), Kind::dataspace, file, "create a scalar dataspace");
}

/// Group creation property list that records link creation order, so readers list
/// members (series columns, parameters) in the order they were written.
Handle ordered_group_plist(const std::string& file) {
  Handle p = own(H5Pcreate(H5P_GROUP_CREATE), Kind::plist, file, "create group properties");
  check(H5Pset_link_creation_order(p.get(), H5P_CRT_ORDER_TRACKED | H5P_CRT_ORDER_INDEXED), file,
        "set link creation order");
  return p;
}

Handle create_group(hid_t parent, const std::string& name, const std::string& file,
                    const std::string& object) {
  Handle gcpl = ordered_group_plist(file);
  return own(H5Gcreate2(parent, name.c_str(), H5P_DEFAULT, gcpl.get(), H5P_DEFAULT), Kind::group,
             file, "create group", object);
}

void write_string_attr(hid_t obj, const char* name, const std::string& value,
                       const std::string& file, const std::string& object) {
  Handle type = utf8_string_type(file);
  Handle space = scalar_space(file);
  const std::string what = object + "@" + name;
  Handle attr = own(H5Acreate2(obj, name, type.get(), space.get(), H5P_DEFAULT, H5P_DEFAULT),
                    Kind::attribute, file, "create attribute", what);
  const char* data = value.c_str();
  check(H5Awrite(attr.get(), type.get(), &data), file, "write attribute", what);
}

/// Integer attribute stored as a 64-bit signed integer.
void write_int_attr(hid_t obj, const char* name, long long value, const std::string& file,
                    const std::string& object) {
  Handle space = scalar_space(file);
  const std::string what = object + "@" + name;
  Handle attr = own(H5Acreate2(obj, name, H5T_STD_I64LE, space.get(), H5P_DEFAULT, H5P_DEFAULT),
                    Kind::attribute, file, "create attribute", what);
  check(H5Awrite(attr.get(), H5T_NATIVE_LLONG, &value), file, "write attribute", what);
}

/// Small integer attribute (format_version, complete) stored as a 32-bit signed integer.
void write_int32_attr(hid_t obj, const char* name, int value, const std::string& file,
                      const std::string& object) {
  Handle space = scalar_space(file);
  const std::string what = object + "@" + name;
  Handle attr = own(H5Acreate2(obj, name, H5T_STD_I32LE, space.get(), H5P_DEFAULT, H5P_DEFAULT),
                    Kind::attribute, file, "create attribute", what);
  check(H5Awrite(attr.get(), H5T_NATIVE_INT, &value), file, "write attribute", what);
}

void write_real_attr(hid_t obj, const char* name, real value, const std::string& file,
                     const std::string& object) {
  Handle space = scalar_space(file);
  const std::string what = object + "@" + name;
  Handle attr = own(H5Acreate2(obj, name, H5T_IEEE_F64LE, space.get(), H5P_DEFAULT, H5P_DEFAULT),
                    Kind::attribute, file, "create attribute", what);
  check(H5Awrite(attr.get(), H5T_NATIVE_DOUBLE, &value), file, "write attribute", what);
}

void write_units(hid_t ds, const std::string& units, const std::string& description,
                 const std::string& file, const std::string& object) {
  write_string_attr(ds, "units", units, file, object);
  write_string_attr(ds, "description", description, file, object);
}

void write_string_dataset(hid_t group, const std::string& name, const std::string& value,
                          const std::string& file, const std::string& object) {
  Handle type = utf8_string_type(file);
  Handle space = scalar_space(file);
  Handle ds = own(H5Dcreate2(group, name.c_str(), type.get(), space.get(), H5P_DEFAULT, H5P_DEFAULT,
                             H5P_DEFAULT),
                  Kind::dataset, file, "create dataset", object);
  const char* data = value.c_str();
  check(H5Dwrite(ds.get(), type.get(), H5S_ALL, H5S_ALL, H5P_DEFAULT, &data), file, "write dataset",
        object);
}

/// 1-D float64 dataset with units, written in one piece.
void write_real_vector(hid_t group, const std::string& name, std::span<const real> values,
                       const std::string& units, const std::string& description,
                       const std::string& file, const std::string& object) {
  const hsize_t n = values.size();
  Handle space =
      own(H5Screate_simple(1, &n, nullptr), Kind::dataspace, file, "create dataspace", object);
  Handle ds = own(H5Dcreate2(group, name.c_str(), H5T_IEEE_F64LE, space.get(), H5P_DEFAULT,
                             H5P_DEFAULT, H5P_DEFAULT),
                  Kind::dataset, file, "create dataset", object);
  if (n > 0) {
    check(H5Dwrite(ds.get(), H5T_NATIVE_DOUBLE, H5S_ALL, H5S_ALL, H5P_DEFAULT, values.data()), file,
          "write dataset", object);
  }
  write_units(ds.get(), units, description, file, object);
}

/// A name usable as one HDF5 link: non-empty, no '/', not "." (which would alias a group).
bool valid_link_name(const std::string& name) {
  return !name.empty() && name != "." && name.find('/') == std::string::npos;
}

bool link_exists(hid_t loc, const std::string& name) {
  return H5Lexists(loc, name.c_str(), H5P_DEFAULT) > 0;
}

/// 32 hexadecimal digits from the system's random source: tells runs apart, so a
/// checkpoint is never continued into another run's output.
std::string new_run_id() {
  std::random_device rd;
  std::string id;
  constexpr const char* digits = "0123456789abcdef";
  for (int i = 0; i < 4; ++i) {
    const unsigned v = rd();
    for (int k = 0; k < 8; ++k) id += digits[(v >> (4 * k)) & 0xFu];
  }
  return id;
}

/// A temporary name next to `path`: "<path>.tmp.<pid>.<6 hex digits>". The random part
/// keeps a writer from colliding with a file left by a killed run that had the same PID
/// (runs in containers often do).
std::string unique_temporary_name(const std::string& path) {
  return temporary_name(path) + "." + new_run_id().substr(0, 6);
}

/// The /status group: how the run ended (or "running" for a published partial copy).
void write_status(hid_t root, const std::string& outcome, const std::string& message, long steps,
                  real simulated_time, real wall_seconds, int restarts, const std::string& file) {
  Handle g = create_group(root, "status", file, "/status");
  write_string_attr(g.get(), "outcome", outcome, file, "/status");
  write_string_attr(g.get(), "message", message, file, "/status");
  write_int_attr(g.get(), "steps", steps, file, "/status");
  write_real_attr(g.get(), "simulated_time", simulated_time, file, "/status");
  write_real_attr(g.get(), "wall_seconds", wall_seconds, file, "/status");
  write_int_attr(g.get(), "restarts", restarts, file, "/status");
}

/// Set the root attribute "complete" of an open file.
void set_complete(hid_t root, int value, const std::string& file) {
  Handle attr = own(H5Aopen(root, "complete", H5P_DEFAULT), Kind::attribute, file,
                    "open attribute", "/@complete");
  check(H5Awrite(attr.get(), H5T_NATIVE_INT, &value), file, "write attribute", "/@complete");
}

/// File access properties of every writable file: strong close, so H5Fclose really closes
/// the file (no identifier can keep it open) before a rename.
Handle strong_close_fapl(const std::string& file) {
  Handle fapl = own(H5Pcreate(H5P_FILE_ACCESS), Kind::plist, file, "create file access properties");
  check(H5Pset_fclose_degree(fapl.get(), H5F_CLOSE_STRONG), file, "set file close degree");
  return fapl;
}

/// An extendable dataset of one series: [rows] (time, step) or [rows, width] (columns).
struct SeriesDataset {
  Handle ds;
  std::string object;  ///< full HDF5 path, for messages
  int rank = 2;
};

/// State of one series. Rows are buffered per column (each column's buffer is the
/// row-major [n, width] block HDF5 expects) and written when rows_per_chunk rows are
/// waiting, so a block always starts on a chunk boundary unless flush() wrote a partial one.
struct SeriesState {
  std::string file;  ///< temporary file path, for messages
  std::string group;
  int width = 0;
  int rows_per_chunk = 1;
  Handle group_handle;
  SeriesDataset time;
  SeriesDataset step;
  std::vector<SeriesDataset> columns;

  std::size_t rows_written = 0;
  std::vector<real> time_buffer;
  std::vector<long long> step_buffer;
  std::vector<std::vector<real>> column_buffers;
  bool open = true;

  [[nodiscard]] std::size_t rows_buffered() const { return time_buffer.size(); }

  void append(real t, long step_index, std::span<const real> values) {
    if (!open) {
      throw InternalError("series '" + group + "' appended after its output file '" + file +
                          "' was closed");
    }
    const std::size_t w = static_cast<std::size_t>(width);
    if (values.size() != w * columns.size()) {
      throw InternalError("series '" + group + "': append got " + std::to_string(values.size()) +
                          " values, expected " + std::to_string(w * columns.size()) + " (" +
                          std::to_string(columns.size()) + " columns x width " +
                          std::to_string(width) + ")");
    }
    time_buffer.push_back(t);
    step_buffer.push_back(step_index);
    for (std::size_t c = 0; c < columns.size(); ++c) {
      const auto first = values.begin() + static_cast<std::ptrdiff_t>(c * w);
      column_buffers[c].insert(column_buffers[c].end(), first,
                               first + static_cast<std::ptrdiff_t>(w));
    }
    if (rows_buffered() >= static_cast<std::size_t>(rows_per_chunk)) write_buffered();
  }

  /// Write every buffered row to the file (a partial chunk if fewer than rows_per_chunk).
  void write_buffered() {
    const std::size_t n = rows_buffered();
    if (n == 0 || !open) return;
    const hsize_t first = rows_written;
    const hsize_t count = n;
    write_block(time, first, count, H5T_NATIVE_DOUBLE, time_buffer.data());
    write_block(step, first, count, H5T_NATIVE_LLONG, step_buffer.data());
    for (std::size_t c = 0; c < columns.size(); ++c) {
      write_block(columns[c], first, count, H5T_NATIVE_DOUBLE, column_buffers[c].data());
    }
    rows_written += n;
    time_buffer.clear();
    step_buffer.clear();
    for (auto& b : column_buffers) b.clear();
  }

  void write_block(const SeriesDataset& d, hsize_t first, hsize_t count, hid_t mem_type,
                   const void* data) const {
    const std::array<hsize_t, 2> extent{first + count, static_cast<hsize_t>(width)};
    check(H5Dset_extent(d.ds.get(), extent.data()), file, "extend dataset", d.object);
    Handle file_space =
        own(H5Dget_space(d.ds.get()), Kind::dataspace, file, "get dataspace of", d.object);
    const std::array<hsize_t, 2> start{first, 0};
    const std::array<hsize_t, 2> block{count, static_cast<hsize_t>(width)};
    check(H5Sselect_hyperslab(file_space.get(), H5S_SELECT_SET, start.data(), nullptr, block.data(),
                              nullptr),
          file, "select rows of", d.object);
    Handle mem_space = own(H5Screate_simple(d.rank, block.data(), nullptr), Kind::dataspace, file,
                           "create memory dataspace for", d.object);
    check(H5Dwrite(d.ds.get(), mem_type, mem_space.get(), file_space.get(), H5P_DEFAULT, data),
          file, "write rows to", d.object);
  }

  /// Release every HDF5 handle; later appends fail. Buffered rows are dropped (callers
  /// that want them written call write_buffered() first).
  void close() noexcept {
    open = false;
    for (auto& c : columns) c.ds.reset();
    time.ds.reset();
    step.ds.reset();
    group_handle.reset();
  }
};

/// Append mode: open the existing series `st.group` (its name, file and width are set), check
/// it has exactly the declared columns and width, and cut every dataset back to `keep` rows.
/// `shown` is the output's final path, for messages.
void reopen_series(SeriesState& st, hid_t root, const std::vector<ColumnInfo>& columns,
                   std::size_t keep, const std::string& shown) {
  const std::string& file = st.file;
  const std::string prefix = "/" + st.group + "/";
  const std::string where = "cannot continue the output '" + shown + "': ";
  if (!link_exists(root, st.group))
    throw InputError(where + "it has no series '" + st.group + "'");
  st.group_handle =
      own(H5Gopen2(root, st.group.c_str(), H5P_DEFAULT), Kind::group, file, "open group", "/" + st.group);
  const hid_t g = st.group_handle.get();
  H5G_info_t info{};
  check(H5Gget_info(g, &info), file, "list group", "/" + st.group);
  if (info.nlinks != columns.size() + 2)
    throw InputError(where + "series '" + st.group + "' has " + std::to_string(info.nlinks - 2) +
                     " columns, the run writes " + std::to_string(columns.size()));
  auto open = [&](const std::string& name, int rank) {
    SeriesDataset d;
    d.object = prefix + name;
    d.rank = rank;
    if (!link_exists(g, name))
      throw InputError(where + "series '" + st.group + "' has no column '" + name + "'");
    d.ds = own(H5Dopen2(g, name.c_str(), H5P_DEFAULT), Kind::dataset, file, "open dataset", d.object);
    Handle space = own(H5Dget_space(d.ds.get()), Kind::dataspace, file, "get dataspace of", d.object);
    std::array<hsize_t, 2> dims{0, 0};
    if (H5Sget_simple_extent_ndims(space.get()) != rank ||
        H5Sget_simple_extent_dims(space.get(), dims.data(), nullptr) < 0)
      throw InputError(where + "'" + d.object + "' does not have rank " + std::to_string(rank));
    if (rank == 2 && dims[1] != static_cast<hsize_t>(st.width))
      throw InputError(where + "'" + d.object + "' has width " + std::to_string(dims[1]) +
                       ", the run writes " + std::to_string(st.width));
    if (dims[0] < keep)
      throw InputError(where + "'" + d.object + "' has " + std::to_string(dims[0]) +
                       " rows, the checkpoint needs " + std::to_string(keep));
    const std::array<hsize_t, 2> extent{keep, static_cast<hsize_t>(st.width)};
    check(H5Dset_extent(d.ds.get(), extent.data()), file, "cut back", d.object);
    return d;
  };
  st.time = open("time", 1);
  st.step = open("step", 1);
  for (const ColumnInfo& c : columns) st.columns.push_back(open(c.name, 2));
  st.rows_written = keep;
}

}  // namespace

struct Series::Impl : SeriesState {};

struct OutputFile::Impl {
  std::string final_path;
  std::string temp_path;
  Handle file;
  bool created = false;  ///< the temporary file is ours (so ours to remove)
  bool closed = false;   ///< close_as() completed: the file now lives at final_path
  bool appending = false;               ///< append mode: the header exists already
  std::string run_id;                   ///< root attribute run_id
  int restarts = 0;                     ///< written to /status
  std::map<std::string, std::size_t> resume_rows;  ///< append mode: rows each series keeps
  std::set<std::string> scalars_written;           ///< write_scalars groups of this run segment
  std::vector<std::shared_ptr<SeriesState>> series;
  std::string length_unit = "m";  ///< of /grid and probe positions (set_axis_units)
  std::string time_unit = "s";    ///< of every series' time column

  Impl(std::string final, std::string temp)
      : final_path(std::move(final)), temp_path(std::move(temp)) {}
  Impl(const Impl&) = delete;
  Impl& operator=(const Impl&) = delete;

  ~Impl() {
    // Never throws: an abandoned run leaves nothing behind.
    for (auto& s : series) s->close();
    file.reset();
    if (created && !closed) {
      std::error_code ec;
      fs::remove(temp_path, ec);
    }
  }

  void require_open(const char* what) const {
    if (closed || !file.valid()) {
      throw InternalError(std::string(what) + " called after close_as() on output file '" +
                          final_path + "'");
    }
  }

  void require_new(const char* what) const {
    if (appending)
      throw InternalError(std::string(what) + " called on output file '" + final_path +
                          "' opened to continue a run (its header exists)");
  }

  void write_buffered_rows() {
    for (auto& s : series) s->write_buffered();
  }

  void flush_file() { check(H5Fflush(file.get(), H5F_SCOPE_GLOBAL), temp_path, "flush"); }
};

// --- Series ----------------------------------------------------------------------------------

void Series::append(real t, long step, std::span<const real> values) {
  if (!impl_) throw InternalError("Series::append on a series not made by create_series()");
  impl_->append(t, step, values);
}

std::size_t Series::rows() const {
  return impl_ ? impl_->rows_written + impl_->rows_buffered() : 0;
}

std::size_t Series::rows_written() const { return impl_ ? impl_->rows_written : 0; }

int Series::width() const { return impl_ ? impl_->width : 0; }

int Series::n_columns() const { return impl_ ? static_cast<int>(impl_->columns.size()) : 0; }

const std::string& Series::name() const {
  static const std::string none;
  return impl_ ? impl_->group : none;
}

// --- OutputFile ------------------------------------------------------------------------------

OutputFile::OutputFile(std::string final_path) {
  h5::silence_error_printing();
  const std::string temp = unique_temporary_name(final_path);
  impl_ = std::make_unique<Impl>(std::move(final_path), temp);
  impl_->run_id = new_run_id();
  const std::string& fin = impl_->final_path;

  // The output directory must exist: creating directories is the user's decision.
  fs::path dir = fs::path(fin).parent_path();
  if (dir.empty()) dir = ".";
  std::error_code ec;
  if (!fs::is_directory(dir, ec)) {
    throw RunError("cannot create output file '" + fin + "': directory '" + dir.string() +
                   "' does not exist");
  }
  if (fs::is_directory(fin, ec)) {
    throw RunError("cannot create output file '" + fin + "': a directory of that name exists");
  }

  Handle fapl = strong_close_fapl(temp);
  Handle fcpl = own(H5Pcreate(H5P_FILE_CREATE), Kind::plist, temp, "create file properties");
  check(H5Pset_link_creation_order(fcpl.get(), H5P_CRT_ORDER_TRACKED | H5P_CRT_ORDER_INDEXED), temp,
        "set link creation order");
  // H5F_ACC_EXCL: never clobber an existing file of that name (another writer of the same
  // final path in this process, or a stale temporary that is not ours to delete).
  impl_->file = own(H5Fcreate(temp.c_str(), H5F_ACC_EXCL, fcpl.get(), fapl.get()), Kind::file, temp,
                    "create");
  impl_->created = true;

  const hid_t root = impl_->file.get();
  write_string_attr(root, "format", "tubewave-run", temp, "/");
  write_int32_attr(root, "format_version", layout_version, temp, "/");
  write_int32_attr(root, "complete", 0, temp, "/");
  write_string_attr(root, "created", utc_now_iso8601(), temp, "/");
  write_string_attr(root, "run_id", impl_->run_id, temp, "/");
}

OutputFile::OutputFile(std::string final_path, const ResumePoint& resume) {
  h5::silence_error_printing();
  const std::string temp = unique_temporary_name(final_path);
  impl_ = std::make_unique<Impl>(std::move(final_path), temp);
  Impl& im = *impl_;
  const std::string& fin = im.final_path;
  im.appending = true;
  im.run_id = resume.run_id;
  im.restarts = resume.restarts;
  im.resume_rows = resume.series_rows;

  // Check the file read-only before copying it: a wrong file is refused untouched.
  {
    const H5Reader r(fin);
    if (!r.has_attribute("/", "format") || r.attr_string("/", "format") != "tubewave-run")
      throw InputError("cannot continue the output '" + fin + "': it is not a tubewave run file");
    const std::string id = r.has_attribute("/", "run_id") ? r.attr_string("/", "run_id") : "";
    if (id != resume.run_id)
      throw InputError("cannot continue the output '" + fin + "': it belongs to another run (run_id '" +
                       id + "', the checkpoint's run is '" + resume.run_id +
                       "'); give the output that was written with the checkpoint (-o FILE)");
    for (const auto& [group, rows] : resume.series_rows) {
      const std::string t = "/" + group + "/time";
      const bool present = r.is_dataset(t) && r.shape(t).size() == 1;
      const std::size_t have = present ? r.shape(t)[0] : 0;
      if (!present || have < rows)
        throw InputError("cannot continue the output '" + fin + "': series '" + group + "' has " +
                         std::to_string(have) + " rows, the checkpoint needs " +
                         std::to_string(rows) + " (an older copy of the output?)");
    }
  }
  copy_new_file(fin, temp);
  im.created = true;
  Handle fapl = strong_close_fapl(temp);
  im.file = own(H5Fopen(temp.c_str(), H5F_ACC_RDWR, fapl.get()), Kind::file, temp, "open");
  const hid_t root = im.file.get();
  // How the earlier segment ended, and results measured on a finished file, no longer hold.
  for (const char* stale : {"status", "measurements"})
    if (link_exists(root, stale))
      check(H5Ldelete(root, stale, H5P_DEFAULT), temp, "remove", std::string("/") + stale);
  set_complete(root, 0, temp);
}

OutputFile::~OutputFile() = default;

const std::string& OutputFile::final_path() const { return impl_->final_path; }
const std::string& OutputFile::temporary_path() const { return impl_->temp_path; }
const std::string& OutputFile::run_id() const { return impl_->run_id; }
bool OutputFile::appending() const { return impl_->appending; }

std::map<std::string, std::size_t> OutputFile::series_rows() const {
  std::map<std::string, std::size_t> rows;
  for (const auto& s : impl_->series) rows[s->group] = s->rows_written + s->rows_buffered();
  return rows;
}

void OutputFile::write_provenance(const Provenance& p) {
  impl_->require_open("write_provenance");
  impl_->require_new("write_provenance");
  const std::string& file = impl_->temp_path;
  const hid_t root = impl_->file.get();
  TW_CHECK(!link_exists(root, "provenance"), "provenance written twice to " + file);

  write_string_attr(root, "title", p.title, file, "/");
  write_string_attr(root, "model", p.model, file, "/");

  Handle g = create_group(root, "provenance", file, "/provenance");
  const std::array<std::pair<const char*, std::string>, 9> entries{{
      {"run_file", p.run_file_text},
      {"run_file_name", p.run_file_name},
      {"overrides", p.overrides},
      {"resolved_run_file", p.resolved_run_file},
      {"tubewave_version", tw::build::version},
      {"git_revision", tw::build::git_revision},
      {"compiler", tw::build::compiler},
      {"build_type", tw::build::build_type},
      {"build_flags", tw::build::flags},
  }};
  for (const auto& [name, value] : entries) {
    write_string_dataset(g.get(), name, value, file, std::string("/provenance/") + name);
  }

  const std::string object = "/provenance/threads";
  Handle space = scalar_space(file);
  Handle ds = own(H5Dcreate2(g.get(), "threads", H5T_STD_I32LE, space.get(), H5P_DEFAULT,
                             H5P_DEFAULT, H5P_DEFAULT),
                  Kind::dataset, file, "create dataset", object);
  check(H5Dwrite(ds.get(), H5T_NATIVE_INT, H5S_ALL, H5S_ALL, H5P_DEFAULT, &p.threads), file,
        "write dataset", object);
  write_units(ds.get(), "1", "number of threads the run used", file, object);
}

void OutputFile::write_parameters(const std::vector<ParameterValue>& params) {
  impl_->require_open("write_parameters");
  impl_->require_new("write_parameters");
  const std::string& file = impl_->temp_path;
  const hid_t root = impl_->file.get();
  Handle g = link_exists(root, "parameters")
                 ? own(H5Gopen2(root, "parameters", H5P_DEFAULT), Kind::group, file, "open group",
                       "/parameters")
                 : create_group(root, "parameters", file, "/parameters");
  Handle space = scalar_space(file);
  for (const ParameterValue& p : params) {
    TW_CHECK(valid_link_name(p.name), "invalid parameter name '" + p.name + "'");
    TW_CHECK(!link_exists(g.get(), p.name), "parameter '" + p.name + "' written twice");
    const std::string object = "/parameters/" + p.name;
    Handle ds = own(H5Dcreate2(g.get(), p.name.c_str(), H5T_IEEE_F64LE, space.get(), H5P_DEFAULT,
                               H5P_DEFAULT, H5P_DEFAULT),
                    Kind::dataset, file, "create dataset", object);
    check(H5Dwrite(ds.get(), H5T_NATIVE_DOUBLE, H5S_ALL, H5S_ALL, H5P_DEFAULT, &p.value), file,
          "write dataset", object);
    write_units(ds.get(), p.units, p.description, file, object);
  }
}

void OutputFile::write_scalars(const std::string& path, const std::vector<ParameterValue>& values,
                               const std::vector<std::pair<std::string, std::string>>& attributes) {
  impl_->require_open("write_scalars");
  const std::string& file = impl_->temp_path;
  Handle g;
  std::string object;
  std::size_t start = 0;
  while (start <= path.size()) {
    const auto slash = path.find('/', start);
    const std::string part = path.substr(start, slash == std::string::npos ? std::string::npos : slash - start);
    TW_CHECK(valid_link_name(part), "invalid group path '" + path + "'");
    const hid_t parent = g.valid() ? g.get() : impl_->file.get();
    object += "/" + part;
    const bool last = slash == std::string::npos;
    // Append mode: the summaries the stopped segment wrote at its end are replaced.
    if (last && impl_->appending && impl_->scalars_written.insert(path).second && link_exists(parent, part))
      check(H5Ldelete(parent, part.c_str(), H5P_DEFAULT), file, "remove", object);
    g = link_exists(parent, part) ? own(H5Gopen2(parent, part.c_str(), H5P_DEFAULT), Kind::group, file, "open group", object)
                                  : create_group(parent, part, file, object);
    if (last) break;
    start = slash + 1;
  }
  Handle space = scalar_space(file);
  for (const ParameterValue& p : values) {
    TW_CHECK(valid_link_name(p.name), "invalid dataset name '" + p.name + "'");
    TW_CHECK(!link_exists(g.get(), p.name), "'" + p.name + "' written twice in " + object);
    const std::string obj = object + "/" + p.name;
    Handle ds = own(H5Dcreate2(g.get(), p.name.c_str(), H5T_IEEE_F64LE, space.get(), H5P_DEFAULT,
                               H5P_DEFAULT, H5P_DEFAULT),
                    Kind::dataset, file, "create dataset", obj);
    check(H5Dwrite(ds.get(), H5T_NATIVE_DOUBLE, H5S_ALL, H5S_ALL, H5P_DEFAULT, &p.value), file,
          "write dataset", obj);
    write_units(ds.get(), p.units, p.description, file, obj);
  }
  for (const auto& [name, value] : attributes) write_string_attr(g.get(), name.c_str(), value, file, object);
}

void OutputFile::set_axis_units(const std::string& length, const std::string& time) {
  impl_->length_unit = length;
  impl_->time_unit = time;
}

void OutputFile::write_grid(std::span<const real> x_centres, std::span<const real> x_faces,
                            std::span<const real> probe_positions) {
  impl_->require_open("write_grid");
  impl_->require_new("write_grid");
  TW_CHECK(x_faces.size() == x_centres.size() + 1, "grid has " + std::to_string(x_centres.size()) +
                                                       " cells but " +
                                                       std::to_string(x_faces.size()) + " faces");
  const std::string& file = impl_->temp_path;
  const hid_t root = impl_->file.get();
  TW_CHECK(!link_exists(root, "grid"), "grid written twice to " + file);
  Handle g = create_group(root, "grid", file, "/grid");
  const std::string& m = impl_->length_unit;
  write_real_vector(g.get(), "x", x_centres, m, "cell centre positions", file, "/grid/x");
  write_real_vector(g.get(), "x_faces", x_faces, m, "cell face positions (n_cells + 1)", file, "/grid/x_faces");
  if (!probe_positions.empty())
    write_real_vector(g.get(), "probe_x", probe_positions, m, "probe positions (the columns of /probes)", file,
                      "/grid/probe_x");
}

Series OutputFile::create_series(const std::string& group, const std::vector<ColumnInfo>& columns,
                                 int width, int rows_per_chunk, bool compress) {
  impl_->require_open("create_series");
  const std::string& file = impl_->temp_path;
  const hid_t root = impl_->file.get();
  TW_CHECK(valid_link_name(group), "invalid series name '" + group + "'");
  TW_CHECK(impl_->appending || !link_exists(root, group), "'" + group + "' already exists in " + file);
  for (const auto& s : impl_->series)
    TW_CHECK(s->group != group, "series '" + group + "' declared twice in " + file);
  TW_CHECK(!columns.empty(), "series '" + group + "' has no columns");
  TW_CHECK(width >= 1, "series '" + group + "' has width " + std::to_string(width));
  TW_CHECK(rows_per_chunk >= 1,
           "series '" + group + "' has rows_per_chunk " + std::to_string(rows_per_chunk));
  for (std::size_t i = 0; i < columns.size(); ++i) {
    const std::string& n = columns[i].name;
    TW_CHECK(valid_link_name(n) && n != "time" && n != "step",
             "invalid column name '" + n + "' in series '" + group + "'");
    for (std::size_t j = 0; j < i; ++j) {
      TW_CHECK(columns[j].name != n, "column '" + n + "' twice in series '" + group + "'");
    }
  }

  auto state = std::make_shared<Series::Impl>();
  state->file = file;
  state->group = group;
  state->width = width;
  state->rows_per_chunk = rows_per_chunk;
  if (impl_->appending) {
    const auto keep = impl_->resume_rows.find(group);
    if (keep == impl_->resume_rows.end())
      throw InputError("cannot continue the output '" + impl_->final_path + "': the checkpoint has no record of series '" +
                       group + "' (written by another version of tubewave?)");
    reopen_series(*state, root, columns, keep->second, impl_->final_path);
    state->column_buffers.resize(columns.size());
    impl_->series.push_back(state);
    Series s;
    s.impl_ = std::move(state);
    return s;
  }
  const std::string prefix = "/" + group + "/";
  state->group_handle = create_group(root, group, file, "/" + group);
  const hid_t g = state->group_handle.get();

  auto make = [&](const std::string& name, int rank, hid_t file_type, hsize_t chunk_rows,
                  bool deflate, const std::string& units,
                  const std::string& description) -> SeriesDataset {
    SeriesDataset d;
    d.object = prefix + name;
    d.rank = rank;
    const std::array<hsize_t, 2> dims{0, static_cast<hsize_t>(width)};
    const std::array<hsize_t, 2> max_dims{H5S_UNLIMITED, static_cast<hsize_t>(width)};
    const std::array<hsize_t, 2> chunk{chunk_rows, static_cast<hsize_t>(width)};
    Handle space = own(H5Screate_simple(rank, dims.data(), max_dims.data()), Kind::dataspace, file,
                       "create dataspace", d.object);
    Handle dcpl = own(H5Pcreate(H5P_DATASET_CREATE), Kind::plist, file, "create dataset properties",
                      d.object);
    check(H5Pset_chunk(dcpl.get(), rank, chunk.data()), file, "set chunking of", d.object);
    if (deflate) {
      check(H5Pset_shuffle(dcpl.get()), file, "set shuffle filter of", d.object);
      check(H5Pset_deflate(dcpl.get(), 4), file, "set deflate filter of", d.object);
    }
    d.ds = own(
        H5Dcreate2(g, name.c_str(), file_type, space.get(), H5P_DEFAULT, dcpl.get(), H5P_DEFAULT),
        Kind::dataset, file, "create dataset", d.object);
    write_units(d.ds.get(), units, description, file, d.object);
    return d;
  };

  const hsize_t axis_chunk =
      std::max<hsize_t>(static_cast<hsize_t>(rows_per_chunk), min_axis_chunk);
  state->time =
      make("time", 1, H5T_IEEE_F64LE, axis_chunk, false, impl_->time_unit, "simulation time of each row");
  state->step =
      make("step", 1, H5T_STD_I64LE, axis_chunk, false, "1", "time step index of each row");
  for (const ColumnInfo& c : columns) {
    state->columns.push_back(make(c.name, 2, H5T_IEEE_F64LE, static_cast<hsize_t>(rows_per_chunk),
                                  compress, c.units, c.description));
  }
  state->column_buffers.resize(columns.size());
  const std::size_t buffer_values =
      static_cast<std::size_t>(rows_per_chunk) * static_cast<std::size_t>(width);
  for (auto& b : state->column_buffers) b.reserve(buffer_values);
  state->time_buffer.reserve(static_cast<std::size_t>(rows_per_chunk));
  state->step_buffer.reserve(static_cast<std::size_t>(rows_per_chunk));

  impl_->series.push_back(state);
  Series s;
  s.impl_ = std::move(state);
  return s;
}

void OutputFile::flush() {
  impl_->require_open("flush");
  impl_->write_buffered_rows();
  impl_->flush_file();
}

void OutputFile::publish_partial(const std::string& message, long steps, real simulated_time,
                                 real wall_seconds) {
  impl_->require_open("publish_partial");
  Impl& im = *impl_;
  im.write_buffered_rows();
  im.flush_file();
  // The flushed file on disk is a consistent HDF5 file; copy it, mark the copy as a run in
  // progress, and put it in place atomically. The open file is not touched.
  const std::string copy = unique_temporary_name(im.final_path);
  try {
    copy_new_file(im.temp_path, copy);
    {
      Handle fapl = strong_close_fapl(copy);
      Handle f = own(H5Fopen(copy.c_str(), H5F_ACC_RDWR, fapl.get()), Kind::file, copy, "open");
      write_status(f.get(), "running", message, steps, simulated_time, wall_seconds, im.restarts, copy);
      check(f.close(), copy, "close");
    }
    replace_file(copy, im.final_path);
  } catch (...) {
    std::error_code ec;
    fs::remove(copy, ec);
    throw;
  }
}

void OutputFile::close_as(const std::string& outcome, const std::string& message, long steps,
                          real simulated_time, real wall_seconds) {
  impl_->require_open("close_as");
  TW_CHECK(outcome == "completed" || outcome == "failed" || outcome == "interrupted",
           "unknown outcome '" + outcome + "'");
  Impl& im = *impl_;
  const std::string& file = im.temp_path;
  const hid_t root = im.file.get();

  im.write_buffered_rows();
  write_status(root, outcome, message, steps, simulated_time, wall_seconds, im.restarts, file);
  for (auto& s : im.series) s->close();
  // Everything else reaches the disk before "complete" says so.
  im.flush_file();
  if (outcome == "completed") {
    set_complete(root, 1, file);
    im.flush_file();
  }
  check(im.file.close(), file, "close");
  replace_file(im.temp_path, im.final_path);
  im.closed = true;
}

}  // namespace tw::io
