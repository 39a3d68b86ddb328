#pragma once
/// The run's HDF5 output file. The time loop calls this object; it knows the layout,
/// the time loop does not. Layout (documented in the README, "Output file"):
///
///   /                      attributes: format = "tubewave-run", format_version,
///                          complete (0/1: set last, after everything else is flushed),
///                          title, model, created (UTC ISO 8601), run_id (32 hex digits,
///                          random, kept by every continuation of the run)
///   /provenance            run_file (text as read), run_file_name, overrides,
///                          resolved_run_file (YAML), tubewave_version, git_revision,
///                          compiler, build_type, build_flags, threads  (all string or int
///                          datasets)
///   /parameters/<name>     scalar datasets of resolved/derived parameters, "units" and
///                          "description" attributes
///   /grid/x, /grid/x_faces cell centres and faces [m]
///   /<series>/time         [n_rows] seconds, plus /<series>/step [n_rows]
///   /<series>/<column>     [n_rows, width] for every declared column, "units" and
///                          "description" attributes. Series used by the solver:
///                          "snapshots" (width n_cells), "probes" (width n_probes),
///                          "history" (width 1: conserved totals, energy budget terms)
///   /status                attributes: outcome ("completed" | "failed" | "interrupted" |
///                          "running"), message, steps, simulated_time, wall_seconds,
///                          restarts (how many times the run was continued from a checkpoint)
///
/// Every numeric dataset carries a CF-style "units" string attribute (SI; "1" for
/// dimensionless). Strings are variable-length UTF-8: h5py (3.x) returns attributes as str,
/// but scalar string datasets (/provenance/*) as bytes, so read those with
/// `f["provenance/run_file"].asstr()[()]`. Groups record link creation order, so members
/// (columns, parameters) list in the order they were written (h5py follows it).
///
/// Atomicity: the file is written as "<path>.tmp.<pid>.<random>" and renamed to <path> by
/// `close_as()`; if the object is destroyed without that, the temporary file is removed.
/// A previous file at <path> is untouched until the rename. `publish_partial()` places a
/// copy of the file so far at <path>, marked incomplete (outcome "running"), while the run
/// goes on; checkpoints use it so that a run killed later still has its output up to the
/// checkpoint. The root attribute complete = 1 only ever reaches <path> in a file whose run
/// completed: readers check it (io::H5Reader::open_complete_or_throw).
///
/// Append mode (continuing a run from a checkpoint): the existing file at <path> is copied
/// to the temporary name and the copy is opened for writing; <path> itself stays as it was
/// until the continued run publishes or closes. `create_series` then reopens each existing
/// series, cut back to the rows the checkpoint recorded (rows written after the checkpoint
/// are dropped, so the continued run writes them again, identically). /status and
/// /measurements are removed (close_as writes the first anew; the second described the file
/// before), a write_scalars group replaces the one the stopped segment wrote, and the header
/// (provenance, parameters, grid) is kept.
#include <map>
#include <memory>
#include <span>
#include <string>
#include <utility>
#include <vector>

#include "core/types.hpp"

namespace tw::io {

/// Description of one output column (a field, a probe quantity, a history scalar).
struct ColumnInfo {
  std::string name;         ///< dataset name, e.g. "density", "magnetic_field_y"
  std::string units;        ///< CF "units" attribute, SI, e.g. "m^-3", "T", "1"
  std::string description;  ///< one line
};

/// A named scalar parameter written under /parameters.
struct ParameterValue {
  std::string name;
  real value = 0;
  std::string units;
  std::string description;
};

/// Build and run provenance written once under /provenance.
struct Provenance {
  std::string title;
  std::string model;
  std::string run_file_name;
  std::string run_file_text;
  std::string overrides;  ///< the --set arguments, one per line
  std::string resolved_run_file;
  int threads = 1;
};

/// What a continued run keeps of an existing output file (append mode).
struct ResumePoint {
  std::string run_id;                              ///< must equal the file's root run_id
  std::map<std::string, std::size_t> series_rows;  ///< rows each series keeps, by group name
  int restarts = 0;  ///< how many times the run has been continued, this time included
};

/// Handle to an extendable table of rows sharing a time axis (see layout above).
///
/// Copies share one table. Rows are buffered in memory and reach the file in blocks of
/// `rows_per_chunk` rows (one HDF5 write per dataset per block), on OutputFile::flush() and
/// on close_as(). Each column dataset is float64 [rows, width] with chunks
/// [rows_per_chunk, width] (shuffle + deflate level 4 when compressed); /<series>/time is
/// float64 and /<series>/step int64, both [rows], chunked by max(rows_per_chunk, 1024).
/// A Series must not be used after its OutputFile is closed or destroyed (append then
/// throws InternalError).
class Series {
 public:
  /// Append one row: `values` holds width values of the first column, then the second, ...
  /// (n_columns() * width() values; another size is an InternalError). `t` in seconds.
  void append(real t, long step, std::span<const real> values);
  [[nodiscard]] std::size_t rows() const;  ///< rows appended (written or still buffered)
  [[nodiscard]] std::size_t rows_written() const;  ///< rows already handed to HDF5
  [[nodiscard]] int width() const;
  [[nodiscard]] int n_columns() const;
  [[nodiscard]] const std::string& name() const;  ///< the group name ("" if not created)

