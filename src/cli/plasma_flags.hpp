#pragma once
/// The plasma flags shared by `tubewave plasma` and `tubewave modes`: --n, --B, --ion or
/// --mass-amu, --charge, --Te, --Ti, --lnlambda. Declared once, read once, validated once
/// (InputError naming the flag and the value, exit code 2).
#include <string>

#include "cli/args.hpp"
#include "core/plasma_params.hpp"

namespace tw::cli {

/// A PlasmaInput and the name of its ion ("" when given by mass).
struct LabelledInput {
  PlasmaInput input;
  std::string ion;
};

/// Declare the plasma flags on a parser.
void declare_plasma_flags(ArgParser& p);

/// The names of the plasma flags (without dashes), e.g. to refuse them next to a run file.
const std::vector<std::string>& plasma_flag_names();

/// Read and validate the plasma flags (--n and --B required, exactly one of --ion and
/// --mass-amu; ranges checked).
LabelledInput input_from_flags(const ArgParser& args);

}  // namespace tw::cli
