// Meshing through the Gmsh SDK: geometry script, CAD file or ready mesh in, Mesh out.
#pragma once

#include "mesh/mesh.hpp"
#include "mesh/mesh_request.hpp"

namespace hearth {

// Loads request.geometry_file, meshes it (HXT 3D algorithm, falling back with a
// message where it fails), converts to a Mesh in metres with named regions and
// boundaries, checks every element has a positive Jacobian and computes its quality.
// Throws MeshError for unreadable or unusable geometry, naming the file and Gmsh's
// message. Gmsh's own messages go to request.progress, never to the terminal.
Mesh build_mesh(const MeshRequest& request);

}  // namespace hearth
