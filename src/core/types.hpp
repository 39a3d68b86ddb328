#pragma once
/// Basic numeric types shared by every part of tubewave.
#include <array>
#include <cstddef>

namespace tw {

/// The floating-point type of every field and parameter.
using real = double;

/// A fixed-size vector of reals: the state of one cell for a model with N variables.
template <int N>
using Vec = std::array<real, static_cast<std::size_t>(N)>;

template <int N>
constexpr Vec<N> operator+(const Vec<N>& a, const Vec<N>& b) {
  Vec<N> r{};
  for (int k = 0; k < N; ++k) r[k] = a[k] + b[k];
  return r;
}
template <int N>
constexpr Vec<N> operator-(const Vec<N>& a, const Vec<N>& b) {
  Vec<N> r{};
  for (int k = 0; k < N; ++k) r[k] = a[k] - b[k];
  return r;
}
template <int N>
constexpr Vec<N> operator*(real s, const Vec<N>& a) {
  Vec<N> r{};
  for (int k = 0; k < N; ++k) r[k] = s * a[k];
  return r;
}

/// Left or right end of the tube (x = x_min or x = x_max).
enum class Side { left = 0, right = 1 };

inline constexpr const char* side_name(Side s) { return s == Side::left ? "left" : "right"; }

}  // namespace tw
