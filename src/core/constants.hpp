#pragma once
/// Physical constants, CODATA 2018 recommended values (SI). The only place they are defined.
///
/// Source: E. Tiesinga, P. J. Mohr, D. B. Newell, B. N. Taylor, "CODATA recommended values
/// of the fundamental physical constants: 2018", Rev. Mod. Phys. 93, 025010 (2021).
/// c, e, h and k_B are exact in the 2019 SI; the others carry their CODATA uncertainty.
#include <numbers>

#include "core/types.hpp"

namespace tw::constants {

inline constexpr real pi = std::numbers::pi_v<real>;
inline constexpr real c = 299792458.0;               ///< speed of light in vacuum [m/s] (exact)
inline constexpr real e = 1.602176634e-19;           ///< elementary charge [C] (exact)
inline constexpr real k_B = 1.380649e-23;            ///< Boltzmann constant [J/K] (exact)
inline constexpr real m_e = 9.1093837015e-31;        ///< electron mass [kg]
inline constexpr real m_p = 1.67262192369e-27;       ///< proton mass [kg]
inline constexpr real u = 1.66053906660e-27;         ///< atomic mass constant [kg]
inline constexpr real mu0 = 1.25663706212e-6;        ///< vacuum magnetic permeability [N/A^2]
inline constexpr real eps0 = 8.8541878128e-12;       ///< vacuum electric permittivity [F/m]
inline constexpr real eV = e;                        ///< one electronvolt [J]
inline constexpr real eV_in_K = e / k_B;             ///< one electronvolt as a temperature [K]

}  // namespace tw::constants
