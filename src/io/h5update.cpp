#include "io/h5update.hpp"

#include <unistd.h>

#include <algorithm>
#include <array>
#include <filesystem>
#include <system_error>

#include "core/error.hpp"
#include "io/file_ops.hpp"
#include "io/h5handle.hpp"

namespace tw::io {

namespace fs = std::filesystem;
using h5::Handle;
using h5::Kind;

namespace {

Handle own(hid_t id, Kind kind, const std::string& file, std::string_view op, std::string_view object = {}) {
  return h5::own<RunError>(id, kind, file, op, object);
}
void check(herr_t status, const std::string& file, std::string_view op, std::string_view object = {}) {
  h5::check<RunError>(status, file, op, object);
}

Handle create_ordered_group(hid_t parent, const std::string& name, const std::string& file,
                            const std::string& object) {
  Handle p = own(H5Pcreate(H5P_GROUP_CREATE), Kind::plist, file, "create group properties", object);
  check(H5Pset_link_creation_order(p.get(), H5P_CRT_ORDER_TRACKED | H5P_CRT_ORDER_INDEXED), file,
        "set link creation order", object);
  return own(H5Gcreate2(parent, name.c_str(), H5P_DEFAULT, p.get(), H5P_DEFAULT), Kind::group, file,
             "create group", object);
}

void string_attr(hid_t obj, const std::string& name, const std::string& value, const std::string& file,
                 const std::string& object) {
  Handle t = own(H5Tcopy(H5T_C_S1), Kind::datatype, file, "create a string type");
  check(H5Tset_size(t.get(), H5T_VARIABLE), file, "create a string type");
  check(H5Tset_cset(t.get(), H5T_CSET_UTF8), file, "create a string type");
  Handle space = own(H5Screate(H5S_SCALAR), Kind::dataspace, file, "create a dataspace");
  const std::string what = object + "@" + name;
  if (H5Aexists(obj, name.c_str()) > 0) check(H5Adelete(obj, name.c_str()), file, "replace attribute", what);
  Handle a = own(H5Acreate2(obj, name.c_str(), t.get(), space.get(), H5P_DEFAULT, H5P_DEFAULT),
                 Kind::attribute, file, "create attribute", what);
  const char* data = value.c_str();
  check(H5Awrite(a.get(), t.get(), &data), file, "write attribute", what);
}

void real_attr(hid_t obj, const std::string& name, real value, const std::string& file,
               const std::string& object) {
  Handle space = own(H5Screate(H5S_SCALAR), Kind::dataspace, file, "create a dataspace");
  const std::string what = object + "@" + name;
  if (H5Aexists(obj, name.c_str()) > 0) check(H5Adelete(obj, name.c_str()), file, "replace attribute", what);
  Handle a = own(H5Acreate2(obj, name.c_str(), H5T_IEEE_F64LE, space.get(), H5P_DEFAULT, H5P_DEFAULT),
                 Kind::attribute, file, "create attribute", what);
  check(H5Awrite(a.get(), H5T_NATIVE_DOUBLE, &value), file, "write attribute", what);
}

/// Removes the temporary copy unless released (the update succeeded).
class TempGuard {
 public:
  explicit TempGuard(std::string path) : path_(std::move(path)) {}
  TempGuard(const TempGuard&) = delete;
  TempGuard& operator=(const TempGuard&) = delete;
  ~TempGuard() {
    if (!path_.empty()) {
      std::error_code ec;
      fs::remove(path_, ec);
    }
  }
  void release() { path_.clear(); }

