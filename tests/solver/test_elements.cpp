// Unit checks of shape functions, quadrature and element matrices on tiny hand-checkable
// elements. Expected values are closed forms named beside each check.
#include <gtest/gtest.h>

#include <cmath>
#include <random>

#include "solver/local_terms.hpp"
#include "solver/quadrature.hpp"
#include "solver/shape_functions.hpp"
#include "solver/tet_element.hpp"

namespace hearth {
namespace {

double factorial(int n) { return n <= 1 ? 1.0 : n * factorial(n - 1); }

// Closed form: int over the unit tetrahedron of x^a y^b z^c = a! b! c! / (a+b+c+3)!
// (Dirichlet's integral; e.g. Zienkiewicz & Taylor, The Finite Element Method, vol. 1,
// section on natural coordinates, from memory).
TEST(Quadrature, TetRulesAreExactUpToTheirDegree) {
  for (int degree = 1; degree <= 8; ++degree) {
    for (int a = 0; a <= degree; ++a)
      for (int b = 0; a + b <= degree; ++b)
        for (int c = 0; a + b + c <= degree; ++c) {
          double sum = 0.0;
          for (const auto& q : tet_rule(degree))
            sum += q.weight * std::pow(q.xi[0], a) * std::pow(q.xi[1], b) * std::pow(q.xi[2], c);
          const double exact = factorial(a) * factorial(b) * factorial(c) / factorial(a + b + c + 3);
          EXPECT_NEAR(sum, exact, 1e-14) << "degree " << degree << " monomial " << a << b << c;
        }
  }
}

// Closed form: int over the unit triangle of s^a t^b = a! b! / (a+b+2)! (same source).
TEST(Quadrature, TriangleRulesAreExactUpToTheirDegree) {
  for (int degree = 1; degree <= 8; ++degree)
    for (int a = 0; a <= degree; ++a)
      for (int b = 0; a + b <= degree; ++b) {
        double sum = 0.0;
        for (const auto& q : triangle_rule(degree)) sum += q.weight * std::pow(q.xi[0], a) * std::pow(q.xi[1], b);
        EXPECT_NEAR(sum, factorial(a) * factorial(b) / factorial(a + b + 2), 1e-14);
      }
}

TEST(Quadrature, CompactRulesAreNotExactBeyondTheirDegree) {
  // The 4-point rule must fail on x^3 (a test that can fail: degree is not overstated).
  double sum = 0.0;
  for (const auto& q : tet_rule(2)) sum += q.weight * std::pow(q.xi[0], 3);
  EXPECT_GT(std::abs(sum - factorial(3) / factorial(6)), 1e-6);
}

TEST(ShapeFunctions, PartitionOfUnityAndKroneckerProperty) {
  std::mt19937 rng(7);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  for (int order : {1, 2}) {
    const int n = order == 1 ? 4 : 10;
    for (int trial = 0; trial < 50; ++trial) {
      Point xi{u(rng), u(rng), u(rng)};
      const double s = xi[0] + xi[1] + xi[2];
      if (s > 1) for (auto& v : xi) v /= s * 1.01;
      double N[10], dN[10][3];
      tet_shape_values(order, xi, N);
      tet_shape_gradients(order, xi, dN);
      double sum = 0, grad_sum[3] = {0, 0, 0};
      for (int a = 0; a < n; ++a) {
        sum += N[a];
        for (int d = 0; d < 3; ++d) grad_sum[d] += dN[a][d];
      }
      EXPECT_NEAR(sum, 1.0, 1e-14);
      for (double g : grad_sum) EXPECT_NEAR(g, 0.0, 1e-13);
    }
    for (int a = 0; a < n; ++a) {
      double N[10];
      tet_shape_values(order, tet_node_reference(a), N);
      for (int b = 0; b < n; ++b) EXPECT_NEAR(N[b], a == b ? 1.0 : 0.0, 1e-14);
    }
  }
}

// Gradients reproduce any linear (P1, P2) or quadratic (P2) field exactly:
// interpolation property of Lagrange elements (Ciarlet 1978, from memory).
TEST(ShapeFunctions, ExactGradientsOfPolynomialFields) {
  TetGeometry g;
  g.order = 2;
  const Point v[4] = {{0.1, 0.0, 0.2}, {1.3, 0.2, 0.1}, {0.2, 0.9, 0.0}, {0.3, 0.4, 1.1}};
  for (int a = 0; a < 4; ++a) g.x[a] = v[a];
  for (int k = 0; k < 6; ++k)
    for (int d = 0; d < 3; ++d) g.x[4 + k][d] = 0.5 * (v[tet_edges[k][0]][d] + v[tet_edges[k][1]][d]);
  auto field = [](const Point& x) { return 2 + 3 * x[0] - x[1] + 0.5 * x[2] + x[0] * x[1] - 2 * x[2] * x[2]; };
  auto gradient = [](const Point& x) { return Point{3 + x[1], -1 + x[0], 0.5 - 4 * x[2]}; };
  double grad[10][3];
  const Point xi{0.2, 0.3, 0.1};
  tet_physical_gradients(g, xi, grad);
  const Point x = tet_map(g, xi);
  Point computed{0, 0, 0};
  for (int a = 0; a < 10; ++a)
    for (int d = 0; d < 3; ++d) computed[d] += field(g.x[a]) * grad[a][d];
  const Point expected = gradient(x);
  for (int d = 0; d < 3; ++d) EXPECT_NEAR(computed[d], expected[d], 1e-12);
}

// Hand value: unit right tetrahedron, k = 1, P1. The conductance matrix is V G G^T with
// G the constant gradients (-1,-1,-1), (1,0,0), (0,1,0), (0,0,1) and V = 1/6:
// K = (1/6) [[3,-1,-1,-1],[-1,1,0,0],[-1,0,1,0],[-1,0,0,1]] (hand computation).
TEST(ElementMatrices, P1ConductanceOfTheUnitTetrahedron) {
  TetGeometry g;
  g.order = 1;
  g.x[0] = {0, 0, 0};
  g.x[1] = {1, 0, 0};
  g.x[2] = {0, 1, 0};
  g.x[3] = {0, 0, 1};
  double K[16] = {0};
  add_tet_conductance(g, 2.0, K);
  const double expected[16] = {3, -1, -1, -1, -1, 1, 0, 0, -1, 0, 1, 0, -1, 0, 0, 1};
  for (int i = 0; i < 16; ++i) EXPECT_NEAR(K[i], 2.0 * expected[i] / 6.0, 1e-15);
  EXPECT_NEAR(tet_volume(g), 1.0 / 6.0, 1e-15);
  double F[4] = {0};
  add_tet_source(g, 24.0, F);  // int f N_a = f V / 4 for P1
  for (double f : F) EXPECT_NEAR(f, 1.0, 1e-14);
}

// The inlined constant-k path of the assembly loop (p1_isotropic_terms): on the unit
// right tetrahedron, the hand values above (K and the load f V / 4); on a skewed
// element, the same R and K as the general element routine (agreement to round-off,
// common practice, no source).
TEST(ElementMatrices, InlinedP1PathMatchesTheGeneralOne) {
  const double unit[4][3] = {{0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {0, 0, 1}};
  const double zero[4] = {0, 0, 0, 0};
  double R[4], K[16];
  p1_isotropic_terms(unit[0], unit[1], unit[2], unit[3], 2.0, 24.0, zero, R, K);
  const double expected[16] = {3, -1, -1, -1, -1, 1, 0, 0, -1, 0, 1, 0, -1, 0, 0, 1};
  for (int i = 0; i < 16; ++i) EXPECT_NEAR(K[i], 2.0 * expected[i] / 6.0, 1e-15);
  for (double r : R) EXPECT_NEAR(r, -1.0, 1e-14);

  TetGeometry g;
  g.order = 1;
  const double skewed[4][3] = {{0.1, -0.2, 0.05}, {1.3, 0.1, -0.1}, {0.4, 0.9, 0.2}, {0.2, 0.3, 1.1}};
  for (int a = 0; a < 4; ++a) g.x[a] = {skewed[a][0], skewed[a][1], skewed[a][2]};
  RegionProperties region{"steel", 37.5, 2.0e5, std::nullopt};
  const double T[4] = {310.0, 295.5, 402.25, 350.0};
  double R_general[4], K_general[16];
  tet_local_terms(g, region, nullptr, 0, T, JacobianKind::exact, R_general, K_general);
  p1_isotropic_terms(skewed[0], skewed[1], skewed[2], skewed[3], 37.5, 2.0e5, T, R, K);
  for (int i = 0; i < 16; ++i) EXPECT_NEAR(K[i], K_general[i], 1e-12 * std::abs(K_general[0]));
  for (int a = 0; a < 4; ++a) EXPECT_NEAR(R[a], R_general[a], 1e-12 * 400.0 * std::abs(K_general[0]));
}

// P2 on a straight tet: the load of a unit source is -V/20 at vertices and V/5 at
// edge nodes (closed form of int L(2L-1) and int 4 La Lb; Zienkiewicz, from memory).
TEST(ElementMatrices, P2SourceLoadAndConductanceProperties) {
  TetGeometry g;
  g.order = 2;
  const Point v[4] = {{0, 0, 0}, {2, 0, 0}, {0, 1, 0}, {0, 0, 3}};
  for (int a = 0; a < 4; ++a) g.x[a] = v[a];
  for (int k = 0; k < 6; ++k)
    for (int d = 0; d < 3; ++d) g.x[4 + k][d] = 0.5 * (v[tet_edges[k][0]][d] + v[tet_edges[k][1]][d]);
  const double volume = 1.0;  // 2*1*3/6
  EXPECT_NEAR(tet_volume(g), volume, 1e-14);
  double F[10] = {0};
  add_tet_source(g, 1.0, F);
  for (int a = 0; a < 4; ++a) EXPECT_NEAR(F[a], -volume / 20, 1e-14);
  for (int a = 4; a < 10; ++a) EXPECT_NEAR(F[a], volume / 5, 1e-14);
  double K[100] = {0};
  add_tet_conductance(g, 1.0, K);
  // Symmetric, rows sum to zero (constants are in the kernel), positive diagonal.
  for (int a = 0; a < 10; ++a) {
    double row = 0;
    for (int b = 0; b < 10; ++b) {
      row += K[a * 10 + b];
      EXPECT_NEAR(K[a * 10 + b], K[b * 10 + a], 1e-13);
    }
    EXPECT_NEAR(row, 0.0, 1e-12);
    EXPECT_GT(K[a * 10 + a], 0.0);
  }
  // Energy of the linear field T = x: int |grad T|^2 = V.
  double energy = 0;
  for (int a = 0; a < 10; ++a)
    for (int b = 0; b < 10; ++b) energy += g.x[a][0] * K[a * 10 + b] * g.x[b][0];
  EXPECT_NEAR(energy, volume, 1e-12);
}

// Triangle mass matrix, P1: (A/12) [[2,1,1],[1,2,1],[1,1,2]] (standard closed form,
// Zienkiewicz, from memory).
TEST(ElementMatrices, P1FaceMassMatrix) {
  FaceGeometry g;
  g.order = 1;
  g.x[0] = {0, 0, 0};
  g.x[1] = {2, 0, 0};
  g.x[2] = {0, 3, 0};
  const double area = 3.0;
  EXPECT_NEAR(face_area(g), area, 1e-14);
  double M[9] = {0};
  add_face_mass(g, 1.0, M);
  for (int a = 0; a < 3; ++a)
    for (int b = 0; b < 3; ++b) EXPECT_NEAR(M[a * 3 + b], area / 12 * (a == b ? 2 : 1), 1e-14);
}

// The exact Jacobian of the element residual is its derivative: with k linear in T on
// one table segment the residual is quadratic in T, so central differences reproduce
// the derivative up to round-off (Taylor's theorem: the central-difference error is
// delta^2/6 times the third derivative, zero here; from memory). The Picard matrix
// M(T) has M(T) T = R(T) without sources (local_terms.hpp). Orthotropic k(T) on rotated
// axes; a 4-node, a straight 10-node and a curved 10-node element (common practice, no source).
TEST(ElementJacobians, ExactJacobianIsTheDerivativeOfTheResidual) {
  const double c = std::cos(0.4), s = std::sin(0.4);
  const Matrix3 axes = {{{c, s, 0}, {-s * 0.6, c * 0.6, 0.8}, {s * 0.8, -c * 0.8, 0.6}}};
  RegionProperties region;
  region.conductivity = Conductivity::orthotropic(
      {PiecewiseLinear({200, 1500}, {1, 14}), PiecewiseLinear({200, 1500}, {0.5, 3}), PiecewiseLinear(2.0)}, axes);
  const Point v[4] = {{0, 0, 0}, {0.3, 0.05, 0}, {0.04, 0.25, 0.02}, {0.02, 0.03, 0.2}};
  std::mt19937 random(7);
  std::uniform_real_distribution<double> temperature(400, 900);
  for (const int variant : {0, 1, 2}) {  // P1, straight P2, curved P2
    TetGeometry g;
    g.order = variant == 0 ? 1 : 2;
    for (int a = 0; a < 4; ++a) g.x[a] = v[a];
    if (g.order == 2)
      for (int k = 0; k < 6; ++k)
        for (int d = 0; d < 3; ++d) g.x[4 + k][d] = 0.5 * (v[tet_edges[k][0]][d] + v[tet_edges[k][1]][d]);
    if (variant == 2) g.x[4][1] -= 0.02, g.x[9][0] += 0.015;  // bowed edges
    const int n = g.order == 1 ? 4 : 10;
    double T[10], R[10], J[100], P[100], Rp[10], Rm[10];
    for (int a = 0; a < n; ++a) T[a] = temperature(random);
    tet_local_terms(g, region, nullptr, 0, T, JacobianKind::exact, R, J);
    double scale = 0;
    for (int i = 0; i < n * n; ++i) scale = std::max(scale, std::abs(J[i]));
    const double delta = 1.0;  // K; exact for a quadratic residual
    for (int b = 0; b < n; ++b) {
      double Tp[10], Tm[10];
      std::copy(T, T + n, Tp);
      std::copy(T, T + n, Tm);
      Tp[b] += delta, Tm[b] -= delta;
      tet_local_terms(g, region, nullptr, 0, Tp, JacobianKind::exact, Rp, nullptr);
      tet_local_terms(g, region, nullptr, 0, Tm, JacobianKind::exact, Rm, nullptr);
      for (int a = 0; a < n; ++a)
        EXPECT_NEAR(J[a * n + b], (Rp[a] - Rm[a]) / (2 * delta), 1e-10 * scale) << "variant " << variant;
    }
    tet_local_terms(g, region, nullptr, 0, T, JacobianKind::picard, Rp, P);
    for (int a = 0; a < n; ++a) {
      double MT = 0;
      for (int b = 0; b < n; ++b) MT += P[a * n + b] * T[b];
      EXPECT_NEAR(MT, R[a], 1e-10 * scale * 900) << "variant " << variant;
      EXPECT_NEAR(Rp[a], R[a], 1e-12 * scale * 900);
    }
  }
}

}  // namespace
}  // namespace hearth
