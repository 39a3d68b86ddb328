#pragma once
/// Adding results to a finished run file without ever exposing a half-written one.
///
/// `replace_group(file, "/measurements/velocity_y", fill)`:
///   1. copies FILE to "FILE.tmp.<pid>" (next to it, so the rename stays on one file system);
///   2. opens the copy, removes the group if it exists (earlier results of the same kind),
///      creates it (and missing parents, with link creation order tracked) and lets `fill`
///      write into it;
///   3. closes the copy and renames it over FILE (atomic on POSIX file systems).
/// Readers of FILE see either the old file or the new one, never a mix; if anything fails
/// (or `fill` throws) the copy is removed and FILE is untouched. Editing in place was
/// rejected: HDF5 1.10 has no journal, so an interrupted write could corrupt the whole
/// file, results included. The root attribute "complete" is copied unchanged: only
/// complete files should be given here (the caller checks).
///
/// Two updates of one file at the same time do not corrupt it, but the later rename wins
/// (the earlier update is lost): run them one after the other.
///
/// Removing a group does not shrink an HDF5 file: repeating an update leaves the space of
/// the old group unused inside the file (h5repack reclaims it). Results are small (a few
/// MB at most), so this is accepted.
///
/// Errors: RunError naming the file and the operation (exit code 1).
#include <functional>
#include <memory>
#include <span>
#include <string>
#include <vector>

#include "core/types.hpp"

namespace tw::io {

/// Writes datasets and attributes into one group of a file being updated. Every dataset
/// gets the CF "units" and a "description" attribute, like the run output. Owns its group
/// handle; valid while `fill` runs.
class GroupWriter {
 public:
  struct Impl;
  explicit GroupWriter(std::unique_ptr<Impl> impl);
  GroupWriter(GroupWriter&&) noexcept;
  GroupWriter& operator=(GroupWriter&&) noexcept;
  GroupWriter(const GroupWriter&) = delete;
  GroupWriter& operator=(const GroupWriter&) = delete;
  ~GroupWriter();

  /// A child group (created, link creation order tracked).
  [[nodiscard]] GroupWriter subgroup(const std::string& name);
  /// Scalar float64 dataset.
  void scalar(const std::string& name, real value, const std::string& units, const std::string& description);
  /// 1-D float64 dataset.
  void vector(const std::string& name, std::span<const real> values, const std::string& units,
              const std::string& description);
  /// 2-D float64 dataset [rows, cols] from row-major values (shuffle + deflate).
  void matrix(const std::string& name, std::span<const real> values, std::size_t rows, std::size_t cols,
              const std::string& units, const std::string& description);
  /// String attribute on this group (`object` = "") or on one of its datasets.
  void attribute(const std::string& object, const std::string& name, const std::string& value);
  /// Float64 attribute on this group (`object` = "") or on one of its datasets.
  void attribute(const std::string& object, const std::string& name, real value);
  /// Absolute HDF5 path of the group.
  [[nodiscard]] const std::string& path() const;

 private:
  std::unique_ptr<Impl> impl_;
};

/// Replace (or create) the group at absolute path `group` of the HDF5 file `file` with what
/// `fill` writes, atomically (see the file comment).
void replace_group(const std::string& file, const std::string& group,
                   const std::function<void(GroupWriter&)>& fill);

/// One group of a multi-group update: its absolute path and what writes it.
struct GroupFill {
  std::string group;
  std::function<void(GroupWriter&)> fill;
};

/// Replace several groups in one copy-and-rename (one copy of the file instead of one per
/// group; the sweep stores its measurements and its completion record this way). Groups are
/// written in order; a later group may not lie inside an earlier one.
void replace_groups(const std::string& file, const std::vector<GroupFill>& groups);

}  // namespace tw::io
