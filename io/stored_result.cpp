#include "io/stored_result.hpp"

#include <vtkCellArray.h>
#include <vtkCellData.h>
#include <vtkDataArray.h>
#include <vtkFieldData.h>
#include <vtkIdTypeArray.h>
#include <vtkIntArray.h>
#include <vtkPointData.h>
#include <vtkSmartPointer.h>
#include <vtkStringArray.h>
#include <vtkUnstructuredGrid.h>
#include <vtkXMLUnstructuredGridReader.h>

#include <fstream>
#include <nlohmann/json.hpp>
#include <stdexcept>

#include "io/time_series_writer.hpp"

namespace hearth {

namespace fs = std::filesystem;

namespace {

std::string unit_of(vtkStringArray* units, const std::string& quantity, const std::string& fallback) {
  if (!units) return fallback;
  for (vtkIdType i = 0; i < units->GetNumberOfValues(); ++i) {
    const std::string entry = units->GetValue(i);
    if (entry.rfind(quantity + "=", 0) == 0) return entry.substr(quantity.size() + 1);
  }
  return fallback;
}

}  // namespace

StoredResult read_stored_result(const fs::path& folder) {
  StoredResult out;
  if (!fs::is_directory(folder))
    throw std::runtime_error("'" + folder.string() + "' is not a folder; give the output folder of an earlier hearth run");
  if (fs::exists(folder / "temperature.pvd")) {
    const std::vector<TimeSeriesEntry> series = read_time_series(folder / "temperature.pvd");
    if (series.empty()) throw std::runtime_error(folder.string() + "/temperature.pvd lists no fields");
    out.field_file = folder / series.back().file;
    out.time = series.back().time;
  } else if (fs::exists(folder / "temperature.vtu")) {
    out.field_file = folder / "temperature.vtu";
  } else {
    throw std::runtime_error("'" + folder.string() +
                             "' holds no temperature.vtu or temperature.pvd; run the case that makes it first");
  }
  auto reader = vtkSmartPointer<vtkXMLUnstructuredGridReader>::New();
  reader->SetFileName(out.field_file.c_str());
  reader->Update();
  vtkUnstructuredGrid* grid = reader->GetOutput();
  if (!grid || grid->GetNumberOfPoints() == 0)
    throw std::runtime_error(out.field_file.string() + " could not be read as a VTK unstructured grid");
  vtkFieldData* data = grid->GetFieldData();
  auto* faces = vtkIdTypeArray::SafeDownCast(data->GetAbstractArray("boundary_faces"));
  auto* face_index = vtkIntArray::SafeDownCast(data->GetAbstractArray("boundary_face_index"));
  auto* boundary_names = vtkStringArray::SafeDownCast(data->GetAbstractArray("boundary_names"));
  auto* boundary_tags = vtkIntArray::SafeDownCast(data->GetAbstractArray("boundary_tags"));
  auto* region_names = vtkStringArray::SafeDownCast(data->GetAbstractArray("region_names"));
  auto* region_tags = vtkIntArray::SafeDownCast(data->GetAbstractArray("region_tags"));
  auto* units = vtkStringArray::SafeDownCast(data->GetAbstractArray("units"));
  vtkDataArray* temperature = grid->GetPointData()->GetArray("temperature");
  auto* region = vtkIntArray::SafeDownCast(grid->GetCellData()->GetAbstractArray("region"));
  if (!faces || !face_index || !boundary_names || !boundary_tags || !region_names || !region_tags || !temperature ||
      !region)
    throw std::runtime_error(out.field_file.string() +
                             " lacks the mesh data a restart needs (it was written by another program or an older "
                             "hearth); run the case that makes it again with this version");

  const double metres = unit_of(units, "length", "m") == "mm" ? 1e-3 : 1.0;
  const bool celsius = unit_of(units, "temperature", "degC") == "degC";
  Mesh& mesh = out.mesh;
  const vtkIdType n = grid->GetNumberOfPoints();
  mesh.coords.resize(3 * static_cast<std::size_t>(n));
  out.temperature.resize(static_cast<std::size_t>(n));
  for (vtkIdType i = 0; i < n; ++i) {
    double x[3];
    grid->GetPoint(i, x);
    for (int d = 0; d < 3; ++d) mesh.coords[3 * i + d] = x[d] * metres;
    out.temperature[i] = temperature->GetComponent(i, 0) + (celsius ? 273.15 : 0.0);
  }
  const vtkIdType cells = grid->GetNumberOfCells();
  if (cells == 0) throw std::runtime_error(out.field_file.string() + " has no cells");
  const int npe = static_cast<int>(grid->GetCell(0)->GetNumberOfPoints());
  if (npe != 4 && npe != 10) throw std::runtime_error(out.field_file.string() + " holds cells that are not tetrahedra");
  mesh.order = npe == 10 ? 2 : 1;
  for (vtkIdType k = 0; k < region_names->GetNumberOfValues(); ++k)
    mesh.regions.push_back({region_names->GetValue(k), region_tags->GetValue(k)});
  for (vtkIdType k = 0; k < boundary_names->GetNumberOfValues(); ++k)
    mesh.boundaries.push_back({boundary_names->GetValue(k), boundary_tags->GetValue(k)});
  mesh.tet_nodes.reserve(static_cast<std::size_t>(cells) * npe);
  for (vtkIdType e = 0; e < cells; ++e) {
    vtkIdType count = 0;
    const vtkIdType* ids = nullptr;
    grid->GetCellPoints(e, count, ids);
    if (count != npe) throw std::runtime_error(out.field_file.string() + " mixes element types");
    for (vtkIdType a = 0; a < count; ++a) mesh.tet_nodes.push_back(static_cast<std::int32_t>(ids[a]));
    const int tag = region->GetValue(e);
    int index = -1;
    for (std::size_t r = 0; r < mesh.regions.size(); ++r)
      if (mesh.regions[r].tag == tag) index = static_cast<int>(r);
    if (index < 0) throw std::runtime_error(out.field_file.string() + ": a cell's region tag is not named");
    mesh.tet_region.push_back(index);
  }
  const int npf = mesh.nodes_per_face();
  if (faces->GetNumberOfComponents() != npf) throw std::runtime_error(out.field_file.string() + ": boundary faces do not match the cells");
  mesh.face_nodes.resize(static_cast<std::size_t>(faces->GetNumberOfValues()));
  for (vtkIdType k = 0; k < faces->GetNumberOfValues(); ++k) mesh.face_nodes[k] = static_cast<std::int32_t>(faces->GetValue(k));
  for (vtkIdType f = 0; f < face_index->GetNumberOfValues(); ++f) mesh.face_boundary.push_back(face_index->GetValue(f));
  if (auto* twins = vtkIdTypeArray::SafeDownCast(data->GetAbstractArray("boundary_twin_nodes"))) {
    mesh.face_twin_nodes.resize(static_cast<std::size_t>(twins->GetNumberOfValues()));
    for (vtkIdType k = 0; k < twins->GetNumberOfValues(); ++k)
      mesh.face_twin_nodes[k] = static_cast<std::int32_t>(twins->GetValue(k));
  }
  std::ifstream run(folder / "run.json");
  if (run) {
    try {
      const nlohmann::json j = nlohmann::json::parse(run);
      out.input_digest = j.value("input_digest", "");
      out.geometry_digest = j.value("geometry_digest", "");
    } catch (const std::exception&) {
      // run.json is provenance only; a damaged one does not stop a restart
    }
  }
  return out;
}

}  // namespace hearth
