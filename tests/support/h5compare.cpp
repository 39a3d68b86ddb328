#include "support/h5compare.hpp"

#include <cmath>
#include <cstring>
#include <functional>
#include <set>

#include "io/h5read.hpp"

namespace tw::test {

namespace {

/// Paths of the numeric datasets of a file, outside the groups that legitimately differ
/// between runs of the same case (/provenance: threads; /status: wall time, restarts).
std::set<std::string> numeric_datasets(const io::H5Reader& r) {
  std::set<std::string> out;
  std::function<void(const std::string&)> walk = [&](const std::string& group) {
    for (const auto& name : r.members(group)) {
      const std::string path = (group == "/" ? "" : group) + "/" + name;
      if (path == "/provenance" || path == "/status") continue;
      if (r.is_group(path))
        walk(path);
      else if (r.is_numeric(path))
        out.insert(path);
    }
  };
  walk("/");
  return out;
}

}  // namespace

std::vector<std::string> bitwise_differences(const std::string& a, const std::string& b, int* compared) {
  const io::H5Reader ra(a), rb(b);
  const auto da = numeric_datasets(ra), db = numeric_datasets(rb);
  std::vector<std::string> diffs;
  int n = 0;
  for (const auto& p : da) {
    if (db.count(p) == 0) {
      diffs.push_back(p + ": only in " + a);
      continue;
    }
    std::vector<hsize_t> sa, sb;
    const auto va = ra.read_real(p, &sa), vb = rb.read_real(p, &sb);
    ++n;
    if (sa != sb) {
      diffs.push_back(p + ": shapes differ");
      continue;
    }
    for (std::size_t i = 0; i < va.size(); ++i) {
      if (std::memcmp(&va[i], &vb[i], sizeof(double)) != 0) {
        diffs.push_back(p + ": value " + std::to_string(i) + " differs (" + std::to_string(va[i]) + " vs " +
                        std::to_string(vb[i]) + ")");
        break;
      }
    }
  }
  for (const auto& p : db)
    if (da.count(p) == 0) diffs.push_back(p + ": only in " + b);
  if (compared != nullptr) *compared = n;
  return diffs;
}

bool all_finite(const std::string& file, std::string* where) {
  const io::H5Reader r(file);
  for (const auto& p : numeric_datasets(r)) {
    const std::string group = p.substr(0, p.rfind('/'));
    if (group != "/grid" && !r.is_dataset(group + "/time")) continue;  // not a series
    for (double v : r.read_real(p)) {
      if (!std::isfinite(v)) {
        if (where != nullptr) *where = p;
        return false;
      }
    }
  }
  return true;
}

}  // namespace tw::test
