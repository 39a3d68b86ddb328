/// Entry point of the `tubewave` executable: dispatches to a subcommand and maps errors
/// to exit codes (tw::Error -> its exit_code(), any other exception -> 1).
#include <algorithm>
#include <array>
#include <cstdio>
#include <exception>
#include <iostream>
#include <span>
#include <string>
#include <vector>

#include "cli/args.hpp"
#include "cli/commands.hpp"
#include "core/error.hpp"
#include "io/text_util.hpp"
#include "tubewave/version.hpp"

namespace {

using tw::cli::Command;

// ---------------------------------------------------------------------------------------
// COMMAND TABLE. Add each subcommand here (one line: name, summary, function declared in
// cli/commands.hpp); `tubewave --help` lists them in this order.
// ---------------------------------------------------------------------------------------
constexpr std::array commands{
    Command{"run", "run a case from a run file and write its HDF5 output", tw::cli::cmd_run},
    Command{"check", "validate a run file and estimate the time step, steps, memory and output size",
            tw::cli::cmd_check},
    Command{"keys", "print the reference of every run-file key", tw::cli::cmd_keys},
    Command{"measure", "measure frequency, wavelength, phase and group speed, damping and the omega-k spectrum of a run",
            tw::cli::cmd_measure},
    Command{"plasma", "print derived plasma parameters (speeds, frequencies, lengths, collisions)",
            tw::cli::cmd_plasma},
    Command{"modes", "linear dispersion relation of a model: every branch omega(k), or k at a drive frequency",
            tw::cli::cmd_modes},
    Command{"sweep", "run a batch of cases from a sweep file (locally or under MPI) into a summary table",
            tw::cli::cmd_sweep},
};
// ---------------------------------------------------------------------------------------

std::string version_line() {
  return std::string("tubewave ") + tw::build::version + " (git " + tw::build::git_revision +
         ", " + tw::build::compiler + ", " + tw::build::build_type + ")";
}

std::string main_help() {
  std::string out =
      "usage: tubewave COMMAND [ARGS...]\n"
      "       tubewave COMMAND --help\n"
      "       tubewave --version\n"
      "\n"
      "A one-dimensional time-domain simulator of waves in a magnetised plasma tube\n"
      "(ideal MHD, Hall MHD, two-fluid). All inputs and outputs are in SI units;\n"
      "temperatures may be given in eV.\n"
      "\n"
      "commands:\n";
  std::size_t width = 0;
  for (const auto& c : commands) width = std::max(width, std::string(c.name).size());
  for (const auto& c : commands) {
    const std::string name = c.name;
    out += "  " + name + std::string(width - name.size() + 3, ' ') + c.summary + "\n";
  }
  out +=
      "\noptions:\n"
      "  -h, --help     show this help and exit\n"
      "  --version      print version, git revision, compiler and build type\n"
      "\nexit codes: 0 success, 1 run failed, 2 bad input, 3 interrupted (checkpoint written)\n";
  return out;
}

const Command* find_command(const std::string& name) {
  for (const auto& c : commands) {
    if (name == c.name) return &c;
  }
  return nullptr;
}

int dispatch(const std::vector<std::string>& words) {
  if (words.empty()) {
    std::cerr << main_help();
    return tw::exit_code::bad_input;
  }
  const std::string& first = words[0];
  if (first == "--help" || first == "-h" || first == "help") {
    if (first == "help" && words.size() > 1) {  // `tubewave help CMD` = `tubewave CMD --help`
      if (const Command* c = find_command(words[1])) {
        const std::vector<std::string> help{"--help"};
        return c->run(help);
      }
    } else {
      std::cout << main_help();
      return tw::exit_code::ok;
    }
  }
  if (first == "--version") {
    std::cout << version_line() << "\n";
    return tw::exit_code::ok;
  }
  const std::string& name = (first == "help") ? words[1] : first;
  if (const Command* c = find_command(name)) {
    return c->run(std::span<const std::string>(words).subspan(1));
  }
  std::vector<std::string> names;
  for (const auto& c : commands) names.emplace_back(c.name);
  const std::string near = tw::io::detail::nearest_name(name, names);
  throw tw::InputError("unknown command '" + name + "'" +
                       (near.empty() ? std::string() : " (did you mean '" + near + "'?)") +
                       "; see 'tubewave --help'");
}

}  // namespace

int main(int argc, char** argv) {
  const std::vector<std::string> words(argv + 1, argv + argc);
  try {
    const int rc = dispatch(words);
    std::cout.flush();
    return rc;
  } catch (const tw::Error& e) {
    std::cout.flush();
    std::cerr << "tubewave: error: " << e.what() << "\n";
    return e.exit_code();
  } catch (const std::exception& e) {
    std::cout.flush();
    std::cerr << "tubewave: error: " << e.what() << "\n";
    return tw::exit_code::run_failed;
  }
}
