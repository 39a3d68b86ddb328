#pragma once
/// A small command-line option parser shared by every `tubewave` subcommand.
///
/// Accepted forms: `--name VALUE`, `--name=VALUE`, `-x VALUE` (short alias), `--flag`,
/// positionals in declaration order, and `--` to end option processing. `--help`/`-h`
/// prints help_text() to stdout. A value that itself starts with "--" is not taken as an
/// option's value (so `--n --B 1` reports the missing value of --n); negative numbers such
/// as `-5` are values.
///
/// Errors (unknown option, missing value, missing or extra positional, malformed number)
/// are tw::InputError (exit code 2) whose message names the option and ends with
/// "see 'tubewave COMMAND --help'".
///
/// Option names are declared and queried without the leading dashes ("n", "mass-amu"),
/// though "--n" is accepted as well. Asking for a name that was never declared is a bug
/// (InternalError).
#include <map>
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace tw::cli {

class ArgParser {
 public:
  /// `command`: subcommand name ("plasma"); `synopsis`: the usage line after
  /// "tubewave COMMAND"; `description`: a paragraph shown in --help.
  ArgParser(std::string command, std::string synopsis, std::string description);

  /// A switch without a value, e.g. "json" for --json.
  ArgParser& flag(const std::string& name, const std::string& help);
  /// An option with a value, e.g. option("n", "N", "electron density [m^-3]") for --n N.
  /// If not `repeatable`, giving it twice keeps the last value.
  ArgParser& option(const std::string& name, const std::string& metavar, const std::string& help,
                    bool repeatable = false);
  /// `-c` as another spelling of a declared flag or option.
  ArgParser& short_alias(char c, const std::string& name);
  /// A positional argument; required ones must precede optional ones.
  ArgParser& positional(const std::string& name, const std::string& help, bool required = true);

  /// Parses `args` (the words after the subcommand name). Returns false if --help/-h was
  /// given: the help text has been printed to stdout and the caller should return 0.
  bool parse(std::span<const std::string> args);

  /// Whether a flag, option or positional was given.
  [[nodiscard]] bool has(const std::string& name) const;
  /// The last value given for an option; InputError "option --NAME is required" if absent.
  [[nodiscard]] std::string value(const std::string& name) const;
  /// All values given for an option, in order (empty if none).
  [[nodiscard]] std::vector<std::string> values(const std::string& name) const;
  /// value() as a finite number; InputError "option --n: 'abc' is not a number".
  [[nodiscard]] double real_value(const std::string& name) const;
  /// value() as an integer; InputError "option --k: '1.5' is not an integer".
  [[nodiscard]] long int_value(const std::string& name) const;
  /// The value of a positional; InputError if it was not given.
  [[nodiscard]] std::string positional_value(const std::string& name) const;

  /// Usage, description and an aligned list of options and positionals.
  [[nodiscard]] std::string help_text() const;
  /// " see 'tubewave COMMAND --help'" — appended to every error message.
  [[nodiscard]] std::string help_hint() const;
  [[nodiscard]] const std::string& command() const { return command_; }

 private:
  enum class Kind { flag, option, positional };
  struct Spec {
    std::string name;
    Kind kind = Kind::flag;
    std::string metavar;
    std::string help;
    bool repeatable = false;
    bool required = false;
    char short_name = 0;
  };
  [[nodiscard]] const Spec& spec(const std::string& name) const;
  [[nodiscard]] const Spec* find_long(std::string_view name) const;
  [[nodiscard]] const Spec* find_short(char c) const;
  [[noreturn]] void fail(const std::string& message) const;
  void declare(Spec s);

  std::string command_;
  std::string synopsis_;
  std::string description_;
  std::vector<Spec> specs_;                               // declaration order
  std::map<std::string, std::vector<std::string>> given_;  // name -> values ("" for flags)
};

/// Parses a whole string as a finite double (leading '+' allowed); false otherwise.
[[nodiscard]] bool parse_real(std::string_view text, double& out);

}  // namespace tw::cli
