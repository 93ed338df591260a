#include <catch2/catch.hpp>
#include <cstdint>
#include <vector>

#include "mesh/nested_dissection.hpp"

using namespace aquiledger;

namespace {

/// Each included cell once and no other: a permutation of the included cells.
bool orders_each_included_cell_once(int n_rows, int n_cols, const std::vector<std::uint8_t>& in,
                                    const std::vector<int>& order) {
  std::vector<int> seen(in.size(), 0);
  for (const int cell : order) {
    if (cell < 0 || cell >= n_rows * n_cols || !in[static_cast<std::size_t>(cell)]) return false;
    ++seen[static_cast<std::size_t>(cell)];
  }
  for (std::size_t i = 0; i < in.size(); ++i)
    if (seen[i] != (in[i] ? 1 : 0)) return false;
  return true;
}

}  // namespace

TEST_CASE("nested dissection orders every included cell once", "[mesh]") {
  for (const auto& [rows, cols] :
       {std::pair{1, 1}, {1, 17}, {23, 1}, {2, 2}, {7, 30}, {64, 64}, {50, 33}}) {
    INFO(rows << " x " << cols);
    std::vector<std::uint8_t> in(static_cast<std::size_t>(rows) * cols, 1);
    CHECK(orders_each_included_cell_once(rows, cols, in, nested_dissection_order(rows, cols, in)));
    // Holes: every third cell of a diagonal band, a whole row and a block excluded.
    for (int r = 0; r < rows; ++r)
      for (int c = 0; c < cols; ++c)
        if ((r + 2 * c) % 3 == 0 || r == rows / 2 || (r < rows / 3 && c < cols / 4))
          in[static_cast<std::size_t>(r) * cols + c] = 0;
    CHECK(orders_each_included_cell_once(rows, cols, in, nested_dissection_order(rows, cols, in)));
  }
  const std::vector<std::uint8_t> none(12, 0);
  CHECK(nested_dissection_order(3, 4, none).empty());
  CHECK_THROWS(nested_dissection_order(3, 4, std::vector<std::uint8_t>(11, 1)));
}

TEST_CASE("nested dissection orders both parts before their separator", "[mesh]") {
  // George (1973), nested dissection: a set of cells whose removal leaves no 5-point
  // neighbours across is numbered after the two parts it separates, each part as a block by
  // the same rule. The first separator here is a whole diagonal of the grid (a 5-point
  // neighbour of a cell differs from it by one in row + col and in row - col, so a diagonal
  // separates; from the stencil's definition): the last cells of the order are all the cells
  // of one diagonal, and before them come all cells of one side, then all of the other.
  for (const auto& [rows, cols] : {std::pair{9, 9}, {15, 15}, {12, 31}}) {
    INFO(rows << " x " << cols);
    const std::vector<std::uint8_t> in(static_cast<std::size_t>(rows) * cols, 1);
    const std::vector<int> order = nested_dissection_order(rows, cols, in);
    REQUIRE(order.size() == in.size());
    const int n = static_cast<int>(order.size());
    const auto diagonal = [&](int k, bool difference) {
      const int r = order[static_cast<std::size_t>(k)] / cols;
      const int c = order[static_cast<std::size_t>(k)] % cols;
      return difference ? r - c : r + c;
    };
    // The separator: the longest run of last cells on one diagonal of either direction.
    int best_run = 0;
    bool difference = false;
    for (const bool d : {false, true}) {
      int run = 1;
      while (run < n && diagonal(n - 1 - run, d) == diagonal(n - 1, d)) ++run;
      if (run > best_run) best_run = run, difference = d;
    }
    const int line = diagonal(n - 1, difference);
    int on_line = 0, below = 0;
    for (int r = 0; r < rows; ++r)
      for (int c = 0; c < cols; ++c) {
        const int d = difference ? r - c : r + c;
        on_line += d == line;
        below += d < line;
      }
    CHECK(best_run == on_line);  // the whole diagonal, and nothing else, last
    REQUIRE(below > 0);
    REQUIRE(below < n - on_line);
    // The parts: one side of the line as a block, then the other side.
    const int first = n - on_line;
    const bool first_below = diagonal(0, difference) < line;
    const int first_size = first_below ? below : first - below;
    for (int k = 0; k < first; ++k) {
      const bool is_below = diagonal(k, difference) < line;
      CHECK(diagonal(k, difference) != line);
      CHECK(is_below == (k < first_size ? first_below : !first_below));
    }
  }
}