 private:
  std::string path_;
};

}  // namespace

struct GroupWriter::Impl {
  Handle group;
  std::string file;  ///< for messages
  std::string path;
  [[nodiscard]] std::string child(const std::string& name) const {
    return path == "/" ? "/" + name : path + "/" + name;
  }
  void write_units(hid_t ds, const std::string& units, const std::string& description, const std::string& object) {
    string_attr(ds, "units", units, file, object);
    string_attr(ds, "description", description, file, object);
  }
  /// The object an attribute goes on: this group, or a member.
  Handle target(const std::string& object) {
    const std::string what = object.empty() ? path : child(object);
    return own(H5Oopen(group.get(), object.empty() ? "." : object.c_str(), H5P_DEFAULT), Kind::object, file,
               "open", what);
  }
};

GroupWriter::GroupWriter(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}
GroupWriter::GroupWriter(GroupWriter&&) noexcept = default;
GroupWriter& GroupWriter::operator=(GroupWriter&&) noexcept = default;
GroupWriter::~GroupWriter() = default;

const std::string& GroupWriter::path() const { return impl_->path; }

GroupWriter GroupWriter::subgroup(const std::string& name) {
  auto im = std::make_unique<Impl>();
  im->file = impl_->file;
  im->path = impl_->child(name);
  im->group = create_ordered_group(impl_->group.get(), name, impl_->file, im->path);
  return GroupWriter(std::move(im));
}

void GroupWriter::scalar(const std::string& name, real value, const std::string& units,
                         const std::string& description) {
  const std::string object = impl_->child(name);
  const std::string& file = impl_->file;
  Handle space = own(H5Screate(H5S_SCALAR), Kind::dataspace, file, "create a dataspace", object);
  Handle ds = own(H5Dcreate2(impl_->group.get(), name.c_str(), H5T_IEEE_F64LE, space.get(), H5P_DEFAULT,
                             H5P_DEFAULT, H5P_DEFAULT),
                  Kind::dataset, file, "create dataset", object);
  check(H5Dwrite(ds.get(), H5T_NATIVE_DOUBLE, H5S_ALL, H5S_ALL, H5P_DEFAULT, &value), file, "write dataset", object);
  impl_->write_units(ds.get(), units, description, object);
}

void GroupWriter::vector(const std::string& name, std::span<const real> values, const std::string& units,
                         const std::string& description) {
  matrix(name, values, 1, values.size(), units, description);
}

void GroupWriter::matrix(const std::string& name, std::span<const real> values, std::size_t rows,
                         std::size_t cols, const std::string& units, const std::string& description) {
  const std::string object = impl_->child(name);
  const std::string& file = impl_->file;
  TW_CHECK(values.size() == rows * cols, "matrix '" + object + "' has " + std::to_string(values.size()) +
                                             " values for " + std::to_string(rows) + " x " + std::to_string(cols));
  // A vector is written 1-D (rows == 1 is how vector() calls this).
  const bool one_d = rows == 1;
  const std::array<hsize_t, 2> dims{one_d ? static_cast<hsize_t>(cols) : static_cast<hsize_t>(rows),
                                    static_cast<hsize_t>(cols)};
  const int rank = one_d ? 1 : 2;
  Handle space = own(H5Screate_simple(rank, dims.data(), nullptr), Kind::dataspace, file, "create dataspace", object);
  Handle dcpl = own(H5Pcreate(H5P_DATASET_CREATE), Kind::plist, file, "create dataset properties", object);
  if (!one_d && rows * cols >= 1024) {
    // Chunks of whole rows, at most ~64 KiB, compressed: spectra are large and smooth.
    const std::array<hsize_t, 2> chunk{std::max<hsize_t>(1, std::min<hsize_t>(rows, 8192 / std::max<std::size_t>(cols, 1))),
                                       static_cast<hsize_t>(cols)};
    check(H5Pset_chunk(dcpl.get(), 2, chunk.data()), file, "set chunking of", object);
    check(H5Pset_shuffle(dcpl.get()), file, "set shuffle filter of", object);
    check(H5Pset_deflate(dcpl.get(), 4), file, "set deflate filter of", object);
  }
  Handle ds = own(H5Dcreate2(impl_->group.get(), name.c_str(), H5T_IEEE_F64LE, space.get(), H5P_DEFAULT,
                             dcpl.get(), H5P_DEFAULT),
                  Kind::dataset, file, "create dataset", object);
  if (!values.empty())
    check(H5Dwrite(ds.get(), H5T_NATIVE_DOUBLE, H5S_ALL, H5S_ALL, H5P_DEFAULT, values.data()), file,
          "write dataset", object);
  impl_->write_units(ds.get(), units, description, object);
}

void GroupWriter::attribute(const std::string& object, const std::string& name, const std::string& value) {
  Handle o = impl_->target(object);
  string_attr(o.get(), name, value, impl_->file, object.empty() ? impl_->path : impl_->child(object));
}

void GroupWriter::attribute(const std::string& object, const std::string& name, real value) {
  Handle o = impl_->target(object);
  real_attr(o.get(), name, value, impl_->file, object.empty() ? impl_->path : impl_->child(object));
}

void replace_group(const std::string& file, const std::string& group,
                   const std::function<void(GroupWriter&)>& fill) {
  replace_groups(file, {GroupFill{group, fill}});
}

void replace_groups(const std::string& file, const std::vector<GroupFill>& groups) {
  h5::silence_error_printing();
  for (const auto& g : groups)
    TW_CHECK(g.group.size() > 1 && g.group[0] == '/' && g.group.back() != '/', "bad group path '" + g.group + "'");
  const std::string temp = temporary_name(file);
  std::error_code ec;
  if (fs::exists(temp, ec))
    throw RunError("cannot update '" + file + "': the temporary file '" + temp + "' already exists");
  fs::copy_file(file, temp, ec);
  if (ec) throw RunError("cannot copy '" + file + "' to '" + temp + "': " + ec.message());
  TempGuard guard(temp);
  {
    // Strong close: the file is really closed (no handle can keep it open) before the rename.
    Handle fapl = own(H5Pcreate(H5P_FILE_ACCESS), Kind::plist, temp, "create file access properties");
    check(H5Pset_fclose_degree(fapl.get(), H5F_CLOSE_STRONG), temp, "set file close degree");
    Handle f = own(H5Fopen(temp.c_str(), H5F_ACC_RDWR, fapl.get()), Kind::file, temp, "open for writing");
    for (const auto& g : groups) {
      const std::string& group = g.group;
      // Parents: open or create each component; the last one is replaced.
      Handle parent = own(H5Gopen2(f.get(), "/", H5P_DEFAULT), Kind::group, temp, "open group", "/");
      std::string path;
      std::size_t pos = 1;
      while (true) {
        const std::size_t next = group.find('/', pos);
        const std::string name = group.substr(pos, next == std::string::npos ? std::string::npos : next - pos);
        path += "/" + name;
        const bool last = next == std::string::npos;
        const bool exists = H5Lexists(parent.get(), name.c_str(), H5P_DEFAULT) > 0;
        (void)H5Eclear2(H5E_DEFAULT);
        if (last) {
          if (exists) check(H5Ldelete(parent.get(), name.c_str(), H5P_DEFAULT), temp, "remove the old group", path);
          auto im = std::make_unique<GroupWriter::Impl>();
          im->file = temp;
          im->path = path;
          im->group = create_ordered_group(parent.get(), name, temp, path);
          GroupWriter w(std::move(im));
          g.fill(w);
          break;
        }
        parent = exists ? own(H5Gopen2(parent.get(), name.c_str(), H5P_DEFAULT), Kind::group, temp, "open group", path)
                        : create_ordered_group(parent.get(), name, temp, path);
        pos = next + 1;
      }
    }
    check(H5Fflush(f.get(), H5F_SCOPE_GLOBAL), temp, "flush");
    check(f.close(), temp, "close");
  }
  replace_file(temp, file);
  guard.release();
}

}  // namespace tw::io
