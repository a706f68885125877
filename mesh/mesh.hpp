// Mesh: the value the mesh stage hands to the solver. Flat arrays, 0-based, SI units.
#pragma once

#include <array>
#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

namespace hearth {

// A named region (volume) or boundary (surface) of the geometry.
struct NamedEntity {
  std::string name;   // physical group name, or volume_<tag> / surface_<tag> when unnamed
  int tag = 0;        // Gmsh physical tag (or entity tag when unnamed)
};

// Tetrahedral mesh of linear (4-node) or quadratic (10-node) elements.
//
// Layouts (all indices 0-based):
//   coords        3 doubles per node, x y z in metres.
//   tet_nodes     nodes_per_tet() per element. Vertices 0..3, then for order 2 the
//                 edge nodes in VTK order: (0,1) (1,2) (0,2) (0,3) (1,3) (2,3).
//                 Every element has positive volume (vertex order right-handed).
//   tet_region    index into `regions` per element.
//   face_nodes    nodes_per_face() per boundary triangle: vertices 0..2, then for
//                 order 2 the edge nodes (0,1) (1,2) (2,0). The right-hand normal of
//                 the vertex order is the surface's normal as the geometry gave it.
//   face_boundary index into `boundaries` per triangle. A triangle lies on exactly one
//                 named boundary; a surface in two physical groups gives two triangles.
//   tet_quality   Gmsh's gamma (inscribed/circumscribed radius ratio, 1 = regular).
struct Mesh {
  int order = 1;
  std::vector<double> coords;
  std::vector<std::int32_t> tet_nodes;
  std::vector<std::int32_t> tet_region;
  std::vector<std::int32_t> face_nodes;
  std::vector<std::int32_t> face_boundary;
  std::vector<NamedEntity> regions;
  std::vector<NamedEntity> boundaries;
  std::vector<double> tet_quality;
  // Exterior triangles of the body that lie on no named boundary (insulated, unnamed).
  std::size_t unnamed_exterior_faces = 0;
  // Internal surfaces cut open for a thermal contact (split_interface): for such a face,
  // nodes_per_face() entries from f * nodes_per_face() give the nodes of the side in front
  // of its normal, in the face's local order (face_nodes keeps the side behind). Empty
  // when nothing is cut; -1 for faces that are not cut.
  std::vector<std::int32_t> face_twin_nodes;

  bool face_is_split(std::size_t f) const {
    return !face_twin_nodes.empty() && face_twin_nodes[f * nodes_per_face()] >= 0;
  }
  const std::int32_t* face_twin(std::size_t f) const { return &face_twin_nodes[f * nodes_per_face()]; }

  int nodes_per_tet() const { return order == 2 ? 10 : 4; }
  int nodes_per_face() const { return order == 2 ? 6 : 3; }
  std::size_t n_nodes() const { return coords.size() / 3; }
  std::size_t n_tets() const { return tet_region.size(); }
  std::size_t n_faces() const { return face_boundary.size(); }
  const std::int32_t* tet(std::size_t e) const { return &tet_nodes[e * nodes_per_tet()]; }
  const std::int32_t* face(std::size_t f) const { return &face_nodes[f * nodes_per_face()]; }
  std::array<double, 3> node(std::size_t i) const {
    return {coords[3 * i], coords[3 * i + 1], coords[3 * i + 2]};
  }
};

}  // namespace hearth
