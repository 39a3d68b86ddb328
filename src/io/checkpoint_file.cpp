#include "io/checkpoint_file.hpp"

#include <array>
#include <ctime>
#include <filesystem>
#include <random>
#include <system_error>

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

constexpr const char* format_name = "tubewave-checkpoint";

/// Writes one checkpoint file; every failure is a RunError naming the file and object.
class Writer {
 public:
  explicit Writer(std::string file) : file_(std::move(file)) {}

  Handle own(hid_t id, Kind kind, std::string_view op, std::string_view object = {}) const {
    return h5::own<RunError>(id, kind, file_, op, object);
  }
  void check(herr_t status, std::string_view op, std::string_view object = {}) const {
    h5::check<RunError>(status, file_, op, object);
  }

  Handle group(hid_t parent, const char* name, const std::string& object) const {
    Handle gcpl = own(H5Pcreate(H5P_GROUP_CREATE), Kind::plist, "create group properties");
    check(H5Pset_link_creation_order(gcpl.get(), H5P_CRT_ORDER_TRACKED | H5P_CRT_ORDER_INDEXED),
          "set link creation order");
    return own(H5Gcreate2(parent, name, H5P_DEFAULT, gcpl.get(), H5P_DEFAULT), Kind::group,
               "create group", object);
  }

  Handle string_type() const {
    Handle t = own(H5Tcopy(H5T_C_S1), Kind::datatype, "create a string type");
    check(H5Tset_size(t.get(), H5T_VARIABLE), "create a string type");
    check(H5Tset_cset(t.get(), H5T_CSET_UTF8), "create a string type");
    return t;
  }

  Handle scalar() const { return own(H5Screate(H5S_SCALAR), Kind::dataspace, "create a dataspace"); }

  void string_attr(hid_t obj, const char* name, const std::string& value, const std::string& object) const {
    Handle type = string_type();
    Handle space = scalar();
    Handle a = own(H5Acreate2(obj, name, type.get(), space.get(), H5P_DEFAULT, H5P_DEFAULT),
                   Kind::attribute, "create attribute", object + "@" + name);
    const char* data = value.c_str();
    check(H5Awrite(a.get(), type.get(), &data), "write attribute", object + "@" + name);
  }

  void int_attr(hid_t obj, const char* name, long long value, const std::string& object) const {
    Handle space = scalar();
    Handle a = own(H5Acreate2(obj, name, H5T_STD_I64LE, space.get(), H5P_DEFAULT, H5P_DEFAULT),
                   Kind::attribute, "create attribute", object + "@" + name);
    check(H5Awrite(a.get(), H5T_NATIVE_LLONG, &value), "write attribute", object + "@" + name);
  }

  void real_attr(hid_t obj, const char* name, double value, const std::string& object) const {
    Handle space = scalar();
    Handle a = own(H5Acreate2(obj, name, H5T_IEEE_F64LE, space.get(), H5P_DEFAULT, H5P_DEFAULT),
                   Kind::attribute, "create attribute", object + "@" + name);
    check(H5Awrite(a.get(), H5T_NATIVE_DOUBLE, &value), "write attribute", object + "@" + name);
  }

  void string_dataset(hid_t parent, const char* name, const std::string& value,
                      const std::string& object) const {
    Handle type = string_type();
    Handle space = scalar();
    Handle ds = own(H5Dcreate2(parent, name, type.get(), space.get(), H5P_DEFAULT, H5P_DEFAULT,
                               H5P_DEFAULT),
                    Kind::dataset, "create dataset", object);
    const char* data = value.c_str();
    check(H5Dwrite(ds.get(), type.get(), H5S_ALL, H5S_ALL, H5P_DEFAULT, &data), "write dataset", object);
  }

  /// float64 dataset of shape `dims` (rank 1 or 2) holding `values` row-major.
  void real_dataset(hid_t parent, const char* name, const std::vector<real>& values,
                    std::vector<hsize_t> dims, const std::string& object) const {
    Handle space = own(H5Screate_simple(static_cast<int>(dims.size()), dims.data(), nullptr),
                       Kind::dataspace, "create dataspace", object);
    Handle ds = own(H5Dcreate2(parent, name, H5T_IEEE_F64LE, space.get(), H5P_DEFAULT, H5P_DEFAULT,
                               H5P_DEFAULT),
                    Kind::dataset, "create dataset", object);
    if (!values.empty())
      check(H5Dwrite(ds.get(), H5T_NATIVE_DOUBLE, H5S_ALL, H5S_ALL, H5P_DEFAULT, values.data()),
            "write dataset", object);
  }

