// The mesh of a study level made by uniform splitting (hearth study --ratio 2): one base
// mesh, meshed once for the whole study and kept in its folder, split again for each
// level, so that the levels are nested (each one's elements are the eighths of the
// elements of the level before) and the same from run to run.
#pragma once

#include <filesystem>

#include "io/case.hpp"
#include "mesh/mesh.hpp"
#include "tools/driver/progress.hpp"

namespace hearth {

// The base mesh (a mesh file of 4-node tetrahedra, interfaces not cut) split
// c.mesh_refinements times by edge midpoints, given straight edge nodes when
// c.mesh_order is 2, then cut at the case's interfaces. New nodes lie on straight
// edges: curved faces keep the facets of the base mesh. InputError when the base mesh
// is missing, unreadable or not of 4-node tetrahedra.
Mesh split_base_mesh(const Case& c, const std::filesystem::path& base_mesh, const Progress& progress);

}  // namespace hearth
