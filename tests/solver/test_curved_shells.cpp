// Verification on curved geometry: radial conduction through a hollow cylinder (C03,
// 90-degree sector) and a hollow sphere (C04, octant), with 10-node elements curved to
// the geometry. Cut planes and end faces are insulated (symmetry).
#include "verification_support.hpp"

#include <cmath>

namespace hearth::testing {
namespace {

const double pi = std::acos(-1.0);

// Sector r_i = 0.05, r_o = 0.10, axial length 0.1; the planes x = 0, y = 0, z = 0, z = 0.1
// are left unnamed (insulated).
const char* cylinder_sector = R"(SetFactory("OpenCASCADE");
Cylinder(1) = {0, 0, 0, 0, 0, 0.1, 0.10, Pi/2};
Cylinder(2) = {0, 0, 0, 0, 0, 0.1, 0.05, Pi/2};
BooleanDifference(3) = { Volume{1}; Delete; }{ Volume{2}; Delete; };
eps = 1e-6;
inner() = Surface In BoundingBox{-eps, -eps, -eps, 0.05 + eps, 0.05 + eps, 0.1 + eps};
px() = Surface In BoundingBox{-eps, -eps, -eps, eps, 0.1 + eps, 0.1 + eps};
py() = Surface In BoundingBox{-eps, -eps, -eps, 0.1 + eps, eps, 0.1 + eps};
pz() = Surface In BoundingBox{-eps, -eps, -eps, 0.1 + eps, 0.1 + eps, eps};
pz2() = Surface In BoundingBox{-eps, -eps, 0.1 - eps, 0.1 + eps, 0.1 + eps, 0.1 + eps};
outer() = Abs(Boundary{ Volume{3}; });
outer() -= {inner(), px(), py(), pz(), pz2()};
Physical Volume("shell") = {3};
Physical Surface("inner") = {inner()};
Physical Surface("outer") = {outer()};
)";

// Octant of a shell r_i = 0.1, r_o = 0.2.
const char* sphere_octant = R"(SetFactory("OpenCASCADE");
Sphere(1) = {0, 0, 0, 0.2, 0, Pi/2, Pi/2};
Sphere(2) = {0, 0, 0, 0.1, 0, Pi/2, Pi/2};
BooleanDifference(3) = { Volume{1}; Delete; }{ Volume{2}; Delete; };
eps = 1e-6;
inner() = Surface In BoundingBox{-eps, -eps, -eps, 0.1 + eps, 0.1 + eps, 0.1 + eps};
px() = Surface In BoundingBox{-eps, -eps, -eps, eps, 0.2 + eps, 0.2 + eps};
py() = Surface In BoundingBox{-eps, -eps, -eps, 0.2 + eps, eps, 0.2 + eps};
pz() = Surface In BoundingBox{-eps, -eps, -eps, 0.2 + eps, 0.2 + eps, eps};
outer() = Abs(Boundary{ Volume{3}; });
outer() -= {inner(), px(), py(), pz()};
Physical Volume("shell") = {3};
Physical Surface("inner") = {inner()};
Physical Surface("outer") = {outer()};
)";

// C03(a): k = 0.05, T(r_i) = 300, T(r_o) = 40 degC. Source: Incropera & DeWitt Table 3.3 /
// section 3.3 (from memory): q' = 2 pi k dT / ln(r_o/r_i) = 117.8414 W/m, sector 0.1 m long
// 2.94604 W; T(r) = T_i - dT ln(r/r_i)/ln(r_o/r_i), T(0.075) = 147.9097 degC.
TEST(HollowCylinder, RadialConductionThroughTheSector) {
  const Mesh mesh = mesh_script("c03.geo", cylinder_sector, 0.008, 2);
  ThermalProblem p = problem_for(mesh, {{"shell", 0.05}});
  condition(mesh, p, "inner").temperature = 300 + celsius;
  condition(mesh, p, "outer").temperature = 40 + celsius;
  const Solved s = solve(mesh, p);
  const double q_sector = 2 * pi * 0.05 * 260 / std::log(2.0) * 0.1 / 4;
  EXPECT_NEAR(q_sector, 2.94604, 1e-5);  // the published number
  EXPECT_NEAR(s.heat_rate(mesh, "inner"), q_sector, 1e-3 * q_sector);    // 0.1 %
  EXPECT_NEAR(s.heat_rate(mesh, "outer"), -q_sector, 1e-3 * q_sector);
  const double r = 0.075, c = std::cos(pi / 6), sn = std::sin(pi / 6);
  EXPECT_NEAR(temperature_at(mesh, s.solution.temperature, {r * c, r * sn, 0.05}) - celsius, 147.9097, 0.1);
  EXPECT_LT(std::abs(s.results.balance.relative_imbalance), 1e-9);
}

// C03(b): outer face convection h = 8 to 20 degC. Same source: q' = 116.4096 W/m (sector
// 2.91024 W), T(r_o) = 43.1590 degC.
TEST(HollowCylinder, ConvectingOuterFace) {
  const Mesh mesh = mesh_script("c03b.geo", cylinder_sector, 0.006, 2);
  ThermalProblem p = problem_for(mesh, {{"shell", 0.05}});
  condition(mesh, p, "inner").temperature = 300 + celsius;
  condition(mesh, p, "outer").convection = Convection{8, 20 + celsius};
  const Solved s = solve(mesh, p);
  EXPECT_NEAR(s.heat_rate(mesh, "inner"), 2.91024, 1e-3 * 2.91024);
  EXPECT_NEAR(s.heat_rate(mesh, "outer"), -2.91024, 1e-3 * 2.91024);
  EXPECT_NEAR(s.results.boundaries[boundary_index(mesh, "outer")].temperature.mean - celsius, 43.1590, 1e-3 * (43.1590 - 20));
  EXPECT_LT(std::abs(s.results.balance.relative_imbalance), 1e-9);
}

// C04: k = 1.5, T(0.1) = 500, T(0.2) = 100 degC. Source: Incropera & DeWitt Table 3.3 (from
// memory): Q = 4 pi k dT / (1/r_i - 1/r_o) = 1507.964 W, octant 188.4956 W; T(0.15) = 233.3333.
TEST(HollowSphere, RadialConductionThroughTheOctant) {
  const Mesh mesh = mesh_script("c04.geo", sphere_octant, 0.02, 2);
  ThermalProblem p = problem_for(mesh, {{"shell", 1.5}});
  condition(mesh, p, "inner").temperature = 500 + celsius;
  condition(mesh, p, "outer").temperature = 100 + celsius;
  const Solved s = solve(mesh, p);
  EXPECT_NEAR(s.heat_rate(mesh, "inner"), 188.4956, 1e-3 * 188.4956);
  EXPECT_NEAR(s.heat_rate(mesh, "outer"), -188.4956, 1e-3 * 188.4956);
  const double a = 0.15 / std::sqrt(3.0);
  EXPECT_NEAR(temperature_at(mesh, s.solution.temperature, {a, a, a}) - celsius, 233.3333, 0.4);
  // The curved faces are meshed onto the spheres: the octant's volume is pi/6 (r_o^3 - r_i^3).
  EXPECT_NEAR(s.results.regions[0].volume, pi / 6 * (0.008 - 0.001), 1e-4 * pi / 6 * 0.007);
}

}  // namespace
}  // namespace hearth::testing