 private:
  friend class OutputFile;
  struct Impl;
  std::shared_ptr<Impl> impl_;
};

/// Errors: HDF5 and file-system failures throw RunError naming the file, the operation and
/// the object; misuse (bad names, duplicates, calls after close_as) throws InternalError.
/// Not thread-safe: one thread (the time loop) owns the object.
class OutputFile {
 public:
  /// Create the temporary file next to `final_path`. Throws RunError if it cannot: the
  /// directory of `final_path` must already exist (it is never created), and an existing
  /// file at the temporary name is never overwritten.
  explicit OutputFile(std::string final_path);
  /// Append mode: continue the run output at `final_path` (see above). Throws InputError
  /// (exit code 2, nothing written) if the file is missing, is not a tubewave run file, has
  /// another run_id, or lacks a series or rows that `resume` names: that output does not
  /// belong to the checkpoint.
  OutputFile(std::string final_path, const ResumePoint& resume);
  OutputFile(const OutputFile&) = delete;
  OutputFile& operator=(const OutputFile&) = delete;
  ~OutputFile();  ///< removes the temporary file unless close_as() succeeded

  /// Header writers; in append mode the header exists already and calling them is an
  /// InternalError.
  void write_provenance(const Provenance& p);
  void write_parameters(const std::vector<ParameterValue>& params);
  /// Units of positions (/grid, probe positions) and of the series' time columns: "m" and
  /// "s" unless set (normalized runs set "1"). Call before the writers.
  void set_axis_units(const std::string& length, const std::string& time);
  /// /grid/x, /grid/x_faces and, when there are probes, /grid/probe_x.
  void write_grid(std::span<const real> x_centres, std::span<const real> x_faces,
                  std::span<const real> probe_positions = {});
  /// Scalar float64 datasets (with units and description) in the group at `path`
  /// ("antennas/antenna1"; the group and its parents are created as needed), and string
  /// attributes on that group. Used for per-antenna and per-region summaries.
  void write_scalars(const std::string& path, const std::vector<ParameterValue>& values,
                     const std::vector<std::pair<std::string, std::string>>& attributes = {});

  /// Declare a series group. `width` values per column per row; `rows_per_chunk` sets the
  /// HDF5 chunking (snapshots: 1 row per chunk and compressed; probes/history: many rows).
  /// In append mode the existing group is reopened instead: its columns and width must be
  /// the ones declared (else InputError), and it is cut back to the resume point's rows.
  Series create_series(const std::string& group, const std::vector<ColumnInfo>& columns,
                       int width, int rows_per_chunk, bool compress);

  /// Flush buffered rows to disk (called by the time loop now and then, not every step).
  void flush();

  /// Write buffered rows, flush, and place a copy of the file so far at the final path,
  /// marked incomplete: complete = 0, /status outcome "running" with `message`. The open
  /// file is unchanged and the run goes on. Costs one copy of the file.
  void publish_partial(const std::string& message, long steps, real simulated_time,
                       real wall_seconds);

  /// Rows appended so far to each series (written or buffered), by group name.
  [[nodiscard]] std::map<std::string, std::size_t> series_rows() const;

  /// Write /status, set the root "complete" attribute (1 only for outcome "completed"),
  /// flush, close and rename to the final path. Buffered rows are written first; the file is
  /// flushed before "complete" is set and again after. If this throws, the temporary file
  /// is removed by the destructor and a previous file at the final path is kept.
  void close_as(const std::string& outcome, const std::string& message, long steps,
                real simulated_time, real wall_seconds);

  [[nodiscard]] const std::string& final_path() const;
  [[nodiscard]] const std::string& temporary_path() const;
  /// The run's identifier (root attribute run_id): new for a new file, kept in append mode.
  [[nodiscard]] const std::string& run_id() const;
  [[nodiscard]] bool appending() const;

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

}  // namespace tw::io
