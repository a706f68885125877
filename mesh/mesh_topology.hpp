// Face adjacency of a tetrahedral mesh: which triangles bound the body, which boundaries are internal.
#pragma once

#include <array>
#include <cstddef>
#include <cstdint>
#include <vector>

#include "mesh/boundary_face_lookup.hpp"  // SortedTriangle, FaceElements, boundary_face_elements
#include "mesh/mesh.hpp"

namespace hearth {

// A face of the body's outside: its sorted vertex triangle, the one element it is a
// face of, and that element's vertex (local number 0..3) opposite it.
struct ExteriorFace {
  SortedTriangle key;
  std::int32_t element;
  std::int32_t opposite_vertex;
};

// The exterior faces of the body (vertex triangles that are a face of exactly one
// tetrahedron) sorted by key, so that a binary search finds one. Cost: one pass over
// each node's elements, in parallel; no list of all element faces.
std::vector<ExteriorFace> exterior_element_faces(const Mesh& mesh);

// The keys of exterior_element_faces.
std::vector<SortedTriangle> exterior_faces(const Mesh& mesh);

// For every boundary triangle of `mesh.face_nodes`, the number of tetrahedra it is a
// face of: 1 on the outside of the body, 2 inside it, 0 if it touches no element.
std::vector<int> adjacent_tet_counts(const Mesh& mesh);

// Per entry of mesh.boundaries: true when the boundary is internal (it has faces and
// each of them lies between two tetrahedra, like a cut through an anchor), false when
// it lies on the outside of the body (or has no faces).
std::vector<bool> internal_boundaries(const Mesh& mesh);

// Exterior faces that lie on no named boundary (the insulated default).
std::size_t count_unnamed_exterior_faces(const Mesh& mesh);

// Nodes whose coordinates equal those of another node exactly (each extra copy
// counted once). A generated mesh must have none: coincident nodes are cracks.
std::size_t count_coincident_nodes(const Mesh& mesh);

}  // namespace hearth
