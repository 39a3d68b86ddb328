#include "core/species.hpp"

#include <array>
#include <cctype>

#include "core/constants.hpp"
#include "core/error.hpp"

namespace tw {
namespace {

// Atomic masses [u]. Sources in species.hpp: AME2016/CODATA 2018 for the hydrogen
// isotopes, IUPAC conventional standard atomic weights for the rest.
constexpr std::array<IonSpecies, 11> species_table{{
    {"H", "hydrogen", 1.00782503223, 1},
    {"D", "deuterium", 2.01410177812, 1},
    {"T", "tritium", 3.0160492779, 1},
    {"He", "helium", 4.002602, 1},
    {"Li", "lithium", 6.94, 1},
    {"N", "nitrogen", 14.007, 1},
    {"O", "oxygen", 15.999, 1},
    {"Ne", "neon", 20.180, 1},
    {"Ar", "argon", 39.95, 1},
    {"Kr", "krypton", 83.798, 1},
    {"Xe", "xenon", 131.29, 1},
}};

bool iequal(std::string_view a, std::string_view b) {
  if (a.size() != b.size()) return false;
  for (std::size_t k = 0; k < a.size(); ++k) {
    const auto ca = static_cast<unsigned char>(a[k]);
    const auto cb = static_cast<unsigned char>(b[k]);
    if (std::tolower(ca) != std::tolower(cb)) return false;
  }
  return true;
}

}  // namespace

real IonSpecies::mass_kg() const {
  return atomic_mass_u * constants::u - static_cast<real>(charge_number) * constants::m_e;
}

real IonSpecies::mass_over_proton_mass() const { return mass_kg() / constants::m_p; }

const IonSpecies* find_species(std::string_view key) {
  if (!key.empty() && key.back() == '+') key.remove_suffix(1);
  for (const auto& s : species_table) {
    if (iequal(key, s.symbol) || iequal(key, s.name)) return &s;
  }
  return nullptr;
}

IonSpecies species_or_throw(std::string_view key, std::string_view context) {
  if (const IonSpecies* s = find_species(key)) return *s;
  throw InputError(std::string(context) + ": unknown ion species '" + std::string(key) +
                   "'; known species: " + known_species_list());
}

std::vector<IonSpecies> all_species() { return {species_table.begin(), species_table.end()}; }

std::string known_species_list() {
  std::string out;
  for (const auto& s : species_table) {
    if (!out.empty()) out += ", ";
    out += std::string(s.symbol) + " (" + std::string(s.name) + ")";
  }
  return out;
}

}  // namespace tw
