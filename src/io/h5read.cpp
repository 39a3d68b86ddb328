#include "io/h5read.hpp"

#include <hdf5.h>

#include <filesystem>
#include <system_error>

#include "core/error.hpp"
#include "io/h5handle.hpp"

namespace tw::io {

using h5::Handle;
using h5::Kind;

struct H5Reader::Impl {
  std::string path;
  Handle file;

  [[nodiscard]] Handle own(hid_t id, Kind kind, std::string_view op,
                           std::string_view object = {}) const {
    return h5::own<InputError>(id, kind, path, op, object);
  }
  void check(herr_t status, std::string_view op, std::string_view object = {}) const {
    h5::check<InputError>(status, path, op, object);
  }

  [[nodiscard]] bool exists(const std::string& object) const {
    if (object.empty() || object[0] != '/') return false;
    if (object == "/") return true;
    // H5Lexists fails (rather than saying no) when an intermediate group is missing, so
    // test every prefix in turn.
    std::size_t pos = 1;
    while (pos <= object.size()) {
      std::size_t next = object.find('/', pos);
      if (next == std::string::npos) next = object.size();
      const std::string prefix = object.substr(0, next);
      if (H5Lexists(file.get(), prefix.c_str(), H5P_DEFAULT) <= 0) {
        (void)H5Eclear2(H5E_DEFAULT);
        return false;
      }
      pos = next + 1;
    }
    const htri_t resolves = H5Oexists_by_name(file.get(), object.c_str(), H5P_DEFAULT);
    (void)H5Eclear2(H5E_DEFAULT);
    return resolves > 0;
  }

  void require(const std::string& object) const {
    if (!exists(object)) {
      throw InputError("'" + object + "' not found in file '" + path + "'");
    }
  }

  [[nodiscard]] H5I_type_t type_of(const std::string& object) const {
    if (!exists(object)) return H5I_BADID;
    Handle o = own(H5Oopen(file.get(), object.c_str(), H5P_DEFAULT), Kind::object, "open", object);
    return H5Iget_type(o.get());
  }

  [[nodiscard]] Handle open_dataset(const std::string& object) const {
    require(object);
    if (type_of(object) != H5I_DATASET) {
      throw InputError("'" + object + "' in file '" + path + "' is not a dataset");
    }
    return own(H5Dopen2(file.get(), object.c_str(), H5P_DEFAULT), Kind::dataset, "open dataset",
               object);
  }

  [[nodiscard]] Handle open_attribute(const std::string& object, const std::string& name) const {
    require(object);
    const std::string what = object + "@" + name;
    if (H5Aexists_by_name(file.get(), object.c_str(), name.c_str(), H5P_DEFAULT) <= 0) {
      (void)H5Eclear2(H5E_DEFAULT);
      throw InputError("attribute '" + name + "' of '" + object + "' not found in file '" + path +
                       "'");
    }
    return own(H5Aopen_by_name(file.get(), object.c_str(), name.c_str(), H5P_DEFAULT, H5P_DEFAULT),
               Kind::attribute, "open attribute", what);
  }

  void require_numeric(hid_t type, const std::string& what) const {
    const H5T_class_t cls = H5Tget_class(type);
    if (cls != H5T_INTEGER && cls != H5T_FLOAT) {
      throw InputError("'" + what + "' in file '" + path + "' is not numeric");
    }
  }

  void require_scalar(hid_t space, const std::string& what) const {
    if (H5Sget_simple_extent_npoints(space) != 1) {
      throw InputError("'" + what + "' in file '" + path + "' is not a single value");
    }
  }

