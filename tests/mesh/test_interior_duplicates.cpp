// Merging a point a volume mesher inserted twice, on hand-built arrays: the unit
// tetrahedron split at an interior point into four, two of the four using a copy of
// that point. The checks are exact by construction (volumes of the reference
// tetrahedron, 1/6; common practice, no source).
#include <gtest/gtest.h>

#include <cmath>
#include <string>
#include <vector>

#include "mesh/gmsh_arrays.hpp"
#include "mesh/interior_duplicates.hpp"
#include "mesh/mesh_topology.hpp"

namespace hearth {
namespace {

NamedGroup group(const std::string& name, int entity_tag) {
  NamedGroup g;
  g.entity.name = name;
  g.entity.tag = entity_tag;
  g.entity_tags = {entity_tag};
  return g;
}

// Corners 1-4 of the unit tetrahedron, the interior point as tag 5 and its copy as
// tag 6, with `copy_coordinates` for the copy (equal to tag 5's for a crack).
GmshArrays split_tetrahedron(const std::vector<double>& copy_coordinates) {
  GmshArrays arrays;
  arrays.order = 1;
  arrays.node_tags = {1, 2, 3, 4, 5, 6};
  arrays.node_coords = {0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 1, 0.25, 0.25, 0.25};
  arrays.node_coords.insert(arrays.node_coords.end(), copy_coordinates.begin(), copy_coordinates.end());
  arrays.tet_permutation = {0, 1, 2, 3};
  arrays.triangle_permutation = {0, 1, 2};
  // The corner opposite each face replaced by the interior point; the last two by its copy.
  arrays.volumes.push_back({1, {5, 2, 3, 4, 1, 5, 3, 4, 1, 2, 6, 4, 1, 2, 3, 6}});
  arrays.surfaces.push_back({1, {1, 2, 3, 1, 2, 4, 1, 3, 4, 2, 3, 4}});
  arrays.regions.push_back(group("solid", 1));
  arrays.boundaries.push_back(group("outside", 1));
  return arrays;
}

double total_volume(const Mesh& mesh) {
  double sum = 0.0;
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    const std::int32_t* t = mesh.tet(e);
    const auto a = mesh.node(t[0]), b = mesh.node(t[1]), c = mesh.node(t[2]), d = mesh.node(t[3]);
    const double u[3] = {b[0] - a[0], b[1] - a[1], b[2] - a[2]}, v[3] = {c[0] - a[0], c[1] - a[1], c[2] - a[2]},
                 w[3] = {d[0] - a[0], d[1] - a[1], d[2] - a[2]};
    sum += std::abs(u[0] * (v[1] * w[2] - v[2] * w[1]) - u[1] * (v[0] * w[2] - v[2] * w[0]) +
                    u[2] * (v[0] * w[1] - v[1] * w[0])) / 6.0;
  }
  return sum;
}

TEST(InteriorDuplicates, CopyOfAnInteriorPointIsMergedAndTheMeshCloses) {
  GmshArrays arrays = split_tetrahedron({0.25, 0.25, 0.25});
  std::size_t dropped = 0;
  const Mesh cracked = mesh_from_gmsh_arrays(arrays, 1.0, dropped);
  EXPECT_EQ(count_coincident_nodes(cracked), 1u);
  // Cracked, the four inner faces between a tetrahedron on the point and one on its
  // copy show twice each as exterior: 4 outer + 4 x 2.
  EXPECT_EQ(exterior_faces(cracked).size(), 12u);

  EXPECT_EQ(merge_interior_duplicate_nodes(arrays), 1u);
  const Mesh mended = mesh_from_gmsh_arrays(arrays, 1.0, dropped);
  EXPECT_EQ(mended.n_nodes(), 5u);  // the unused copy drops out
  EXPECT_EQ(count_coincident_nodes(mended), 0u);
  EXPECT_EQ(exterior_faces(mended).size(), 4u);  // only the tetrahedron's own faces
  EXPECT_NEAR(total_volume(mended), 1.0 / 6.0, 1e-15);
  EXPECT_EQ(merge_interior_duplicate_nodes(arrays), 0u);  // nothing left to merge
}

TEST(InteriorDuplicates, DistinctPointsAreLeftAlone) {
  GmshArrays arrays = split_tetrahedron({0.25, 0.25, 0.2500001});
  const std::vector<std::size_t> before = arrays.volumes[0].node_tags;
  EXPECT_EQ(merge_interior_duplicate_nodes(arrays), 0u);
  EXPECT_EQ(arrays.volumes[0].node_tags, before);
}

TEST(InteriorDuplicates, CoincidentNodesOnASurfaceAreNotMerged) {
  // Two tetrahedra that touch on the face z = 0 with their own copies of its corners:
  // volumes that were never fragmented. Merging them would join bodies the script
  // keeps apart, so nothing changes.
  GmshArrays arrays;
  arrays.order = 1;
  arrays.node_tags = {1, 2, 3, 4, 5, 6, 7, 8};
  arrays.node_coords = {0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, -1};
  arrays.tet_permutation = {0, 1, 2, 3};
  arrays.triangle_permutation = {0, 1, 2};
  arrays.volumes.push_back({1, {1, 2, 3, 4}});
  arrays.volumes.push_back({2, {5, 7, 6, 8}});
  arrays.surfaces.push_back({1, {1, 2, 3}});
  arrays.surfaces.push_back({2, {5, 6, 7}});
  arrays.regions.push_back(group("upper", 1));
  arrays.regions.push_back(group("lower", 2));
  const auto before = arrays.volumes;
  EXPECT_EQ(merge_interior_duplicate_nodes(arrays), 0u);
  EXPECT_EQ(arrays.volumes[1].node_tags, before[1].node_tags);
}

}  // namespace
}  // namespace hearth
