// MeshRequest: what the mesh stage is asked to build. Sizes in metres.
#pragma once

#include <filesystem>
#include <functional>
#include <map>
#include <string>

namespace hearth {

struct MeshRequest {
  std::filesystem::path geometry_file;  // .geo, .step/.stp, .brep or .msh
  // Length unit the geometry file is written in ("m" or "mm"); coordinates are
  // multiplied by length_scale() to give metres. STEP files carry their own unit and
  // are converted by the importer to this unit first.
  std::string length_unit = "m";
  double size = 0.0;                          // target element size, metres (> 0)
  int order = 1;                              // 1: 4-node tets, 2: 10-node tets
  std::map<std::string, double> local_sizes;  // named boundary or region -> size, metres
  // Where each local size was given ("case.yaml:7: mesh.local_sizes.anchor"), for
  // messages about a name the geometry lacks; may be empty.
  std::map<std::string, std::string> local_size_origins;
  int refinements = 0;                        // uniform splits after meshing (studies)
  int threads = 0;                            // meshing threads; 0: two
  bool renumber = true;                       // reverse Cuthill-McKee for locality
  // 3D algorithm: "hxt" (Gmsh's parallel Delaunay, falling back to "delaunay" where it
  // fails) or "delaunay" alone (the retry when HXT crashed in a worker process).
  std::string algorithm = "hxt";
  // --trust-geometry: hand a geometry script to Gmsh without scanning it for constructs
  // that run programs or write files (mesh/geometry_guard.hpp).
  bool trust_geometry = false;
  std::function<void(const std::string&)> progress;  // one line per stage; may be empty

  double length_scale() const { return length_unit == "mm" ? 1e-3 : 1.0; }
};

}  // namespace hearth
