// Exterior faces from the element faces that belong to one element only; orientation
// from that element's vertex order.
#include "mesh/body_surface.hpp"

#include <algorithm>

#include "mesh/mesh_topology.hpp"

namespace hearth {
namespace {

// Faces of a positively oriented tetrahedron with right-hand normals pointing out of
// it, as local vertex numbers, by the vertex opposite the face.
constexpr int kOutwardFaces[4][3] = {{1, 2, 3}, {2, 0, 3}, {0, 1, 3}, {0, 2, 1}};

// Local number of the edge node between local vertices a and b (10-node layout).
int edge_node(int a, int b) {
  if (a > b) std::swap(a, b);
  if (a == 0) return b == 1 ? 4 : b == 2 ? 6 : 7;
  if (a == 1) return b == 2 ? 5 : 8;
  return 9;  // (2, 3)
}

// Appends the outward face of element `e` opposite its vertex `opposite`, in face_nodes layout.
void append_outward_face(const Mesh& mesh, std::size_t e, int opposite, std::vector<std::int32_t>& out) {
  const std::int32_t* t = mesh.tet(e);
  const int* v = kOutwardFaces[opposite];
  for (int k = 0; k < 3; ++k) out.push_back(t[v[k]]);
  if (mesh.order == 2)
    for (int k = 0; k < 3; ++k) out.push_back(t[edge_node(v[k], v[(k + 1) % 3])]);
}

SortedTriangle key_of(const std::int32_t* nodes) { return sorted_triangle(nodes[0], nodes[1], nodes[2]); }

}  // namespace

BodySurface body_surface(const Mesh& mesh) {
  const std::vector<ExteriorFace> single = exterior_element_faces(mesh);
  // `claimed` marks the exterior faces a named face or a contact surface accounts for.
  std::vector<bool> claimed(single.size(), false);
  auto find_single = [&](const SortedTriangle& key) -> std::ptrdiff_t {
    const auto it = std::lower_bound(single.begin(), single.end(), key,
                                     [](const ExteriorFace& s, const SortedTriangle& k) { return s.key < k; });
    return it != single.end() && it->key == key ? it - single.begin() : -1;
  };
  const std::vector<int> elements_of_face = adjacent_tet_counts(mesh);

  BodySurface surface;
  surface.nodes_per_face = mesh.nodes_per_face();
  const int npf = mesh.nodes_per_face();
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    const std::int32_t* nodes = mesh.face(f);
    const SortedTriangle key = key_of(nodes);
    const bool cut = mesh.face_is_split(f);
    if (cut) {  // both sides look exterior by their nodes; neither is
      const std::ptrdiff_t behind = find_single(key), front = find_single(key_of(mesh.face_twin(f)));
      if (behind >= 0) claimed[behind] = true;
      if (front >= 0) claimed[front] = true;
    }
    const std::ptrdiff_t s = cut ? -1 : find_single(key);
    if (s >= 0) {
      claimed[s] = true;
      append_outward_face(mesh, single[s].element, single[s].opposite_vertex, surface.face_nodes);
      surface.exterior.push_back(1);
      surface.face_region.push_back(mesh.tet_region[single[s].element]);
    } else if (cut || elements_of_face[f] == 2) {
      surface.face_nodes.insert(surface.face_nodes.end(), nodes, nodes + npf);
      surface.exterior.push_back(0);
      surface.face_region.push_back(-1);
    } else {
      continue;  // a named triangle on no element: nothing to show
    }
    surface.face_boundary.push_back(mesh.face_boundary[f]);
  }
  for (std::size_t s = 0; s < single.size(); ++s) {
    if (claimed[s]) continue;
    append_outward_face(mesh, single[s].element, single[s].opposite_vertex, surface.face_nodes);
    surface.exterior.push_back(1);
    surface.face_region.push_back(mesh.tet_region[single[s].element]);
    surface.face_boundary.push_back(-1);
  }
  return surface;
}

}  // namespace hearth
