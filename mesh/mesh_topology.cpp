// Face adjacency of a tetrahedral mesh.
#include "mesh/mesh_topology.hpp"

#include <omp.h>

#include <algorithm>

namespace hearth {

std::vector<ExteriorFace> exterior_element_faces(const Mesh& mesh) {
  // Every face is listed at its smallest vertex: node -> elements (vertices only), then
  // each node's faces that start at it, sorted (a few dozen), the single ones kept. Each
  // thread takes one contiguous block of nodes, so the blocks joined in order are sorted.
  const std::size_t n_nodes = mesh.n_nodes();
  std::vector<std::int64_t> start(n_nodes + 1, 0);
  for (std::size_t e = 0; e < mesh.n_tets(); ++e)
    for (int a = 0; a < 4; ++a) ++start[mesh.tet(e)[a] + 1];
  for (std::size_t i = 0; i < n_nodes; ++i) start[i + 1] += start[i];
  std::vector<std::int32_t> node_elements(static_cast<std::size_t>(start[n_nodes]));
  {
    std::vector<std::int64_t> fill(start.begin(), start.end() - 1);
    for (std::size_t e = 0; e < mesh.n_tets(); ++e)
      for (int a = 0; a < 4; ++a) node_elements[fill[mesh.tet(e)[a]]++] = static_cast<std::int32_t>(e);
  }
  const int threads = omp_get_max_threads();
  std::vector<std::vector<ExteriorFace>> blocks(threads);
#pragma omp parallel num_threads(threads)
  {
    const int t = omp_get_thread_num();
    const std::int64_t first = static_cast<std::int64_t>(n_nodes) * t / threads;
    const std::int64_t last = static_cast<std::int64_t>(n_nodes) * (t + 1) / threads;
    std::vector<ExteriorFace> local;
    for (std::int64_t i = first; i < last; ++i) {
      local.clear();
      for (std::int64_t p = start[i]; p < start[i + 1]; ++p) {
        const std::int32_t e = node_elements[p];
        const std::int32_t* v = mesh.tet(static_cast<std::size_t>(e));
        for (int k = 0; k < 4; ++k) {
          const SortedTriangle key = sorted_triangle(v[kTetFaceVertices[k][0]], v[kTetFaceVertices[k][1]], v[kTetFaceVertices[k][2]]);
          if (key[0] == i) local.push_back({key, e, kTetFaceOpposite[k]});
        }
      }
      std::sort(local.begin(), local.end(), [](const ExteriorFace& a, const ExteriorFace& b) { return a.key < b.key; });
      for (std::size_t j = 0; j < local.size();) {
        std::size_t k = j + 1;
        while (k < local.size() && local[k].key == local[j].key) ++k;
        if (k - j == 1) blocks[t].push_back(local[j]);
        j = k;
      }
    }
  }
  std::vector<ExteriorFace> faces;
  for (const auto& block : blocks) faces.insert(faces.end(), block.begin(), block.end());
  return faces;
}

std::vector<SortedTriangle> exterior_faces(const Mesh& mesh) {
  std::vector<SortedTriangle> keys;
  for (const ExteriorFace& face : exterior_element_faces(mesh)) keys.push_back(face.key);
  return keys;
}

std::vector<int> adjacent_tet_counts(const Mesh& mesh) {
  std::vector<int> counts(mesh.n_faces(), 0);
  for_each_boundary_face_of_elements(mesh, [&](std::size_t f, std::int32_t, int) {
#pragma omp atomic
    ++counts[f];
  });
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
