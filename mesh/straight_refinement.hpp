// Uniform refinement and order elevation of straight-sided meshes, without Gmsh.
#pragma once

#include "mesh/mesh.hpp"

namespace hearth {

// Splits every 4-node tetrahedron into eight (four corner tetrahedra and four around
// the shortest diagonal of the inner octahedron, which keeps the shape quality bounded
// under repeated splitting) and every boundary triangle into four. New nodes lie at edge
// midpoints, so curved surfaces stay as faceted as the parent: use it for flat-faced
// bodies (convergence checks on boxes), Gmsh's refinement for curved ones.
// Precondition: mesh.order == 1. Node numbering is renumbered for locality.
Mesh refine_straight(const Mesh& mesh);

// Adds straight edge nodes (at edge midpoints) to a 4-node mesh: a 10-node mesh of the
// same straight elements. Precondition: mesh.order == 1.
Mesh elevate_straight(const Mesh& mesh);

}  // namespace hearth
