// Element integrals on 4- and 10-node tetrahedra and 3- and 6-node triangles.
//
// Weak form of steady conduction, -div(k grad T) = f:
//   sum_e  int_e k grad N_a . grad N_b  T_b   (conductance)
// + sum_f  int_f h N_a N_b T_b                (convection)
// = sum_e  int_e f N_a + sum_f int_f (q_in + h T_inf) N_a.
#pragma once

#include <array>
#include <functional>

#include "solver/shape_functions.hpp"

namespace hearth {

using Point = std::array<double, 3>;

// Node coordinates of one tetrahedron, in the canonical order.
struct TetGeometry {
  int order = 1;
  Point x[max_tet_nodes];
  // True when the element is straight-sided (P1, or P2 with edge nodes at the edge
  // midpoints): then the Jacobian is constant and low-order rules are exact.
  bool affine() const;
};

// Jacobian J[i][d] = dx_i/dxi_d at reference point xi; returns det J.
double tet_jacobian(const TetGeometry& g, const Point& xi, double J[3][3]);
// Physical gradients of the shape functions at xi; returns det J (> 0 for valid elements).
double tet_physical_gradients(const TetGeometry& g, const Point& xi, double (*grad)[3]);
// The constant gradients of a 4-node element's shape functions, in closed form (edge
// cross products); returns det J = 6 V.
double p1_gradients(const TetGeometry& g, double (*grad)[3]);
// The same gradients times det J, from the corner coordinates (x, y, z each): with a,
// b, c the edges from corner 0, g_1 = b x c, g_2 = c x a, g_3 = a x b and
// g_0 = -(g_1 + g_2 + g_3). Returns det J. Inline for the assembly loop's constant-k path.
inline double p1_scaled_gradients(const double* x0, const double* x1, const double* x2, const double* x3,
                                  double (*g)[3]) {
  const double a[3] = {x1[0] - x0[0], x1[1] - x0[1], x1[2] - x0[2]};
  const double b[3] = {x2[0] - x0[0], x2[1] - x0[1], x2[2] - x0[2]};
  const double c[3] = {x3[0] - x0[0], x3[1] - x0[1], x3[2] - x0[2]};
  g[1][0] = b[1] * c[2] - b[2] * c[1], g[1][1] = b[2] * c[0] - b[0] * c[2], g[1][2] = b[0] * c[1] - b[1] * c[0];
  g[2][0] = c[1] * a[2] - c[2] * a[1], g[2][1] = c[2] * a[0] - c[0] * a[2], g[2][2] = c[0] * a[1] - c[1] * a[0];
  g[3][0] = a[1] * b[2] - a[2] * b[1], g[3][1] = a[2] * b[0] - a[0] * b[2], g[3][2] = a[0] * b[1] - a[1] * b[0];
  for (int d = 0; d < 3; ++d) g[0][d] = -g[1][d] - g[2][d] - g[3][d];
  return a[0] * g[1][0] + a[1] * g[1][1] + a[2] * g[1][2];
}
Point tet_map(const TetGeometry& g, const Point& xi);

double tet_volume(const TetGeometry& g);

// K[a][b] += k * int grad N_a . grad N_b, isotropic k in W/(m K). K is n x n, n = nodes.
void add_tet_conductance(const TetGeometry& g, double conductivity, double* K);
// F[a] += int f N_a for constant f (W/m3).
void add_tet_source(const TetGeometry& g, double source, double* F);
// F[a] += int f(x) N_a, integrated with a rule of the given degree.
void add_tet_source_field(const TetGeometry& g, const std::function<double(const Point&)>& f,
                          int degree, double* F);

struct FaceGeometry {
  int order = 1;
  Point x[max_face_nodes];
};

// Surface measure |dx/ds x dx/dt| and unit normal (right-hand rule) at (s, t).
double face_jacobian(const FaceGeometry& g, double s, double t, Point* normal = nullptr);
double face_area(const FaceGeometry& g);
// M[a][b] += h * int N_a N_b dA.
void add_face_mass(const FaceGeometry& g, double h, double* M);
// int N_a dA for each node (weights for splitting nodal quantities between faces).
void face_shape_integrals(const FaceGeometry& g, double* integrals);

}  // namespace hearth
