// surface.vtp through VTK's XML poly data writer.
#include "io/surface_writer.hpp"

#include <vtkCellArray.h>
#include <vtkCellData.h>
#include <vtkDoubleArray.h>
#include <vtkFieldData.h>
#include <vtkIntArray.h>
#include <vtkPointData.h>
#include <vtkPoints.h>
#include <vtkPolyData.h>
#include <vtkSmartPointer.h>
#include <vtkStringArray.h>
#include <vtkUnsignedCharArray.h>
#include <vtkXMLPolyDataWriter.h>

#include <cerrno>

#include "io/atomic_file.hpp"

namespace hearth {

namespace {

template <class T>
using Ptr = vtkSmartPointer<T>;

// The four 3-node triangles of a 6-node triangle (v0 v1 v2 e01 e12 e20), each with the
// parent's orientation: three at the corners, one in the middle.
constexpr int kQuarters[4][3] = {{0, 3, 5}, {3, 1, 4}, {5, 4, 2}, {3, 4, 5}};

}  // namespace

void write_surface_vtp(const std::filesystem::path& path, const Mesh& mesh, const BodySurface& surface,
                       const Units& units, const SurfaceFields& fields, VtkEncoding encoding) {
  // Compact point numbering: surface nodes only, in order of first use.
  std::vector<std::int32_t> local(mesh.n_nodes(), -1);
  std::vector<std::int32_t> nodes;
  for (std::int32_t n : surface.face_nodes)
    if (local[n] < 0) {
      local[n] = static_cast<std::int32_t>(nodes.size());
      nodes.push_back(n);
    }

  auto poly = Ptr<vtkPolyData>::New();
  auto points = Ptr<vtkPoints>::New();
  points->SetDataTypeToDouble();
  points->SetNumberOfPoints(static_cast<vtkIdType>(nodes.size()));
  const double scale = 1.0 / units.metres_per_length();
  for (std::size_t i = 0; i < nodes.size(); ++i) {
    const auto x = mesh.node(nodes[i]);
    points->SetPoint(static_cast<vtkIdType>(i), x[0] * scale, x[1] * scale, x[2] * scale);
  }
  poly->SetPoints(points);

  auto node = Ptr<vtkIntArray>::New();
  node->SetName("node");
  node->SetNumberOfValues(static_cast<vtkIdType>(nodes.size()));
  for (std::size_t i = 0; i < nodes.size(); ++i) node->SetValue(static_cast<vtkIdType>(i), nodes[i]);
  poly->GetPointData()->AddArray(node);
  if (fields.temperature) {
    auto t = Ptr<vtkDoubleArray>::New();
    t->SetName("temperature");
    t->SetNumberOfValues(static_cast<vtkIdType>(nodes.size()));
    for (std::size_t i = 0; i < nodes.size(); ++i)
      t->SetValue(static_cast<vtkIdType>(i), units.from_kelvin((*fields.temperature)[nodes[i]]));
    poly->GetPointData()->AddArray(t);
    poly->GetPointData()->SetActiveScalars("temperature");
  }
  if (fields.nodal_flux) {
    auto q = Ptr<vtkDoubleArray>::New();
    q->SetName("heat_flux");
    q->SetNumberOfComponents(3);
    q->SetNumberOfTuples(static_cast<vtkIdType>(nodes.size()));
    for (std::size_t i = 0; i < nodes.size(); ++i)
      q->SetTuple(static_cast<vtkIdType>(i), &(*fields.nodal_flux)[3 * static_cast<std::size_t>(nodes[i])]);
    poly->GetPointData()->AddArray(q);
  }

  const bool quadratic = surface.nodes_per_face == 6;
  auto triangles = Ptr<vtkCellArray>::New();
  auto boundary = Ptr<vtkIntArray>::New();
  boundary->SetName("boundary");
  auto exterior = Ptr<vtkUnsignedCharArray>::New();
  exterior->SetName("exterior");
  auto region = Ptr<vtkIntArray>::New();
  region->SetName("region");
  auto parent = Ptr<vtkIntArray>::New();
  parent->SetName("element_face");
  bool has_unnamed = false;
  for (std::size_t f = 0; f < surface.n_faces(); ++f) {
    const std::int32_t* v = surface.face(f);
    const int b = surface.face_boundary[f];
    has_unnamed = has_unnamed || b < 0;
    const int tag = b < 0 ? unnamed_surface_tag : mesh.boundaries[b].tag;
    const int pieces = quadratic ? 4 : 1;
    for (int q = 0; q < pieces; ++q) {
      const vtkIdType ids[3] = {local[v[quadratic ? kQuarters[q][0] : 0]], local[v[quadratic ? kQuarters[q][1] : 1]],
                                local[v[quadratic ? kQuarters[q][2] : 2]]};
      triangles->InsertNextCell(3, ids);
      boundary->InsertNextValue(tag);
      exterior->InsertNextValue(surface.exterior[f]);
      region->InsertNextValue(surface.face_region[f] < 0 ? 0 : mesh.regions[surface.face_region[f]].tag);
      if (quadratic) parent->InsertNextValue(static_cast<int>(f));
    }
  }
  poly->SetPolys(triangles);
  poly->GetCellData()->AddArray(boundary);
  poly->GetCellData()->AddArray(exterior);
  poly->GetCellData()->AddArray(region);
  if (quadratic) poly->GetCellData()->AddArray(parent);

  auto names = Ptr<vtkStringArray>::New();
  names->SetName("boundary_names");
  auto tags = Ptr<vtkIntArray>::New();
  tags->SetName("boundary_tags");
  for (const auto& b : mesh.boundaries) {
    names->InsertNextValue(b.name);
    tags->InsertNextValue(b.tag);
  }
  if (has_unnamed) {
    names->InsertNextValue(unnamed_surface_name);
    tags->InsertNextValue(unnamed_surface_tag);
  }
  poly->GetFieldData()->AddArray(names);
  poly->GetFieldData()->AddArray(tags);
  auto region_names = Ptr<vtkStringArray>::New();
  region_names->SetName("region_names");
  auto region_tags = Ptr<vtkIntArray>::New();
  region_tags->SetName("region_tags");
  for (const auto& r : mesh.regions) {
    region_names->InsertNextValue(r.name);
    region_tags->InsertNextValue(r.tag);
  }
  poly->GetFieldData()->AddArray(region_names);
  poly->GetFieldData()->AddArray(region_tags);
  add_units_field_data(*poly->GetFieldData(), units);
  if (!fields.title.empty()) add_text_field_data(*poly->GetFieldData(), "title", fields.title);

  // VTK reports a failure through its error code; keep its own messages off the terminal.
  vtkObject::GlobalWarningDisplayOff();
  write_atomically(path, [&](const std::filesystem::path& temporary) {
    errno = 0;
    auto writer = Ptr<vtkXMLPolyDataWriter>::New();
    writer->SetFileName(temporary.c_str());
    writer->SetInputData(poly);
    configure_xml_writer(*writer, encoding);
    run_xml_writer(*writer, path);
  });
}

}  // namespace hearth
