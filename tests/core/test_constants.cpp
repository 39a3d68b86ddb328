// Consistency of the constants in core/constants.hpp with relations and derived values
// published by CODATA 2018 (Tiesinga, Mohr, Newell & Taylor, "CODATA recommended values of
// the fundamental physical constants: 2018", Rev. Mod. Phys. 93, 025010 (2021)).
// Reference values below are CODATA 2018 derived constants, quoted from memory.
#include <catch2/catch.hpp>

#include <cmath>

#include "core/constants.hpp"

namespace K = tw::constants;

TEST_CASE("constants: mu0 eps0 c^2 = 1", "[unit][constants]") {
  // Maxwell: c^2 = 1/(mu0 eps0). In the 2019 SI mu0 and eps0 are measured, but CODATA
  // adjusts them together so the relation holds; 1e-9 covers the 11-digit rounding.
  CHECK(K::mu0 * K::eps0 * K::c * K::c == Approx(1.0).epsilon(1e-9));
}

TEST_CASE("constants: mass ratios against CODATA 2018", "[unit][constants]") {
  // CODATA 2018: m_p/m_e = 1836.15267343(11); tolerance from rounding both masses to
  // 11-12 digits.
  CHECK(K::m_p / K::m_e == Approx(1836.15267343).epsilon(1e-9));
  // CODATA 2018: proton relative atomic mass A_r(p) = 1.007276466621(53).
  CHECK(K::m_p / K::u == Approx(1.007276466621).epsilon(1e-9));
  // CODATA 2018: electron relative atomic mass A_r(e) = 5.48579909065(16)e-4.
  CHECK(K::m_e / K::u == Approx(5.48579909065e-4).epsilon(1e-9));
}

TEST_CASE("constants: derived CODATA 2018 values", "[unit][constants]") {
  // Electron charge-to-mass quotient -e/m_e = -1.75882001076(53)e11 C/kg (CODATA 2018).
  CHECK(K::e / K::m_e == Approx(1.75882001076e11).epsilon(1e-9));
  // Fine-structure constant alpha = mu0 e^2 c/(2h) = 7.2973525693(11)e-3 (CODATA 2018),
  // with the exact Planck constant h = 6.62607015e-34 J s of the 2019 SI. This checks mu0
  // itself, not only its product with eps0.
  const double h = 6.62607015e-34;
  CHECK(K::mu0 * K::e * K::e * K::c / (2.0 * h) == Approx(7.2973525693e-3).epsilon(1e-9));
  // mu0/(4 pi 1e-7) = 1.00000000055(15) (CODATA 2018): no longer exactly 1 in the 2019 SI.
  CHECK(K::mu0 / (4.0 * K::pi * 1e-7) == Approx(1.00000000055).epsilon(3e-10));
  // Electron volt - kelvin relationship 1 eV = 11604.51812... K (exact in the 2019 SI;
  // CODATA lists it truncated to 10 digits, hence 1e-9).
  CHECK(K::eV_in_K == Approx(11604.51812).epsilon(1e-9));
}
