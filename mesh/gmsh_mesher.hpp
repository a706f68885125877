// Meshing through the Gmsh SDK: geometry script, CAD file or ready mesh in, Mesh out.
#pragma once

#include <vector>

#include "mesh/mesh.hpp"
#include "mesh/mesh_request.hpp"

namespace hearth {

// Loads request.geometry_file, meshes it (HXT 3D algorithm, falling back with a
// message where it fails), converts to a Mesh in metres with named regions and
// boundaries, checks every element has a positive Jacobian and computes its quality.
// Throws MeshError for unreadable or unusable geometry, naming the file and Gmsh's
// message, and, unless request.trust_geometry, for a geometry script that holds
// constructs that run programs or write files (refuse_unsafe_geometry), before Gmsh
// sees it. Gmsh's own messages go to request.progress, never to the terminal.
Mesh build_mesh(const MeshRequest& request);

// Nested meshes for convergence checks: the mesh of build_mesh, then `levels - 1`
// more, each splitting every element of the one before into eight (new nodes on the
// curved geometry), all from one Gmsh mesh. Gmsh's HXT does not make the same mesh in
// every run, so levels meshed by separate build_mesh calls with growing
// request.refinements are not nested; these are. levels >= 1.
std::vector<Mesh> build_mesh_levels(const MeshRequest& request, int levels);

}  // namespace hearth
