#pragma once
/// Uniform 1D grid of cells along the tube axis, with ghost layers at both ends.
///
/// Interior cells are numbered 0 .. n_cells-1; ghost cells -n_ghost .. -1 and
/// n_cells .. n_cells+n_ghost-1. Face f (0 .. n_cells) lies between cells f-1 and f.
#include <vector>

#include "core/error.hpp"
#include "core/types.hpp"

namespace tw {

struct Grid {
  /// Ghost layers on each side: enough for the widest stencil (fifth-order WENO).
  static constexpr int n_ghost = 3;

  int n_cells = 0;    ///< interior cells
  real x_min = 0;     ///< position of the left end [m]
  real length = 1;    ///< tube length [m]

  Grid() = default;
  Grid(int cells, real x_left, real len) : n_cells(cells), x_min(x_left), length(len) {
    TW_CHECK(cells >= 1 && len > 0, "grid needs at least one cell and a positive length");
  }

  [[nodiscard]] real dx() const { return length / n_cells; }
  [[nodiscard]] real x_max() const { return x_min + length; }
  [[nodiscard]] int n_total() const { return n_cells + 2 * n_ghost; }
  /// Centre of cell i (ghost indices allowed).
  [[nodiscard]] real x_centre(int i) const { return x_min + (i + 0.5) * length / n_cells; }
  /// Position of face f.
  [[nodiscard]] real x_face(int f) const { return x_min + f * (length / n_cells); }

  [[nodiscard]] std::vector<real> centres() const {
    std::vector<real> x(static_cast<std::size_t>(n_cells));
    for (int i = 0; i < n_cells; ++i) x[static_cast<std::size_t>(i)] = x_centre(i);
    return x;
  }
  [[nodiscard]] std::vector<real> faces() const {
    std::vector<real> x(static_cast<std::size_t>(n_cells + 1));
    for (int f = 0; f <= n_cells; ++f) x[static_cast<std::size_t>(f)] = x_face(f);
    return x;
  }
};

/// Cell values of type T over a grid including its ghost cells, indexed by cell number
/// (negative for left ghosts). Storage is contiguous, left ghost first.
template <class T>
class Field {
 public:
  Field() = default;
  explicit Field(const Grid& g) : n_cells_(g.n_cells), data_(static_cast<std::size_t>(g.n_total())) {}
  Field(const Grid& g, const T& value)
      : n_cells_(g.n_cells), data_(static_cast<std::size_t>(g.n_total()), value) {}

  T& operator[](int i) {
    TW_ASSERT(i >= -Grid::n_ghost && i < n_cells_ + Grid::n_ghost, "cell index out of range");
    return data_[static_cast<std::size_t>(i + Grid::n_ghost)];
  }
  const T& operator[](int i) const {
    TW_ASSERT(i >= -Grid::n_ghost && i < n_cells_ + Grid::n_ghost, "cell index out of range");
    return data_[static_cast<std::size_t>(i + Grid::n_ghost)];
  }
  [[nodiscard]] int n_cells() const { return n_cells_; }
  /// All storage, ghosts included (for bulk copies and checkpoints).
  std::vector<T>& raw() { return data_; }
  [[nodiscard]] const std::vector<T>& raw() const { return data_; }

 private:
  int n_cells_ = 0;
  std::vector<T> data_;
};

}  // namespace tw
