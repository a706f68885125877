// The point locator's two ways of finding a point (named in advance, found in one pass
// over the elements; or through the grid of element boxes) must agree, element for
// element, including points on shared faces, edges and vertices, where several elements
// hold the point and the rule (least violation, lowest element number) decides.
#include <gtest/gtest.h>

#include <random>
#include <vector>

#include "solver/point_locator.hpp"
#include "verification_support.hpp"

namespace hearth {
namespace {

std::vector<Point> test_points(const Mesh& mesh) {
  std::vector<Point> points;
  std::mt19937 random(7);
  std::uniform_real_distribution<double> inside(0.0, 1.0), around(-0.2, 1.2);
  for (int i = 0; i < 300; ++i) points.push_back({inside(random), 0.5 * inside(random), 0.5 * inside(random)});
  for (int i = 0; i < 100; ++i) points.push_back({around(random), 0.5 * around(random), 0.5 * around(random)});
  // Vertices (held by a dozen or more elements) and face and edge midpoints of some elements.
  for (std::size_t e = 0; e < mesh.n_tets(); e += 37) {
    const std::int32_t* t = mesh.tet(e);
    const Point a = mesh.node(t[0]), b = mesh.node(t[1]), c = mesh.node(t[2]);
    points.push_back(a);
    points.push_back({(a[0] + b[0]) / 2, (a[1] + b[1]) / 2, (a[2] + b[2]) / 2});
    points.push_back({(a[0] + b[0] + c[0]) / 3, (a[1] + b[1] + c[1]) / 3, (a[2] + b[2] + c[2]) / 3});
  }
  // On the surface, and just off it by less and by more than the tolerance (1e-9 of
  // the body's diagonal, 1.22 here).
  points.push_back({0.0, 0.25, 0.25});
  points.push_back({-1e-11, 0.25, 0.25});
  points.push_back({-1e-6, 0.25, 0.25});
  points.push_back({1.0, 0.5, 0.5});
  return points;
}

void expect_both_ways_agree(int order) {
  const Mesh mesh = testing::mesh_script("locator_box.geo", testing::prism(1.0, 0.5), 0.12, order);
  const std::vector<Point> points = test_points(mesh);
  const PointLocator named(mesh, points), grid(mesh);
  // T = 2x + 3y - z + 5: linear, so reproduced exactly by 4- and 10-node Lagrange
  // interpolation (completeness of the elements; a standard property, from memory).
  std::vector<double> T(mesh.n_nodes());
  for (std::size_t i = 0; i < mesh.n_nodes(); ++i) {
    const Point x = mesh.node(i);
    T[i] = 2 * x[0] + 3 * x[1] - x[2] + 5;
  }
  int found = 0;
  for (const Point& p : points) {
    const auto a = named.locate(p), b = grid.locate(p);
    ASSERT_EQ(a.has_value(), b.has_value()) << p[0] << " " << p[1] << " " << p[2];
    if (!a) continue;
    ++found;
    EXPECT_EQ(a->element, b->element);
    for (int d = 0; d < 3; ++d) EXPECT_EQ(a->xi[d], b->xi[d]);
    EXPECT_NEAR(named.interpolate(*a, T), 2 * p[0] + 3 * p[1] - p[2] + 5, 1e-9);
  }
  EXPECT_GT(found, 300);
  EXPECT_TRUE(named.locate({-1e-11, 0.25, 0.25}).has_value());   // within the tolerance
  EXPECT_FALSE(named.locate({-1e-6, 0.25, 0.25}).has_value());   // beyond it
  // A point not named in advance goes through the grid, built on first use.
  EXPECT_TRUE(named.locate({0.3141, 0.2718, 0.1414}).has_value());
}

TEST(PointLocator, NamedPointsAndGridAgreeFor4NodeElements) { expect_both_ways_agree(1); }
TEST(PointLocator, NamedPointsAndGridAgreeFor10NodeElements) { expect_both_ways_agree(2); }

}  // namespace
}  // namespace hearth
