#include "io/h5table.hpp"

#include <unistd.h>

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

Handle string_type(const std::string& file) {
  Handle t = own(H5Tcopy(H5T_C_S1), Kind::datatype, file, "create a string type");
  check(H5Tset_size(t.get(), H5T_VARIABLE), file, "create a string type");
  check(H5Tset_cset(t.get(), H5T_CSET_UTF8), file, "create a string type");
  return t;
}

void string_attr(hid_t obj, const std::string& name, const std::string& value, const std::string& file,
                 const std::string& object) {
  Handle t = string_type(file);
  Handle space = own(H5Screate(H5S_SCALAR), Kind::dataspace, file, "create a dataspace");
  const std::string what = object + "@" + name;
  Handle a = own(H5Acreate2(obj, name.c_str(), t.get(), space.get(), H5P_DEFAULT, H5P_DEFAULT), Kind::attribute,
                 file, "create attribute", what);
  const char* data = value.c_str();
  check(H5Awrite(a.get(), t.get(), &data), file, "write attribute", what);
}

void real_attr(hid_t obj, const std::string& name, real value, const std::string& file, const std::string& object) {
  Handle space = own(H5Screate(H5S_SCALAR), Kind::dataspace, file, "create a dataspace");
  const std::string what = object + "@" + name;
  Handle a = own(H5Acreate2(obj, name.c_str(), H5T_IEEE_F64LE, space.get(), H5P_DEFAULT, H5P_DEFAULT),
                 Kind::attribute, file, "create attribute", what);
  check(H5Awrite(a.get(), H5T_NATIVE_DOUBLE, &value), file, "write attribute", what);
}

/// Open the group at `path` (absolute), creating it and its parents as needed.
Handle open_or_create_group(hid_t root, const std::string& path, const std::string& file) {
  Handle g = own(H5Gopen2(root, "/", H5P_DEFAULT), Kind::group, file, "open group", "/");
  std::string sofar;
  std::size_t pos = 1;
  while (pos < path.size()) {
    const std::size_t next = path.find('/', pos);
    const std::string name = path.substr(pos, next == std::string::npos ? std::string::npos : next - pos);
    sofar += "/" + name;
    if (H5Lexists(g.get(), name.c_str(), H5P_DEFAULT) > 0) {
      g = own(H5Gopen2(g.get(), name.c_str(), H5P_DEFAULT), Kind::group, file, "open group", sofar);
    } else {
      (void)H5Eclear2(H5E_DEFAULT);
      Handle p = own(H5Pcreate(H5P_GROUP_CREATE), Kind::plist, file, "create group properties", sofar);
      check(H5Pset_link_creation_order(p.get(), H5P_CRT_ORDER_TRACKED | H5P_CRT_ORDER_INDEXED), file,
            "set link creation order", sofar);
      g = own(H5Gcreate2(g.get(), name.c_str(), H5P_DEFAULT, p.get(), H5P_DEFAULT), Kind::group, file, "create group",
              sofar);
    }
    if (next == std::string::npos) break;
    pos = next + 1;
  }
  return g;
}

void write_column(hid_t root, const TableColumn& c, const std::string& file) {
  TW_CHECK(c.path.size() > 1 && c.path[0] == '/' && c.path.back() != '/', "bad column path '" + c.path + "'");
  const std::size_t slash = c.path.rfind('/');
  const std::string parent = slash == 0 ? "/" : c.path.substr(0, slash);
  const std::string name = c.path.substr(slash + 1);
  Handle g = open_or_create_group(root, parent, file);
  const hsize_t n = c.text ? c.texts.size() : c.reals.size();
  Handle space = own(H5Screate_simple(1, &n, nullptr), Kind::dataspace, file, "create dataspace", c.path);
  if (c.text) {
    Handle t = string_type(file);
    Handle ds = own(H5Dcreate2(g.get(), name.c_str(), t.get(), space.get(), H5P_DEFAULT, H5P_DEFAULT, H5P_DEFAULT),
                    Kind::dataset, file, "create dataset", c.path);
    std::vector<const char*> ptrs;
    for (const auto& s : c.texts) ptrs.push_back(s.c_str());
    if (n > 0) check(H5Dwrite(ds.get(), t.get(), H5S_ALL, H5S_ALL, H5P_DEFAULT, ptrs.data()), file, "write dataset", c.path);
    string_attr(ds.get(), "description", c.description, file, c.path);
    for (const auto& [k, v] : c.attributes) string_attr(ds.get(), k, v, file, c.path);
  } else {
    Handle ds = own(H5Dcreate2(g.get(), name.c_str(), H5T_IEEE_F64LE, space.get(), H5P_DEFAULT, H5P_DEFAULT,
                               H5P_DEFAULT),
                    Kind::dataset, file, "create dataset", c.path);
    if (n > 0)
      check(H5Dwrite(ds.get(), H5T_NATIVE_DOUBLE, H5S_ALL, H5S_ALL, H5P_DEFAULT, c.reals.data()), file, "write dataset",
            c.path);
    string_attr(ds.get(), "units", c.units.empty() ? "1" : c.units, file, c.path);
    string_attr(ds.get(), "description", c.description, file, c.path);
    for (const auto& [k, v] : c.attributes) string_attr(ds.get(), k, v, file, c.path);
  }
}

}  // namespace

void write_table_file(const std::string& path, const TableFile& table) {
  h5::silence_error_printing();
  const std::string temp = temporary_name(path);
  std::error_code ec;
  fs::remove(temp, ec);  // a leftover of this process id is ours
  struct Guard {
    std::string p;
    ~Guard() {
      if (!p.empty()) {
        std::error_code e;
        fs::remove(p, e);
      }
    }
  } guard{temp};
  {
    Handle fapl = own(H5Pcreate(H5P_FILE_ACCESS), Kind::plist, temp, "create file access properties");
    check(H5Pset_fclose_degree(fapl.get(), H5F_CLOSE_STRONG), temp, "set file close degree");
    Handle fcpl = own(H5Pcreate(H5P_FILE_CREATE), Kind::plist, temp, "create file properties");
    check(H5Pset_link_creation_order(fcpl.get(), H5P_CRT_ORDER_TRACKED | H5P_CRT_ORDER_INDEXED), temp,
          "set link creation order");
    Handle f = own(H5Fcreate(temp.c_str(), H5F_ACC_EXCL, fcpl.get(), fapl.get()), Kind::file, temp, "create");
    {
      Handle root = own(H5Gopen2(f.get(), "/", H5P_DEFAULT), Kind::group, temp, "open group", "/");
      for (const auto& [k, v] : table.text_attributes) string_attr(root.get(), k, v, temp, "/");
      for (const auto& [k, v] : table.real_attributes) real_attr(root.get(), k, v, temp, "/");
    }
    for (const auto& c : table.columns) write_column(f.get(), c, temp);
    check(H5Fflush(f.get(), H5F_SCOPE_GLOBAL), temp, "flush");
    check(f.close(), temp, "close");
  }
  replace_file(temp, path);
  guard.p.clear();
}

}  // namespace tw::io
