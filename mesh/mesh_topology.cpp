// Face adjacency of a tetrahedral mesh.
#include "mesh/mesh_topology.hpp"

#include <algorithm>

namespace hearth {
namespace {

// The four vertex faces of every element, each sorted, the list sorted. A counting
// sort on the smallest vertex, then a sort of each node's few faces (about 24): the
// order of one std::sort of the whole list, without its log factor and cache misses
// (it took 8 % of a million-node run's time as one sort of 21 million triangles).
std::vector<SortedTriangle> all_tet_faces(const Mesh& mesh) {
  static constexpr int kFaceVertices[4][3] = {{0, 1, 2}, {0, 1, 3}, {0, 2, 3}, {1, 2, 3}};
  const std::size_t n_nodes = mesh.n_nodes();
  std::vector<std::size_t> start(n_nodes + 1, 0);
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    const std::int32_t* t = mesh.tet(e);
    for (const auto& f : kFaceVertices) ++start[std::min({t[f[0]], t[f[1]], t[f[2]]}) + 1];
  }
  for (std::size_t i = 0; i < n_nodes; ++i) start[i + 1] += start[i];
  std::vector<SortedTriangle> faces(4 * mesh.n_tets());
  std::vector<std::size_t> fill(start.begin(), start.end() - 1);
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    const std::int32_t* t = mesh.tet(e);
    for (const auto& f : kFaceVertices) {
      const SortedTriangle face = sorted_triangle(t[f[0]], t[f[1]], t[f[2]]);
      faces[fill[face[0]]++] = face;
    }
  }
  for (std::size_t i = 0; i < n_nodes; ++i)
    std::sort(faces.begin() + static_cast<std::ptrdiff_t>(start[i]),
              faces.begin() + static_cast<std::ptrdiff_t>(start[i + 1]));
  return faces;
}

}  // namespace

SortedTriangle sorted_triangle(std::int32_t a, std::int32_t b, std::int32_t c) {
  if (a > b) std::swap(a, b);
  if (b > c) std::swap(b, c);
  if (a > b) std::swap(a, b);
  return {a, b, c};
}

std::vector<SortedTriangle> exterior_faces(const Mesh& mesh) {
  const std::vector<SortedTriangle> faces = all_tet_faces(mesh);
  std::vector<SortedTriangle> exterior;
  for (std::size_t i = 0; i < faces.size();) {
    std::size_t j = i + 1;
    while (j < faces.size() && faces[j] == faces[i]) ++j;
    if (j - i == 1) exterior.push_back(faces[i]);
    i = j;
  }
  return exterior;
}

std::vector<int> adjacent_tet_counts(const Mesh& mesh) {
  const std::vector<SortedTriangle> faces = all_tet_faces(mesh);
  std::vector<int> counts(mesh.n_faces());
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    const std::int32_t* v = mesh.face(f);
    const auto range = std::equal_range(faces.begin(), faces.end(), sorted_triangle(v[0], v[1], v[2]));
    counts[f] = static_cast<int>(range.second - range.first);
  }
  return counts;
}

std::vector<bool> internal_boundaries(const Mesh& mesh) {
  const std::vector<int> counts = adjacent_tet_counts(mesh);
  std::vector<bool> has_faces(mesh.boundaries.size(), false);
  std::vector<bool> internal(mesh.boundaries.size(), true);
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    const auto b = static_cast<std::size_t>(mesh.face_boundary[f]);
    has_faces[b] = true;
    if (counts[f] != 2 && !mesh.face_is_split(f)) internal[b] = false;  // a cut face stays internal
  }
  for (std::size_t b = 0; b < internal.size(); ++b) internal[b] = internal[b] && has_faces[b];
  return internal;
}

std::size_t count_unnamed_exterior_faces(const Mesh& mesh) {
  std::vector<SortedTriangle> named;
  named.reserve(mesh.n_faces());
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    const std::int32_t* v = mesh.face(f);
    named.push_back(sorted_triangle(v[0], v[1], v[2]));
  }
  std::sort(named.begin(), named.end());
  std::size_t unnamed = 0;
  for (const SortedTriangle& face : exterior_faces(mesh))
    if (!std::binary_search(named.begin(), named.end(), face)) ++unnamed;
  return unnamed;
}

std::size_t count_coincident_nodes(const Mesh& mesh) {
  std::vector<std::int32_t> by_position(mesh.n_nodes());
  for (std::size_t i = 0; i < by_position.size(); ++i) by_position[i] = static_cast<std::int32_t>(i);
  auto position = [&](std::int32_t i) { return mesh.node(static_cast<std::size_t>(i)); };
  std::sort(by_position.begin(), by_position.end(), [&](std::int32_t a, std::int32_t b) { return position(a) < position(b); });
  std::size_t coincident = 0;
  for (std::size_t k = 1; k < by_position.size(); ++k)
    if (position(by_position[k]) == position(by_position[k - 1])) ++coincident;
  return coincident;
}

}  // namespace hearth
