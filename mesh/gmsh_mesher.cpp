// Meshing through the Gmsh SDK: load, name, size, generate, convert, check, renumber.
#include "mesh/gmsh_mesher.hpp"

#include <gmsh.h>

#include <algorithm>
#include <cctype>
#include <chrono>
#include <cmath>
#include <iomanip>
#include <map>
#include <regex>
#include <set>
#include <sstream>

#include "mesh/geometry_guard.hpp"
#include "mesh/gmsh_arrays.hpp"
#include "mesh/gmsh_session.hpp"
#include "mesh/interior_duplicates.hpp"
#include "mesh/mesh_error.hpp"
#include "mesh/mesh_quality.hpp"
#include "mesh/mesh_topology.hpp"
#include "mesh/renumber.hpp"

namespace hearth {
namespace {

using Clock = std::chrono::steady_clock;

enum class GeometryKind { script, cad, ready_mesh };

constexpr int kHxt = 10;       // Mesh.Algorithm3D
constexpr int kDelaunay = 1;

std::string format_number(double value, int digits = 3) {
  std::ostringstream out;
  out << std::setprecision(digits) << value;
  return out.str();
}

double seconds_since(Clock::time_point start) {
  return std::chrono::duration<double>(Clock::now() - start).count();
}

std::string lower_extension(const std::filesystem::path& path) {
  std::string extension = path.extension().string();
  std::transform(extension.begin(), extension.end(), extension.begin(), [](unsigned char c) { return std::tolower(c); });
  return extension;
}

GeometryKind check_request(const MeshRequest& request) {
  const std::string file = request.geometry_file.string();
  if (request.length_unit != "m" && request.length_unit != "mm")
    throw MeshError("length unit '" + request.length_unit + "' is not supported; use m or mm");
  if (!(request.size > 0.0) || !std::isfinite(request.size))
    throw MeshError("mesh size must be a positive length, got " + format_number(request.size));
  if (request.order != 1 && request.order != 2)
    throw MeshError("mesh order must be 1 or 2, got " + std::to_string(request.order));
  if (request.refinements < 0)
    throw MeshError("mesh refinements must be 0 or more, got " + std::to_string(request.refinements));
  for (const auto& [name, size] : request.local_sizes)
    if (!(size > 0.0) || !std::isfinite(size))
      throw MeshError("local mesh size for '" + name + "' must be a positive length, got " + format_number(size));
  std::error_code error;
  if (!std::filesystem::is_regular_file(request.geometry_file, error))
    throw MeshError(file + ": geometry file not found");
  const std::string extension = lower_extension(request.geometry_file);
  if (extension == ".geo") {
    if (!request.trust_geometry) refuse_unsafe_geometry(scan_geometry_script(request.geometry_file));
    return GeometryKind::script;
  }
  if (extension == ".step" || extension == ".stp" || extension == ".brep") return GeometryKind::cad;
  if (extension == ".msh") return GeometryKind::ready_mesh;
  throw MeshError(file + ": unsupported geometry file type '" + extension +
                  "'; use a Gmsh script (.geo), CAD (.step, .stp, .brep) or a Gmsh mesh (.msh)");
}

// Gmsh's "'<path>', line <n>: <what>" as "<path>:<n>: <what>"; other messages as
// "<file>: <message>".
std::string located_message(const std::string& file, const std::string& message) {
  static const std::regex with_line("^'(.*)', line ([0-9]+) ?: (.*)$");
  std::smatch match;
  if (std::regex_match(message, match, with_line)) return match.str(1) + ":" + match.str(2) + ": " + match.str(3);
  return file + ": " + message;
}

// Loads the file into Gmsh's current model. CAD imports are converted to the
// request's length unit; several CAD solids are fragmented so that they conform.
// What OpenCASCADE prints directly is caught and sent to progress as well.
void load_geometry(GmshSession& session, const MeshRequest& request, GeometryKind kind) {
  const std::string file = request.geometry_file.string();
  bool failed = false, fragmented = false;
  std::string failure;
  std::vector<std::string> printed;
  {
    TerminalCapture capture;
    try {
      gmsh::option::setString("Geometry.OCCTargetUnit", request.length_unit == "mm" ? "MM" : "M");
      if (kind == GeometryKind::cad) {
        gmsh::model::add(request.geometry_file.stem().string());
        gmsh::vectorpair imported;
        gmsh::model::occ::importShapes(file, imported, /*highestDimOnly=*/true);
        gmsh::vectorpair volumes;
        gmsh::model::occ::getEntities(volumes, 3);
        if (volumes.size() > 1) {
          gmsh::vectorpair fragments;
          std::vector<gmsh::vectorpair> fragment_map;
          gmsh::model::occ::fragment(volumes, {}, fragments, fragment_map);
          fragmented = true;
        }
        gmsh::model::occ::synchronize();
      } else {
        gmsh::open(file);
      }
    } catch (const std::string& message) {
      failed = true;
      failure = message;
    } catch (const std::exception& error) {
      failed = true;
      failure = error.what();
    }
    printed = capture.finish();
  }
  session.forward_messages();
  for (const std::string& line : printed) session.report("gmsh: " + line);
  // Gmsh keeps going after some script errors; any error logged while loading counts.
  const std::vector<std::string> errors = session.errors();
  if (failed || !errors.empty()) {
    std::string message = errors.empty() ? failure : errors.front();
    if (message.empty()) message = "Gmsh could not load the file";
    for (const std::string& line : printed)
      if (line.find("ERR") != std::string::npos || line.find("rror") != std::string::npos) {
        message += " (" + line + ")";
        break;
      }
    if (kind == GeometryKind::cad)
      message += "; the file does not import: check that it is a complete STEP or BREP file (export it again from "
                 "the CAD program, as a solid)";
    else if (message.find("syntax error") != std::string::npos)
      message += "; Gmsh names the line where it noticed the error: look there and at the end of the line before "
                 "(a missing ';' is found on the next line)";
    throw MeshError(located_message(file, message));
  }
  if (fragmented)
    session.report("CAD solids of " + request.geometry_file.filename().string() +
                   " fragmented so that touching solids share their faces");
  gmsh::vectorpair volumes;
  gmsh::model::getEntities(volumes, 3);
  if (volumes.empty()) throw MeshError(file + ": the geometry has no volume; hearth meshes 3D solids");
}

std::string physical_name(int dim, int tag) {
  std::string name;
  gmsh::model::getPhysicalName(dim, tag, name);
  if (!name.empty()) return name;
  return (dim == 3 ? "volume_" : "surface_") + std::to_string(tag);
}

// Regions: the physical volumes, then every volume in none of them as volume_<tag>.
// Boundaries: the physical surfaces or, where there are none, every surface as
// surface_<tag>.
void name_entities(const std::string& file, GmshArrays& arrays) {
  gmsh::vectorpair groups, volumes, surfaces;
  gmsh::model::getEntities(volumes, 3);
  gmsh::model::getEntities(surfaces, 2);
  std::set<std::string> region_names;
  std::map<int, std::string> region_of_volume;
  auto add_region = [&](const NamedEntity& entity, const std::vector<int>& tags) {
    if (!region_names.insert(entity.name).second)
      throw MeshError(file + ": two regions are called '" + entity.name + "'; give each physical volume its own name");
    for (int tag : tags) {
      const auto [it, fresh] = region_of_volume.emplace(tag, entity.name);
      if (!fresh)
        throw MeshError(file + ": volume " + std::to_string(tag) + " is in two physical volumes, '" + it->second +
                        "' and '" + entity.name + "'; a volume must belong to one region");
    }
    arrays.regions.push_back({entity, tags});
  };
  gmsh::model::getPhysicalGroups(groups, 3);
  for (const auto& [dim, tag] : groups) {
    std::vector<int> tags;
    gmsh::model::getEntitiesForPhysicalGroup(dim, tag, tags);
    for (int& t : tags) t = std::abs(t);
    add_region({physical_name(dim, tag), tag}, tags);
  }
  for (const auto& [dim, tag] : volumes)
    if (region_of_volume.count(tag) == 0) add_region({"volume_" + std::to_string(tag), tag}, {tag});

  gmsh::model::getPhysicalGroups(groups, 2);
  std::set<std::string> boundary_names;
  for (const auto& [dim, tag] : groups) {
    std::vector<int> tags;
    gmsh::model::getEntitiesForPhysicalGroup(dim, tag, tags);
    for (int& t : tags) t = std::abs(t);
    const NamedEntity entity{physical_name(dim, tag), tag};
    if (!boundary_names.insert(entity.name).second)
      throw MeshError(file + ": two boundaries are called '" + entity.name + "'; give each physical surface its own name");
    arrays.boundaries.push_back({entity, tags});
  }
  if (groups.empty())
    for (const auto& [dim, tag] : surfaces) arrays.boundaries.push_back({{"surface_" + std::to_string(tag), tag}, {tag}});
}

std::string list_names(const std::vector<NamedGroup>& groups) {
  std::string list;
  for (const NamedGroup& group : groups) list += (list.empty() ? "" : ", ") + group.entity.name;
  return list.empty() ? "(none)" : list;
}

// Largest side of the bounding box of the given surfaces, geometry units.
double surfaces_extent(const std::vector<int>& surfaces) {
  double extent = 0.0;
  for (int tag : surfaces) {
    double x0, y0, z0, x1, y1, z1;
    gmsh::model::getBoundingBox(2, tag, x0, y0, z0, x1, y1, z1);
    extent = std::max({extent, x1 - x0, y1 - y0, z1 - z0});
  }
  return extent;
}

// Size fields: `size` everywhere (Mesh.MeshSizeMax), and for each local size a
// Threshold on the distance to the named boundary (or to a region's bounding
// surfaces, with the size held inside the region too), combined by a Min field.
// Sizes in geometry units. Point sizes of the script are ignored: the request's
// sizes are the only ones.
void apply_sizes(GmshSession& session, const MeshRequest& request, const GmshArrays& arrays) {
  const double scale = request.length_scale();
  const double size = request.size / scale;
  const std::string file = request.geometry_file.filename().string();
  std::vector<std::string> unknown;
  for (const auto& entry : request.local_sizes) {
    const std::string& name = entry.first;
    auto named = [&](const NamedGroup& g) { return g.entity.name == name; };
    if (std::none_of(arrays.boundaries.begin(), arrays.boundaries.end(), named) &&
        std::none_of(arrays.regions.begin(), arrays.regions.end(), named))
      unknown.push_back(name);
  }
  if (!unknown.empty()) {
    std::string names;
    for (const std::string& name : unknown) names += (names.empty() ? "'" : ", '") + name + "'";
    const auto origin = request.local_size_origins.find(unknown.front());
    throw MeshError((origin != request.local_size_origins.end() ? origin->second + ": " : std::string()) +
                    "local mesh size for " + names + ": no such boundary or region in " + file +
                    "; the boundaries are " + list_names(arrays.boundaries) + "; the regions are " +
                    list_names(arrays.regions));
  }
  session.guarded(file + ": mesh sizes", [&] {
    // The request decides; settings a script made for itself are undone.
    gmsh::option::setNumber("Mesh.MeshSizeFactor", 1.0);
    gmsh::option::setNumber("Mesh.ElementOrder", 1);  // order 2 comes from setOrder
    gmsh::option::setNumber("Mesh.RecombineAll", 0);
    gmsh::option::setNumber("Mesh.SubdivisionAlgorithm", 0);
    gmsh::option::setNumber("Mesh.MeshSizeMax", size);
    gmsh::option::setNumber("Mesh.MeshSizeMin", 0.0);
    gmsh::option::setNumber("Mesh.MeshSizeFromPoints", 0);
    gmsh::option::setNumber("Mesh.MeshSizeFromCurvature", 0);
    gmsh::option::setNumber("Mesh.MeshSizeExtendFromBoundary", 0);
    std::vector<double> fields;
    auto threshold_near = [&](const std::vector<int>& surfaces, double local) {
      const int distance = gmsh::model::mesh::field::add("Distance");
      gmsh::model::mesh::field::setNumbers(distance, "FacesList", std::vector<double>(surfaces.begin(), surfaces.end()));
      // Sample points on the surfaces no further apart than the local size.
      const double samples = std::clamp(std::ceil(surfaces_extent(surfaces) / local) + 1.0, 20.0, 300.0);
      gmsh::model::mesh::field::setNumber(distance, "NNodesByEdge", samples);
      const int threshold = gmsh::model::mesh::field::add("Threshold");
      gmsh::model::mesh::field::setNumber(threshold, "IField", distance);
      gmsh::model::mesh::field::setNumber(threshold, "LcMin", local);
      gmsh::model::mesh::field::setNumber(threshold, "LcMax", size);
      gmsh::model::mesh::field::setNumber(threshold, "DistMin", local);
      gmsh::model::mesh::field::setNumber(threshold, "DistMax", local + std::max(4.0 * (size - local), local));
      fields.push_back(threshold);
    };
    for (const auto& [name, local_metres] : request.local_sizes) {
      const double local = local_metres / scale;
      if (local >= size)
        session.report("local mesh size for '" + name + "' (" + format_number(local_metres) +
                       " m) is not smaller than the mesh size: it has no effect");
      for (const NamedGroup& boundary : arrays.boundaries)
        if (boundary.entity.name == name) threshold_near(boundary.entity_tags, local);
      for (const NamedGroup& region : arrays.regions) {
        if (region.entity.name != name) continue;
        gmsh::vectorpair volumes, faces;
        for (int tag : region.entity_tags) volumes.emplace_back(3, tag);
        gmsh::model::getBoundary(volumes, faces, /*combined=*/false, /*oriented=*/false);
        std::set<int> surfaces;
        for (const auto& face : faces) surfaces.insert(std::abs(face.second));
        threshold_near(std::vector<int>(surfaces.begin(), surfaces.end()), local);
        const int constant = gmsh::model::mesh::field::add("MathEval");
        std::ostringstream value;
        value << std::setprecision(17) << local;
        gmsh::model::mesh::field::setString(constant, "F", value.str());
        const int inside = gmsh::model::mesh::field::add("Restrict");
        gmsh::model::mesh::field::setNumber(inside, "IField", constant);
        gmsh::model::mesh::field::setNumbers(inside, "RegionsList",
                                             std::vector<double>(region.entity_tags.begin(), region.entity_tags.end()));
        fields.push_back(inside);
      }
    }
    if (fields.empty()) return;
    const int smallest = gmsh::model::mesh::field::add("Min");
    gmsh::model::mesh::field::setNumbers(smallest, "FieldsList", fields);
    gmsh::model::mesh::field::setAsBackgroundMesh(smallest);
  });
}

// Volume entities that hold no tetrahedra ("" when all do), e.g. "3, 7".
std::string volumes_without_tets() {
  gmsh::vectorpair volumes;
  gmsh::model::getEntities(volumes, 3);
  std::string missing;
  for (const auto& [dim, tag] : volumes) {
    std::vector<int> types;
    gmsh::model::mesh::getElementTypes(types, dim, tag);
    if (std::find(types.begin(), types.end(), 4) == types.end() && std::find(types.begin(), types.end(), 11) == types.end())
      missing += (missing.empty() ? "" : ", ") + std::to_string(tag);
  }
  return missing;
}

// Generates the 3D mesh with HXT, falling back to Delaunay where HXT fails. Returns
// the name of the algorithm that made the mesh.
std::string generate_volume_mesh(GmshSession& session, const MeshRequest& request, int threads) {
  const std::string file = request.geometry_file.filename().string();
  gmsh::option::setNumber("General.NumThreads", threads);
  // Curves and surfaces on one thread: Gmsh 4.8's parallel 1D and 2D meshing writes
  // its message log from several threads at once.
  gmsh::option::setNumber("Mesh.MaxNumThreads1D", 1);
  gmsh::option::setNumber("Mesh.MaxNumThreads2D", 1);
  gmsh::option::setNumber("Mesh.MaxNumThreads3D", threads);
  // No Laplacian smoothing pass over the surface mesh: it took 5 of the 11 s of surface
  // meshing at a million nodes, and the volume mesh's own optimisation follows.
  gmsh::option::setNumber("Mesh.Smoothing", 0);
  gmsh::option::setNumber("Mesh.Algorithm3D", kHxt);
  std::string hxt_failure = "HXT not requested";
  if (request.algorithm != "delaunay") try {
    session.guarded("HXT", [] { gmsh::model::mesh::generate(3); });
    const std::string missing = volumes_without_tets();
    if (missing.empty()) return "HXT";
    hxt_failure = "HXT left volumes " + missing + " empty";
  } catch (const MeshError& error) {
    hxt_failure = error.what();
  }
  if (request.algorithm != "delaunay") session.report("meshing " + file + ": " + hxt_failure + "; retrying with Delaunay");
  session.guarded(file + ": Delaunay meshing", [] {
    gmsh::model::mesh::clear();
    gmsh::option::setNumber("Mesh.Algorithm3D", kDelaunay);
    gmsh::model::mesh::generate(3);
  });
  const std::string missing = volumes_without_tets();
  if (!missing.empty())
    throw MeshError(file + ": Gmsh made no tetrahedra in volumes " + missing +
                    "; check that their surfaces are closed and do not intersect, or try another mesh size");
  return "Delaunay";
}

// Order of the tetrahedra of a loaded mesh (1 or 2); MeshError for other volume elements.
int mesh_order(const std::string& file) {
  std::vector<int> types;
  gmsh::model::mesh::getElementTypes(types, 3);
  bool linear = false, quadratic = false;
  for (int type : types) {
    if (type == 4) linear = true;
    else if (type == 11) quadratic = true;
    else {
      std::string name;
      int dim, order, n_nodes, n_primary;
      std::vector<double> local;
      gmsh::model::mesh::getElementProperties(type, name, dim, order, n_nodes, local, n_primary);
      throw MeshError(file + ": the mesh has " + name + " elements; hearth needs 4- or 10-node tetrahedra only" +
                      " (remove Recombine or Transfinite settings of volumes)");
    }
  }
  if (linear && quadratic) throw MeshError(file + ": the mesh mixes 4- and 10-node tetrahedra");
  if (!linear && !quadratic) throw MeshError(file + ": the mesh has no tetrahedra");
  return quadratic ? 2 : 1;
}

std::vector<int> gmsh_permutation(int type) {
  std::string name;
  int dim, order, n_nodes, n_primary;
  std::vector<double> local;
  gmsh::model::mesh::getElementProperties(type, name, dim, order, n_nodes, local, n_primary);
  return canonical_node_permutation(dim, local);
}

// Reads nodes and elements of the current model into `arrays` (names already set).
void read_mesh_arrays(const std::string& file, GmshArrays& arrays) {
  arrays.volumes.clear();
  arrays.surfaces.clear();
  arrays.order = mesh_order(file);
  const int tet_type = arrays.order == 2 ? 11 : 4;
  const int triangle_type = arrays.order == 2 ? 9 : 2;
  arrays.tet_permutation = gmsh_permutation(tet_type);
  arrays.triangle_permutation = gmsh_permutation(triangle_type);
  std::vector<double> parametric;
  gmsh::model::mesh::getNodes(arrays.node_tags, arrays.node_coords, parametric, -1, -1, false, false);
  gmsh::vectorpair volumes, surfaces;
  gmsh::model::getEntities(volumes, 3);
  gmsh::model::getEntities(surfaces, 2);
  for (const auto& [dim, tag] : volumes) {
    GmshElementBlock block{tag, {}};
    std::vector<std::size_t> element_tags;
    gmsh::model::mesh::getElementsByType(tet_type, element_tags, block.node_tags, tag);
    arrays.volumes.push_back(std::move(block));
  }
  for (const auto& [dim, tag] : surfaces) {
    GmshElementBlock block{tag, {}};
    std::vector<std::size_t> element_tags;
    gmsh::model::mesh::getElementsByType(triangle_type, element_tags, block.node_tags, tag);
    arrays.surfaces.push_back(std::move(block));
  }
}

// A ready mesh keeps its elements: refined if asked, elevated to order 2 if asked;
// 10-node tetrahedra stay so. Returns the order of the prepared mesh.
int prepare_ready_mesh(GmshSession& session, const MeshRequest& request) {
  const std::string file = request.geometry_file.string();
  const int file_order = mesh_order(file);
  const int order = std::max(file_order, request.order);
  session.guarded(file, [&] {
    // refine() splits at the edge nodes and leaves 4-node tetrahedra.
    for (int i = 0; i < request.refinements; ++i) gmsh::model::mesh::refine();
    if (order == 2 && (file_order == 1 || request.refinements > 0)) gmsh::model::mesh::setOrder(2);
  });
  if (file_order == 2 && request.order == 1)
    session.report(request.geometry_file.filename().string() + " holds 10-node tetrahedra: kept at order 2");
  return order;
}

void check_jacobians(const std::string& file, const Mesh& mesh, bool ready_mesh) {
  const InvalidElements invalid = find_invalid_elements(mesh);
  if (invalid.count == 0) return;
  const std::int32_t* t = mesh.tet(invalid.worst_element);
  Point3 centre{0, 0, 0};
  for (int k = 0; k < 4; ++k)
    for (int d = 0; d < 3; ++d) centre[d] += 0.25 * mesh.node(t[k])[d];
  const std::string region = mesh.regions[mesh.tet_region[invalid.worst_element]].name;
  throw MeshError(file + ": " + std::to_string(invalid.count) + " of " + std::to_string(mesh.n_tets()) +
                  " tetrahedra have a zero or negative Jacobian; the worst (ratio " + format_number(invalid.worst_ratio) +
                  ") is in region " + region + " at (" + format_number(centre[0], 6) + ", " +
                  format_number(centre[1], 6) + ", " + format_number(centre[2], 6) +
                  ") m; " +
                  (ready_mesh ? std::string("the mesh file is broken there: mesh the geometry again, or give the "
                                            "geometry itself (.geo, .step) and let hearth mesh it")
                              : std::string("try a smaller mesh size (or a local size) there") +
                                    (mesh.order == 2 ? ", or order 1" : "")));
}

struct GmshMeshes {
  std::vector<Mesh> levels;
  std::string algorithm;  // HXT, Delaunay or "read from file"
  bool first_level_checked = false;  // its Jacobians already found valid here
};

// Everything that needs Gmsh: load, name, size, generate (remeshing on one thread
// where HXT's threads cracked the mesh), convert; then `levels - 1` times: split
// uniformly (on the curved geometry), back to the order, convert.
GmshMeshes mesh_with_gmsh(const MeshRequest& request, GeometryKind kind, int levels) {
  const std::string file = request.geometry_file.string();
  const std::string short_name = request.geometry_file.filename().string();
  GmshSession session(request.progress);
  load_geometry(session, request, kind);

  GmshArrays arrays;
  name_entities(file, arrays);
  if (kind == GeometryKind::ready_mesh && !request.local_sizes.empty())
    session.report(short_name + " is a ready mesh: local mesh sizes are ignored");
  if (kind != GeometryKind::ready_mesh) apply_sizes(session, request, arrays);

  auto convert_arrays = [&](bool report_dropped) {
    std::size_t dropped_faces = 0;
    Mesh mesh = mesh_from_gmsh_arrays(arrays, request.length_scale(), dropped_faces);
    if (dropped_faces > 0 && report_dropped)
      session.report(std::to_string(dropped_faces) +
                     " boundary triangles lie on no tetrahedron (a named surface outside every volume): left out");
    return mesh;
  };
  // Set when the first mesh was cracked by HXT's threads and mended: Gmsh's own model
  // keeps the copies, so every level read from it is mended the same way.
  bool mend = false;
  auto convert = [&] {
    session.guarded(file, [&] { read_mesh_arrays(file, arrays); });
    if (mend) merge_interior_duplicate_nodes(arrays);
    return convert_arrays(true);
  };

  GmshMeshes result;
  result.algorithm = "read from file";
  int order = request.order;
  int threads = request.threads > 0 ? request.threads : 2;
  while (true) {
    if (kind == GeometryKind::ready_mesh) {
      order = prepare_ready_mesh(session, request);
    } else {
      result.algorithm = generate_volume_mesh(session, request, threads);
      session.guarded(file, [&] {
        gmsh::option::setNumber("Mesh.SecondOrderLinear", 0);  // edge nodes on the curved geometry
        for (int i = 0; i < request.refinements; ++i) gmsh::model::mesh::refine();
        if (order == 2) gmsh::model::mesh::setOrder(2);
      });
    }
    Mesh mesh = convert();
    const std::size_t coincident = count_coincident_nodes(mesh);
    const bool parallel_hxt = kind != GeometryKind::ready_mesh && threads > 1 && result.algorithm == "HXT";
    if (coincident == 0 && parallel_hxt && mesh.order == 1) {
      // HXT on several threads now and then also leaves a flat tetrahedron (four
      // distinct, coplanar vertices; seen in the lining panel's 50 mm shell at a 40 mm
      // size): made again on one thread, as a crack that cannot be mended. (At order 2
      // an invalid element is mostly a curved one, which one thread would not mend:
      // it is reported by the checks after meshing.)
      const InvalidElements invalid = find_invalid_elements(mesh);
      result.first_level_checked = invalid.count == 0;
      if (invalid.count > 0) {
        session.report("meshing " + short_name + ": HXT on " + std::to_string(threads) + " threads made " +
                       std::to_string(invalid.count) + " flat or inverted tetrahedra; remeshing on 1 thread");
        threads = 1;
        session.guarded(file, [] { gmsh::model::mesh::clear(); });
        continue;
      }
    }
    if (coincident == 0) {
      result.levels.push_back(std::move(mesh));
      break;
    }
    const std::string found = std::to_string(coincident) + " nodes coincide with another node";
    if (kind == GeometryKind::ready_mesh) {
      session.report(short_name + ": " + found + ": the mesh is cracked there (heat does not cross)");
      result.levels.push_back(std::move(mesh));
      break;
    }
    if (threads == 1 || result.algorithm != "HXT")
      throw MeshError(file + ": " + found + ": volumes touch without sharing their faces (fragment them, e.g. " +
                      "BooleanFragments in the script) or Gmsh's mesh is cracked (try a slightly different mesh size)");
    // Gmsh 4.8's HXT now and then inserts the same point twice when it runs on
    // several threads; on one thread it does not. Merging the copies in the arrays
    // just read, converting again and checking take about 1.3 s at a million nodes
    // (Gmsh's removeDuplicateNodes and a second read took 5 s), remeshing on one
    // thread about as long again as the meshing.
    const Clock::time_point merge_start = Clock::now();
    if (merge_interior_duplicate_nodes(arrays) == coincident) {
      Mesh merged = convert_arrays(false);
      if (count_coincident_nodes(merged) == 0 && find_invalid_elements(merged).count == 0) {
        mend = true;
        result.first_level_checked = true;
        session.report("meshing " + short_name + ": HXT on " + std::to_string(threads) + " threads made a cracked mesh (" +
                       found + ", all inside volumes); merged them in " + format_number(seconds_since(merge_start), 2) + " s");
        result.levels.push_back(std::move(merged));
        break;
      }
    }
    session.report("meshing " + short_name + ": HXT on " + std::to_string(threads) + " threads made a cracked mesh (" +
                   found + "); remeshing on 1 thread");
    threads = 1;
    session.guarded(file, [] { gmsh::model::mesh::clear(); });
  }
  for (int level = 1; level < levels; ++level) {
    session.guarded(file, [&] {
      gmsh::model::mesh::refine();
      if (order == 2) gmsh::model::mesh::setOrder(2);
    });
    Mesh mesh = convert();
    if (mend && count_coincident_nodes(mesh) != 0)
      throw MeshError(file + ": level " + std::to_string(level + 1) + " of the refined mesh is cracked (coincident " +
                      "nodes left after mending); try a slightly different mesh size");
    result.levels.push_back(std::move(mesh));
  }
  return result;
}

// Checks, quality figures and renumbering of a converted mesh.
void finish_mesh(const MeshRequest& request, const std::string& algorithm, Clock::time_point start, Mesh& mesh,
                 bool elements_checked) {
  auto report = [&](const std::string& line) {
    if (request.progress) request.progress(line);
  };
  if (!elements_checked)
    check_jacobians(request.geometry_file.string(), mesh, lower_extension(request.geometry_file) == ".msh");
  mesh.tet_quality = tet_qualities(mesh);
  mesh.unnamed_exterior_faces = count_unnamed_exterior_faces(mesh);
  report("meshing " + request.geometry_file.filename().string() + ": " + std::to_string(mesh.n_nodes()) + " nodes, " +
         std::to_string(mesh.n_tets()) + " tets" + (mesh.order == 2 ? " (10-node)" : "") + " in " +
         format_number(seconds_since(start), 2) + " s (" + algorithm + ")");
  if (request.renumber) {
    const std::size_t before = node_bandwidth(mesh);
    renumber_reverse_cuthill_mckee(mesh);
    report("renumbered nodes (reverse Cuthill-McKee): bandwidth " + std::to_string(before) + " -> " +
           std::to_string(node_bandwidth(mesh)));
  }
}

}  // namespace

Mesh build_mesh(const MeshRequest& request) { return build_mesh_levels(request, 1).front(); }

std::vector<Mesh> build_mesh_levels(const MeshRequest& request, int levels) {
  if (levels < 1) throw MeshError("the number of mesh levels must be 1 or more, got " + std::to_string(levels));
  const GeometryKind kind = check_request(request);
  const Clock::time_point start = Clock::now();
  GmshMeshes meshes = mesh_with_gmsh(request, kind, levels);  // Gmsh is finalised here
  for (std::size_t level = 0; level < meshes.levels.size(); ++level)
    finish_mesh(request, meshes.algorithm, start, meshes.levels[level], level == 0 && meshes.first_level_checked);
  return std::move(meshes.levels);
}

}  // namespace hearth
