#pragma once
// A fill-reducing elimination order for the 5-point stencil of a structured grid, from the
// grid's index space alone: geometric nested dissection (George, "Nested dissection of a
// regular finite element mesh", SIAM J. Numer. Anal. 10 (1973) 345-363; from memory). A
// separator splits a region in two parts with no 5-point neighbours across; the parts are
// ordered first, each by the same rule, and the separator last.
//
// The separators are diagonals of the grid, the cells with row + col = s or row - col = s: a
// 5-point neighbour changes both sums by one, so such a diagonal separates the cells on its
// two sides. Diagonals rather than rows and columns because in the 5-point graph a region
// bounded by diagonals (a diamond) has about 1/sqrt(2) of the boundary cells of a square of
// the same area, and the fronts of the factorisation are the separators plus the boundaries:
// on the 1000 x 1000 grid, cuts along rows and columns gave a factor of 50.2 million nonzeros
// and 1.90e10 flops, diagonal cuts 29.4 million and 8.4e9, CHOLMOD's METIS ordering 34.0
// million and 1.26e10 (benchmarks/ordering_cost; docs/performance.md, "Ninth pass").
// solver/sparse_direct.cpp hands the order to CHOLMOD as a given permutation.
#include <cstdint>
#include <span>
#include <vector>

namespace aquiledger {

/// The raster indices (row * n_cols + col) of the included cells of an n_rows x n_cols grid,
/// in elimination order. `included` holds n_rows * n_cols flags in raster order (an inactive or
/// fixed cell, which has no unknown, is excluded). Each region of the recursion is a box in the
/// two diagonal directions, first shrunk to the bounding box of its included cells; of the two
/// diagonals that halve its included cells (in each direction, the diagonal with the fewest
/// included cells within an eighth of the box's extent of the halving one, so that holes and a
/// ragged outline give shorter separators), the one with fewer cells is the cut. Cost: one
/// pass over each box per level, O(n log n) for n cells (0.1 s at 1e6 cells).
std::vector<int> nested_dissection_order(int n_rows, int n_cols,
                                         std::span<const std::uint8_t> included);

}  // namespace aquiledger
