#include "io/h5handle.hpp"

#include <mutex>
#include <vector>

namespace tw::io::h5 {

herr_t Handle::close() noexcept {
  if (id_ < 0) return 0;
  const hid_t id = std::exchange(id_, H5I_INVALID_HID);
  switch (kind_) {
    case Kind::file:
      return H5Fclose(id);
    case Kind::group:
      return H5Gclose(id);
    case Kind::dataset:
      return H5Dclose(id);
    case Kind::dataspace:
      return H5Sclose(id);
    case Kind::datatype:
      return H5Tclose(id);
    case Kind::plist:
      return H5Pclose(id);
    case Kind::attribute:
      return H5Aclose(id);
    case Kind::object:
      return H5Oclose(id);
  }
  return -1;
}

void silence_error_printing() noexcept {
  static std::once_flag once;
  std::call_once(once, [] { (void)H5Eset_auto2(H5E_DEFAULT, nullptr, nullptr); });
}

namespace {

struct StackEntry {
  std::string function;
  std::string description;
  std::string minor;
};

herr_t collect_entry(unsigned /*n*/, const H5E_error2_t* err, void* data) {
  auto* entries = static_cast<std::vector<StackEntry>*>(data);
  StackEntry e;
  if (err->func_name != nullptr) e.function = err->func_name;
  if (err->desc != nullptr) e.description = err->desc;
  char minor[256] = {};
  H5E_type_t type{};
  if (H5Eget_msg(err->min_num, &type, minor, sizeof(minor)) > 0) e.minor = minor;
  entries->push_back(std::move(e));
  return 0;
}

}  // namespace

std::string error_stack_message() {
  std::vector<StackEntry> entries;
  // Walk upward: the innermost (most specific) cause comes first.
  (void)H5Ewalk2(H5E_DEFAULT, H5E_WALK_UPWARD, collect_entry, &entries);
  (void)H5Eclear2(H5E_DEFAULT);
  if (entries.empty()) return "no detail from the HDF5 library";
  // The innermost entry names the cause (often with errno text); the outermost names the
  // API call that failed. Two entries are enough to diagnose without a wall of text.
  const StackEntry& inner = entries.front();
  std::string msg = inner.description;
  if (!inner.minor.empty() && inner.minor != inner.description) msg += " (" + inner.minor + ")";
  if (entries.size() > 1) {
    const StackEntry& outer = entries.back();
    msg += "; in " + outer.function + ": " + outer.description;
  }
  return msg;
}

std::string failure_message(std::string_view file, std::string_view op, std::string_view object) {
  std::string msg = "cannot ";
  msg += op;
  if (!object.empty()) {
    msg += " '";
    msg += object;
    msg += "' in";
  }
  msg += " file '";
  msg += file;
  msg += "': ";
  msg += error_stack_message();
  return msg;
}

}  // namespace tw::io::h5
