#pragma once
// Field files for open viewers: VTK XML rectilinear grids (.vtr) per output time and the
// .pvd collection that indexes them. The only place that includes VTK headers is
// vtk_fields.cpp.
#include <filesystem>
#include <string>
#include <vector>

#include "io/files/output_error.hpp"
#include "mesh/grid_part.hpp"
#include "postproc/cell_fields.hpp"
#include "solver/model.hpp"

namespace aquiledger {

/// One entry of a .pvd collection.
struct FieldFileEntry {
  double time = 0.0;  ///< T, model units
  std::string file;   ///< relative to the .pvd's folder
};

/// Writes the cell arrays of the format contract (head, drawdown, saturated_thickness, state,
/// storage_rate, storage_skeleton_rate, storage_water_rate, storage_drainage_rate,
/// compaction, flow_east, flow_north; plus storage_elastic_rate) on the model's grid. The
/// grid is 2D: x edges west to east, y edges south to north, z = 0. Inactive cells hold NaN
/// and are hidden through the vtkGhostType array. Field data: TIME, title, length_unit,
/// time_unit. Written atomically; throws OutputError naming the path on failure.
void write_fields_vtr(const std::filesystem::path& path, const Model& model,
                      const CellFields& fields, double time);

/// As above for a band of rows (fields of that band's cells): one piece of a parallel set,
/// with the piece's extent within the whole grid.
void write_fields_vtr(const std::filesystem::path& path, const Model& model,
                      const CellFields& fields, double time, RowBand band);

/// One piece of a parallel field set: its rows and its .vtr file (relative to the .pvtr).
struct FieldPiece {
  RowBand rows;
  std::string file;
};

/// Writes the .pvtr index of a parallel set of pieces written by the band write_fields_vtr,
/// which VTK's parallel reader (and any viewer using it) reads as one grid. Atomically.
void write_pvtr(const std::filesystem::path& path, const Model& model,
                const std::vector<FieldPiece>& pieces);

/// Writes the model's cell properties: kx, ky, top, bottom, specific_storage,
/// specific_yield (only when the model has one) and active (1/0), with the same grid,
/// blanking and field data as write_fields_vtr (without TIME).
void write_static_vtr(const std::filesystem::path& path, const Model& model);

/// As above for a band of rows (whose cells the model's arrays hold): one piece of the
/// parallel set of a distributed run.
void write_static_vtr(const std::filesystem::path& path, const Model& model, RowBand band);

/// The .pvtr index of the parallel set of aquifer property pieces. Atomically.
void write_static_pvtr(const std::filesystem::path& path, const Model& model,
                       const std::vector<FieldPiece>& pieces);

/// Writes the collection file by hand (VTK 9.1 has no writer for it), atomically.
void write_pvd(const std::filesystem::path& path, const std::vector<FieldFileEntry>& entries);

/// One cell array read back from a field file (for the HTML report's maps).
struct FieldMap {
  double time = 0.0;            ///< T; NaN when the file has no TIME
  std::vector<double> x_edges;  ///< L, west to east
  std::vector<double> y_edges;  ///< L, north to south
  std::vector<double> values;   ///< per cell in raster order (row 0 north); NaN where inactive
};

/// Reads the named cell array of a .vtr written by write_fields_vtr; throws OutputError
/// naming the path when the file or the array cannot be read.
FieldMap read_field_vtr(const std::filesystem::path& path, const std::string& array);

/// "fields_0007.vtr": the name of the n-th field file (0 for time 0).
std::string field_file_name(std::size_t n);

}  // namespace aquiledger
