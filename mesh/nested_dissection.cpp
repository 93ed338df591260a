#include "mesh/nested_dissection.hpp"

#include <algorithm>
#include <cassert>
#include <cstdlib>
#include <stdexcept>

namespace aquiledger {

namespace {

/// A box of diagonals: u = row + col in [u0, u1), v = row - col + n_cols - 1 in [v0, v1).
struct DiagonalBox {
  int u0, u1, v0, v1;
};

class DiagonalDissector {
 public:
  DiagonalDissector(int n_rows, int n_cols, std::span<const std::uint8_t> included)
      : n_rows_(n_rows),
        n_cols_(n_cols),
        included_(included),
        u_count_(static_cast<std::size_t>(n_rows + n_cols)),
        v_count_(static_cast<std::size_t>(n_rows + n_cols)) {}

  std::vector<int> order(std::size_t expected) {
    order_.reserve(expected);
    dissect({0, n_rows_ + n_cols_ - 1, 0, n_rows_ + n_cols_ - 1});
    return std::move(order_);
  }

 private:
  /// The included cell on diagonals (u, v), or -1 (no cell there, or one excluded).
  int cell_at(int u, int v) const {
    const int twice_row = u + v - (n_cols_ - 1), twice_col = u - v + (n_cols_ - 1);
    if ((twice_row & 1) != 0 || twice_row < 0 || twice_col < 0) return -1;
    const int r = twice_row / 2, c = twice_col / 2;
    if (r >= n_rows_ || c >= n_cols_) return -1;
    const int cell = r * n_cols_ + c;
    return included_[static_cast<std::size_t>(cell)] != 0 ? cell : -1;
  }

  /// The index of the cut among the lines lo .. hi - 1 (count: included cells per line,
  /// `total` in all): the line with the fewest cells within an eighth of the extent of the
  /// line at which the prefix sum reaches half of `total`, the nearest to it among equals.
  static int cut_line(const std::vector<int>& count, int lo, int hi, long total) {
    long prefix = 0;
    int median = lo;
    for (int i = lo; i < hi; ++i) {
      prefix += count[static_cast<std::size_t>(i)];
      if (2 * prefix >= total) {
        median = i;
        break;
      }
    }
    const int reach = (hi - lo) / 8;
    int best = median;
    for (int i = std::max(lo, median - reach); i <= std::min(hi - 1, median + reach); ++i) {
      const int ci = count[static_cast<std::size_t>(i)];
      const int cb = count[static_cast<std::size_t>(best)];
      if (ci < cb || (ci == cb && std::abs(i - median) < std::abs(best - median))) best = i;
    }
    return best;
  }

  void dissect(DiagonalBox b) {
    // Included cells per diagonal of the box, then the box shrunk to them.
    std::fill(u_count_.begin() + b.u0, u_count_.begin() + b.u1, 0);
    std::fill(v_count_.begin() + b.v0, v_count_.begin() + b.v1, 0);
    long total = 0;
    for (int u = b.u0; u < b.u1; ++u)
      for (int v = b.v0 + ((b.v0 + u + n_cols_ - 1) & 1); v < b.v1; v += 2)  // same parity
        if (cell_at(u, v) >= 0) {
          ++u_count_[static_cast<std::size_t>(u)];
          ++v_count_[static_cast<std::size_t>(v)];
          ++total;
        }
    if (total == 0) return;
    while (u_count_[static_cast<std::size_t>(b.u0)] == 0) ++b.u0;
    while (u_count_[static_cast<std::size_t>(b.u1 - 1)] == 0) --b.u1;
    while (v_count_[static_cast<std::size_t>(b.v0)] == 0) ++b.v0;
    while (v_count_[static_cast<std::size_t>(b.v1 - 1)] == 0) --b.v1;
    if (total <= 2) {  // nothing to gain from a cut
      for (int u = b.u0; u < b.u1; ++u)
        for (int v = b.v0; v < b.v1; ++v)
          if (const int cell = cell_at(u, v); cell >= 0) order_.push_back(cell);
      return;
    }
    // The shorter of the two balanced cuts; across the longer side when they are equal.
    const int su = cut_line(u_count_, b.u0, b.u1, total);
    const int sv = cut_line(v_count_, b.v0, b.v1, total);
    const int nu = u_count_[static_cast<std::size_t>(su)];
    const int nv = v_count_[static_cast<std::size_t>(sv)];
    if (nu < nv || (nu == nv && b.u1 - b.u0 > b.v1 - b.v0)) {
      dissect({b.u0, su, b.v0, b.v1});
      dissect({su + 1, b.u1, b.v0, b.v1});
      for (int v = b.v0; v < b.v1; ++v)
        if (const int cell = cell_at(su, v); cell >= 0) order_.push_back(cell);
    } else {
      dissect({b.u0, b.u1, b.v0, sv});
      dissect({b.u0, b.u1, sv + 1, b.v1});
      for (int u = b.u0; u < b.u1; ++u)
        if (const int cell = cell_at(u, sv); cell >= 0) order_.push_back(cell);
    }
  }

  int n_rows_, n_cols_;
  std::span<const std::uint8_t> included_;
  std::vector<int> u_count_, v_count_;  ///< scratch, read before each box's recursion
  std::vector<int> order_;
};

}  // namespace

std::vector<int> nested_dissection_order(int n_rows, int n_cols,
                                         std::span<const std::uint8_t> included) {
  if (n_rows < 0 || n_cols < 0 ||
      included.size() != static_cast<std::size_t>(n_rows) * static_cast<std::size_t>(n_cols))
    throw std::invalid_argument("nested_dissection_order: the flags do not match the grid");
  if (n_rows == 0 || n_cols == 0) return {};
  const auto expected = static_cast<std::size_t>(
      std::count_if(included.begin(), included.end(), [](std::uint8_t f) { return f != 0; }));
  std::vector<int> order = DiagonalDissector(n_rows, n_cols, included).order(expected);
  assert(order.size() == expected);
  return order;
}

}  // namespace aquiledger