  [[nodiscard]] const std::string& file() const { return file_; }

 private:
  std::string file_;
};

void require_link_name(const std::string& name, const char* what) {
  TW_CHECK(!name.empty() && name != "." && name.find('/') == std::string::npos,
           std::string("invalid checkpoint ") + what + " name '" + name + "'");
}

void write_all(const Writer& w, hid_t root, const CheckpointData& d) {
  w.string_attr(root, "format", format_name, "/");
  w.int_attr(root, "format_version", checkpoint_format_version, "/");
  w.int_attr(root, "complete", 0, "/");
  w.string_attr(root, "created", utc_now_iso8601(), "/");
  w.string_attr(root, "tubewave_version", tw::build::version, "/");
  w.string_attr(root, "git_revision", tw::build::git_revision, "/");
  w.string_attr(root, "reason", d.reason, "/");
  w.string_attr(root, "model", d.model, "/");
  w.string_attr(root, "run_id", d.run_id, "/");
  w.int_attr(root, "n_vars", d.n_vars, "/");
  w.int_attr(root, "n_cells", d.n_cells, "/");
  w.real_attr(root, "x_min", d.x_min, "/");
  w.real_attr(root, "length", d.length, "/");

  {
    Handle g = w.group(root, "run_file", "/run_file");
    w.string_dataset(g.get(), "text", d.run_file_text, "/run_file/text");
    w.string_dataset(g.get(), "name", d.run_file_name, "/run_file/name");
    w.string_dataset(g.get(), "resolved", d.resolved_run_file, "/run_file/resolved");
    w.string_dataset(g.get(), "output_file", d.output_file, "/run_file/output_file");
    Handle o = w.group(g.get(), "overrides", "/run_file/overrides");
    for (std::size_t i = 0; i < d.overrides.size(); ++i) {
      const std::string name = std::to_string(i);
      w.string_dataset(o.get(), name.c_str(), d.overrides[i], "/run_file/overrides/" + name);
    }
  }
  {
    Handle g = w.group(root, "loop", "/loop");
    w.real_attr(g.get(), "t", d.t, "/loop");
    w.int_attr(g.get(), "step", d.step, "/loop");
    w.real_attr(g.get(), "t_snap_last", d.t_snap_last, "/loop");
    w.real_attr(g.get(), "wall_seconds", d.wall_seconds, "/loop");
    w.int_attr(g.get(), "restarts", d.restarts, "/loop");
  }
  {
    TW_CHECK(d.state.size() == static_cast<std::size_t>(d.n_cells) * static_cast<std::size_t>(d.n_vars),
             "checkpoint state has " + std::to_string(d.state.size()) + " values for " +
                 std::to_string(d.n_cells) + " cells x " + std::to_string(d.n_vars) + " variables");
    Handle g = w.group(root, "state", "/state");
    w.real_dataset(g.get(), "conserved", d.state,
                   {static_cast<hsize_t>(d.n_cells), static_cast<hsize_t>(d.n_vars)}, "/state/conserved");
  }
  auto int_group = [&](const char* name, const auto& values) {
    const std::string object = std::string("/") + name;
    Handle g = w.group(root, name, object);
    for (const auto& [key, value] : values) {
      require_link_name(key, name);
      w.int_attr(g.get(), key.c_str(), static_cast<long long>(value), object);
    }
  };
  int_group("cadences", d.cadences);
  int_group("counters", d.counters);
  int_group("series_rows", d.series_rows);
  auto real_group = [&](const char* name, const std::map<std::string, std::vector<real>>& values) {
    const std::string object = std::string("/") + name;
    Handle g = w.group(root, name, object);
    for (const auto& [key, v] : values) {
      require_link_name(key, name);
      w.real_dataset(g.get(), key.c_str(), v, {static_cast<hsize_t>(v.size())}, object + "/" + key);
    }
  };
  real_group("accumulators", d.accumulators);
  real_group("drives", d.drives);
}

std::string temp_name_for(const std::string& path) {
  std::random_device rd;
  return temporary_name(path) + "." + std::to_string(rd() % 1000000u);
}

}  // namespace

