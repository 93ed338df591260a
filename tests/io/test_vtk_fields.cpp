#include <vtkCellData.h>
#include <vtkDataArray.h>
#include <vtkDataSetAttributes.h>
#include <vtkFieldData.h>
#include <vtkNew.h>
#include <vtkRectilinearGrid.h>
#include <vtkStringArray.h>
#include <vtkType.h>
#include <vtkXMLDataElement.h>
#include <vtkXMLDataParser.h>
#include <vtkXMLRectilinearGridReader.h>

#include <catch2/catch.hpp>
#include <cmath>
#include <fstream>
#include <map>

#include "io/results/vtk_fields.hpp"
#include "small_model.hpp"

using namespace aquiledger;
using aquiledger::testing::file_names;
using aquiledger::testing::scratch_folder;
using aquiledger::testing::small_model;

// The reference for every check here is the value written: VTK's XML format stores Float64
// arrays bit for bit (VTK file formats, "XML File Formats"), so a read-back must be exact.
namespace {

const char* const field_names[] = {"head",
                                   "drawdown",
                                   "saturated_thickness",
                                   "state",
                                   "storage_rate",
                                   "storage_skeleton_rate",
                                   "storage_water_rate",
                                   "storage_elastic_rate",
                                   "storage_drainage_rate",
                                   "compaction",
                                   "flow_east",
                                   "flow_north"};

/// Distinct values per array and cell: array a, cell c -> (a + 1) * 1000 + c / 3.
std::map<std::string, std::vector<double>> distinct_fields(int n_cells) {
  std::map<std::string, std::vector<double>> m;
  int a = 0;
  for (const char* name : field_names) {
    auto& v = m[name];
    for (int c = 0; c < n_cells; ++c)
      v.push_back(std::string(name) == "state" ? c % 3 : (a + 1) * 1000.0 + c / 3.0);
    ++a;
  }
  return m;
}

CellFields to_cell_fields(std::map<std::string, std::vector<double>> m) {
  CellFields f;
  f.head = m["head"];
  f.drawdown = m["drawdown"];
  f.saturated_thickness = m["saturated_thickness"];
  f.state = m["state"];
  f.storage_rate = m["storage_rate"];
  f.storage_skeleton_rate = m["storage_skeleton_rate"];
  f.storage_water_rate = m["storage_water_rate"];
  f.storage_elastic_rate = m["storage_elastic_rate"];
  f.storage_drainage_rate = m["storage_drainage_rate"];
  f.compaction = m["compaction"];
  f.flow_east = m["flow_east"];
  f.flow_north = m["flow_north"];
  return f;
}

vtkSmartPointer<vtkRectilinearGrid> read_vtr(const std::filesystem::path& p) {
  vtkNew<vtkXMLRectilinearGridReader> reader;
  reader->SetFileName(p.c_str());
  reader->Update();
  REQUIRE(reader->GetErrorCode() == 0);
  return reader->GetOutput();
}

/// Compares a read-back cell array with raster-order values: VTK cell (i, j) with j from the
/// south is raster row n_rows - 1 - j. Inactive cells must read NaN.
void check_cell_array(vtkRectilinearGrid* g, const Model& m, const std::string& name,
                      const std::vector<double>& raster) {
  INFO("array " << name);
  vtkDataArray* a = g->GetCellData()->GetArray(name.c_str());
  REQUIRE(a != nullptr);
  REQUIRE(a->GetNumberOfTuples() == m.grid.n_cells());
  const int nr = m.grid.n_rows(), nc = m.grid.n_cols();
  for (int j = 0; j < nr; ++j)
    for (int i = 0; i < nc; ++i) {
      const CellIndex c = m.grid.cell(nr - 1 - j, i);
      const double v = a->GetComponent(j * nc + i, 0);
      if (m.grid.is_active(c))
        CHECK(v == raster[static_cast<std::size_t>(c.value)]);
      else
        CHECK(std::isnan(v));
    }
}

std::string field_text(vtkRectilinearGrid* g, const char* name) {
  auto* a = vtkStringArray::SafeDownCast(g->GetFieldData()->GetAbstractArray(name));
  return a != nullptr && a->GetNumberOfValues() == 1 ? a->GetValue(0) : std::string("<missing>");
}

void check_geometry_and_blanking(vtkRectilinearGrid* g, const Model& m) {
  int dims[3];
  g->GetDimensions(dims);
  CHECK(dims[0] == 4);
  CHECK(dims[1] == 3);
  CHECK(dims[2] == 1);
  // True edges: x = 100, 110, 130, 170 (widths 10, 20, 40); y from the south edge 200 up:
  // 200, 215 (south row 15 high), 220 (north row 5 high).
  const double x[] = {100.0, 110.0, 130.0, 170.0}, y[] = {200.0, 215.0, 220.0};
  for (int i = 0; i < 4; ++i) CHECK(g->GetXCoordinates()->GetComponent(i, 0) == x[i]);
  for (int j = 0; j < 3; ++j) CHECK(g->GetYCoordinates()->GetComponent(j, 0) == y[j]);
  CHECK(g->GetZCoordinates()->GetComponent(0, 0) == 0.0);
  CHECK(std::string(g->GetXCoordinates()->GetName()) == "x");
  CHECK(std::string(g->GetYCoordinates()->GetName()) == "y");
  // The inactive north-east cell is VTK cell (i = 2, j = 1) = 5; all others visible.
  vtkDataArray* ghost = g->GetCellData()->GetArray(vtkDataSetAttributes::GhostArrayName());
  REQUIRE(ghost != nullptr);
  for (vtkIdType id = 0; id < 6; ++id) {
    const bool hidden = id == 5;
    CHECK(static_cast<int>(ghost->GetComponent(id, 0)) ==
          (hidden ? static_cast<int>(vtkDataSetAttributes::HIDDENCELL) : 0));
    CHECK(static_cast<bool>(g->IsCellVisible(id)) == !hidden);
  }
  CHECK(field_text(g, "title") == m.title);
  CHECK(field_text(g, "length_unit") == "m");
  CHECK(field_text(g, "time_unit") == "d");
  // Every array carries a name (an unnamed one would get a pointer-like name).
  for (int k = 0; k < g->GetCellData()->GetNumberOfArrays(); ++k)
    CHECK(g->GetCellData()->GetArrayName(k) != nullptr);
}

}  // namespace

