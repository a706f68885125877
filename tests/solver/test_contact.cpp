// Thermal contact conductance across a cut internal surface (C05).
#include "verification_support.hpp"

#include <cmath>

#include "mesh/interface_split.hpp"

namespace hearth::testing {
namespace {

// C05: two blocks of aluminium alloy 2024-T6 (k = 177), each 20 mm thick, interface at
// x = 20 mm with R''_tc = 2.0e-4 m2K/W (h_c = 5000 W/(m2 K)); T(0) = 100, T(40 mm) = 20 degC.
// Series resistances (Incropera & DeWitt section 3.1.4; R''_tc inside the Table 3.1 range
// for aluminium interfaces, from memory): q'' = 187 798.4 W/m2; interface sides 78.7798 and
// 41.2202 degC; jump 37.5597 K. The profile is piecewise linear: exact to round-off.
TEST(ThermalContact, TwoAluminiumBlocksWithContactResistance) {
  const char* script = R"(SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 0.02, 0.03, 0.03};
Box(2) = {0.02, 0, 0, 0.02, 0.03, 0.03};
v() = BooleanFragments{ Volume{1, 2}; Delete; }{};
eps = 1e-7;
Physical Volume("left") = {Volume In BoundingBox{-eps, -eps, -eps, 0.02 + eps, 0.03 + eps, 0.03 + eps}};
Physical Volume("right") = {Volume In BoundingBox{0.02 - eps, -eps, -eps, 0.04 + eps, 0.03 + eps, 0.03 + eps}};
Physical Surface("hot") = {Surface In BoundingBox{-eps, -eps, -eps, eps, 0.03 + eps, 0.03 + eps}};
Physical Surface("cold") = {Surface In BoundingBox{0.04 - eps, -eps, -eps, 0.04 + eps, 0.03 + eps, 0.03 + eps}};
Physical Surface("contact") = {Surface In BoundingBox{0.02 - eps, -eps, -eps, 0.02 + eps, 0.03 + eps, 0.03 + eps}};
)";
  for (int order : {1, 2}) {
    Mesh mesh = mesh_script("c05.geo", script, 0.008, order);
    const int contact = boundary_index(mesh, "contact");
    EXPECT_GT(split_interface(mesh, contact), 0u);
    ThermalProblem p = problem_for(mesh, {{"left", 177.0}, {"right", 177.0}});
    condition(mesh, p, "hot").temperature = 100 + celsius;
    condition(mesh, p, "cold").temperature = 20 + celsius;
    condition(mesh, p, "contact").contact_conductance = 1 / 2.0e-4;
    const Solved s = solve(mesh, p);
    const double area = 0.03 * 0.03, q = 187798.4;
    EXPECT_NEAR(s.heat_rate(mesh, "hot") / area, q, 1e-6 * q);
    EXPECT_NEAR(s.heat_rate(mesh, "cold") / area, -q, 1e-6 * q);
    // Across the contact: positive along the surface normal, whichever way Gmsh made it.
    std::size_t first = 0;
    while (mesh.face_boundary[first] != contact) ++first;
    const auto n0 = mesh.node(mesh.face(first)[0]), n1 = mesh.node(mesh.face(first)[1]), n2 = mesh.node(mesh.face(first)[2]);
    const double normal_x = (n1[1] - n0[1]) * (n2[2] - n0[2]) - (n1[2] - n0[2]) * (n2[1] - n0[1]);
    const double sign = normal_x > 0 ? 1.0 : -1.0;
    EXPECT_NEAR(sign * s.heat_rate(mesh, "contact") / area, q, 1e-6 * q);
    for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
      if (mesh.face_boundary[f] != contact) continue;
      for (int a = 0; a < mesh.nodes_per_face(); ++a) {
        const double behind = s.solution.temperature[mesh.face(f)[a]] - celsius;
        const double front = s.solution.temperature[mesh.face_twin(f)[a]] - celsius;
        const double left = sign > 0 ? behind : front, right = sign > 0 ? front : behind;
        ASSERT_NEAR(left, 78.7798, 1e-4);
        ASSERT_NEAR(right, 41.2202, 1e-4);
        ASSERT_NEAR(left - right, 37.5597, 1e-4);
      }
    }
    EXPECT_LT(std::abs(s.results.balance.relative_imbalance), 1e-9);
    EXPECT_TRUE(s.results.boundaries[contact].internal);
  }
}

}  // namespace
}  // namespace hearth::testing
