// Element integrals: straight elements use constant Jacobians and minimal exact rules;
// curved 10-node elements use a degree-4 rule with the Jacobian at every point.
#include "solver/tet_element.hpp"

#include <cmath>

#include "solver/quadrature.hpp"

namespace hearth {

namespace {
int tet_nodes(int order) { return order == 2 ? 10 : 4; }
int face_nodes(int order) { return order == 2 ? 6 : 3; }
double distance(const Point& a, const Point& b) {
  return std::sqrt((a[0] - b[0]) * (a[0] - b[0]) + (a[1] - b[1]) * (a[1] - b[1]) + (a[2] - b[2]) * (a[2] - b[2]));
}
// Degree of the rule for element integrals: exact for constant coefficients on
// straight elements; a degree-4 rule for the rational integrands of curved ones.
int stiffness_degree(const TetGeometry& g) { return g.order == 1 ? 1 : (g.affine() ? 2 : 4); }
}  // namespace

bool TetGeometry::affine() const {
  if (order == 1) return true;
  for (int k = 0; k < 6; ++k) {
    const Point& a = x[tet_edges[k][0]];
    const Point& b = x[tet_edges[k][1]];
    const Point mid{0.5 * (a[0] + b[0]), 0.5 * (a[1] + b[1]), 0.5 * (a[2] + b[2])};
    if (distance(mid, x[4 + k]) > 1e-10 * distance(a, b)) return false;
  }
  return true;
}

double tet_jacobian(const TetGeometry& g, const Point& xi, double J[3][3]) {
  double dN[max_tet_nodes][3];
  tet_shape_gradients(g.order, xi, dN);
  for (int i = 0; i < 3; ++i)
    for (int d = 0; d < 3; ++d) J[i][d] = 0.0;
  for (int a = 0; a < tet_nodes(g.order); ++a)
    for (int i = 0; i < 3; ++i)
      for (int d = 0; d < 3; ++d) J[i][d] += g.x[a][i] * dN[a][d];
  return J[0][0] * (J[1][1] * J[2][2] - J[1][2] * J[2][1]) - J[0][1] * (J[1][0] * J[2][2] - J[1][2] * J[2][0]) +
         J[0][2] * (J[1][0] * J[2][1] - J[1][1] * J[2][0]);
}

double tet_physical_gradients(const TetGeometry& g, const Point& xi, double (*grad)[3]) {
  if (g.order == 1) return p1_gradients(g, grad);  // constant: the closed form, a third of the work
  double J[3][3];
  const double det = tet_jacobian(g, xi, J);
  // Inverse transpose: grad N = J^{-T} dN/dxi.
  double inv[3][3];
  inv[0][0] = (J[1][1] * J[2][2] - J[1][2] * J[2][1]) / det;
  inv[0][1] = (J[0][2] * J[2][1] - J[0][1] * J[2][2]) / det;
  inv[0][2] = (J[0][1] * J[1][2] - J[0][2] * J[1][1]) / det;
  inv[1][0] = (J[1][2] * J[2][0] - J[1][0] * J[2][2]) / det;
  inv[1][1] = (J[0][0] * J[2][2] - J[0][2] * J[2][0]) / det;
  inv[1][2] = (J[0][2] * J[1][0] - J[0][0] * J[1][2]) / det;
  inv[2][0] = (J[1][0] * J[2][1] - J[1][1] * J[2][0]) / det;
  inv[2][1] = (J[0][1] * J[2][0] - J[0][0] * J[2][1]) / det;
  inv[2][2] = (J[0][0] * J[1][1] - J[0][1] * J[1][0]) / det;
  double dN[max_tet_nodes][3];
  tet_shape_gradients(g.order, xi, dN);
  for (int a = 0; a < tet_nodes(g.order); ++a)
    for (int i = 0; i < 3; ++i)  // d N / d x_i = sum_d dN/dxi_d * dxi_d/dx_i = sum_d dN_d inv[d][i]
      grad[a][i] = dN[a][0] * inv[0][i] + dN[a][1] * inv[1][i] + dN[a][2] * inv[2][i];
  return det;
}

Point tet_map(const TetGeometry& g, const Point& xi) {
  double N[max_tet_nodes];
  tet_shape_values(g.order, xi, N);
  Point p{0, 0, 0};
  for (int a = 0; a < tet_nodes(g.order); ++a)
    for (int i = 0; i < 3; ++i) p[i] += N[a] * g.x[a][i];
  return p;
}

double tet_volume(const TetGeometry& g) {
  if (g.order == 1) {
    const Point& o = g.x[0];
    const double a[3] = {g.x[1][0] - o[0], g.x[1][1] - o[1], g.x[1][2] - o[2]};
    const double b[3] = {g.x[2][0] - o[0], g.x[2][1] - o[1], g.x[2][2] - o[2]};
    const double c[3] = {g.x[3][0] - o[0], g.x[3][1] - o[1], g.x[3][2] - o[2]};
    return (a[0] * (b[1] * c[2] - b[2] * c[1]) - a[1] * (b[0] * c[2] - b[2] * c[0]) + a[2] * (b[0] * c[1] - b[1] * c[0])) / 6.0;
  }
  double volume = 0.0;
  double J[3][3];
  for (const auto& q : tet_rule(g.affine() ? 1 : 4)) volume += q.weight * tet_jacobian(g, q.xi, J);
  return volume;
}

double p1_gradients(const TetGeometry& g, double (*grad)[3]) {
  // Rows of J^{-T}: the gradients of L1, L2, L3 are (b x c, c x a, a x b) / det.
  const double det = p1_scaled_gradients(g.x[0].data(), g.x[1].data(), g.x[2].data(), g.x[3].data(), grad);
  const double inv = 1.0 / det;
  for (int a = 0; a < 4; ++a)
    for (int d = 0; d < 3; ++d) grad[a][d] *= inv;
  return det;
}

namespace {
// Straight 4-node element: K = k V G G^T with the constant gradients G. About a third
// of the work of the general path.
void add_p1_conductance(const TetGeometry& g, double conductivity, double* K) {
  double G[4][3];
  const double w = conductivity * p1_gradients(g, G) / 6.0;  // k V
  for (int i = 0; i < 4; ++i)
    for (int j = i; j < 4; ++j) {
      const double kij = w * (G[i][0] * G[j][0] + G[i][1] * G[j][1] + G[i][2] * G[j][2]);
      K[i * 4 + j] += kij;
      if (j != i) K[j * 4 + i] += kij;
    }
}
}  // namespace

void add_tet_conductance(const TetGeometry& g, double conductivity, double* K) {
  if (g.order == 1) return add_p1_conductance(g, conductivity, K);
  const int n = tet_nodes(g.order);
  double grad[max_tet_nodes][3];
  for (const auto& q : tet_rule(stiffness_degree(g))) {
    const double w = q.weight * tet_physical_gradients(g, q.xi, grad) * conductivity;
    for (int a = 0; a < n; ++a)
      for (int b = a; b < n; ++b) {
        const double kab = w * (grad[a][0] * grad[b][0] + grad[a][1] * grad[b][1] + grad[a][2] * grad[b][2]);
        K[a * n + b] += kab;
        if (b != a) K[b * n + a] += kab;
      }
  }
}

void add_tet_source(const TetGeometry& g, double source, double* F) {
  if (source == 0.0) return;
  if (g.order == 1) {  // int f L_a = f V / 4
    const double share = source * tet_volume(g) / 4.0;
    for (int a = 0; a < 4; ++a) F[a] += share;
    return;
  }
  const int n = tet_nodes(g.order);
  double N[max_tet_nodes];
  double J[3][3];
  for (const auto& q : tet_rule(g.order == 1 ? 1 : stiffness_degree(g))) {
    tet_shape_values(g.order, q.xi, N);
    const double w = q.weight * tet_jacobian(g, q.xi, J) * source;
    for (int a = 0; a < n; ++a) F[a] += w * N[a];
  }
}

void add_tet_source_field(const TetGeometry& g, const std::function<double(const Point&)>& f, int degree,
                          double* F) {
  const int n = tet_nodes(g.order);
  double N[max_tet_nodes];
  double J[3][3];
  for (const auto& q : tet_rule(degree)) {
    tet_shape_values(g.order, q.xi, N);
    const double w = q.weight * tet_jacobian(g, q.xi, J) * f(tet_map(g, q.xi));
    for (int a = 0; a < n; ++a) F[a] += w * N[a];
  }
}

double face_jacobian(const FaceGeometry& g, double s, double t, Point* normal) {
  double dN[max_face_nodes][2];
  triangle_shape_gradients(g.order, s, t, dN);
  Point ds{0, 0, 0}, dt{0, 0, 0};
  for (int a = 0; a < face_nodes(g.order); ++a)
    for (int i = 0; i < 3; ++i) {
      ds[i] += g.x[a][i] * dN[a][0];
      dt[i] += g.x[a][i] * dN[a][1];
    }
  const Point c{ds[1] * dt[2] - ds[2] * dt[1], ds[2] * dt[0] - ds[0] * dt[2], ds[0] * dt[1] - ds[1] * dt[0]};
  const double m = std::sqrt(c[0] * c[0] + c[1] * c[1] + c[2] * c[2]);
  if (normal) *normal = {c[0] / m, c[1] / m, c[2] / m};
  return m;
}

namespace {
// Faces: P1 integrands N_a N_b have degree 2; P2 degree 4 (curved faces add a little).
int face_degree(int order) { return order == 1 ? 2 : 5; }
}  // namespace

double face_area(const FaceGeometry& g) {
  double area = 0.0;
  for (const auto& q : triangle_rule(g.order == 1 ? 1 : 4)) area += q.weight * face_jacobian(g, q.xi[0], q.xi[1]);
  return area;
}

void add_face_mass(const FaceGeometry& g, double h, double* M) {
  const int n = face_nodes(g.order);
  double N[max_face_nodes];
  for (const auto& q : triangle_rule(face_degree(g.order))) {
    triangle_shape_values(g.order, q.xi[0], q.xi[1], N);
    const double w = q.weight * face_jacobian(g, q.xi[0], q.xi[1]) * h;
    for (int a = 0; a < n; ++a)
      for (int b = 0; b < n; ++b) M[a * n + b] += w * N[a] * N[b];
  }
}

void face_shape_integrals(const FaceGeometry& g, double* integrals) {
  const int n = face_nodes(g.order);
  for (int a = 0; a < n; ++a) integrals[a] = 0.0;
  double N[max_face_nodes];
  for (const auto& q : triangle_rule(g.order == 1 ? 1 : 4)) {
    triangle_shape_values(g.order, q.xi[0], q.xi[1], N);
    const double w = q.weight * face_jacobian(g, q.xi[0], q.xi[1]);
    for (int a = 0; a < n; ++a) integrals[a] += w * N[a];
  }
}


}  // namespace hearth