TEST_CASE("field file reads back exactly, on true edges, with inactive cells blanked",
          "[io][vtk]") {
  const Model m = small_model();
  const auto folder = scratch_folder("vtk-fields");
  auto values = distinct_fields(m.grid.n_cells());
  CellFields f = to_cell_fields(values);
  f.head[2] = 12345.0;  // a fake value in the inactive cell must not reach the file
  const double time = 365.0 / 7.0;
  write_fields_vtr(folder / "fields_0001.vtr", m, f, time);
  CHECK(file_names(folder) == std::vector<std::string>{"fields_0001.vtr"});

  auto g = read_vtr(folder / "fields_0001.vtr");
  check_geometry_and_blanking(g, m);
  for (const char* name : field_names)
    if (std::string(name) != "state") check_cell_array(g, m, name, values[name]);
  // state is an integer array (results contract version 2): 0 dry, 1 water table, 2
  // confined, and -1 in the blanked inactive cell (VTK cell 5, raster cell 2).
  vtkDataArray* state = g->GetCellData()->GetArray("state");
  REQUIRE(state != nullptr);
  CHECK(state->GetDataType() == VTK_INT);
  const int nc = m.grid.n_cols(), nr = m.grid.n_rows();
  for (int j = 0; j < nr; ++j)
    for (int i = 0; i < nc; ++i) {
      const CellIndex c = m.grid.cell(nr - 1 - j, i);
      const double expected = m.grid.is_active(c) ? c.value % 3 : -1.0;
      CHECK(state->GetComponent(j * nc + i, 0) == expected);
    }
  // Read back for maps, the hidden cell reads NaN whatever its integer.
  const FieldMap map = read_field_vtr(folder / "fields_0001.vtr", "state");
  CHECK(std::isnan(map.values[2]));
  CHECK(map.values[0] == 0.0);
  CHECK(map.values[4] == 1.0);
  // Compressed binary, appended (the brief's choice of encoding), read from the XML header.
  std::ifstream raw(folder / "fields_0001.vtr", std::ios::binary);
  std::string header(2048, '\0');
  raw.read(header.data(), static_cast<std::streamsize>(header.size()));
  CHECK(header.find(R"(compressor="vtkLZ4DataCompressor")") != std::string::npos);
  CHECK(header.find(R"(format="appended")") != std::string::npos);
  vtkDataArray* t = g->GetFieldData()->GetArray("TIME");
  REQUIRE(t != nullptr);
  CHECK(t->GetComponent(0, 0) == time);
  std::filesystem::remove_all(folder);
}

