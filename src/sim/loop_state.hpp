#pragma once
/// The time loop's own variables, by reference, under the names they have in checkpoints
/// (sim/checkpoint.hpp). A diagnostic that adds a cadence, a counter or an accumulator
/// registers it here so it survives a restart (DEVELOPERS.md, "Adding a diagnostic").
#include <algorithm>
#include <functional>
#include <span>
#include <string>
#include <utility>
#include <vector>

#include "core/error.hpp"
#include "core/types.hpp"
#include "sim/cadence.hpp"

namespace tw {

/// State a diagnostic carries from step to step, as a flat list of reals: `save` gives it,
/// `restore` puts back what `save` gave (bit for bit) and throws InputError if the list does
/// not fit (a checkpoint of another case).
struct Accumulator {
  std::function<std::vector<real>()> save;
  std::function<void(std::span<const real>)> restore;
};

/// An Accumulator over a fixed-size block of reals (which must outlive it).
inline Accumulator accumulator_over(std::span<real> values) {
  return {[values] { return std::vector<real>(values.begin(), values.end()); },
          [values](std::span<const real> v) {
            if (v.size() != values.size())
              throw InputError("it holds " + std::to_string(v.size()) + " values, this run " +
                               std::to_string(values.size()));
            std::copy(v.begin(), v.end(), values.begin());
          }};
}

struct LoopVariables {
  real* t = nullptr;
  long* step = nullptr;
  real* t_snap_last = nullptr;
  std::vector<std::pair<std::string, Cadence*>> cadences;
  std::vector<std::pair<std::string, long*>> counters;
  std::vector<std::pair<std::string, Accumulator>> accumulators;
};

}  // namespace tw
