#pragma once
/// Table of singly charged ion species, looked up by element symbol or name.
///
/// Masses (atomic masses, in unified atomic mass units u):
/// - H, D, T: the isotope atomic masses of 1H, 2H and 3H from the Atomic Mass Evaluation
///   as adopted by CODATA 2018 (Wang et al., "The AME2016 atomic mass evaluation",
///   Chin. Phys. C 41, 030003 (2017); Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021)):
///   1.00782503223, 2.01410177812, 3.0160492779 u.
/// - every other element: the IUPAC standard atomic weight for a natural isotope mixture,
///   conventional or abridged value (IUPAC CIAAW, "Standard atomic weights of the elements
///   2021", Pure Appl. Chem. 94, 573 (2022)): He 4.002602, Li 6.94, N 14.007, O 15.999,
///   Ne 20.180, Ar 39.95, Kr 83.798, Xe 131.29. Quoted from memory, not re-checked against
///   the printed table; the spread of natural abundances (up to 1e-3 relative for Li) is
///   larger than any rounding here.
///
/// The ion mass is the atomic mass minus the mass of the removed electrons,
/// m_i = m_atom - Z m_e (the ionisation energy, at most ~1e-8 relative, is neglected).
#include <string>
#include <string_view>
#include <vector>

#include "core/types.hpp"

namespace tw {

/// One ion species: an element (or hydrogen isotope) ionised Z times.
struct IonSpecies {
  std::string_view symbol;  ///< element symbol as written in tables, e.g. "Ar"
  std::string_view name;    ///< lower-case English name, e.g. "argon"
  real atomic_mass_u = 0;   ///< mass of the neutral atom [u]
  int charge_number = 1;    ///< Z: ion charge in units of e (all entries are singly charged)

  /// Ion mass m_i = m_atom - Z m_e [kg].
  [[nodiscard]] real mass_kg() const;
  /// Ion mass in units of the proton mass, mu = m_i/m_p (the NRL Formulary's mu).
  [[nodiscard]] real mass_over_proton_mass() const;
};

/// Species with symbol or name `key`, compared case-insensitively; a trailing "+" is
/// accepted ("Ar+" = "ar" = "ARGON"). nullptr if unknown.
[[nodiscard]] const IonSpecies* find_species(std::string_view key);

/// As find_species, but an unknown key throws InputError:
///   "<context>: unknown ion species 'Xx'; known species: H (hydrogen), D (deuterium), ..."
/// `context` names where the key came from (an option or a run-file key path).
[[nodiscard]] IonSpecies species_or_throw(std::string_view key,
                                          std::string_view context = "ion species");

/// Every species in the table, in table order (lightest first).
[[nodiscard]] std::vector<IonSpecies> all_species();

/// "H (hydrogen), D (deuterium), ..." — for help texts and error messages.
[[nodiscard]] std::string known_species_list();

}  // namespace tw
