// The three pictures: surface.vtp for the outside (coloured with the VTU's temperatures
// through surface.vtp's "node" map, so a transient step can be shown on it), a VTK
// cutter over the VTU for the section.
#include "io/field_pictures.hpp"

#include <vtkActor.h>
#include <vtkAppendPolyData.h>
#include <vtkCellArray.h>
#include <vtkCellData.h>
#include <vtkCleanPolyData.h>
#include <vtkCutter.h>
#include <vtkDataArray.h>
#include <vtkDoubleArray.h>
#include <vtkFeatureEdges.h>
#include <vtkFieldData.h>
#include <vtkIdList.h>
#include <vtkPlane.h>
#include <vtkPointData.h>
#include <vtkPoints.h>
#include <vtkPolyData.h>
#include <vtkPolyDataMapper.h>
#include <vtkPolyDataNormals.h>
#include <vtkProperty.h>
#include <vtkSmartPointer.h>
#include <vtkSphereSource.h>
#include <vtkStringArray.h>
#include <vtkUnstructuredGrid.h>
#include <vtkVersion.h>
#include <vtkXMLPolyDataReader.h>

#include <cmath>
#include <map>
#include <sstream>
#include <stdexcept>
#include <unordered_map>

#include "io/input_error.hpp"
#include "io/nice_numbers.hpp"
#include "io/picture_scene.hpp"
#include "io/view_choice.hpp"

