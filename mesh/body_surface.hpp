// The surface of the body as triangles for viewing: every exterior face oriented outwards
// (named or not) and the named internal surfaces, each with the boundary it lies on.
#pragma once

#include <cstddef>
#include <cstdint>
#include <vector>

#include "mesh/mesh.hpp"

namespace hearth {

// Triangles in the layout of Mesh::face_nodes (nodes_per_face() per triangle: vertices,
// then for order 2 the edge nodes (0,1) (1,2) (2,0)), numbered as the mesh's nodes.
//   face_boundary  index into Mesh::boundaries, or -1 for an exterior face that lies on
//                  no named boundary (insulated by default).
//   exterior       1 for a face of the body's outside, whose right-hand normal then
//                  points out of the body; 0 for a named internal surface, which keeps
//                  the orientation the geometry gave it (the sign of its heat rate). A
//                  surface cut open for a contact appears once, with the nodes of the
//                  side behind its normal.
//   face_region    for an exterior face, the index into Mesh::regions of the element it
//                  bounds; -1 for an internal surface (it has a region on each side).
struct BodySurface {
  int nodes_per_face = 3;
  std::vector<std::int32_t> face_nodes;
  std::vector<std::int32_t> face_boundary;
  std::vector<std::uint8_t> exterior;
  std::vector<std::int32_t> face_region;

  std::size_t n_faces() const { return face_boundary.size(); }
  const std::int32_t* face(std::size_t f) const { return &face_nodes[f * nodes_per_face]; }
};

// Collects the body's surface (mesh_topology's exterior faces and face counts).
BodySurface body_surface(const Mesh& mesh);

}  // namespace hearth
