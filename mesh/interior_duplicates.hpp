// Mending a mesh whose volume mesher inserted an interior point more than once: the
// copies are merged in the arrays Gmsh handed over, before they become a Mesh.
#pragma once

#include <cstddef>

#include "mesh/gmsh_arrays.hpp"

namespace hearth {

// Nodes of the tetrahedra of `arrays` that share their coordinates exactly with another
// such node are merged into the one with the smallest tag: every tetrahedron that used
// a copy uses that node instead (the copies, now unused, drop out of the conversion).
// Only nodes inside volumes are merged: when any node of a group of coincident nodes
// lies on a surface triangle of `arrays` (a surface, curve or point of the model, as
// where volumes touch without being fragmented), nothing is changed and 0 returned.
// Otherwise returns the number of copies merged (0 when none coincide). Throws
// MeshError when an element names a node tag the arrays do not define.
std::size_t merge_interior_duplicate_nodes(GmshArrays& arrays);

}  // namespace hearth
