// A Mesh in a private binary file: how the meshing process hands its mesh back, and how
// a study keeps the one mesh its split levels are made from. Not an exchange format:
// the same build writes and reads it.
#pragma once

#include <filesystem>

#include "mesh/mesh.hpp"

namespace hearth {

// Layout: order (int), then coords, tet_nodes, tet_region, face_nodes, face_boundary,
// tet_quality as (uint64 count, raw values), regions and boundaries as (uint64 count,
// then per entity: name as uint64 length + bytes, tag), unnamed_exterior_faces (uint64).
// Throws WriteError when the file cannot be written, std::runtime_error when it cannot
// be read whole.
void write_mesh_file(const std::filesystem::path& path, const Mesh& mesh);
Mesh read_mesh_file(const std::filesystem::path& path);

}  // namespace hearth
