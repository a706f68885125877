// Verification of the nonlinear terms: temperature-dependent conductivity (C20),
// radiation with convection (C21), and Newton's convergence.
#include "verification_support.hpp"

#include <cmath>

namespace hearth::testing {
namespace {

const double pi = std::acos(-1.0);

// k = 0.8 (1 + 0.001 T[degC]) as a two-point table in kelvin, exact inside 0..1000 degC
// and beyond the range of the checks (the table is held constant outside it).
Conductivity linear_in_temperature() {
  return Conductivity::isotropic(PiecewiseLinear({celsius - 200, celsius + 1200}, {0.8 * 0.8, 0.8 * 2.2}));
}

// The C20(a) slab: k(T) below, 1000 degC on x = 0, 100 degC on x = L.
ThermalProblem kirchhoff_slab(const Mesh& mesh) {
  ThermalProblem p = problem_for(mesh, {{"wall", 1.0}});
  p.regions[0].conductivity = linear_in_temperature();
  condition(mesh, p, "x0").temperature = 1000 + celsius;
  condition(mesh, p, "x1").temperature = 100 + celsius;
  return p;
}

// C20(a): slab L = 0.2 m, T(0) = 1000, T(L) = 100 degC. Kirchhoff transformation (Carslaw &
// Jaeger; textbook problems on k = k0(1 + beta T) in Incropera and Cengel, from memory):
// q'' = (k0/L)[(T1 - T2) + beta/2 (T1^2 - T2^2)] = 5580.0 W/m2; T(0.05) = 817.2782,
// T(0.10) = 614.0012, T(0.15) = 381.1227 degC (verification.md C20, numbers recomputed).
TEST(TemperatureDependentConductivity, SlabFollowsTheKirchhoffProfile) {
  const Mesh mesh = mesh_script("c20a.geo", prism(0.2, 0.05), 0.02, 2);
  const ThermalProblem p = kirchhoff_slab(mesh);
  const Solved s = solve(mesh, p);
  const double area = 0.05 * 0.05;
  EXPECT_NEAR(s.heat_rate(mesh, "x0") / area, 5580.0, 1e-4 * 5580.0);
  EXPECT_NEAR(s.heat_rate(mesh, "x1") / area, -5580.0, 1e-4 * 5580.0);
  // The band at a point: the error bound of quadratic interpolation on an interval of
  // length h, h^3 / (9 sqrt 3) max|T'''|, the Lagrange remainder (Burden & Faires,
  // Numerical Analysis, from memory), with max|T'''| taken over [x, x + h] where it
  // grows, and twice that for unstructured tetrahedra up to 1.26 h (project choice).
  // Here (1 + beta T)^2 = u(x) = 4 - 13.95 x, so |T'''| = (3/8) 13.95^3 u^(-5/2) / beta.
  const double h = 0.02, beta = 0.001;
  auto third_derivative = [&](double x) { return 0.375 * std::pow(13.95, 3) * std::pow(4 - 13.95 * x, -2.5) / beta; };
  const std::vector<std::pair<double, double>> profile = {{0.05, 817.2782}, {0.10, 614.0012}, {0.15, 381.1227}};
  for (const auto& [x, expected] : profile) {
    const double band = 2 * std::pow(h, 3) / (9 * std::sqrt(3.0)) * third_derivative(x + h);  // 0.07, 0.13, 0.31 K
    EXPECT_NEAR(temperature_at(mesh, s.solution.temperature, {x, 0.021, 0.032}) - celsius, expected, band);
  }
  EXPECT_LT(std::abs(s.results.balance.relative_imbalance), 1e-8);
  // The last Newton step: GMRES on the exact, non-symmetric Jacobian, preconditioned by
  // the kept Cholesky factor of the first step's (symmetric) Picard matrix.
  EXPECT_EQ(s.solution.linear.solver, "cholmod-gmres");
}

// Newton converges quadratically (Kelley, Iterative Methods for Linear and Nonlinear
// Equations, 1995, from memory): once close, each residual is about the square of the
// last, so log r_{k+1} / log r_k approaches 2 for relative residuals below 1.
TEST(TemperatureDependentConductivity, NewtonConvergesQuadratically) {
  const Mesh mesh = mesh_script("c20q.geo", prism(0.2, 0.05), 0.025, 1);
  ThermalProblem p = problem_for(mesh, {{"wall", 1.0}});
  p.regions[0].conductivity = linear_in_temperature();
  condition(mesh, p, "x0").temperature = 1000 + celsius;
  condition(mesh, p, "x1").convection = Convection{15, 20 + celsius};
  const Solved s = solve(mesh, p, LinearSolverKind::direct);
  const auto& h = s.solution.history;
  ASSERT_GE(h.size(), 3u);
  EXPECT_LE(h.size(), 8u);
  bool quadratic_step = false;
  for (std::size_t k = 1; k + 1 < h.size(); ++k) {
    const double r0 = h[k].relative_residual, r1 = h[k + 1].relative_residual;
    std::printf("newton %zu: relative residual %.3e -> %.3e, ratio of logs %.2f\n", k, r0, r1,
                std::log(r1) / std::log(r0));
    if (r0 < 1e-2 && r1 > 1e-14 && std::log(r1) / std::log(r0) > 1.7) quadratic_step = true;
  }
  EXPECT_TRUE(quadratic_step);
  EXPECT_TRUE(s.solution.nonlinear_converged);
}

// Inexact Newton with multigrid (Eisenstat & Walker, SIAM J. Sci. Comput. 17, 1996,
// from memory): loose Krylov tolerances far from the answer, tight ones near it, reach
// the same discrete answer as the direct path (a kept factorisation), to the Newton
// tolerance, and the C20(a) flux of 5580.0 W/m2 (Kirchhoff transformation, as above).
TEST(TemperatureDependentConductivity, InexactNewtonWithMultigridMatchesTheDirectPath) {
  const Mesh mesh = mesh_script("c20i.geo", prism(0.2, 0.05), 0.02, 1);
  const ThermalProblem p = kirchhoff_slab(mesh);
  const Solved direct = solve(mesh, p, LinearSolverKind::direct);
  const Solved inexact = solve(mesh, p, LinearSolverKind::iterative, 1e-10);
  EXPECT_EQ(inexact.solution.linear.solver, "boomeramg-gmres");
  const auto& h = inexact.solution.history;
  ASSERT_GE(h.size(), 3u);
  EXPECT_DOUBLE_EQ(h.front().linear_tolerance, 0.1);          // the first step: loose
  EXPECT_LT(h.front().linear_iterations, h[h.size() - 2].linear_iterations);  // tighter near the end
  EXPECT_LE(inexact.solution.nonlinear_relative_residual, 1e-8);  // the Newton target
  const double area = 0.05 * 0.05;
  EXPECT_NEAR(inexact.heat_rate(mesh, "x0") / area, 5580.0, 1e-4 * 5580.0);
  // Both solve the same discrete equations to |R| <= 1e-8 |R0|: the heat rates agree to
  // about that (relative to the rates), with a margin of 100.
  EXPECT_NEAR(inexact.heat_rate(mesh, "x0"), direct.heat_rate(mesh, "x0"), 1e-6 * std::abs(direct.heat_rate(mesh, "x0")));
  double worst = 0;
  for (std::size_t i = 0; i < mesh.n_nodes(); ++i)
    worst = std::max(worst, std::abs(inexact.solution.temperature[i] - direct.solution.temperature[i]));
  std::printf("inexact flux %.4f W/m2, direct-path flux %.4f, largest difference %.2e K\n", inexact.heat_rate(mesh, "x0") / area, direct.heat_rate(mesh, "x0") / area, worst);
  EXPECT_LT(worst, 1e-5);  // K, against temperatures of about 1000 K: 1e-8 relative
}

// C20(b): cylinder r_i = 0.1, r_o = 0.3 (90-degree sector, 0.1 m long), T(r_i) = 1000,
// T(r_o) = 100 degC. Same source: q' = 2 pi k0 [(T1 - T2) + beta/2 (T1^2 - T2^2)] / ln(r_o/r_i)
// = 6382.629 W/m (sector: 159.5657 W); T(0.2) = 496.5647 degC.
TEST(TemperatureDependentConductivity, CylinderFollowsTheKirchhoffProfile) {
  const char* sector = R"(SetFactory("OpenCASCADE");
Cylinder(1) = {0, 0, 0, 0, 0, 0.1, 0.3, Pi/2};
Cylinder(2) = {0, 0, 0, 0, 0, 0.1, 0.1, Pi/2};
BooleanDifference(3) = { Volume{1}; Delete; }{ Volume{2}; Delete; };
eps = 1e-6;
inner() = Surface In BoundingBox{-eps, -eps, -eps, 0.1 + eps, 0.1 + eps, 0.1 + eps};
all() = Abs(Boundary{ Volume{3}; });
flat() = Surface In BoundingBox{-eps, -eps, -eps, eps, 0.3 + eps, 0.1 + eps};
flat() += Surface In BoundingBox{-eps, -eps, -eps, 0.3 + eps, eps, 0.1 + eps};
flat() += Surface In BoundingBox{-eps, -eps, -eps, 0.3 + eps, 0.3 + eps, eps};
flat() += Surface In BoundingBox{-eps, -eps, 0.1 - eps, 0.3 + eps, 0.3 + eps, 0.1 + eps};
outer() = all();
outer() -= {inner(), flat()};
Physical Volume("wall") = {3};
Physical Surface("inner") = {inner()};
Physical Surface("outer") = {outer()};
)";
  const Mesh mesh = mesh_script("c20b.geo", sector, 0.02, 2);
  ThermalProblem p = problem_for(mesh, {{"wall", 1.0}});
  p.regions[0].conductivity = linear_in_temperature();
  condition(mesh, p, "inner").temperature = 1000 + celsius;
  condition(mesh, p, "outer").temperature = 100 + celsius;
  const Solved s = solve(mesh, p);
  EXPECT_NEAR(s.heat_rate(mesh, "inner"), 159.5657, 1e-3 * 159.5657);
  const double r = 0.2;
  EXPECT_NEAR(temperature_at(mesh, s.solution.temperature, {r * std::cos(pi / 5), r * std::sin(pi / 5), 0.05}) -
                  celsius,
              496.5647, 0.1);
}

// C21: slab L = 0.2, k = 0.5; T = 1100 degC inside; outside convection h = 10 to 300 K and
// radiation eps = 0.8 to 300 K. Surface energy balance (Incropera & DeWitt ch. 1 and
// section 3.1, from memory): Ts = 425.2961 K, q'' = 2369.635 W/m2 (convection 1252.961,
// radiation 1116.674). The profile is linear, so P1 is exact once Newton has converged.
TEST(Radiation, SlabWithConvectionAndRadiationSolvesTheQuarticBalance) {
  for (int order : {1, 2}) {
    const Mesh mesh = mesh_script("c21.geo", prism(0.2, 0.05), 0.025, order);
    ThermalProblem p = problem_for(mesh, {{"wall", 0.5}});
    condition(mesh, p, "x0").temperature = 1100 + celsius;
    auto& outer = condition(mesh, p, "x1");
    outer.convection = Convection{10, 300};
    outer.radiation = Radiation{0.8, 300};
    const Solved s = solve(mesh, p);
    const auto& face = s.results.boundaries[boundary_index(mesh, "x1")];
    EXPECT_NEAR(face.temperature.mean, 425.2961, 0.05);
    EXPECT_NEAR(face.temperature.max, 425.2961, 0.05);
    const double area = 0.05 * 0.05;
    EXPECT_NEAR(s.heat_rate(mesh, "x0") / area, 2369.635, 0.01);
    EXPECT_NEAR(s.heat_rate(mesh, "x1") / area, -2369.635, 0.01);
    EXPECT_LT(std::abs(s.results.balance.relative_imbalance), 1e-8);
    EXPECT_EQ(s.solution.linear.solver, "cholmod-gmres");  // on the kept Cholesky factor
  }
}

// Temperature-dependent film coefficient: h(T) as a table; at the converged state the
// face obeys k (T1 - Ts)/L = h(Ts)(Ts - T_inf) (surface energy balance, same source).
TEST(Radiation, FilmCoefficientTableMeetsTheSurfaceBalance) {
  const Mesh mesh = mesh_script("hT.geo", prism(0.1, 0.05), 0.025, 1);
  ThermalProblem p = problem_for(mesh, {{"wall", 2.0}});
  condition(mesh, p, "x0").temperature = 400 + celsius;
  condition(mesh, p, "x1").convection = Convection{PiecewiseLinear({celsius, celsius + 400}, {5.0, 25.0}), 20 + celsius};
  const Solved s = solve(mesh, p);
  const double ts = s.results.boundaries[boundary_index(mesh, "x1")].temperature.mean;
  const double h = 5.0 + 20.0 * (ts - celsius) / 400;
  EXPECT_NEAR(2.0 * (400 + celsius - ts) / 0.1, h * (ts - 20 - celsius), 1e-6 * 2.0 * 400 / 0.1);
}

}  // namespace
}  // namespace hearth::testing
