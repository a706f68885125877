// Verification on "1D in 3D" prisms with unstructured tetrahedra: plane wall (C01),
// four-layer furnace wall with convection on both faces (C02), slab with uniform
// generation (C06). The exact solutions are piecewise linear or quadratic, so P1 (linear)
// and P2 (both) must reproduce them to round-off.
#include "verification_support.hpp"

#include <cmath>

namespace hearth::testing {
namespace {

class PlaneWall : public ::testing::TestWithParam<int> {};

// C01(a). Source: Fourier's law, 1D steady solution T(x) = T0 - (T0 - T1) x / L
// (Incropera & DeWitt, Table 3.3, from memory). Numbers: T(x) = 1000 - 3200 x degC,
// T(0.1) = 680 degC, q'' = 3520 W/m2, 35.2 W through the 0.01 m2 ends (closed form).
TEST_P(PlaneWall, FixedTemperaturesReproduceTheLinearProfile) {
  const int order = GetParam();
  const Mesh mesh = mesh_script("c01.geo", prism(0.25, 0.1), 0.04, order);
  ThermalProblem p = problem_for(mesh, {{"wall", 1.1}});
  condition(mesh, p, "x0").temperature = 1000 + celsius;
  condition(mesh, p, "x1").temperature = 200 + celsius;
  const Solved s = solve(mesh, p);
  for (std::size_t i = 0; i < mesh.n_nodes(); ++i)
    ASSERT_NEAR(s.solution.temperature[i] - celsius, 1000 - 3200 * mesh.coords[3 * i], 1e-9 * 1000);
  EXPECT_NEAR(temperature_at(mesh, s.solution.temperature, {0.1, 0.037, 0.061}) - celsius, 680.0, 1e-9 * 680);
  EXPECT_NEAR(s.heat_rate(mesh, "x0"), 35.2, 1e-9 * 35.2);
  EXPECT_NEAR(s.heat_rate(mesh, "x1"), -35.2, 1e-9 * 35.2);
  for (std::size_t i = 0; i < mesh.n_nodes(); ++i) {
    ASSERT_NEAR(s.results.nodal_flux[3 * i], 3520.0, 1e-6 * 3520);
    ASSERT_NEAR(s.results.nodal_flux[3 * i + 1], 0.0, 1e-6 * 3520);
  }
  EXPECT_LT(std::abs(s.results.balance.relative_imbalance), 1e-9);
}

// C01(b). Same source: prescribed q'' = 3520 W/m2 into x = 0 with T(0.25) = 200 degC gives
// T(0) = 1000 degC (closed form).
TEST_P(PlaneWall, PrescribedFluxGivesTheHotFaceTemperature) {
  const int order = GetParam();
  const Mesh mesh = mesh_script("c01b.geo", prism(0.25, 0.1), 0.04, order);
  ThermalProblem p = problem_for(mesh, {{"wall", 1.1}});
  condition(mesh, p, "x0").heat_flux = 3520;
  condition(mesh, p, "x1").temperature = 200 + celsius;
  const Solved s = solve(mesh, p);
  const auto& hot = s.results.boundaries[boundary_index(mesh, "x0")];
  EXPECT_NEAR(hot.temperature.max - celsius, 1000.0, 1e-9 * 1000);
  EXPECT_NEAR(hot.temperature.min - celsius, 1000.0, 1e-9 * 1000);
  EXPECT_NEAR(s.heat_rate(mesh, "x0"), 35.2, 1e-9 * 35.2);
  EXPECT_NEAR(s.heat_rate(mesh, "x1"), -35.2, 1e-9 * 35.2);
}

// C02: fireclay brick 0.230 m (k 1.10), insulating firebrick 0.115 (0.25), calcium silicate
// 0.050 (0.07), steel 0.006 (45); h_i = 50 to 1100 degC, h_o = 10 to 25 degC. Series thermal
// resistances (Incropera & DeWitt section 3.1; Cengel & Ghajar ch. 3, from memory):
// U = 0.665110 W/(m2 K), q'' = 714.994 W/m2, hot face 1085.700, interfaces 936.202,
// 607.304, 96.595, cold face 96.499 degC (verification.md C02, numbers recomputed).
TEST_P(PlaneWall, FourLayerFurnaceWallOverallCoefficient) {
  const int order = GetParam();
  const std::string script = R"(SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 0.230, 0.1, 0.1};
Box(2) = {0.230, 0, 0, 0.115, 0.1, 0.1};
Box(3) = {0.345, 0, 0, 0.050, 0.1, 0.1};
Box(4) = {0.395, 0, 0, 0.006, 0.1, 0.1};
v() = BooleanFragments{ Volume{1, 2, 3, 4}; Delete; }{};
eps = 1e-6;
Physical Volume("brick") = {Volume In BoundingBox{-eps, -eps, -eps, 0.230 + eps, 0.1 + eps, 0.1 + eps}};
Physical Volume("ifb") = {Volume In BoundingBox{0.230 - eps, -eps, -eps, 0.345 + eps, 0.1 + eps, 0.1 + eps}};
Physical Volume("casi") = {Volume In BoundingBox{0.345 - eps, -eps, -eps, 0.395 + eps, 0.1 + eps, 0.1 + eps}};
Physical Volume("steel") = {Volume In BoundingBox{0.395 - eps, -eps, -eps, 0.401 + eps, 0.1 + eps, 0.1 + eps}};
Physical Surface("hot") = {Surface In BoundingBox{-eps, -eps, -eps, eps, 0.1 + eps, 0.1 + eps}};
Physical Surface("cold") = {Surface In BoundingBox{0.401 - eps, -eps, -eps, 0.401 + eps, 0.1 + eps, 0.1 + eps}};
)";
  const Mesh mesh = mesh_script("c02.geo", script, 0.03, order);
  ThermalProblem p = problem_for(mesh, {{"brick", 1.10}, {"ifb", 0.25}, {"casi", 0.07}, {"steel", 45.0}});
  condition(mesh, p, "hot").convection = Convection{50, 1100 + celsius};
  condition(mesh, p, "cold").convection = Convection{10, 25 + celsius};
  const Solved s = solve(mesh, p);
  // Closed form, evaluated here from the same resistances.
  const double R = 1 / 50.0 + 0.230 / 1.10 + 0.115 / 0.25 + 0.050 / 0.07 + 0.006 / 45.0 + 1 / 10.0;
  const double q = (1100 - 25) / R;
  EXPECT_NEAR(1 / R, 0.665110, 1e-6);  // published value, 6 digits
  EXPECT_NEAR(q, 714.994, 1e-3);
  const double area = 0.01;
  EXPECT_NEAR(s.heat_rate(mesh, "hot"), q * area, 1e-8 * q * area);
  EXPECT_NEAR(s.heat_rate(mesh, "cold"), -q * area, 1e-8 * q * area);
  const std::vector<std::pair<double, double>> interfaces = {
      {0.0, 1085.700}, {0.230, 936.202}, {0.345, 607.304}, {0.395, 96.595}, {0.401, 96.499}};
  for (const auto& [x, expected] : interfaces) {
    const double t = temperature_at(mesh, s.solution.temperature, {x, 0.043, 0.071}) - celsius;
    EXPECT_NEAR(t, expected, 1e-3) << "at x = " << x;  // 6 published digits
  }
  EXPECT_LT(std::abs(s.results.balance.relative_imbalance), 1e-9);
}

// C06: slab 2L = 0.1 m, k = 15, uniform q = 5e5 W/m3. Source: Incropera & DeWitt section 3.5
// (from memory). (a) both faces 100 degC: T(x) = Ts + qL^2/(2k)(1 - x^2/L^2), T_max = 141.6667,
// T(+-L/2) = 131.25 degC, face flux qL = 25 000 W/m2. P2 reproduces the parabola exactly.
TEST(SlabWithGeneration, P2ReproducesTheParabolaAndTheBalanceCloses) {
  const Mesh mesh = mesh_script("c06.geo", prism(0.1, 0.05), 0.02, 2);
  ThermalProblem p = problem_for(mesh, {{"wall", 15.0}}, {{"wall", 5e5}});
  condition(mesh, p, "x0").temperature = 100 + celsius;
  condition(mesh, p, "x1").temperature = 100 + celsius;
  const Solved s = solve(mesh, p);
  const double L = 0.05, k = 15, q = 5e5;
  for (std::size_t i = 0; i < mesh.n_nodes(); ++i) {
    const double x = mesh.coords[3 * i] - L;
    ASSERT_NEAR(s.solution.temperature[i] - celsius, 100 + q * L * L / (2 * k) * (1 - x * x / (L * L)), 1e-8);
  }
  EXPECT_NEAR(temperature_at(mesh, s.solution.temperature, {0.05, 0.02, 0.03}) - celsius, 141.6667, 1e-4);
  EXPECT_NEAR(temperature_at(mesh, s.solution.temperature, {0.025, 0.01, 0.04}) - celsius, 131.25, 1e-8);
  const double face = 0.05 * 0.05;
  EXPECT_NEAR(s.heat_rate(mesh, "x0"), -25000 * face, 1e-8 * 25000 * face);
  EXPECT_NEAR(s.heat_rate(mesh, "x1"), -25000 * face, 1e-8 * 25000 * face);
  EXPECT_NEAR(s.results.balance.sources, q * 0.1 * face, 1e-10 * q * 0.1 * face);
  EXPECT_LT(std::abs(s.results.balance.relative_imbalance), 1e-10);
}

// C06(b): half model, x = 0 symmetry, x = L convection h = 250 to 20 degC: Ts = T_inf + qL/h
// = 120.0 degC, T_max = Ts + qL^2/(2k) = 161.6667 degC (same source).
TEST(SlabWithGeneration, ConvectingFaceOfTheHalfModel) {
  const Mesh mesh = mesh_script("c06b.geo", prism(0.05, 0.05), 0.015, 2);
  ThermalProblem p = problem_for(mesh, {{"wall", 15.0}}, {{"wall", 5e5}});
  condition(mesh, p, "x1").convection = Convection{250, 20 + celsius};
  const Solved s = solve(mesh, p);
  const auto& face = s.results.boundaries[boundary_index(mesh, "x1")];
  EXPECT_NEAR(face.temperature.mean - celsius, 120.0, 1e-7);
  const auto& region = s.results.regions[region_index(mesh, "wall")];
  EXPECT_NEAR(region.temperature.max - celsius, 161.6667, 1e-4);
  EXPECT_NEAR(s.heat_rate(mesh, "x1"), -5e5 * 0.05 * 0.05 * 0.05, 1e-8);
}

INSTANTIATE_TEST_SUITE_P(LinearAndQuadratic, PlaneWall, ::testing::Values(1, 2),
                         [](const auto& info) { return info.param == 1 ? "P1" : "P2"; });

}  // namespace
}  // namespace hearth::testing
