#include "io/results/head_arrays.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <iterator>

#include "io/files/atomic_file.hpp"

namespace aquiledger {

namespace {

/// The reader's test of a raster's cell size (io/model_file/field_value.cpp): within 1e-6 relative.
bool same_size(double a, double b) {
  return std::abs(a - b) <= 1.0e-6 * std::max(1.0, std::abs(b));
}

void append_rows(std::string& out, const RectilinearGrid& g, std::span<const double> head,
                 const char* separator) {
  for (int r = 0; r < g.n_rows(); ++r) {
    for (int c = 0; c < g.n_cols(); ++c) {
      const CellIndex cell = g.cell(r, c);
      const double h = head[static_cast<std::size_t>(cell.value)];
      const double v = g.is_active(cell) && std::isfinite(h) ? h : head_array_no_value;
      if (c > 0) out += separator;
      fmt::format_to(std::back_inserter(out), "{}", v);
    }
    out += '\n';
  }
}

}  // namespace

std::string head_text_array(const Model& model, std::span<const double> head, double time) {
  const RectilinearGrid& g = model.grid;
  std::string title = model.title;  // one comment line
  std::replace_if(
      title.begin(), title.end(), [](char ch) { return ch == '\n' || ch == '\r'; }, ' ');
  std::string out = fmt::format(
      "# aquiledger heads ({}) at t = {} {}, model \"{}\"\n"
      "# {} rows (northern row first) of {} columns; inactive cells hold {} (ignored when read)\n"
      "# start a model from it: [initial] head = {{ file = \"...\" }}\n",
      model.length_unit, time, model.time_unit, title, g.n_rows(), g.n_cols(), head_array_no_value);
  append_rows(out, g, head, " ");
  return out;
}

std::optional<std::string> head_ascii_grid(const Model& model, std::span<const double> head) {
  const RectilinearGrid& g = model.grid;
  const double size = g.dx(0);
  for (double w : g.column_widths())
    if (!same_size(w, size)) return std::nullopt;
  for (double h : g.row_heights())
    if (!same_size(h, size)) return std::nullopt;
  std::string out =
      fmt::format("ncols {}\nnrows {}\nxllcorner {}\nyllcorner {}\ncellsize {}\nNODATA_value {}\n",
                  g.n_cols(), g.n_rows(), g.x_min(), g.y_min(), size, head_array_no_value);
  append_rows(out, g, head, " ");
  return out;
}

std::string head_array_stem(double time) { return fmt::format("head_at_{}", time); }

HeadArrayFiles write_head_arrays(const std::filesystem::path& folder, const Model& model,
                                 std::span<const double> head, double time) {
  HeadArrayFiles files;
  const std::string stem = head_array_stem(time);
  files.text = stem + ".txt";
  write_file_atomically(folder / files.text, head_text_array(model, head, time));
  if (const auto grid = head_ascii_grid(model, head)) {
    files.grid = stem + ".asc";
    write_file_atomically(folder / files.grid, *grid);
  }
  return files;
}

}  // namespace aquiledger
