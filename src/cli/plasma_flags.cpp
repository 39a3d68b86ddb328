// The plasma flags of `tubewave plasma` and `tubewave modes` (see plasma_flags.hpp).
#include "cli/plasma_flags.hpp"

#include <string>
#include <vector>

#include "core/constants.hpp"
#include "core/error.hpp"
#include "core/species.hpp"

namespace tw::cli {

namespace {

/// `--NAME` as a number that must satisfy `ok`, else InputError naming flag and value.
template <class Pred>
double checked_real(const ArgParser& args, const std::string& name, Pred ok,
                    const std::string& range) {
  const double v = args.real_value(name);
  if (!ok(v)) {
    throw InputError("option --" + name + ": '" + args.value(name) + "' is out of range; it must be " +
                     range + "; " + args.help_hint());
  }
  return v;
}

}  // namespace

void declare_plasma_flags(ArgParser& p) {
  p.option("n", "N_M3", "electron density [m^-3] (> 0); the ion density is n/Z")
      .option("B", "B_T", "magnetic field strength [T] (> 0)")
      .option("ion", "NAME", "ion species by symbol or name, e.g. H, D, He, Ar, argon")
      .option("mass-amu", "M", "ion mass [u] instead of --ion (the ion's own mass, > 0)")
      .option("charge", "Z", "ion charge number (integer >= 1, default 1); with --ion, Z electrons are removed")
      .option("Te", "EV", "electron temperature [eV] (>= 0, default 0)")
      .option("Ti", "EV", "ion temperature [eV] (>= 0, default 0)")
      .option("lnlambda", "L", "Coulomb logarithm to use instead of the NRL formula (> 0)");
}

const std::vector<std::string>& plasma_flag_names() {
  static const std::vector<std::string> n{"n", "B", "ion", "mass-amu", "charge", "Te", "Ti", "lnlambda"};
  return n;
}

LabelledInput input_from_flags(const ArgParser& args) {
  LabelledInput out;
  PlasmaInput& in = out.input;
  const auto positive = [](double v) { return v > 0; };
  const auto non_negative = [](double v) { return v >= 0; };
  in.n_e = checked_real(args, "n", positive, "> 0 (electron density in m^-3)");
  in.B = checked_real(args, "B", positive, "> 0 (field strength in T)");
  if (args.has("charge")) {
    const long z = args.int_value("charge");
    if (z < 1 || z > 200) {
      throw InputError("option --charge: '" + args.value("charge") +
                       "' is out of range; it must be an integer >= 1; " + args.help_hint());
    }
    in.Z = static_cast<int>(z);
  }
  const bool by_name = args.has("ion");
  const bool by_mass = args.has("mass-amu");
  if (by_name == by_mass) {
    throw InputError(std::string(by_name ? "options --ion and --mass-amu were both given"
                                         : "no ion given") +
                     ": give exactly one of --ion NAME or --mass-amu M; " + args.help_hint());
  }
  if (by_name) {
    const std::string name = args.value("ion");
    const IonSpecies* s = find_species(name);
    if (s == nullptr) {
      throw InputError("option --ion: unknown ion species '" + name + "'; known species: " +
                       known_species_list() + "; or give the ion mass with --mass-amu M; " +
                       args.help_hint());
    }
    out.ion = std::string(s->symbol);
    // The table's atoms lose Z electrons (Z from --charge, default 1).
    in.ion_mass = s->atomic_mass_u * constants::u - static_cast<real>(in.Z) * constants::m_e;
  } else {
    in.ion_mass = checked_real(args, "mass-amu", positive, "> 0 (ion mass in u)") * constants::u;
  }
  if (args.has("Te")) in.Te_eV = checked_real(args, "Te", non_negative, ">= 0 (eV)");
  if (args.has("Ti")) in.Ti_eV = checked_real(args, "Ti", non_negative, ">= 0 (eV)");
  if (args.has("lnlambda")) in.ln_lambda = checked_real(args, "lnlambda", positive, "> 0");
  return out;
}

}  // namespace tw::cli
