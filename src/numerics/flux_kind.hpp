#pragma once
/// The names of the numerical fluxes a run file can choose (the catalogue itself, which
/// model can use which, is numerics/fluxes.hpp).
#include <string>
#include <vector>

namespace tw {

enum class FluxKind { rusanov, hll, hlld, upwind };

inline const std::vector<std::string>& flux_names() {
  static const std::vector<std::string> n{"rusanov", "hll", "hlld", "upwind"};
  return n;
}

}  // namespace tw
