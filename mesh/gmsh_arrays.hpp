// GmshArrays: a mesh as Gmsh hands it over (1-based tags, Gmsh's node order, geometry
// units), and its one conversion into a Mesh. No Gmsh header needed.
#pragma once

#include <cstddef>
#include <limits>
#include <string>
#include <unordered_map>
#include <vector>

#include "mesh/mesh.hpp"

namespace hearth {

// Elements of one type classified on one Gmsh entity.
struct GmshElementBlock {
  int entity_tag = 0;                  // the volume or surface entity
  std::vector<std::size_t> node_tags;  // nodes per element x elements, Gmsh's local order
};

// A region or boundary and the Gmsh entities it consists of.
struct NamedGroup {
  NamedEntity entity;
  std::vector<int> entity_tags;
};

struct GmshArrays {
  int order = 1;                        // 1: 4-node tets, 3-node triangles; 2: 10 and 6
  std::vector<std::size_t> node_tags;   // every node of the model
  std::vector<double> node_coords;      // 3 per node tag, geometry units
  // Gmsh's local node number at each canonical position (see mesh.hpp): node k of the
  // canonical element is node tet_permutation[k] of Gmsh's element.
  std::vector<int> tet_permutation;
  std::vector<int> triangle_permutation;
  std::vector<GmshElementBlock> volumes;   // tetrahedra per volume entity
  std::vector<GmshElementBlock> surfaces;  // triangles per surface entity
  std::vector<NamedGroup> regions;         // every volume entity in exactly one
  std::vector<NamedGroup> boundaries;      // a surface entity in any number (or none)
};

// Position of each Gmsh node tag in GmshArrays::node_tags (a dense vector when the tags
// are compact, a hash map otherwise). Looking up a tag the arrays do not define throws
// MeshError.
class NodeTagIndex {
 public:
  explicit NodeTagIndex(const std::vector<std::size_t>& tags);
  std::size_t operator()(std::size_t tag) const;

 private:
  static constexpr std::size_t kAbsent = std::numeric_limits<std::size_t>::max();
  bool dense_ = true;
  std::vector<std::size_t> position_;
  std::unordered_map<std::size_t, std::size_t> sparse_;
};

// The canonical (VTK) order of an element's nodes from the local coordinates of
// Gmsh's nodes (`dim` per node, as gmsh::model::mesh::getElementProperties gives
// them): returns, for each canonical position, Gmsh's local node number. Supports the
// 4- and 10-node tetrahedron (dim 3) and the 3- and 6-node triangle (dim 2); throws
// std::invalid_argument for anything else.
std::vector<int> canonical_node_permutation(int dim, const std::vector<double>& local_coords);

// Converts to a Mesh: nodes used by tetrahedra numbered 0.. in increasing Gmsh tag,
// coordinates multiplied by `length_scale` (to metres), element nodes permuted to the
// canonical order and every tetrahedron turned right-handed (vertices 1 and 2 swapped
// with their edge nodes where Gmsh's was left-handed), one boundary triangle per
// (triangle, boundary containing its surface). Triangles with a node on no
// tetrahedron are left out and counted in `dropped_faces`. Throws MeshError when a
// volume entity belongs to no region. Leaves tet_quality and unnamed_exterior_faces
// empty.
Mesh mesh_from_gmsh_arrays(const GmshArrays& arrays, double length_scale, std::size_t& dropped_faces);

}  // namespace hearth