  /// Read a one-element string (dataset or attribute) of file type `type`.
  template <class ReadFn>
  std::string read_string_value(hid_t type, const std::string& what, ReadFn read) const {
    if (H5Tget_class(type) != H5T_STRING) {
      throw InputError("'" + what + "' in file '" + path + "' is not a string");
    }
    Handle mem = own(H5Tcopy(H5T_C_S1), Kind::datatype, "create a string type for", what);
    check(H5Tset_cset(mem.get(), H5Tget_cset(type)), "create a string type for", what);
    const htri_t variable = H5Tis_variable_str(type);
    check(variable < 0 ? -1 : 0, "inspect string type of", what);
    if (variable > 0) {
      check(H5Tset_size(mem.get(), H5T_VARIABLE), "create a string type for", what);
      char* data = nullptr;
      check(read(mem.get(), static_cast<void*>(&data)), "read", what);
      std::string out = data != nullptr ? std::string(data) : std::string();
      if (data != nullptr) H5free_memory(data);
      return out;
    }
    const std::size_t size = H5Tget_size(type);
    check(H5Tset_size(mem.get(), size + 1), "create a string type for", what);
    check(H5Tset_strpad(mem.get(), H5T_STR_NULLTERM), "create a string type for", what);
    std::string buf(size + 1, '\0');
    check(read(mem.get(), static_cast<void*>(buf.data())), "read", what);
    buf.resize(buf.find('\0') == std::string::npos ? buf.size() : buf.find('\0'));
    // Space-padded fixed strings keep their padding out of the value.
    while (!buf.empty() && buf.back() == ' ' && H5Tget_strpad(type) == H5T_STR_SPACEPAD) {
      buf.pop_back();
    }
    return buf;
  }
};

H5Reader::H5Reader(const std::string& path) : impl_(std::make_unique<Impl>()) {
  h5::silence_error_printing();
  impl_->path = path;
  std::error_code ec;
  if (!std::filesystem::is_regular_file(path, ec)) {
    throw InputError("cannot open '" + path + "': no such file");
  }
  if (H5Fis_hdf5(path.c_str()) <= 0) {
    (void)H5Eclear2(H5E_DEFAULT);
    throw InputError("cannot open '" + path + "': not an HDF5 file");
  }
  impl_->file = impl_->own(H5Fopen(path.c_str(), H5F_ACC_RDONLY, H5P_DEFAULT), Kind::file, "open");
}

H5Reader H5Reader::open_complete_or_throw(const std::string& path) {
  H5Reader r(path);
  const std::string format = r.has_attribute("/", "format") ? r.attr_string("/", "format") : "";
  if (format != "tubewave-run") {
    throw InputError(path + " is not a tubewave run output (format '" + format +
                     "'; run outputs have format 'tubewave-run')");
  }
  if (!r.is_complete()) {
    std::string msg = path + " is incomplete (the run did not finish or is still running)";
    if (r.has_attribute("/status", "outcome")) {
      const std::string outcome = r.attr_string("/status", "outcome");
      msg += ": outcome '" + outcome + "'";
      if (r.has_attribute("/status", "simulated_time"))
        msg += " at t = " + std::to_string(r.attr_real("/status", "simulated_time")) + " s";
      const std::string why =
          r.has_attribute("/status", "message") ? r.attr_string("/status", "message") : "";
      if (!why.empty()) msg += " (" + why + ")";
      if (outcome == "interrupted" || outcome == "running")
        msg += "; continue the run with 'tubewave run --restart CHECKPOINT'";
    }
    throw InputError(msg);
  }
  return r;
}

H5Reader::H5Reader(H5Reader&&) noexcept = default;
H5Reader& H5Reader::operator=(H5Reader&&) noexcept = default;
H5Reader::~H5Reader() = default;

const std::string& H5Reader::file_name() const { return impl_->path; }

bool H5Reader::is_complete() const {
  if (!has_attribute("/", "complete")) return false;
  return attr_int("/", "complete") == 1;
}

bool H5Reader::exists(const std::string& object) const { return impl_->exists(object); }

bool H5Reader::is_group(const std::string& object) const {
  return impl_->type_of(object) == H5I_GROUP;
}

bool H5Reader::is_dataset(const std::string& object) const {
  return impl_->type_of(object) == H5I_DATASET;
}

bool H5Reader::is_numeric(const std::string& object) const {
  if (!is_dataset(object)) return false;
  Handle ds = impl_->open_dataset(object);
  Handle type = impl_->own(H5Dget_type(ds.get()), Kind::datatype, "get type of", object);
  const H5T_class_t cls = H5Tget_class(type.get());
  return cls == H5T_INTEGER || cls == H5T_FLOAT;
}

std::vector<std::string> H5Reader::members(const std::string& group) const {
  impl_->require(group);
  if (!is_group(group)) {
    throw InputError("'" + group + "' in file '" + impl_->path + "' is not a group");
  }
  Handle g = impl_->own(H5Gopen2(impl_->file.get(), group.c_str(), H5P_DEFAULT), Kind::group,
                        "open group", group);
  H5G_info_t info{};
  impl_->check(H5Gget_info(g.get(), &info), "list group", group);

  H5_index_t index = H5_INDEX_NAME;
  Handle gcpl = impl_->own(H5Gget_create_plist(g.get()), Kind::plist, "inspect group", group);
  unsigned order_flags = 0;
  if (H5Pget_link_creation_order(gcpl.get(), &order_flags) >= 0 &&
      (order_flags & H5P_CRT_ORDER_INDEXED) != 0) {
    index = H5_INDEX_CRT_ORDER;
  }

  std::vector<std::string> names;
  names.reserve(info.nlinks);
  for (hsize_t i = 0; i < info.nlinks; ++i) {
    const ssize_t len =
        H5Lget_name_by_idx(g.get(), ".", index, H5_ITER_INC, i, nullptr, 0, H5P_DEFAULT);
    impl_->check(len < 0 ? -1 : 0, "list group", group);
    std::string name(static_cast<std::size_t>(len) + 1, '\0');
    impl_->check(H5Lget_name_by_idx(g.get(), ".", index, H5_ITER_INC, i, name.data(), name.size(),
                                    H5P_DEFAULT) < 0
                     ? -1
                     : 0,
                 "list group", group);
    name.resize(static_cast<std::size_t>(len));
    names.push_back(std::move(name));
  }
  return names;
}

namespace {
herr_t collect_attribute_name(hid_t /*loc*/, const char* name, const H5A_info_t* /*info*/,
                              void* data) {
  static_cast<std::vector<std::string>*>(data)->emplace_back(name);
  return 0;
}
}  // namespace

std::vector<std::string> H5Reader::attribute_names(const std::string& object) const {
  impl_->require(object);
  Handle o = impl_->own(H5Oopen(impl_->file.get(), object.c_str(), H5P_DEFAULT), Kind::object,
                        "open", object);
  std::vector<std::string> names;
  hsize_t idx = 0;
  impl_->check(
      H5Aiterate2(o.get(), H5_INDEX_NAME, H5_ITER_INC, &idx, collect_attribute_name, &names),
      "list attributes of", object);
  return names;
}

bool H5Reader::has_attribute(const std::string& object, const std::string& name) const {
  if (!exists(object)) return false;
  const htri_t r = H5Aexists_by_name(impl_->file.get(), object.c_str(), name.c_str(), H5P_DEFAULT);
  (void)H5Eclear2(H5E_DEFAULT);
  return r > 0;
}

std::vector<hsize_t> H5Reader::shape(const std::string& object) const {
  Handle ds = impl_->open_dataset(object);
  Handle space = impl_->own(H5Dget_space(ds.get()), Kind::dataspace, "get dataspace of", object);
  const int rank = H5Sget_simple_extent_ndims(space.get());
  impl_->check(rank < 0 ? -1 : 0, "get rank of", object);
  std::vector<hsize_t> dims(static_cast<std::size_t>(rank));
  if (rank > 0)
    impl_->check(H5Sget_simple_extent_dims(space.get(), dims.data(), nullptr) < 0 ? -1 : 0,
                 "get shape of", object);
  return dims;
}

std::vector<double> H5Reader::read_real(const std::string& object,
                                        std::vector<hsize_t>* dims) const {
  Handle ds = impl_->open_dataset(object);
  Handle type = impl_->own(H5Dget_type(ds.get()), Kind::datatype, "get type of", object);
  impl_->require_numeric(type.get(), object);
  Handle space = impl_->own(H5Dget_space(ds.get()), Kind::dataspace, "get dataspace of", object);
  const int rank = H5Sget_simple_extent_ndims(space.get());
  impl_->check(rank < 0 ? -1 : 0, "get rank of", object);
  std::vector<hsize_t> shape(static_cast<std::size_t>(rank));
  if (rank > 0) {
    impl_->check(H5Sget_simple_extent_dims(space.get(), shape.data(), nullptr) < 0 ? -1 : 0,
                 "get shape of", object);
  }
  hsize_t n = 1;
  for (hsize_t d : shape) n *= d;
  std::vector<double> values(n);
  if (n > 0) {
    impl_->check(H5Dread(ds.get(), H5T_NATIVE_DOUBLE, H5S_ALL, H5S_ALL, H5P_DEFAULT, values.data()),
                 "read", object);
  }
  if (dims != nullptr) *dims = std::move(shape);
  return values;
}

std::vector<double> H5Reader::read_real_rows(const std::string& object, hsize_t first,
                                             hsize_t count, std::vector<hsize_t>* dims) const {
  Handle ds = impl_->open_dataset(object);
  Handle type = impl_->own(H5Dget_type(ds.get()), Kind::datatype, "get type of", object);
  impl_->require_numeric(type.get(), object);
  Handle space = impl_->own(H5Dget_space(ds.get()), Kind::dataspace, "get dataspace of", object);
  const int rank = H5Sget_simple_extent_ndims(space.get());
  if (rank < 1) {
    throw InputError("'" + object + "' in file '" + impl_->path + "' has no rows (scalar)");
  }
  std::vector<hsize_t> shape(static_cast<std::size_t>(rank));
  impl_->check(H5Sget_simple_extent_dims(space.get(), shape.data(), nullptr) < 0 ? -1 : 0,
               "get shape of", object);
  if (first > shape[0] || count > shape[0] - first) {
    throw InputError("rows " + std::to_string(first) + " to " + std::to_string(first + count) +
                     " requested from '" + object + "' in file '" + impl_->path + "', which has " +
                     std::to_string(shape[0]) + " rows");
  }
  std::vector<hsize_t> start(shape.size(), 0);
  start[0] = first;
  std::vector<hsize_t> block = shape;
  block[0] = count;
  hsize_t n = 1;
  for (hsize_t d : block) n *= d;
  std::vector<double> values(n);
  if (n > 0) {
    impl_->check(H5Sselect_hyperslab(space.get(), H5S_SELECT_SET, start.data(), nullptr,
                                     block.data(), nullptr),
                 "select rows of", object);
    Handle mem = impl_->own(H5Screate_simple(rank, block.data(), nullptr), Kind::dataspace,
                            "create memory dataspace for", object);
    impl_->check(
        H5Dread(ds.get(), H5T_NATIVE_DOUBLE, mem.get(), space.get(), H5P_DEFAULT, values.data()),
        "read", object);
  }
  if (dims != nullptr) *dims = std::move(block);
  return values;
}

long H5Reader::read_int(const std::string& object) const {
  Handle ds = impl_->open_dataset(object);
  Handle type = impl_->own(H5Dget_type(ds.get()), Kind::datatype, "get type of", object);
  if (H5Tget_class(type.get()) != H5T_INTEGER) {
    throw InputError("'" + object + "' in file '" + impl_->path + "' is not an integer");
  }
  Handle space = impl_->own(H5Dget_space(ds.get()), Kind::dataspace, "get dataspace of", object);
  impl_->require_scalar(space.get(), object);
  long value = 0;
  impl_->check(H5Dread(ds.get(), H5T_NATIVE_LONG, H5S_ALL, H5S_ALL, H5P_DEFAULT, &value), "read",
               object);
  return value;
}

std::string H5Reader::read_string(const std::string& object) const {
  Handle ds = impl_->open_dataset(object);
  Handle type = impl_->own(H5Dget_type(ds.get()), Kind::datatype, "get type of", object);
  Handle space = impl_->own(H5Dget_space(ds.get()), Kind::dataspace, "get dataspace of", object);
  impl_->require_scalar(space.get(), object);
  const hid_t d = ds.get();
  return impl_->read_string_value(type.get(), object, [d](hid_t mem, void* buf) {
    return H5Dread(d, mem, H5S_ALL, H5S_ALL, H5P_DEFAULT, buf);
  });
}

std::string H5Reader::attr_string(const std::string& object, const std::string& name) const {
  Handle a = impl_->open_attribute(object, name);
  const std::string what = object + "@" + name;
  Handle type = impl_->own(H5Aget_type(a.get()), Kind::datatype, "get type of", what);
  Handle space = impl_->own(H5Aget_space(a.get()), Kind::dataspace, "get dataspace of", what);
  impl_->require_scalar(space.get(), what);
  const hid_t id = a.get();
  return impl_->read_string_value(type.get(), what,
                                  [id](hid_t mem, void* buf) { return H5Aread(id, mem, buf); });
}

double H5Reader::attr_real(const std::string& object, const std::string& name) const {
  Handle a = impl_->open_attribute(object, name);
  const std::string what = object + "@" + name;
  Handle type = impl_->own(H5Aget_type(a.get()), Kind::datatype, "get type of", what);
  impl_->require_numeric(type.get(), what);
  Handle space = impl_->own(H5Aget_space(a.get()), Kind::dataspace, "get dataspace of", what);
  impl_->require_scalar(space.get(), what);
  double value = 0;
  impl_->check(H5Aread(a.get(), H5T_NATIVE_DOUBLE, &value), "read attribute", what);
  return value;
}

long H5Reader::attr_int(const std::string& object, const std::string& name) const {
  Handle a = impl_->open_attribute(object, name);
  const std::string what = object + "@" + name;
  Handle type = impl_->own(H5Aget_type(a.get()), Kind::datatype, "get type of", what);
  if (H5Tget_class(type.get()) != H5T_INTEGER) {
    throw InputError("'" + what + "' in file '" + impl_->path + "' is not an integer");
  }
  Handle space = impl_->own(H5Aget_space(a.get()), Kind::dataspace, "get dataspace of", what);
  impl_->require_scalar(space.get(), what);
  long value = 0;
  impl_->check(H5Aread(a.get(), H5T_NATIVE_LONG, &value), "read attribute", what);
  return value;
}

}  // namespace tw::io
