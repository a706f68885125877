// VTK unstructured grid assembly and XML writing.
#include "io/vtu_writer.hpp"

#include <vtkCellArray.h>
#include <vtkCellData.h>
#include <vtkCellType.h>
#include <vtkDoubleArray.h>
#include <vtkErrorCode.h>
#include <vtkFieldData.h>
#include <vtkIdTypeArray.h>
#include <vtkIntArray.h>
#include <vtkPointData.h>
#include <vtkPoints.h>
#include <vtkSmartPointer.h>
#include <vtkStringArray.h>
#include <vtkTypeInt32Array.h>
#include <vtkTypeInt64Array.h>
#include <vtkUnstructuredGrid.h>
#include <vtkXMLUnstructuredGridWriter.h>

#include <cerrno>
#include <cstdint>
#include <limits>
#include <stdexcept>

#include "io/atomic_file.hpp"
#include "io/write_error.hpp"

namespace hearth {

namespace {
template <class T>
using Ptr = vtkSmartPointer<T>;

Ptr<vtkDoubleArray> vector_array(const char* name, const std::vector<double>& values) {
  auto array = Ptr<vtkDoubleArray>::New();
  array->SetName(name);
  array->SetNumberOfComponents(3);
  array->SetNumberOfTuples(static_cast<vtkIdType>(values.size() / 3));
  std::copy(values.begin(), values.end(), array->GetPointer(0));
  return array;
}
// Offsets and connectivity in the given integer type: 32-bit where they fit (node and
// element numbers in hearth are 32-bit), half the bytes of VTK's default 64-bit ids in
// the largest arrays of the file.
template <class IntArray>
void set_cells(const Mesh& mesh, vtkCellArray& cells) {
  // Our node order is VTK's (vertices, then edges 01 12 02 03 13 23), so no permutation.
  const int npe = mesh.nodes_per_tet();
  auto offsets = Ptr<IntArray>::New();
  auto connectivity = Ptr<IntArray>::New();
  offsets->SetNumberOfValues(static_cast<vtkIdType>(mesh.n_tets() + 1));
  connectivity->SetNumberOfValues(static_cast<vtkIdType>(mesh.tet_nodes.size()));
  for (std::size_t e = 0; e <= mesh.n_tets(); ++e) offsets->SetValue(static_cast<vtkIdType>(e), e * npe);
  for (std::size_t k = 0; k < mesh.tet_nodes.size(); ++k) connectivity->SetValue(static_cast<vtkIdType>(k), mesh.tet_nodes[k]);
  cells.SetData(offsets, connectivity);
}
}  // namespace

void write_vtu(const std::filesystem::path& path, const Mesh& mesh, const Units& units, const VtuFields& fields,
               VtkEncoding encoding) {
  auto grid = Ptr<vtkUnstructuredGrid>::New();
  auto points = Ptr<vtkPoints>::New();
  points->SetDataTypeToDouble();
  points->SetNumberOfPoints(static_cast<vtkIdType>(mesh.n_nodes()));
  const double scale = 1.0 / units.metres_per_length();
  for (std::size_t i = 0; i < mesh.n_nodes(); ++i)
    points->SetPoint(static_cast<vtkIdType>(i), mesh.coords[3 * i] * scale, mesh.coords[3 * i + 1] * scale,
                     mesh.coords[3 * i + 2] * scale);
  grid->SetPoints(points);

  auto cells = Ptr<vtkCellArray>::New();
  if (mesh.tet_nodes.size() < std::size_t(std::numeric_limits<std::int32_t>::max()))
    set_cells<vtkTypeInt32Array>(mesh, *cells);
  else
    set_cells<vtkTypeInt64Array>(mesh, *cells);
  grid->SetCells(mesh.order == 2 ? VTK_QUADRATIC_TETRA : VTK_TETRA, cells);

  auto region = Ptr<vtkIntArray>::New();
  region->SetName("region");
  region->SetNumberOfValues(static_cast<vtkIdType>(mesh.n_tets()));
  for (std::size_t e = 0; e < mesh.n_tets(); ++e)
    region->SetValue(static_cast<vtkIdType>(e), mesh.regions[mesh.tet_region[e]].tag);
  grid->GetCellData()->AddArray(region);

  auto names = Ptr<vtkStringArray>::New();
  names->SetName("region_names");
  auto tags = Ptr<vtkIntArray>::New();
  tags->SetName("region_tags");
  for (const auto& r : mesh.regions) {
    names->InsertNextValue(r.name);
    tags->InsertNextValue(r.tag);
  }
  grid->GetFieldData()->AddArray(names);
  grid->GetFieldData()->AddArray(tags);
  add_units_field_data(*grid->GetFieldData(), units);
  if (!fields.title.empty()) add_text_field_data(*grid->GetFieldData(), "title", fields.title);

  if (fields.restart_data) {
    // Boundary triangles (node ids into this file's points) and which named boundary each
    // lies on: what a restart needs beyond the volume cells.
    auto faces = Ptr<vtkIdTypeArray>::New();
    faces->SetName("boundary_faces");
    faces->SetNumberOfComponents(mesh.nodes_per_face());
    faces->SetNumberOfTuples(static_cast<vtkIdType>(mesh.n_faces()));
    for (std::size_t k = 0; k < mesh.face_nodes.size(); ++k) faces->SetValue(static_cast<vtkIdType>(k), mesh.face_nodes[k]);
    auto index = Ptr<vtkIntArray>::New();
    index->SetName("boundary_face_index");
    index->SetNumberOfValues(static_cast<vtkIdType>(mesh.n_faces()));
    for (std::size_t f = 0; f < mesh.n_faces(); ++f) index->SetValue(static_cast<vtkIdType>(f), mesh.face_boundary[f]);
    auto boundary_names = Ptr<vtkStringArray>::New();
    boundary_names->SetName("boundary_names");
    auto boundary_tags = Ptr<vtkIntArray>::New();
    boundary_tags->SetName("boundary_tags");
    for (const auto& b : mesh.boundaries) {
      boundary_names->InsertNextValue(b.name);
      boundary_tags->InsertNextValue(b.tag);
    }
    if (!mesh.face_twin_nodes.empty()) {  // the other side of faces cut for a thermal contact
      auto twins = Ptr<vtkIdTypeArray>::New();
      twins->SetName("boundary_twin_nodes");
      twins->SetNumberOfComponents(mesh.nodes_per_face());
      twins->SetNumberOfTuples(static_cast<vtkIdType>(mesh.n_faces()));
      for (std::size_t k = 0; k < mesh.face_twin_nodes.size(); ++k)
        twins->SetValue(static_cast<vtkIdType>(k), mesh.face_twin_nodes[k]);
      grid->GetFieldData()->AddArray(twins);
    }
    grid->GetFieldData()->AddArray(faces);
    grid->GetFieldData()->AddArray(index);
    grid->GetFieldData()->AddArray(boundary_names);
    grid->GetFieldData()->AddArray(boundary_tags);
  }
  if (fields.time >= 0.0) {  // the time of a transient output, read by viewers as TimeValue
    auto time = Ptr<vtkDoubleArray>::New();
    time->SetName("TimeValue");
    time->InsertNextValue(fields.time);
    grid->GetFieldData()->AddArray(time);
  }
  if (fields.temperature) {
    auto t = Ptr<vtkDoubleArray>::New();
    t->SetName("temperature");
    t->SetNumberOfValues(static_cast<vtkIdType>(mesh.n_nodes()));
    for (std::size_t i = 0; i < mesh.n_nodes(); ++i)
      t->SetValue(static_cast<vtkIdType>(i), units.from_kelvin((*fields.temperature)[i]));
    grid->GetPointData()->AddArray(t);
    grid->GetPointData()->SetActiveScalars("temperature");
  }
  if (fields.nodal_flux) grid->GetPointData()->AddArray(vector_array("heat_flux", *fields.nodal_flux));
  if (fields.cell_flux) grid->GetCellData()->AddArray(vector_array("heat_flux", *fields.cell_flux));
  if (fields.quality) {
    auto q = Ptr<vtkDoubleArray>::New();
    q->SetName("quality");
    q->SetNumberOfValues(static_cast<vtkIdType>(mesh.n_tets()));
    for (std::size_t e = 0; e < mesh.n_tets(); ++e)
      q->SetValue(static_cast<vtkIdType>(e), e < mesh.tet_quality.size() ? mesh.tet_quality[e] : 0.0);
    grid->GetCellData()->AddArray(q);
  }

  // VTK reports a failure through its error code; keep its own messages off the terminal.
  vtkObject::GlobalWarningDisplayOff();
  write_atomically(path, [&](const std::filesystem::path& temporary) {
    errno = 0;
    auto writer = Ptr<vtkXMLUnstructuredGridWriter>::New();
    writer->SetFileName(temporary.c_str());
    writer->SetInputData(grid);
    configure_xml_writer(*writer, encoding);
    run_xml_writer(*writer, path);
  });
}

}  // namespace hearth
