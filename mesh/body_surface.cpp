// Exterior faces from the element faces that belong to one element only; orientation
// from that element's vertex order.
#include "mesh/body_surface.hpp"

#include <algorithm>

#include "mesh/mesh_topology.hpp"

namespace hearth {
namespace {

// Faces of a positively oriented tetrahedron with right-hand normals pointing out of
// it (VTK's vtkTetra face order), as local vertex numbers.
constexpr int kOutwardFaces[4][3] = {{0, 1, 3}, {1, 2, 3}, {2, 0, 3}, {0, 2, 1}};

// Local number of the edge node between local vertices a and b (10-node layout).
int edge_node(int a, int b) {
  if (a > b) std::swap(a, b);
  if (a == 0) return b == 1 ? 4 : b == 2 ? 6 : 7;
  if (a == 1) return b == 2 ? 5 : 8;
  return 9;  // (2, 3)
}

struct ElementFace {
  SortedTriangle key;
  std::uint32_t element;
  std::uint8_t local_face;
  bool operator<(const ElementFace& other) const { return key < other.key; }
};

// Appends the outward face `local_face` of element `e` in face_nodes layout.
void append_outward_face(const Mesh& mesh, std::size_t e, int local_face, std::vector<std::int32_t>& out) {
  const std::int32_t* t = mesh.tet(e);
  const int* v = kOutwardFaces[local_face];
  for (int k = 0; k < 3; ++k) out.push_back(t[v[k]]);
  if (mesh.order == 2)
    for (int k = 0; k < 3; ++k) out.push_back(t[edge_node(v[k], v[(k + 1) % 3])]);
}

SortedTriangle key_of(const std::int32_t* nodes) { return sorted_triangle(nodes[0], nodes[1], nodes[2]); }

}  // namespace

BodySurface body_surface(const Mesh& mesh) {
  std::vector<ElementFace> faces;
  faces.reserve(4 * mesh.n_tets());
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    const std::int32_t* t = mesh.tet(e);
    for (int f = 0; f < 4; ++f) {
      const int* v = kOutwardFaces[f];
      faces.push_back({sorted_triangle(t[v[0]], t[v[1]], t[v[2]]), static_cast<std::uint32_t>(e),
                       static_cast<std::uint8_t>(f)});
    }
  }
  std::sort(faces.begin(), faces.end());
  // Exterior faces: those that occur once. `claimed` marks the ones a named face or a
  // contact surface accounts for.
  std::vector<std::size_t> single;
  for (std::size_t i = 0; i < faces.size();) {
    std::size_t j = i + 1;
    while (j < faces.size() && faces[j].key == faces[i].key) ++j;
    if (j - i == 1) single.push_back(i);
    i = j;
  }
  std::vector<bool> claimed(single.size(), false);
  auto find_single = [&](const SortedTriangle& key) -> std::ptrdiff_t {
    const auto it = std::lower_bound(single.begin(), single.end(), key,
                                     [&](std::size_t s, const SortedTriangle& k) { return faces[s].key < k; });
    return it != single.end() && faces[*it].key == key ? it - single.begin() : -1;
  };
  auto count_of = [&](const SortedTriangle& key) {
    const ElementFace probe{key, 0, 0};
    const auto range = std::equal_range(faces.begin(), faces.end(), probe);
    return range.second - range.first;
  };

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
      append_outward_face(mesh, faces[single[s]].element, faces[single[s]].local_face, surface.face_nodes);
      surface.exterior.push_back(1);
      surface.face_region.push_back(mesh.tet_region[faces[single[s]].element]);
    } else if (cut || count_of(key) == 2) {
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
    append_outward_face(mesh, faces[single[s]].element, faces[single[s]].local_face, surface.face_nodes);
    surface.exterior.push_back(1);
    surface.face_region.push_back(mesh.tet_region[faces[single[s]].element]);
    surface.face_boundary.push_back(-1);
  }
  return surface;
}

}  // namespace hearth
