#pragma once
/// The subcommands of the `tubewave` executable. Each takes the words after its name
/// and returns the process exit code; errors are thrown as tw::Error and mapped to exit
/// codes once, in main().
#include <span>
#include <string>

namespace tw::cli {

/// One entry of the command table in main.cpp.
struct Command {
  const char* name;     ///< the word after `tubewave`
  const char* summary;  ///< one line for `tubewave --help`
  int (*run)(std::span<const std::string> args);
};

/// `tubewave plasma`: derived plasma parameters (cmd_plasma.cpp).
int cmd_plasma(std::span<const std::string> args);
/// `tubewave run`, `check`, `keys` (cmd_run.cpp).
int cmd_run(std::span<const std::string> args);
int cmd_check(std::span<const std::string> args);
int cmd_keys(std::span<const std::string> args);
/// `tubewave measure`: wave figures of a finished run (cmd_measure.cpp).
int cmd_measure(std::span<const std::string> args);
/// `tubewave modes`: linear dispersion relation of a model (cmd_modes.cpp).
int cmd_modes(std::span<const std::string> args);
/// `tubewave sweep`: batches of cases from a sweep file (cmd_sweep.cpp).
int cmd_sweep(std::span<const std::string> args);

}  // namespace tw::cli