void write_checkpoint_file(const std::string& path, const CheckpointData& data) {
  h5::silence_error_printing();
  const std::string temp = temp_name_for(path);
  const Writer w(temp);
  bool created = false;
  try {
    {
      Handle fcpl = w.own(H5Pcreate(H5P_FILE_CREATE), Kind::plist, "create file properties");
      w.check(H5Pset_link_creation_order(fcpl.get(), H5P_CRT_ORDER_TRACKED | H5P_CRT_ORDER_INDEXED),
              "set link creation order");
      Handle fapl = w.own(H5Pcreate(H5P_FILE_ACCESS), Kind::plist, "create file access properties");
      w.check(H5Pset_fclose_degree(fapl.get(), H5F_CLOSE_STRONG), "set file close degree");
      Handle f = w.own(H5Fcreate(temp.c_str(), H5F_ACC_EXCL, fcpl.get(), fapl.get()), Kind::file, "create");
      created = true;
      write_all(w, f.get(), data);
      // "complete" last, after everything else is on its way to the disk.
      w.check(H5Fflush(f.get(), H5F_SCOPE_GLOBAL), "flush");
      {
        Handle a = w.own(H5Aopen(f.get(), "complete", H5P_DEFAULT), Kind::attribute, "open attribute", "/@complete");
        const long long one = 1;
        w.check(H5Awrite(a.get(), H5T_NATIVE_LLONG, &one), "write attribute", "/@complete");
      }
      w.check(f.close(), "close");
    }
    replace_file(temp, path);
  } catch (...) {
    if (created) {
      std::error_code ec;
      fs::remove(temp, ec);
    }
    throw;
  }
}

CheckpointData read_checkpoint_file(const std::string& path) {
  const H5Reader r(path);
  const std::string format = r.has_attribute("/", "format") ? r.attr_string("/", "format") : "";
  if (format != format_name) {
    std::string hint;
    if (format == "tubewave-run") hint = " (it is a run output; its checkpoint is a separate file, by default NAME.checkpoint.h5)";
    throw InputError("'" + path + "' is not a tubewave checkpoint (format '" + format + "')" + hint);
  }
  const long version = r.attr_int("/", "format_version");
  if (version != checkpoint_format_version)
    throw InputError("checkpoint '" + path + "' has format version " + std::to_string(version) +
                     "; this tubewave reads version " + std::to_string(checkpoint_format_version));
  if (!r.has_attribute("/", "complete") || r.attr_int("/", "complete") != 1)
    throw InputError("checkpoint '" + path + "' is incomplete (its writer was stopped while writing it)");

  CheckpointData d;
  d.tubewave_version = r.attr_string("/", "tubewave_version");
  d.git_revision = r.attr_string("/", "git_revision");
  d.reason = r.attr_string("/", "reason");
  d.model = r.attr_string("/", "model");
  d.run_id = r.attr_string("/", "run_id");
  d.n_vars = static_cast<int>(r.attr_int("/", "n_vars"));
  d.n_cells = static_cast<int>(r.attr_int("/", "n_cells"));
  d.x_min = r.attr_real("/", "x_min");
  d.length = r.attr_real("/", "length");

  d.run_file_text = r.read_string("/run_file/text");
  d.run_file_name = r.read_string("/run_file/name");
  d.resolved_run_file = r.read_string("/run_file/resolved");
  d.output_file = r.read_string("/run_file/output_file");
  for (const auto& name : r.members("/run_file/overrides"))
    d.overrides.push_back(r.read_string("/run_file/overrides/" + name));

  d.t = r.attr_real("/loop", "t");
  d.step = r.attr_int("/loop", "step");
  d.t_snap_last = r.attr_real("/loop", "t_snap_last");
  d.wall_seconds = r.attr_real("/loop", "wall_seconds");
  d.restarts = static_cast<int>(r.attr_int("/loop", "restarts"));

  std::vector<hsize_t> dims;
  d.state = r.read_real("/state/conserved", &dims);
  if (dims.size() != 2 || dims[0] != static_cast<hsize_t>(d.n_cells) ||
      dims[1] != static_cast<hsize_t>(d.n_vars))
    throw InputError("checkpoint '" + path + "': /state/conserved does not have the shape [" +
                     std::to_string(d.n_cells) + ", " + std::to_string(d.n_vars) + "] of its header");

  for (const auto& name : r.attribute_names("/cadences")) d.cadences[name] = r.attr_int("/cadences", name);
  for (const auto& name : r.attribute_names("/counters")) d.counters[name] = r.attr_int("/counters", name);
  for (const auto& name : r.attribute_names("/series_rows")) {
    const long rows = r.attr_int("/series_rows", name);
    if (rows < 0) throw InputError("checkpoint '" + path + "': negative row count for series '" + name + "'");
    d.series_rows[name] = static_cast<std::size_t>(rows);
  }
  for (const auto& name : r.members("/accumulators")) d.accumulators[name] = r.read_real("/accumulators/" + name);
  for (const auto& name : r.members("/drives")) d.drives[name] = r.read_real("/drives/" + name);
  return d;
}

}  // namespace tw::io
