// The one conversion from Gmsh's arrays to a Mesh.
#include "mesh/gmsh_arrays.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdint>
#include <limits>
#include <map>
#include <numeric>
#include <stdexcept>
#include <unordered_map>

#include "mesh/mesh_error.hpp"
#include "mesh/mesh_quality.hpp"

namespace hearth {
namespace {

// Local coordinates of the canonical nodes (mesh.hpp): vertices, then edge midpoints.
const std::vector<std::array<double, 3>>& canonical_local_coords(int dim, std::size_t n_nodes) {
  static const std::vector<std::array<double, 3>> tet4 = {{0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {0, 0, 1}};
  static const std::vector<std::array<double, 3>> tet10 = {
      {0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {0, 0, 1},
      // edges (0,1) (1,2) (0,2) (0,3) (1,3) (2,3)
      {0.5, 0, 0}, {0.5, 0.5, 0}, {0, 0.5, 0}, {0, 0, 0.5}, {0.5, 0, 0.5}, {0, 0.5, 0.5}};
  static const std::vector<std::array<double, 3>> tri3 = {{0, 0, 0}, {1, 0, 0}, {0, 1, 0}};
  // edges (0,1) (1,2) (2,0)
  static const std::vector<std::array<double, 3>> tri6 = {{0, 0, 0},   {1, 0, 0},     {0, 1, 0},
                                                          {0.5, 0, 0}, {0.5, 0.5, 0}, {0, 0.5, 0}};
  if (dim == 3 && n_nodes == 4) return tet4;
  if (dim == 3 && n_nodes == 10) return tet10;
  if (dim == 2 && n_nodes == 3) return tri3;
  if (dim == 2 && n_nodes == 6) return tri6;
  throw std::invalid_argument("canonical_node_permutation: unsupported element (dimension " + std::to_string(dim) +
                              ", " + std::to_string(n_nodes) + " nodes)");
}

}  // namespace

NodeTagIndex::NodeTagIndex(const std::vector<std::size_t>& tags) {
  const std::size_t max_tag = tags.empty() ? 0 : *std::max_element(tags.begin(), tags.end());
  dense_ = max_tag <= 4 * tags.size() + 1024;
  if (dense_) position_.assign(max_tag + 1, kAbsent);
  for (std::size_t i = 0; i < tags.size(); ++i) {
    if (dense_) position_[tags[i]] = i;
    else sparse_[tags[i]] = i;
  }
}

std::size_t NodeTagIndex::operator()(std::size_t tag) const {
  std::size_t found = kAbsent;
  if (dense_) {
    if (tag < position_.size()) found = position_[tag];
  } else if (const auto it = sparse_.find(tag); it != sparse_.end()) {
    found = it->second;
  }
  if (found == kAbsent) throw MeshError("Gmsh's mesh refers to node " + std::to_string(tag) + ", which it does not define");
  return found;
}

std::vector<int> canonical_node_permutation(int dim, const std::vector<double>& local_coords) {
  if (dim != 2 && dim != 3) throw std::invalid_argument("canonical_node_permutation: dimension must be 2 or 3");
  const std::size_t n_nodes = local_coords.size() / static_cast<std::size_t>(dim);
  const auto& canonical = canonical_local_coords(dim, n_nodes);
  std::vector<int> permutation(n_nodes, -1);
  for (std::size_t k = 0; k < n_nodes; ++k) {
    for (std::size_t g = 0; g < n_nodes; ++g) {
      double distance = 0.0;
      for (int d = 0; d < dim; ++d) distance += std::fabs(local_coords[g * dim + d] - canonical[k][d]);
      if (distance < 1e-9) permutation[k] = static_cast<int>(g);
    }
    if (permutation[k] < 0) throw std::invalid_argument("canonical_node_permutation: no Gmsh node at canonical position " + std::to_string(k));
  }
  return permutation;
}

Mesh mesh_from_gmsh_arrays(const GmshArrays& arrays, double length_scale, std::size_t& dropped_faces) {
  Mesh mesh;
  mesh.order = arrays.order;
  const auto per_tet = static_cast<std::size_t>(mesh.nodes_per_tet());
  const auto per_face = static_cast<std::size_t>(mesh.nodes_per_face());
  if (arrays.tet_permutation.size() != per_tet || arrays.triangle_permutation.size() != per_face)
    throw std::invalid_argument("mesh_from_gmsh_arrays: permutations do not match the order");

  for (const NamedGroup& group : arrays.regions) mesh.regions.push_back(group.entity);
  for (const NamedGroup& group : arrays.boundaries) mesh.boundaries.push_back(group.entity);
  std::map<int, std::int32_t> region_of_volume;
  for (std::size_t r = 0; r < arrays.regions.size(); ++r)
    for (int tag : arrays.regions[r].entity_tags) region_of_volume[tag] = static_cast<std::int32_t>(r);
  std::multimap<int, std::int32_t> boundaries_of_surface;
  for (std::size_t b = 0; b < arrays.boundaries.size(); ++b)
    for (int tag : arrays.boundaries[b].entity_tags) boundaries_of_surface.emplace(tag, static_cast<std::int32_t>(b));

  // Compact numbering of the nodes used by tetrahedra, in increasing Gmsh tag.
  const NodeTagIndex position(arrays.node_tags);
  std::vector<char> used(arrays.node_tags.size(), 0);
  for (const GmshElementBlock& block : arrays.volumes)
    for (std::size_t tag : block.node_tags) used[position(tag)] = 1;
  std::vector<std::size_t> by_tag(arrays.node_tags.size());
  std::iota(by_tag.begin(), by_tag.end(), 0);
  std::sort(by_tag.begin(), by_tag.end(), [&](std::size_t a, std::size_t b) { return arrays.node_tags[a] < arrays.node_tags[b]; });
  std::vector<std::int32_t> number(arrays.node_tags.size(), -1);
  std::int32_t n_nodes = 0;
  for (std::size_t i : by_tag) {
    if (!used[i]) continue;
    number[i] = n_nodes++;
    for (int d = 0; d < 3; ++d) mesh.coords.push_back(arrays.node_coords[3 * i + d] * length_scale);
  }

  // Tetrahedra: canonical order, right-handed.
  for (const GmshElementBlock& block : arrays.volumes) {
    const auto region = region_of_volume.find(block.entity_tag);
    if (region == region_of_volume.end())
      throw MeshError("volume " + std::to_string(block.entity_tag) + " belongs to no region");
    for (std::size_t first = 0; first + per_tet <= block.node_tags.size(); first += per_tet) {
      std::array<std::int32_t, 10> t{};
      for (std::size_t k = 0; k < per_tet; ++k)
        t[k] = number[position(block.node_tags[first + static_cast<std::size_t>(arrays.tet_permutation[k])])];
      if (tet_signed_volume(mesh.node(t[0]), mesh.node(t[1]), mesh.node(t[2]), mesh.node(t[3])) < 0.0) {
        // Swapping vertices 1 and 2 exchanges edges (0,1)<->(0,2) and (1,3)<->(2,3).
        std::swap(t[1], t[2]);
        if (per_tet == 10) {
          std::swap(t[4], t[6]);
          std::swap(t[8], t[9]);
        }
      }
      mesh.tet_nodes.insert(mesh.tet_nodes.end(), t.begin(), t.begin() + static_cast<std::ptrdiff_t>(per_tet));
      mesh.tet_region.push_back(region->second);
    }
  }

  // Boundary triangles: Gmsh's orientation, one copy per boundary of their surface.
  dropped_faces = 0;
  for (const GmshElementBlock& block : arrays.surfaces) {
    const auto [begin, end] = boundaries_of_surface.equal_range(block.entity_tag);
    if (begin == end) continue;
    for (std::size_t first = 0; first + per_face <= block.node_tags.size(); first += per_face) {
      std::array<std::int32_t, 6> f{};
      bool on_tets = true;
      for (std::size_t k = 0; k < per_face; ++k) {
        f[k] = number[position(block.node_tags[first + static_cast<std::size_t>(arrays.triangle_permutation[k])])];
        on_tets = on_tets && f[k] >= 0;
      }
      for (auto it = begin; it != end; ++it) {
        if (!on_tets) {
          ++dropped_faces;
          continue;
        }
        mesh.face_nodes.insert(mesh.face_nodes.end(), f.begin(), f.begin() + static_cast<std::ptrdiff_t>(per_face));
        mesh.face_boundary.push_back(it->second);
      }
    }
  }
  return mesh;
}

}  // namespace hearth
