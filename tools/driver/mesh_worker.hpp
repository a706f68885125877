// Meshing in a child process: Gmsh 4.8's HXT algorithm can corrupt memory and abort on
// some surface meshes, which would take the whole run down. The driver meshes in a
// child (the hearth program itself, started with the hidden worker command) and, if
// that child dies on a signal, meshes again with Gmsh's plain Delaunay algorithm.
#pragma once

#include <string>

#include "mesh/mesh.hpp"
#include "mesh/mesh_request.hpp"

namespace hearth {

// Builds the mesh in a worker process (retrying once with request.algorithm =
// "delaunay" after a crash). MeshError as build_mesh. `quiet`: the worker prints no
// progress lines. `sandbox`: the worker runs in the bubblewrap sandbox of
// tools/driver/sandbox.hpp, where it can write only its own temporary folder; where
// bubblewrap cannot be used it runs without, and says so on stderr unless quiet.
Mesh build_mesh_isolated(const MeshRequest& request, bool quiet, bool sandbox);

// The worker command: reads the request from `request_file`, meshes, and writes the
// mesh to `mesh_file` (or the error text to `mesh_file` + ".error" and returns 1).
int mesh_worker_command(const std::string& request_file, const std::string& mesh_file, bool quiet);

// Name of the hidden command line verb.
constexpr const char* mesh_worker_verb = "__mesh-worker";

}  // namespace hearth
