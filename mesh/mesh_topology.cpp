// Face adjacency of a tetrahedral mesh.
#include "mesh/mesh_topology.hpp"

#include <omp.h>

#include <algorithm>

namespace hearth {

std::vector<ExteriorFace> exterior_element_faces(const Mesh& mesh) {
  // Every face is listed at its smallest vertex. Only an element's two smallest vertices
  // are the smallest of one of its faces (the smallest of three, the second of the one
  // face without the smallest), so each element is listed at those two nodes only:
  // node -> elements, then each node's faces that start at it (a dozen on average)
  // sorted by an insertion sort of packed keys, the single ones kept. Each thread takes
  // one contiguous block of nodes, so the blocks joined in order are sorted; the order
  // of a node's elements does not matter (a face is kept only when it is alone).
  const std::size_t n_nodes = mesh.n_nodes();
  const std::int64_t n_tets = static_cast<std::int64_t>(mesh.n_tets());
  auto two_smallest = [&](std::int64_t e, std::int32_t& first, std::int32_t& second) {
    const std::int32_t* v = mesh.tet(static_cast<std::size_t>(e));
    first = std::min(v[0], v[1]), second = std::max(v[0], v[1]);
    for (int a = 2; a < 4; ++a) {
      if (v[a] < first) second = first, first = v[a];
      else if (v[a] < second) second = v[a];
    }
  };
  std::vector<std::int64_t> start(n_nodes + 1, 0);
#pragma omp parallel for schedule(static)
  for (std::int64_t e = 0; e < n_tets; ++e) {
    std::int32_t first, second;
    two_smallest(e, first, second);
#pragma omp atomic
    ++start[first + 1];
#pragma omp atomic
    ++start[second + 1];
  }
  for (std::size_t i = 0; i < n_nodes; ++i) start[i + 1] += start[i];
  std::vector<std::int32_t> node_elements(static_cast<std::size_t>(start[n_nodes]));
  {
    std::vector<std::int64_t> fill(start.begin(), start.end() - 1);
#pragma omp parallel for schedule(static)
    for (std::int64_t e = 0; e < n_tets; ++e) {
      std::int32_t first, second;
      two_smallest(e, first, second);
      std::int64_t slot_first, slot_second;
#pragma omp atomic capture
      slot_first = fill[first]++;
#pragma omp atomic capture
      slot_second = fill[second]++;
      node_elements[static_cast<std::size_t>(slot_first)] = static_cast<std::int32_t>(e);
      node_elements[static_cast<std::size_t>(slot_second)] = static_cast<std::int32_t>(e);
    }
  }
  // A face (i, b, c) at node i: b < c packed in one integer, its element and the
  // element's vertex opposite it.
  struct LocalFace {
    std::uint64_t key;
    std::int32_t element, opposite;
  };
  const int threads = omp_get_max_threads();
  std::vector<std::vector<ExteriorFace>> blocks(threads);
#pragma omp parallel num_threads(threads)
  {
    const int t = omp_get_thread_num();
    const std::int64_t first = static_cast<std::int64_t>(n_nodes) * t / threads;
    const std::int64_t last = static_cast<std::int64_t>(n_nodes) * (t + 1) / threads;
    std::vector<LocalFace> local;
    for (std::int64_t i = first; i < last; ++i) {
      local.clear();
      for (std::int64_t p = start[i]; p < start[i + 1]; ++p) {
        const std::int32_t e = node_elements[p];
        const std::int32_t* v = mesh.tet(static_cast<std::size_t>(e));
        for (int opposite = 0; opposite < 4; ++opposite) {
          if (v[opposite] == i) continue;  // the face must contain i
          std::int32_t other[2], n_other = 0;
          for (int a = 0; a < 4; ++a)
            if (a != opposite && v[a] != i) other[n_other++] = v[a];
          if (other[0] < i || other[1] < i) continue;  // listed at a smaller vertex
          const auto lo = static_cast<std::uint64_t>(std::min(other[0], other[1]));
          const auto hi = static_cast<std::uint64_t>(std::max(other[0], other[1]));
          LocalFace face{lo << 32 | hi, e, opposite};
          std::size_t j = local.size();
          local.push_back(face);
          for (; j > 0 && local[j - 1].key > face.key; --j) local[j] = local[j - 1];
          local[j] = face;
        }
      }
      for (std::size_t j = 0; j < local.size();) {
        std::size_t k = j + 1;
        while (k < local.size() && local[k].key == local[j].key) ++k;
        if (k - j == 1)
          blocks[t].push_back({{static_cast<std::int32_t>(i), static_cast<std::int32_t>(local[j].key >> 32),
                                static_cast<std::int32_t>(local[j].key & 0xffffffffu)},
                               local[j].element, local[j].opposite});
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