TEST_CASE("static file holds the model's properties", "[io][vtk]") {
  const Model m = small_model();
  const auto folder = scratch_folder("vtk-static");
  write_static_vtr(folder / "model.vtr", m);
  auto g = read_vtr(folder / "model.vtr");
  check_geometry_and_blanking(g, m);
  check_cell_array(g, m, "kx", m.aquifer.kx.values());
  check_cell_array(g, m, "ky", m.aquifer.ky.values());
  check_cell_array(g, m, "top", m.aquifer.top.values());
  check_cell_array(g, m, "bottom", m.aquifer.bottom.values());
  check_cell_array(g, m, "specific_storage", m.aquifer.specific_storage.values());
  check_cell_array(g, m, "specific_yield", m.aquifer.specific_yield.values());
  vtkDataArray* active = g->GetCellData()->GetArray("active");
  REQUIRE(active != nullptr);
  for (vtkIdType id = 0; id < 6; ++id) CHECK(active->GetComponent(id, 0) == (id == 5 ? 0.0 : 1.0));
  std::filesystem::remove_all(folder);
}

TEST_CASE("collection file parses as XML and names existing field files", "[io][vtk]") {
  const Model m = small_model();
  const auto folder = scratch_folder("vtk-pvd");
  const CellFields f = to_cell_fields(distinct_fields(m.grid.n_cells()));
  std::vector<FieldFileEntry> entries;
  for (std::size_t n = 0; n < 3; ++n) {
    entries.push_back({n * 0.1, field_file_name(n)});
    write_fields_vtr(folder / entries.back().file, m, f, entries.back().time);
  }
  write_pvd(folder / "fields.pvd", entries);

  vtkNew<vtkXMLDataParser> parser;
  parser->SetFileName((folder / "fields.pvd").c_str());
  REQUIRE(parser->Parse() == 1);
  vtkXMLDataElement* root = parser->GetRootElement();
  REQUIRE(root != nullptr);
  CHECK(std::string(root->GetAttribute("type")) == "Collection");
  vtkXMLDataElement* collection = root->FindNestedElementWithName("Collection");
  REQUIRE(collection != nullptr);
  REQUIRE(collection->GetNumberOfNestedElements() == 3);
  for (int k = 0; k < 3; ++k) {
    vtkXMLDataElement* ds = collection->GetNestedElement(k);
    CHECK(std::string(ds->GetName()) == "DataSet");
    const std::string file = ds->GetAttribute("file");
    CHECK(file == field_file_name(static_cast<std::size_t>(k)));
    CHECK(std::filesystem::is_regular_file(folder / file));
    double t = -1.0;
    ds->GetScalarAttribute("timestep", t);
    CHECK(t == entries[static_cast<std::size_t>(k)].time);
  }
  CHECK(field_file_name(7) == "fields_0007.vtr");
  std::filesystem::remove_all(folder);
}

// As root, permission bits do not stop a write, so the unwritable target is a path whose
// parent is a regular file (ENOTDIR for every user) and one inside /proc (procfs accepts no
// new files, proc(5)).
TEST_CASE("a field file that cannot be written gives OutputError naming the path", "[io][vtk]") {
  const Model m = small_model();
  const auto folder = scratch_folder("vtk-fail");
  const CellFields f = to_cell_fields(distinct_fields(m.grid.n_cells()));
  write_pvd(folder / "plain", {});
  for (const std::filesystem::path& bad :
       {folder / "plain" / "fields_0000.vtr", std::filesystem::path("/proc/fields_0000.vtr")}) {
    try {
      write_fields_vtr(bad, m, f, 0.0);
      FAIL("no exception for " << bad);
    } catch (const OutputError& e) {
      CHECK(std::string(e.what()).find(bad.string()) != std::string::npos);
    }
  }
  CHECK(file_names(folder) == std::vector<std::string>{"plain"});
  CHECK_THROWS_AS(write_pvd(folder / "plain" / "fields.pvd", {}), OutputError);
  std::filesystem::remove_all(folder);
}