namespace hearth {

namespace {

template <class T>
using Ptr = vtkSmartPointer<T>;

const Vector3 kEdgeDark{0.1, 0.1, 0.1};
const Vector3 kEdgeLight{1.0, 1.0, 1.0};
const Vector3 kMeshEdge{0.42, 0.42, 0.42};
const Vector3 kMarker{0.0, 0.8, 1.0};  // cyan: far from every colour of the map

Bounds bounds_of(vtkPolyData& poly) {
  Bounds b{};
  poly.GetBounds(b.data());
  return b;
}

double diagonal_of(const Bounds& b) {
  return std::sqrt(std::pow(b[1] - b[0], 2) + std::pow(b[3] - b[2], 2) + std::pow(b[5] - b[4], 2));
}

std::string vector_text(const Vector3& v, int digits = 4) {
  return "(" + short_number(v[0], digits) + ", " + short_number(v[1], digits) + ", " + short_number(v[2], digits) + ")";
}

// Which edges of a polygon mesh to draw.
enum class EdgeRule {
  outline_and_group_borders,  // edges of one polygon only, and edges between polygons of different groups
  all_but_within_group,       // every edge except those between two polygons of the same group
};

// The edges of `poly`'s polygons that `rule` keeps, as line cells on the same points.
// `group`: a cell array (region, element face), or null (every polygon its own group).
vtkSmartPointer<vtkPolyData> select_edges(vtkPolyData& poly, vtkDataArray* group, EdgeRule rule) {
  struct Use {
    vtkIdType first_cell;
    int count;
    bool differ;
  };
  std::unordered_map<std::uint64_t, Use> edges;
  edges.reserve(static_cast<std::size_t>(poly.GetNumberOfPolys()) * 2);
  auto group_of = [&](vtkIdType c) { return group ? group->GetComponent(c, 0) : static_cast<double>(c); };
  auto ids = Ptr<vtkIdList>::New();
  std::vector<std::uint64_t> order;
  for (vtkIdType c = 0; c < poly.GetNumberOfCells(); ++c) {
    poly.GetCellPoints(c, ids);
    const vtkIdType n = ids->GetNumberOfIds();
    if (n < 3) continue;
    for (vtkIdType k = 0; k < n; ++k) {
      vtkIdType a = ids->GetId(k), b = ids->GetId((k + 1) % n);
      if (a > b) std::swap(a, b);
      const std::uint64_t key = (static_cast<std::uint64_t>(a) << 32) | static_cast<std::uint64_t>(b);
      auto [it, inserted] = edges.try_emplace(key, Use{c, 1, false});
      if (inserted) {
        order.push_back(key);
      } else {
        ++it->second.count;
        if (group_of(it->second.first_cell) != group_of(c)) it->second.differ = true;
      }
    }
  }
  auto lines = Ptr<vtkCellArray>::New();
  for (std::uint64_t key : order) {
    const Use& use = edges[key];
    const bool keep = rule == EdgeRule::outline_and_group_borders ? (use.count == 1 || use.differ)
                                                                  : (use.count == 1 || use.differ || !group);
    if (!keep) continue;
    const vtkIdType pair[2] = {static_cast<vtkIdType>(key >> 32), static_cast<vtkIdType>(key & 0xffffffffu)};
    lines->InsertNextCell(2, pair);
  }
  auto out = Ptr<vtkPolyData>::New();
  out->SetPoints(poly.GetPoints());
  out->SetLines(lines);
  return out;
}

// Lines in a light colour under a dark one, so that they show on both ends of the map.
void add_two_tone_lines(PictureScene& scene, vtkPolyData* lines, double lift) {
  scene.add_lines(lines, kEdgeLight, 3.5, lift);
  scene.add_lines(lines, kEdgeDark, 1.6, 2 * lift);
}

// The body's outside from surface.vtp, coloured by the VTU's temperatures.
struct OutsideSurface {
  vtkSmartPointer<vtkPolyData> faces;        // exterior triangles, point field "temperature"
  vtkSmartPointer<vtkPolyData> smooth;       // the same with point normals, for shading
  vtkSmartPointer<vtkPolyData> outline;      // body edges and region borders
  vtkSmartPointer<vtkPolyData> mesh_edges;   // element edges
  std::vector<BoundaryPatch> patches;        // named exterior boundaries
  std::map<std::string, std::pair<double, double>> ranges;  // their lowest and highest temperatures
};

OutsideSurface read_outside(const std::filesystem::path& file, const FieldGrid& field, bool with_mesh_edges) {
  if (!std::filesystem::is_regular_file(file))
    throw InputError(file.string() + ": no such file; results from before surface.vtp was written: run the case "
                                     "again to make the report");
  auto reader = Ptr<vtkXMLPolyDataReader>::New();
  reader->SetFileName(file.c_str());
  reader->Update();
  vtkPolyData* surface = reader->GetOutput();
  vtkDataArray* node = surface ? surface->GetPointData()->GetArray("node") : nullptr;
  vtkDataArray* exterior = surface ? surface->GetCellData()->GetArray("exterior") : nullptr;
  vtkDataArray* boundary = surface ? surface->GetCellData()->GetArray("boundary") : nullptr;
  if (!node || !exterior || !boundary)
    throw InputError(file.string() + ": not a hearth surface file (no 'node', 'exterior' or 'boundary' field); "
                                     "run the case again");
  vtkDataArray* region = surface->GetCellData()->GetArray("region");
  vtkDataArray* element_face = surface->GetCellData()->GetArray("element_face");
  std::map<int, std::string> names;
  auto* name_array = vtkStringArray::SafeDownCast(surface->GetFieldData()->GetAbstractArray("boundary_names"));
  vtkDataArray* tag_array = surface->GetFieldData()->GetArray("boundary_tags");
  if (name_array && tag_array)
    for (vtkIdType i = 0; i < std::min(name_array->GetNumberOfValues(), tag_array->GetNumberOfTuples()); ++i)
      names[static_cast<int>(tag_array->GetComponent(i, 0))] = name_array->GetValue(i);

  // Temperatures of the pictured field at the surface's nodes.
  vtkDataArray* t_field = field.grid().GetPointData()->GetArray("temperature");
  auto temperature = Ptr<vtkDoubleArray>::New();
  temperature->SetName("temperature");
  temperature->SetNumberOfValues(surface->GetNumberOfPoints());
  for (vtkIdType i = 0; i < surface->GetNumberOfPoints(); ++i) {
    const auto n = static_cast<vtkIdType>(node->GetComponent(i, 0));
    if (n < 0 || n >= t_field->GetNumberOfTuples())
      throw InputError(file.string() + ": refers to node " + std::to_string(n) + ", which the temperature file "
                                       "does not have; the two files are from different runs: run the case again");
    temperature->SetValue(i, t_field->GetComponent(n, 0));
  }

  OutsideSurface out;
  out.faces = Ptr<vtkPolyData>::New();
  out.faces->SetPoints(surface->GetPoints());
  out.faces->GetPointData()->AddArray(temperature);
  out.faces->GetPointData()->SetActiveScalars("temperature");
  auto polys = Ptr<vtkCellArray>::New();
  auto kept_region = Ptr<vtkDoubleArray>::New();
  kept_region->SetName("region");
  auto kept_face = Ptr<vtkDoubleArray>::New();
  kept_face->SetName("element_face");
  std::map<int, BoundaryPatch> patches;
  std::map<int, std::pair<double, double>> ranges;
  auto ids = Ptr<vtkIdList>::New();
  for (vtkIdType c = 0; c < surface->GetNumberOfCells(); ++c) {
    if (exterior->GetComponent(c, 0) < 0.5) continue;
    surface->GetCellPoints(c, ids);
    if (ids->GetNumberOfIds() != 3) continue;
    polys->InsertNextCell(ids);
    kept_region->InsertNextValue(region ? region->GetComponent(c, 0) : 0.0);
    kept_face->InsertNextValue(element_face ? element_face->GetComponent(c, 0) : static_cast<double>(c));
    const int tag = static_cast<int>(boundary->GetComponent(c, 0));
    if (tag == 0 || !names.count(tag)) continue;  // unnamed faces
    double p[3][3];
    for (int k = 0; k < 3; ++k) surface->GetPoint(ids->GetId(k), p[k]);
    const Vector3 u{p[1][0] - p[0][0], p[1][1] - p[0][1], p[1][2] - p[0][2]};
    const Vector3 v{p[2][0] - p[0][0], p[2][1] - p[0][1], p[2][2] - p[0][2]};
    const Vector3 n{u[1] * v[2] - u[2] * v[1], u[2] * v[0] - u[0] * v[2], u[0] * v[1] - u[1] * v[0]};
    const double twice_area = std::sqrt(n[0] * n[0] + n[1] * n[1] + n[2] * n[2]);
    if (!(twice_area > 0)) continue;
    BoundaryPatch& patch = patches[tag];
    patch.name = names[tag];
    patch.areas.push_back(twice_area / 2);
    patch.normals.push_back({n[0] / twice_area, n[1] / twice_area, n[2] / twice_area});
    auto [range, fresh] = ranges.try_emplace(tag, INFINITY, -INFINITY);
    (void)fresh;
    for (int k = 0; k < 3; ++k) {
      const double t = temperature->GetValue(ids->GetId(k));
      range->second.first = std::min(range->second.first, t);
      range->second.second = std::max(range->second.second, t);
    }
  }
  out.faces->SetPolys(polys);
  out.faces->GetCellData()->AddArray(kept_region);
  out.faces->GetCellData()->AddArray(kept_face);
  for (auto& [tag, patch] : patches) {
    patch.temperature_range = ranges[tag].second - ranges[tag].first;
    out.ranges[patch.name] = ranges[tag];
    out.patches.push_back(patch);
  }
  if (out.faces->GetNumberOfPolys() == 0)
    throw InputError(file.string() + ": has no exterior faces; run the case again");

  auto normals = Ptr<vtkPolyDataNormals>::New();
  normals->SetInputData(out.faces);
  normals->SetFeatureAngle(30.0);
  normals->SplittingOn();
  normals->ConsistencyOff();
  normals->AutoOrientNormalsOff();
  normals->ComputeCellNormalsOff();
  normals->Update();
  out.smooth = normals->GetOutput();

  // Body edges (sharp creases) and region borders on the outside.
  auto creases = Ptr<vtkFeatureEdges>::New();
  creases->SetInputData(out.faces);
  creases->SetFeatureAngle(30.0);
  creases->FeatureEdgesOn();
  creases->BoundaryEdgesOff();
  creases->NonManifoldEdgesOff();
  creases->ManifoldEdgesOff();
  creases->ColoringOff();
  creases->Update();
  auto join = Ptr<vtkAppendPolyData>::New();
  join->AddInputConnection(creases->GetOutputPort());
  join->AddInputData(select_edges(*out.faces, kept_region, EdgeRule::outline_and_group_borders));
  join->Update();
  out.outline = join->GetOutput();

  if (with_mesh_edges) out.mesh_edges = select_edges(*out.faces, element_face ? kept_face.Get() : nullptr,
                                                     EdgeRule::all_but_within_group);
  return out;
}

std::string range_text(const FieldGrid& field, const std::string& symbol) {
  return "min " + short_number(field.min_temperature(), 5) + " " + symbol + ", max " +
         short_number(field.max_temperature(), 5) + " " + symbol;
}

std::string subtitle(const std::string& view, const PictureRequest& request, const FieldGrid& field) {
  std::string s = view;
  if (!request.time_label.empty()) s += ", " + request.time_label;
  return s + "; whole body " + range_text(field, temperature_symbol(request.temperature_unit));
}

std::string axis_name(int axis) { return std::string(1, static_cast<char>('x' + axis)); }

// The axis (with sign) nearest to a direction, e.g. "+x", for captions.
std::string nearest_axis(const Vector3& v) {
  int k = 0;
  for (int i = 1; i < 3; ++i)
    if (std::abs(v[i]) > std::abs(v[k])) k = i;
  return (v[k] >= 0 ? "+" : "-") + axis_name(k);
}

ColourScale colour_scale(double low, double high, const PictureRequest& request) {
  return {low, high, "Temperature (" + temperature_symbol(request.temperature_unit) + ")"};
}

// `straight_on`: the view looks onto a plane face (lit from the camera, with a scale bar).
Picture surface_picture(const FieldGrid& field, const PictureRequest& request, const OutsideSurface& outside,
                        const ViewDirection& view, const ColourScale& scale, bool straight_on,
                        const std::string& view_name) {
  PictureScene scene(request.width, request.height, scale);
  const Bounds b = bounds_of(*outside.faces);
  scene.frame(view, b);
  scene.add_coloured_surface(outside.smooth, straight_on);
  const double lift = 2e-3 * diagonal_of(b);
  if (outside.mesh_edges) scene.add_lines(outside.mesh_edges, kMeshEdge, 1.0, 0.5 * lift);
  add_two_tone_lines(scene, outside.outline, lift);
  scene.set_title(request.title, subtitle(view_name, request, field));
  if (straight_on) scene.add_scale_bar(request.length_unit);
  Picture p;
  p.png = scene.render_png();
  p.width = request.width;
  p.height = request.height;
  return p;
}

Picture section_picture(const FieldGrid& field, const PictureRequest& request, const SectionPlane& plane) {
  auto cut_plane = Ptr<vtkPlane>::New();
  cut_plane->SetOrigin(plane.origin.data());
  double normal[3] = {0, 0, 0};
  normal[plane.normal_axis] = 1;
  cut_plane->SetNormal(normal);
  auto cutter = Ptr<vtkCutter>::New();
  cutter->SetInputData(&field.grid());
  cutter->SetCutFunction(cut_plane);
  auto clean = Ptr<vtkCleanPolyData>::New();  // the cutter leaves each triangle its own points
  clean->SetInputConnection(cutter->GetOutputPort());
  clean->PointMergingOn();
  clean->ToleranceIsAbsoluteOff();
  clean->SetTolerance(1e-9);  // of the diagonal: points of a shared edge, computed from either end
  clean->Update();
  vtkPolyData* cut = clean->GetOutput();
  if (cut->GetNumberOfPolys() == 0) throw std::runtime_error("the section through the hottest point is empty");
  cut->GetPointData()->SetActiveScalars("temperature");

  PictureScene scene(request.width, request.height,
                     colour_scale(field.min_temperature(), field.max_temperature(), request));
  const Bounds b = bounds_of(*cut);
  scene.frame(plane.view, b);
  scene.add_coloured_surface(cut, true);
  const double lift = 2e-3 * diagonal_of(field.bounds());
  add_two_tone_lines(scene, select_edges(*cut, cut->GetCellData()->GetArray("region"),
                                         EdgeRule::outline_and_group_borders),
                     lift);
  auto marker = Ptr<vtkSphereSource>::New();
  const Point3 hot = field.hottest_point();
  marker->SetCenter(hot[0], hot[1], hot[2]);
  marker->SetRadius(0.012 * std::max({b[1] - b[0], b[3] - b[2], b[5] - b[4]}));
  marker->SetThetaResolution(32);
  marker->SetPhiResolution(16);
  auto marker_mapper = Ptr<vtkPolyDataMapper>::New();
  marker_mapper->SetInputConnection(marker->GetOutputPort());
  auto marker_actor = Ptr<vtkActor>::New();
  marker_actor->SetMapper(marker_mapper);
  marker_actor->GetProperty()->SetColor(kMarker[0], kMarker[1], kMarker[2]);
  marker_actor->GetProperty()->SetLighting(false);
  const Vector3& d = plane.view.direction;
  marker_actor->SetPosition(-d[0] * 4 * lift, -d[1] * 4 * lift, -d[2] * 4 * lift);
  scene.add_actor(marker_actor);
  scene.set_title(request.title,
                  subtitle("section " + axis_name(plane.normal_axis) + " = " +
                               short_number(plane.origin[plane.normal_axis], 5) + " " + request.length_unit,
                           request, field));
  scene.add_scale_bar(request.length_unit);
  Picture p;
  p.png = scene.render_png();
  p.width = request.width;
  p.height = request.height;
  return p;
}

}  // namespace

std::string vtk_version() { return vtkVersion::GetVTKVersion(); }

std::string temperature_symbol(const std::string& unit) { return unit == "degC" ? "\u00b0C" : unit; }

std::vector<Picture> render_field_pictures(const FieldGrid& field, const PictureRequest& request) {
  const OutsideSurface outside = read_outside(request.surface_file, field, request.mesh_edges);
  const std::string& L = request.length_unit;
  std::vector<Picture> pictures;
  const std::string edges_note = request.mesh_edges ? " Grey lines are the edges of the mesh's elements." : "";

  const ViewDirection iso = isometric_view(field.bounds(), field.hottest_point());
  const ColourScale whole = colour_scale(field.min_temperature(), field.max_temperature(), request);
  Picture p = surface_picture(field, request, outside, iso, whole, false, "isometric view");
  p.file_name = "picture_isometric.png";
  p.heading = "Isometric view";
  p.caption = "The outside of the body coloured by temperature, seen from above along a diagonal of its bounding "
              "box, from the side of the hottest point (looking along " + vector_text(iso.direction, 3) +
              "). Dark lines with a light rim mark the body's edges and the borders between regions. The triad "
              "shows the axes; faces seen obliquely are shaded darker." + edges_note;
  pictures.push_back(std::move(p));

  if (const auto facing = largest_boundary_view(outside.patches)) {
    double area = 0;
    for (const auto& patch : outside.patches)
      if (patch.name == facing->name) area = patch.area();
    // The boundary's own range, unless it varies too little to show (a face held at
    // one temperature): then the whole body's.
    const auto [low, high] = outside.ranges.at(facing->name);
    const bool own = high - low >= 0.01 * (field.max_temperature() - field.min_temperature());
    const ColourScale scale = own ? colour_scale(low, high, request) : whole;
    Picture q = surface_picture(field, request, outside, facing->view, scale, true,
                                "view onto " + facing->name + (own ? " (colours over its own range)" : ""));
    q.file_name = "picture_boundary.png";
    q.heading = "View onto " + facing->name;
    q.caption = "Looking onto the boundary '" + facing->name + "', the largest named outer surface (" +
                short_number(area, 4) + " " + L + "\u00b2 in the picture's units), from outside the body along " +
                nearest_axis(facing->view.direction) + ". " +
                (own ? "The colours span this boundary's own temperatures, " + short_number(low, 5) + " to " +
                           short_number(high, 5) + " " + temperature_symbol(request.temperature_unit) +
                           ", so that its variation shows; the other pictures use the whole body's range. "
                     : std::string("The colours use the whole body's range. ")) +
                "Faces seen straight on show the colour map's colours unchanged; the scale bar holds for lengths "
                "in the picture's plane." + edges_note;
    pictures.push_back(std::move(q));
  }

  // The way heat flows at the hottest point: its nodal heat flux, unless that is next to
  // nothing (a peak inside the body, where the flux vanishes): then towards the coldest.
  const Point3 q = field.heat_flux_at_hottest(), hot = field.hottest_point(), cold = field.coldest_point();
  const bool by_flux = std::sqrt(q[0] * q[0] + q[1] * q[1] + q[2] * q[2]) > 1e-3 * field.max_heat_flux();
  const Vector3 flow = by_flux ? q : Vector3{cold[0] - hot[0], cold[1] - hot[1], cold[2] - hot[2]};
  const SectionPlane plane = section_through(hot, flow, field.bounds());
  Picture s = section_picture(field, request, plane);
  s.file_name = "picture_section.png";
  s.heading = "Section through the hottest point";
  s.caption = "The temperature on the plane " + axis_name(plane.normal_axis) + " = " +
              short_number(plane.origin[plane.normal_axis], 5) + " " + L + " through the hottest point " +
              vector_text(hot) + " " + L + " (cyan dot), normal to the axis most nearly perpendicular to " +
              (by_flux ? "the heat flux there" : "the way from there to the coldest point " + vector_text(cold) + " " + L) +
              ". Lines mark the section's outline and the borders between regions.";
  pictures.push_back(std::move(s));
  return pictures;
}

}  // namespace hearth
