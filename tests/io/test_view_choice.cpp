// The report's camera choices (io/view_choice.hpp), worked by hand from the rules the
// header states; no rendering. Expected behaviour of our own rules, not results:
// common practice, no source.
#include <gtest/gtest.h>

#include <cmath>

#include "io/view_choice.hpp"

namespace hearth {
namespace {

double dot(const Vector3& a, const Vector3& b) { return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]; }

void expect_vector(const Vector3& v, const Vector3& expected) {
  for (int k = 0; k < 3; ++k) EXPECT_NEAR(v[k], expected[k], 1e-12) << "component " << k;
}

const double kThird = 1.0 / std::sqrt(3.0);

TEST(ViewChoice, IsometricViewLooksFromAboveOnTheHotSideAlongADiagonal) {
  const Bounds box{0, 0.25, 0, 0.1, 0, 0.1};
  // Hot face at x = 0, its hottest node at the face's centre: the camera sits at -x, +y, +z.
  const ViewDirection v = isometric_view(box, {0.0, 0.05, 0.05});
  expect_vector(v.direction, {kThird, -kThird, -kThird});
  EXPECT_NEAR(dot(v.direction, v.view_up), 0.0, 1e-12);
  EXPECT_GT(v.view_up[2], 0.0);  // z up
  // Hottest at the bottom corner (x max, y min, z min): +x, -y, and still from above.
  const ViewDirection w = isometric_view(box, {0.25, 0.0, 0.0});
  expect_vector(w.direction, {-kThird, kThird, -kThird});
}

TEST(ViewChoice, ViewUpIsZUnlessLookingAlongZ) {
  expect_vector(view_up_for({1, 0, 0}), {0, 0, 1});
  expect_vector(view_up_for({0, 0, -1}), {0, 1, 0});
}

BoundaryPatch patch(const std::string& name, double area, const Vector3& normal, double range) {
  return {name, {area / 2, area / 2}, {normal, normal}, range};
}

TEST(ViewChoice, LargestBoundaryWinsAndNearTiesGoToTheOneThatVariesMost) {
  // "hot" is 0.5 % smaller than "cold" but uniform: "cold" varies, so it is chosen.
  const std::vector<BoundaryPatch> patches = {patch("hot", 0.995, {-1, 0, 0}, 0.0),
                                              patch("cold", 1.0, {1, 0, 0}, 24.0),
                                              patch("small", 0.2, {0, 1, 0}, 100.0)};
  const auto view = largest_boundary_view(patches);
  ASSERT_TRUE(view);
  EXPECT_EQ(view->name, "cold");
  expect_vector(view->view.direction, {-1, 0, 0});  // against the outward normal +x
  // Beyond 1 %, area decides whatever the temperatures.
  const auto clear = largest_boundary_view({patch("hot", 0.98, {-1, 0, 0}, 0.0), patch("cold", 1.0, {1, 0, 0}, 0.0)});
  ASSERT_TRUE(clear);
  EXPECT_EQ(clear->name, "cold");
}

TEST(ViewChoice, BoundaryFacingSeveralWaysIsSeenFromTheWayMostOfItFaces) {
  // Four side faces of a box, the +y face the largest: look along -y onto it.
  BoundaryPatch sides{"sides", {0.02, 0.02, 0.03, 0.02}, {{0, -1, 0}, {0, 0, 1}, {0, 1, 0}, {0, 0, -1}}, 5.0};
  const auto view = largest_boundary_view({sides});
  ASSERT_TRUE(view);
  expect_vector(view->view.direction, {0, -1, 0});
  // A face tilted 20 degrees from +x is seen straight on, not along x.
  const double c = std::cos(20.0 * M_PI / 180), s = std::sin(20.0 * M_PI / 180);
  const auto tilted = largest_boundary_view({patch("tilted", 1.0, {c, s, 0}, 1.0)});
  ASSERT_TRUE(tilted);
  expect_vector(tilted->view.direction, {-c, -s, 0});
  EXPECT_FALSE(largest_boundary_view({}));
}

TEST(ViewChoice, SectionContainsTheFlowAndReadsLeftToRight) {
  // Heat flows along x; y and z are equally perpendicular and the box is as thick in
  // both, so the later axis (z) is the normal; looking along -z, x runs to the right.
  const SectionPlane cut = section_through({0, 0.05, 0.05}, {1, 0, 0}, {0, 0.25, 0, 0.1, 0, 0.1});
  EXPECT_EQ(cut.normal_axis, 2);
  expect_vector(cut.view.direction, {0, 0, -1});
  expect_vector(cut.origin, {0, 0.05, 0.05});
  // The thinner axis (y) gives the larger cut; the camera then looks along +y so that
  // x still runs to the right (right = direction x up = +x).
  const SectionPlane thin = section_through({0, 0.05, 0.1}, {1, 0, 0}, {0, 0.25, 0, 0.1, 0, 0.2});
  EXPECT_EQ(thin.normal_axis, 1);
  expect_vector(thin.view.direction, {0, 1, 0});
  expect_vector(thin.view.view_up, {0, 0, 1});
  // Flow mostly along z with some x: the normal is y, the axis it has none of.
  const SectionPlane diagonal = section_through({0, 0.5, 0}, {0.1, 0, 1}, {0, 1, 0, 1, 0, 1});
  EXPECT_EQ(diagonal.normal_axis, 1);
}

TEST(ViewChoice, SectionOnAFaceOfTheBoxMovesInside) {
  // Hottest at the edge y = 0 of a face: the plane y = 0 would only touch the body.
  const SectionPlane cut = section_through({0, 0.0, 0.05}, {1, 0, 0}, {0, 0.25, 0, 0.1, 0, 0.2});
  EXPECT_EQ(cut.normal_axis, 1);
  EXPECT_NEAR(cut.origin[1], 1e-4, 1e-15);  // a thousandth of the 0.1 extent inside
  const SectionPlane top = section_through({0, 0.05, 0.2}, {1, 0, 0}, {0, 0.25, 0, 0.1, 0, 0.2});
  EXPECT_EQ(top.normal_axis, 1);
  EXPECT_NEAR(top.origin[2], 0.2, 1e-15);  // along the plane nothing moves
}

}  // namespace
}  // namespace hearth
