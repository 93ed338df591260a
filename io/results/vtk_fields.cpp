#include "io/results/vtk_fields.hpp"

#include <fmt/format.h>
#include <vtkCellData.h>
#include <vtkDataSetAttributes.h>
#include <vtkDoubleArray.h>
#include <vtkErrorCode.h>
#include <vtkFieldData.h>
#include <vtkIntArray.h>
#include <vtkNew.h>
#include <vtkRectilinearGrid.h>
#include <vtkStringArray.h>
#include <vtkUnsignedCharArray.h>
#include <vtkXMLPRectilinearGridReader.h>
#include <vtkXMLRectilinearGridReader.h>
#include <vtkXMLRectilinearGridWriter.h>

#include <cmath>
#include <iterator>
#include <limits>
#include <stdexcept>
#include <string_view>

#include "io/files/atomic_file.hpp"

namespace aquiledger {
namespace {

constexpr double nan_value = std::numeric_limits<double>::quiet_NaN();

/// The grid with true cell edges. VTK's j index grows with y, so the y coordinates run south
/// to north (the reverse of the grid's raster order).
/// A band of rows is the piece of the whole grid with VTK j from n_rows - band end.
vtkNew<vtkRectilinearGrid> make_grid(const RectilinearGrid& grid, RowBand band) {
  vtkNew<vtkRectilinearGrid> vtk_grid;
  const int j0 = grid.n_rows() - band.end();
  vtk_grid->SetExtent(0, grid.n_cols(), j0, j0 + band.count, 0, 0);
  vtkNew<vtkDoubleArray> x, y, z;
  x->SetName("x");
  y->SetName("y");
  z->SetName("z");
  for (double e : grid.x_edges()) x->InsertNextValue(e);
  const auto ye = grid.y_edges();
  for (int e = band.end(); e >= band.first; --e)
    y->InsertNextValue(ye[static_cast<std::size_t>(e)]);
  z->InsertNextValue(0.0);
  vtk_grid->SetXCoordinates(x);
  vtk_grid->SetYCoordinates(y);
  vtk_grid->SetZCoordinates(z);

  // Viewers hide cells flagged HIDDENCELL in the ghost array (blanking).
  vtkNew<vtkUnsignedCharArray> ghost;
  ghost->SetName(vtkDataSetAttributes::GhostArrayName());
  const int n_rows = band.count, n_cols = grid.n_cols();
  ghost->SetNumberOfValues(static_cast<vtkIdType>(n_rows) * n_cols);
  for (int j = 0; j < n_rows; ++j) {
    const int row = band.end() - 1 - j;
    for (int i = 0; i < n_cols; ++i) {
      const bool active = grid.is_active(grid.cell(row, i));
      ghost->SetValue(static_cast<vtkIdType>(j) * n_cols + i,
                      active ? 0 : static_cast<unsigned char>(vtkDataSetAttributes::HIDDENCELL));
    }
  }
  vtk_grid->GetCellData()->AddArray(ghost);
  return vtk_grid;
}

/// Adds a per-cell array over the band's rows; inactive cells get NaN whatever they hold.
/// values: indexed by grid cell, holding at least the band's cells.
void add_cell_array(vtkRectilinearGrid* vtk_grid, const RectilinearGrid& grid, RowBand band,
                    std::string_view name, CellValues values) {
  const std::size_t n_cells = static_cast<std::size_t>(band.count) * grid.n_cols();
  const auto first = static_cast<std::size_t>(band.first) * grid.n_cols();
  if (first < static_cast<std::size_t>(values.first()) ||
      first + n_cells > values.first() + values.values().size()) {
    throw std::invalid_argument(fmt::format(
        "cell array '{}' holds cells {} to {}, the rows written cells {} to {}", name,
        values.first(), values.first() + values.values().size(), first, first + n_cells));
  }
  vtkNew<vtkDoubleArray> array;
  array->SetName(std::string(name).c_str());
  array->SetNumberOfValues(static_cast<vtkIdType>(n_cells));
  const int n_rows = band.count, n_cols = grid.n_cols();
  for (int j = 0; j < n_rows; ++j) {
    const int row = band.end() - 1 - j;
    for (int i = 0; i < n_cols; ++i) {
      const CellIndex c = grid.cell(row, i);
      const double v = grid.is_active(c) ? values[static_cast<std::size_t>(c.value)] : nan_value;
      array->SetValue(static_cast<vtkIdType>(j) * n_cols + i, v);
    }
  }
  vtk_grid->GetCellData()->AddArray(array);
}

/// A field of the band's cells in raster order (values[0] is the band's first cell).
void add_cell_array(vtkRectilinearGrid* vtk_grid, const RectilinearGrid& grid, RowBand band,
                    std::string_view name, const std::vector<double>& values) {
  const std::size_t n_cells = static_cast<std::size_t>(band.count) * grid.n_cols();
  if (values.size() != n_cells) {
    throw std::invalid_argument(fmt::format("cell array '{}' has {} values, the grid {} cells",
                                            name, values.size(), n_cells));
  }
  add_cell_array(vtk_grid, grid, band, name,
                 CellValues(std::span<const double>(values), band.first * grid.n_cols()));
}

/// The cell state as an integer array (0 dry, 1 water table, 2 confined). An integer has no
/// NaN: inactive cells hold -1 and are hidden through the ghost array like every other array.
void add_state_array(vtkRectilinearGrid* vtk_grid, const RectilinearGrid& grid, RowBand band,
                     const std::vector<double>& state) {
  const std::size_t n_cells = static_cast<std::size_t>(band.count) * grid.n_cols();
  if (state.size() != n_cells) {
    throw std::invalid_argument(
        fmt::format("cell array 'state' has {} values, the grid {} cells", state.size(), n_cells));
  }
  vtkNew<vtkIntArray> array;
  array->SetName("state");
  array->SetNumberOfValues(static_cast<vtkIdType>(n_cells));
  const int n_rows = band.count, n_cols = grid.n_cols();
  const auto first = static_cast<std::size_t>(band.first) * n_cols;
  for (int j = 0; j < n_rows; ++j) {
    const int row = band.end() - 1 - j;
    for (int i = 0; i < n_cols; ++i) {
      const CellIndex c = grid.cell(row, i);
      const double v = state[static_cast<std::size_t>(c.value) - first];
      array->SetValue(static_cast<vtkIdType>(j) * n_cols + i,
                      grid.is_active(c) && !std::isnan(v) ? static_cast<int>(std::lround(v)) : -1);
    }
  }
  vtk_grid->GetCellData()->AddArray(array);
}

void add_text(vtkFieldData* data, const char* name, const std::string& text) {
  vtkNew<vtkStringArray> array;
  array->SetName(name);
  array->InsertNextValue(text);
  data->AddArray(array);
}

void add_model_field_data(vtkRectilinearGrid* vtk_grid, const Model& model) {
  vtkFieldData* data = vtk_grid->GetFieldData();
  add_text(data, "title", model.title);
  add_text(data, "length_unit", model.length_unit);
  add_text(data, "time_unit", model.time_unit);
}

/// VTK fills a temporary beside the target, which is then flushed and renamed into place.
void write_atomically(vtkRectilinearGrid* vtk_grid, const std::filesystem::path& path) {
  // Creating the file ourselves first reports an unwritable folder with the OS reason.
  const std::filesystem::path temporary = create_temporary_for(path);
  vtkNew<vtkXMLRectilinearGridWriter> writer;
  writer->SetInputData(vtk_grid);
  writer->SetFileName(temporary.c_str());
  writer->SetDataModeToAppended();
  writer->EncodeAppendedDataOff();
  // LZ4 rather than zlib: at 1M cells (12 arrays) it wrote in 0.5 s against 5-6 s for
  // zlib, for 64 MB against 52 MB (measured on the 2-core build machine); VTK 8.1+ and
  // ParaView 5.5+ read it.
  writer->SetCompressorTypeToLZ4();
  writer->SetHeaderTypeToUInt64();  // arrays beyond 4 GB stay readable
  const int ok = writer->Write();
  const unsigned long code = writer->GetErrorCode();
  if (ok != 1 || code != vtkErrorCode::NoError) {
    discard_temporary_file(temporary);
    const char* reason = vtkErrorCode::GetStringFromErrorCode(code);
    throw OutputError(fmt::format("cannot write '{}': VTK writer failed ({})", path.string(),
                                  reason != nullptr ? reason : "unknown error"));
  }
  commit_temporary_file(temporary, path);
}

std::string xml_escaped(std::string_view text) {
  std::string out;
  for (char ch : text) {
    switch (ch) {
      case '&':
        out += "&amp;";
        break;
      case '<':
        out += "&lt;";
        break;
      case '>':
        out += "&gt;";
        break;
      case '"':
        out += "&quot;";
        break;
      case '\'':
        out += "&apos;";
        break;
      default:
        out += ch;
    }
  }
  return out;
}

/// A cell array of the field files: its name and the CellFields member holding it (null for
/// `state`, written as Int32 from its own member).
struct FieldArray {
  const char* name;
  std::vector<double> CellFields::*values;
};

/// Every cell array of a field file of this model, in file order: the one list the pieces
/// (.vtr) and the index of a distributed set (.pvtr) both follow.
std::vector<FieldArray> field_arrays(const Model& model) {
  std::vector<FieldArray> arrays = {{"head", &CellFields::head},
                                    {"drawdown", &CellFields::drawdown},
                                    {"saturated_thickness", &CellFields::saturated_thickness},
                                    {"state", nullptr},
                                    {"storage_rate", &CellFields::storage_rate},
                                    {"storage_skeleton_rate", &CellFields::storage_skeleton_rate},
                                    {"storage_water_rate", &CellFields::storage_water_rate},
                                    {"storage_elastic_rate", &CellFields::storage_elastic_rate},
                                    {"storage_drainage_rate", &CellFields::storage_drainage_rate},
                                    {"compaction", &CellFields::compaction},
                                    {"flow_east", &CellFields::flow_east},
                                    {"flow_north", &CellFields::flow_north}};
  if (!model.aquifer.land_surface.empty())
    arrays.push_back({"depth_to_water", &CellFields::depth_to_water});
  if (model.aquifer.interbeds)
    arrays.insert(arrays.end(),
                  {{"interbed_elastic_compaction", &CellFields::interbed_elastic_compaction},
                   {"interbed_inelastic_compaction", &CellFields::interbed_inelastic_compaction},
                   {"subsidence", &CellFields::subsidence},
                   {"preconsolidation_head", &CellFields::preconsolidation_head}});
  return arrays;
}

/// The cell arrays of the aquifer properties file, in file order (`active` follows them).
struct PropertyArray {
  const char* name;
  const CellArray<double>* values;
};

std::vector<PropertyArray> property_arrays(const Model& model) {
  const Aquifer& a = model.aquifer;
  std::vector<PropertyArray> arrays = {{"kx", &a.kx}, {"ky", &a.ky}};
  if (!a.top.empty()) arrays.push_back({"top", &a.top});
  arrays.push_back({"bottom", &a.bottom});
  arrays.push_back({"specific_storage", &a.specific_storage});
  if (!a.specific_yield.empty()) arrays.push_back({"specific_yield", &a.specific_yield});
  if (!a.land_surface.empty()) arrays.push_back({"land_surface", &a.land_surface});
  return arrays;
}

/// The .pvtr index of a parallel set: the cell arrays (type, name), the ghost array, and
/// one piece per band.
void write_pvtr_index(const std::filesystem::path& path, const RectilinearGrid& grid,
                      const char* scalars,
                      const std::vector<std::pair<const char*, const char*>>& arrays,
                      const std::vector<FieldPiece>& pieces) {
  std::string text = fmt::format(
      "<?xml version=\"1.0\"?>\n"
      "<VTKFile type=\"PRectilinearGrid\" version=\"1.0\" byte_order=\"LittleEndian\" "
      "header_type=\"UInt64\">\n"
      "  <PRectilinearGrid WholeExtent=\"0 {} 0 {} 0 0\" GhostLevel=\"0\">\n"
      "    <PCellData Scalars=\"{}\">\n",
      grid.n_cols(), grid.n_rows(), scalars);
  for (const auto& [type, name] : arrays)
    fmt::format_to(std::back_inserter(text), "      <PDataArray type=\"{}\" Name=\"{}\"/>\n", type,
                   name);
  fmt::format_to(std::back_inserter(text), "      <PDataArray type=\"UInt8\" Name=\"{}\"/>\n",
                 vtkDataSetAttributes::GhostArrayName());
  text +=
      "    </PCellData>\n"
      "    <PCoordinates>\n"
      "      <PDataArray type=\"Float64\" Name=\"x\"/>\n"
      "      <PDataArray type=\"Float64\" Name=\"y\"/>\n"
      "      <PDataArray type=\"Float64\" Name=\"z\"/>\n"
      "    </PCoordinates>\n";
  for (const FieldPiece& piece : pieces) {
    const int j0 = grid.n_rows() - piece.rows.end();
    fmt::format_to(std::back_inserter(text),
                   "    <Piece Extent=\"0 {} {} {} 0 0\" Source=\"{}\"/>\n", grid.n_cols(), j0,
                   j0 + piece.rows.count, xml_escaped(piece.file));
  }
  text += "  </PRectilinearGrid>\n</VTKFile>\n";
  write_file_atomically(path, text);
}

}  // namespace

void write_fields_vtr(const std::filesystem::path& path, const Model& model,
                      const CellFields& fields, double time) {
  write_fields_vtr(path, model, fields, time, RowBand{0, model.grid.n_rows()});
}

void write_fields_vtr(const std::filesystem::path& path, const Model& model,
                      const CellFields& fields, double time, RowBand band) {
  const RectilinearGrid& grid = model.grid;
  auto vtk_grid = make_grid(grid, band);
  for (const FieldArray& a : field_arrays(model)) {
    if (a.values)
      add_cell_array(vtk_grid, grid, band, a.name, fields.*a.values);
    else
      add_state_array(vtk_grid, grid, band, fields.state);
  }
  vtk_grid->GetCellData()->SetActiveScalars("head");

  vtkNew<vtkDoubleArray> time_array;
  time_array->SetName("TIME");
  time_array->InsertNextValue(time);
  vtk_grid->GetFieldData()->AddArray(time_array);
  add_model_field_data(vtk_grid, model);
  write_atomically(vtk_grid, path);
}

void write_static_vtr(const std::filesystem::path& path, const Model& model) {
  write_static_vtr(path, model, RowBand{0, model.grid.n_rows()});
}

void write_static_vtr(const std::filesystem::path& path, const Model& model, RowBand band) {
  const RectilinearGrid& grid = model.grid;
  auto vtk_grid = make_grid(grid, band);
  for (const PropertyArray& a : property_arrays(model))
    add_cell_array(vtk_grid, grid, band, a.name, a.values->cells());

  vtkNew<vtkUnsignedCharArray> active;
  active->SetName("active");
  const int n_rows = band.count, n_cols = grid.n_cols();
  active->SetNumberOfValues(static_cast<vtkIdType>(n_rows) * n_cols);
  for (int j = 0; j < n_rows; ++j)
    for (int i = 0; i < n_cols; ++i)
      active->SetValue(static_cast<vtkIdType>(j) * n_cols + i,
                       grid.is_active(grid.cell(band.end() - 1 - j, i)) ? 1 : 0);
  vtk_grid->GetCellData()->AddArray(active);
  vtk_grid->GetCellData()->SetActiveScalars("kx");
  add_model_field_data(vtk_grid, model);
  write_atomically(vtk_grid, path);
}

void write_pvd(const std::filesystem::path& path, const std::vector<FieldFileEntry>& entries) {
  std::string text =
      "<?xml version=\"1.0\"?>\n"
      "<VTKFile type=\"Collection\" version=\"0.1\" byte_order=\"LittleEndian\">\n"
      "  <Collection>\n";
  for (const FieldFileEntry& e : entries) {
    fmt::format_to(std::back_inserter(text),
                   "    <DataSet timestep=\"{}\" group=\"\" part=\"0\" file=\"{}\"/>\n", e.time,
                   xml_escaped(e.file));
  }
  text += "  </Collection>\n</VTKFile>\n";
  write_file_atomically(path, text);
}

void write_pvtr(const std::filesystem::path& path, const Model& model,
                const std::vector<FieldPiece>& pieces) {
  std::vector<std::pair<const char*, const char*>> arrays;
  for (const FieldArray& a : field_arrays(model))
    arrays.emplace_back(a.values ? "Float64" : "Int32", a.name);
  write_pvtr_index(path, model.grid, "head", arrays, pieces);
}

void write_static_pvtr(const std::filesystem::path& path, const Model& model,
                       const std::vector<FieldPiece>& pieces) {
  std::vector<std::pair<const char*, const char*>> arrays;
  for (const PropertyArray& a : property_arrays(model)) arrays.emplace_back("Float64", a.name);
  arrays.emplace_back("UInt8", "active");
  write_pvtr_index(path, model.grid, "kx", arrays, pieces);
}

std::string field_file_name(std::size_t n) { return fmt::format("fields_{:04d}.vtr", n); }

FieldMap read_field_vtr(const std::filesystem::path& path, const std::string& array) {
  if (!std::filesystem::is_regular_file(path)) throw OutputError("cannot read " + path.string());
  // A parallel set (.pvtr, from the distributed engine) is read as one grid.
  vtkNew<vtkXMLRectilinearGridReader> serial_reader;
  vtkNew<vtkXMLPRectilinearGridReader> parallel_reader;
  const bool parallel = path.extension() == ".pvtr";
  vtkRectilinearGrid* grid = nullptr;
  unsigned long error = 0;
  if (parallel) {
    parallel_reader->SetFileName(path.string().c_str());
    parallel_reader->Update();
    grid = parallel_reader->GetOutput();
    error = parallel_reader->GetErrorCode();
  } else {
    serial_reader->SetFileName(path.string().c_str());
    serial_reader->Update();
    grid = serial_reader->GetOutput();
    error = serial_reader->GetErrorCode();
  }
  if (error != 0 || grid == nullptr || grid->GetNumberOfCells() == 0)
    throw OutputError("cannot read " + path.string() + " as a VTK rectilinear grid");
  vtkDataArray* values = grid->GetCellData()->GetArray(array.c_str());
  if (values == nullptr) throw OutputError(path.string() + " has no cell array '" + array + "'");
  int dims[3];
  grid->GetDimensions(dims);
  const int n_cols = dims[0] - 1, n_rows = dims[1] - 1;
  FieldMap map;
  map.time = nan_value;
  if (vtkDataArray* t = grid->GetFieldData()->GetArray("TIME"); t && t->GetNumberOfTuples() > 0)
    map.time = t->GetTuple1(0);
  for (int i = 0; i <= n_cols; ++i) map.x_edges.push_back(grid->GetXCoordinates()->GetTuple1(i));
  for (int j = n_rows; j >= 0; --j) map.y_edges.push_back(grid->GetYCoordinates()->GetTuple1(j));
  map.values.resize(static_cast<std::size_t>(n_rows) * static_cast<std::size_t>(n_cols));
  // Hidden (inactive) cells read NaN, also from an integer array such as state.
  vtkDataArray* ghost = grid->GetCellData()->GetArray(vtkDataSetAttributes::GhostArrayName());
  for (int j = 0; j < n_rows; ++j)
    for (int i = 0; i < n_cols; ++i) {
      const int row = n_rows - 1 - j;  // VTK's j grows northward
      const vtkIdType id = j * n_cols + i;
      const bool hidden = ghost != nullptr && (static_cast<int>(ghost->GetTuple1(id)) &
                                               vtkDataSetAttributes::HIDDENCELL) != 0;
      map.values[static_cast<std::size_t>(row * n_cols + i)] =
          hidden ? nan_value : values->GetTuple1(id);
    }
  return map;
}

}  // namespace aquiledger
