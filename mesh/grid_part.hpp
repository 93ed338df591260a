#pragma once
// The part of the grid one process works on: a band of whole rows, which in raster order is
// one contiguous run of cells. The serial engine works on every row; each rank of the
// distributed engine (solver/distributed/) on its own band, holding one ghost row more on
// each side. Per-cell arrays of a part are indexed by grid cell through CellWindow.
#include <algorithm>
#include <cassert>
#include <cstddef>
#include <cstdint>
#include <span>
#include <type_traits>
#include <utility>
#include <vector>

#include "mesh/rectilinear_grid.hpp"

namespace aquiledger {

/// Rows [first, first + count) of a grid.
struct RowBand {
  int first = 0;
  int count = 0;
  int end() const { return first + count; }
};

struct GridPart {
  int n_cols = 0;
  RowBand owned;   ///< rows whose equations, budget terms and field values this part computes
  RowBand window;  ///< rows whose heads it holds: the owned rows and their ghost rows

  /// Every row of the grid: the serial engine's part.
  static GridPart whole(const RectilinearGrid& grid) {
    return {grid.n_cols(), {0, grid.n_rows()}, {0, grid.n_rows()}};
  }
  std::int32_t first_owned() const { return owned.first * n_cols; }
  std::int32_t end_owned() const { return owned.end() * n_cols; }
  std::int32_t first_held() const { return window.first * n_cols; }
  std::size_t n_owned() const { return static_cast<std::size_t>(owned.count) * n_cols; }
  std::size_t n_held() const { return static_cast<std::size_t>(window.count) * n_cols; }
  bool owns(CellIndex c) const { return c.value >= first_owned() && c.value < end_owned(); }
};

/// Values of a contiguous run of grid cells, indexed by grid cell (raster order). A window
/// over a whole-grid array starts at cell 0; a distributed rank's over its band of rows.
template <class T>
class CellWindow {
 public:
  using Value = std::remove_const_t<T>;
  CellWindow(std::span<T> values, std::int32_t first = 0) : values_(values), first_(first) {}
  CellWindow(std::vector<Value>& values) : values_(values), first_(0) {}
  CellWindow(const std::vector<Value>& values) requires std::is_const_v<T> : values_(values),
                                                                             first_(0) {}
  template <class U>
  requires(std::is_const_v<T>&& std::is_same_v<U, Value>) CellWindow(CellWindow<U> other)
      : values_(other.values()), first_(other.first()) {}

  T& operator[](std::size_t cell) const {
    assert(cell >= static_cast<std::size_t>(first_) && cell - first_ < values_.size());
    return values_[cell - static_cast<std::size_t>(first_)];
  }
  std::span<T> values() const { return values_; }
  std::int32_t first() const { return first_; }

 private:
  std::span<T> values_;
  std::int32_t first_ = 0;
};

/// Heads (or any per-cell value) read by the kernels' callers.
using CellValues = CellWindow<const double>;

/// A per-cell array that owns the values of a contiguous run of grid cells and is indexed by
/// grid cell: the model's per-cell inputs. The serial engine holds every cell (first 0); a
/// distributed rank reads and holds only its window of rows (its band and ghost rows).
template <class T>
class CellArray {
 public:
  CellArray() = default;
  CellArray(std::vector<T> values, std::int32_t first = 0)
      : values_(std::move(values)), first_(first) {}
  /// A whole-grid array (from cell 0).
  CellArray& operator=(std::vector<T> values) {
    values_ = std::move(values);
    first_ = 0;
    return *this;
  }
  /// n values from cell 0 (a whole grid of n cells).
  void assign(std::size_t n, const T& value) {
    values_.assign(n, value);
    first_ = 0;
  }

  T& operator[](std::size_t cell) {
    assert(holds(cell));
    return values_[cell - static_cast<std::size_t>(first_)];
  }
  const T& operator[](std::size_t cell) const {
    assert(holds(cell));
    return values_[cell - static_cast<std::size_t>(first_)];
  }
  bool holds(std::size_t cell) const {
    return cell >= static_cast<std::size_t>(first_) && cell - first_ < values_.size();
  }
  bool empty() const { return values_.empty(); }
  /// Holds no cells (a field the model does not have).
  void clear() {
    values_.clear();
    first_ = 0;
  }
  /// Number of cells held (the grid's cell count when whole).
  std::size_t size() const { return values_.size(); }
  std::int32_t first() const { return first_; }  ///< grid cell of the first value
  std::int32_t end() const { return first_ + static_cast<std::int32_t>(values_.size()); }
  const std::vector<T>& values() const { return values_; }
  std::vector<T>& values() { return values_; }
  CellWindow<const T> cells() const { return {std::span<const T>(values_), first_}; }
  CellWindow<T> cells() { return {std::span<T>(values_), first_}; }

 private:
  std::vector<T> values_;
  std::int32_t first_ = 0;
};

}  // namespace aquiledger
