// Merging coincident interior nodes in Gmsh's arrays.
#include "mesh/interior_duplicates.hpp"

#include <algorithm>
#include <array>
#include <cstdint>
#include <unordered_map>
#include <vector>

namespace hearth {

std::size_t merge_interior_duplicate_nodes(GmshArrays& arrays) {
  const std::size_t n = arrays.node_tags.size();
  if (n == 0) return 0;
  const NodeTagIndex position(arrays.node_tags);
  std::vector<char> in_tet(n, 0), on_surface(n, 0);
  for (const GmshElementBlock& block : arrays.volumes)
    for (const std::size_t tag : block.node_tags) in_tet[position(tag)] = 1;
  for (const GmshElementBlock& block : arrays.surfaces)
    for (const std::size_t tag : block.node_tags) on_surface[position(tag)] = 1;

  // Nodes of the tetrahedra sorted by their coordinates: copies end up side by side.
  std::vector<std::int64_t> by_position;
  by_position.reserve(n);
  for (std::size_t i = 0; i < n; ++i)
    if (in_tet[i]) by_position.push_back(static_cast<std::int64_t>(i));
  auto point = [&](std::int64_t i) {
    const double* x = &arrays.node_coords[3 * static_cast<std::size_t>(i)];
    return std::array<double, 3>{x[0], x[1], x[2]};
  };
  std::sort(by_position.begin(), by_position.end(), [&](std::int64_t a, std::int64_t b) {
    const auto pa = point(a), pb = point(b);
    return pa != pb ? pa < pb : arrays.node_tags[a] < arrays.node_tags[b];
  });
  std::unordered_map<std::size_t, std::size_t> keeper_of;  // copy's tag -> kept tag
  for (std::size_t k = 0; k < by_position.size();) {
    std::size_t end = k + 1;
    while (end < by_position.size() && point(by_position[end]) == point(by_position[k])) ++end;
    if (end - k > 1) {
      for (std::size_t m = k; m < end; ++m)
        if (on_surface[by_position[m]]) return 0;  // touching volumes, not a mesher's slip
      for (std::size_t m = k + 1; m < end; ++m)
        keeper_of[arrays.node_tags[by_position[m]]] = arrays.node_tags[by_position[k]];
    }
    k = end;
  }
  if (keeper_of.empty()) return 0;
  for (GmshElementBlock& block : arrays.volumes) {
    const std::int64_t count = static_cast<std::int64_t>(block.node_tags.size());
#pragma omp parallel for schedule(static)
    for (std::int64_t k = 0; k < count; ++k) {
      const auto it = keeper_of.find(block.node_tags[k]);
      if (it != keeper_of.end()) block.node_tags[k] = it->second;
    }
  }
  return keeper_of.size();
}

}  // namespace hearth
