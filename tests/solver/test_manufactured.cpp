// Manufactured solution on the unit cube (C25): T* = sin(pi x) sin(pi y) sin(pi z),
// f = 3 pi^2 k T*, T = 0 on all faces, on a mesh refined uniformly three times (every
// tetrahedron split into eight, h halved each time; 10-node levels add straight edge nodes). Expected L2 orders p + 1 and H1
// orders p. Sources: Ciarlet, The Finite Element Method for Elliptic Problems (1978);
// Brenner & Scott, The Mathematical Theory of Finite Element Methods (2008); method of
// manufactured solutions: Roache, Verification and Validation in Computational Science
// and Engineering (1998) [all from memory].
#include "verification_support.hpp"

#include <cmath>

#include "mesh/straight_refinement.hpp"
#include "solver/assembler.hpp"
#include "solver/quadrature.hpp"

namespace hearth::testing {
namespace {

const double pi = std::acos(-1.0);

double exact(const Point& x) { return std::sin(pi * x[0]) * std::sin(pi * x[1]) * std::sin(pi * x[2]); }
Point exact_gradient(const Point& x) {
  const double sx = std::sin(pi * x[0]), sy = std::sin(pi * x[1]), sz = std::sin(pi * x[2]);
  const double cx = std::cos(pi * x[0]), cy = std::cos(pi * x[1]), cz = std::cos(pi * x[2]);
  return {pi * cx * sy * sz, pi * sx * cy * sz, pi * sx * sy * cz};
}

const char* unit_cube = R"(SetFactory("OpenCASCADE");
Box(1) = {0, 0, 0, 1, 1, 1};
Physical Volume("cube") = {1};
Physical Surface("faces") = {1, 2, 3, 4, 5, 6};
)";

struct Errors {
  double l2 = 0.0, h1 = 0.0;
};

// Errors integrated with a rule of degree 2p + 2, as the check requires.
// f = -div(K grad T*) = -sum_ij K_ij d_i d_j T*, with d_i d_i T* = -pi^2 T* and, for i != j,
// d_i d_j T* = pi^2 cos(pi x_i) cos(pi x_j) sin(pi x_k).
double manufactured_source(const Matrix3& K, const Point& x) {
  const double s[3] = {std::sin(pi * x[0]), std::sin(pi * x[1]), std::sin(pi * x[2])};
  const double c[3] = {std::cos(pi * x[0]), std::cos(pi * x[1]), std::cos(pi * x[2])};
  double f = (K[0][0] + K[1][1] + K[2][2]) * pi * pi * s[0] * s[1] * s[2];
  f -= 2 * K[0][1] * pi * pi * c[0] * c[1] * s[2];
  f -= 2 * K[0][2] * pi * pi * c[0] * s[1] * c[2];
  f -= 2 * K[1][2] * pi * pi * s[0] * c[1] * c[2];
  return f;
}

Errors solve_and_measure(const Mesh& mesh, const Matrix3& K) {
  const int order = mesh.order;
  ThermalProblem p = problem_for(mesh, {{"cube", 1.0}});
  p.regions[0].conductivity = Conductivity::full(K);
  condition(mesh, p, "faces").temperature = 0.0;
  p.source_field = [K](const Point& x) { return manufactured_source(K, x); };
  p.source_field_degree = order + 4;
  LinearSolverSettings settings;
  settings.tolerance = 1e-12;
  const SteadySolution s = solve_steady(mesh, p, settings);
  EXPECT_TRUE(s.converged());
  Errors e;
  double N[max_tet_nodes], grad[max_tet_nodes][3];
  for (std::size_t el = 0; el < mesh.n_tets(); ++el) {
    const TetGeometry g = tet_geometry(mesh, el);
    for (const auto& q : tet_rule(2 * order + 2)) {
      tet_shape_values(order, q.xi, N);
      const double w = q.weight * tet_physical_gradients(g, q.xi, grad);
      double t = 0.0;
      Point gt{0, 0, 0};
      for (int a = 0; a < mesh.nodes_per_tet(); ++a) {
        const double ta = s.temperature[mesh.tet(el)[a]];
        t += N[a] * ta;
        for (int d = 0; d < 3; ++d) gt[d] += grad[a][d] * ta;
      }
      const Point x = tet_map(g, q.xi);
      const Point ge = exact_gradient(x);
      e.l2 += w * (t - exact(x)) * (t - exact(x));
      for (int d = 0; d < 3; ++d) e.h1 += w * (gt[d] - ge[d]) * (gt[d] - ge[d]);
    }
  }
  e.l2 = std::sqrt(e.l2) / 0.3535533906;  // |T*|_L2 = (1/2)^(3/2)
  e.h1 = std::sqrt(e.h1) / 1.9238247452;  // |T*|_H1 = sqrt(3) pi (1/2)^(3/2)
  return e;
}

void expect_orders(int order, double base_size, int finest, const Matrix3& K) {
  MeshRequest request;
  request.geometry_file = scratch_file("c25.geo", unit_cube);
  request.size = base_size;
  // Nested levels, h halved each time: every tetrahedron of the level before split into
  // eight around the shortest octahedron diagonal, which keeps the quality bounded.
  std::vector<Errors> errors;
  Mesh linear = build_mesh(request);
  for (int level = 0; level <= finest; ++level) {
    if (level > 0) linear = refine_straight(linear);
    errors.push_back(solve_and_measure(order == 1 ? linear : elevate_straight(linear), K));
  }
  for (std::size_t k = 1; k < errors.size(); ++k)
    std::printf("P%d level %zu: L2 %.3e (order %.2f), H1 %.3e (order %.2f)\n", order, k, errors[k].l2,
                std::log2(errors[k - 1].l2 / errors[k].l2), errors[k].h1, std::log2(errors[k - 1].h1 / errors[k].h1));
  const Errors& fine = errors[finest];
  const Errors& medium = errors[finest - 1];
  EXPECT_NEAR(std::log2(medium.l2 / fine.l2), order + 1.0, 0.15);
  EXPECT_NEAR(std::log2(medium.h1 / fine.h1), order, 0.15);
}

const Matrix3 unit = {{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}};
// A full symmetric positive-definite tensor (eigenvalues about 1.92, 2.59, 5.50; C24(d)).
const Matrix3 full_tensor = {{{5, 1, 0.5}, {1, 3, 0.2}, {0.5, 0.2, 2}}};

TEST(ManufacturedSolution, P1ConvergesAtSecondOrderInL2) { expect_orders(1, 0.2, 3, unit); }
TEST(ManufacturedSolution, P2ConvergesAtThirdOrderInL2) { expect_orders(2, 0.25, 3, unit); }
TEST(ManufacturedSolution, P1WithAFullTensorConvergesAtSecondOrder) { expect_orders(1, 0.2, 3, full_tensor); }
TEST(ManufacturedSolution, P2WithAFullTensorConvergesAtThirdOrder) { expect_orders(2, 0.25, 3, full_tensor); }

}  // namespace
}  // namespace hearth::testing
