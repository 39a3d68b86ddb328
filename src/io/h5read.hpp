#pragma once
/// Read-only access to tubewave HDF5 files (run output, see io/output.hpp for the layout),
/// for tests and post-processing commands. Object paths are absolute HDF5 paths such as
/// "/snapshots/density"; "/" is the root group.
///
/// Errors are InputError (exit code 2): the file is something the user named, so a missing
/// file, a non-HDF5 file or a missing object is bad input. Messages name the file and the
/// object.
#include <H5public.h>  // hsize_t

#include <memory>
#include <string>
#include <vector>

namespace tw::io {

class H5Reader {
 public:
  /// Open `path` read-only. A file whose root "complete" attribute is not 1 opens too;
  /// ask is_complete().
  explicit H5Reader(const std::string& path);
  /// Open a run output for post-processing: the one check every reader of results uses
  /// (commands and tests alike). Throws InputError unless the root attribute format is
  /// "tubewave-run" and complete == 1: "PATH is incomplete (the run did not finish or is
  /// still running)", followed, when the file says, by its outcome, time and message and,
  /// for an interrupted or running run, how to continue it. Only a run that reached its end
  /// passes; a checkpoint (format "tubewave-checkpoint") never does.
  static H5Reader open_complete_or_throw(const std::string& path);

  H5Reader(H5Reader&&) noexcept;
  H5Reader& operator=(H5Reader&&) noexcept;
  H5Reader(const H5Reader&) = delete;
  H5Reader& operator=(const H5Reader&) = delete;
  ~H5Reader();

  [[nodiscard]] const std::string& file_name() const;
  /// True when the root attribute "complete" exists and equals 1.
  [[nodiscard]] bool is_complete() const;

  /// True when `object` names a group or dataset (every path component must exist).
  [[nodiscard]] bool exists(const std::string& object) const;
  [[nodiscard]] bool is_group(const std::string& object) const;
  [[nodiscard]] bool is_dataset(const std::string& object) const;
  /// True for a dataset of integer or floating-point type.
  [[nodiscard]] bool is_numeric(const std::string& object) const;

  /// Names (not paths) of the members of a group, in creation order where the file records
  /// it (tubewave files do), else in name order.
  [[nodiscard]] std::vector<std::string> members(const std::string& group) const;
  /// Names of the attributes of a group or dataset, in name order.
  [[nodiscard]] std::vector<std::string> attribute_names(const std::string& object) const;
  [[nodiscard]] bool has_attribute(const std::string& object, const std::string& name) const;

  /// Shape of a dataset (empty for a scalar), without reading it.
  [[nodiscard]] std::vector<hsize_t> shape(const std::string& object) const;

  /// A numeric dataset of any rank, converted to double, in row-major order. `dims`, when
  /// given, receives the shape (empty for a scalar).
  [[nodiscard]] std::vector<double> read_real(const std::string& object,
                                              std::vector<hsize_t>* dims = nullptr) const;
  /// Rows [first, first + count) along the first dimension of a numeric dataset of rank >= 1
  /// (a snapshot range without reading the whole table). `dims` receives the shape read.
  [[nodiscard]] std::vector<double> read_real_rows(const std::string& object, hsize_t first,
                                                   hsize_t count,
                                                   std::vector<hsize_t>* dims = nullptr) const;
  /// A scalar integer dataset (e.g. /provenance/threads).
  [[nodiscard]] long read_int(const std::string& object) const;
  /// A scalar string dataset (variable- or fixed-length).
  [[nodiscard]] std::string read_string(const std::string& object) const;

  /// Scalar attributes of a group or dataset.
  [[nodiscard]] std::string attr_string(const std::string& object, const std::string& name) const;
  [[nodiscard]] double attr_real(const std::string& object, const std::string& name) const;
  [[nodiscard]] long attr_int(const std::string& object, const std::string& name) const;

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

}  // namespace tw::io
