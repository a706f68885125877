// Lagrange shape functions in barycentric form: vertex L(2L-1), edge 4 La Lb.
#include "solver/shape_functions.hpp"

namespace hearth {

namespace {
// Barycentric coordinates and their (constant) reference gradients.
void tet_barycentric(const std::array<double, 3>& xi, double L[4]) {
  L[0] = 1.0 - xi[0] - xi[1] - xi[2];
  L[1] = xi[0];
  L[2] = xi[1];
  L[3] = xi[2];
}
constexpr double tet_dL[4][3] = {{-1, -1, -1}, {1, 0, 0}, {0, 1, 0}, {0, 0, 1}};
constexpr double tri_dL[3][2] = {{-1, -1}, {1, 0}, {0, 1}};
}  // namespace

void tet_shape_values(int order, const std::array<double, 3>& xi, double* values) {
  double L[4];
  tet_barycentric(xi, L);
  if (order == 1) {
    for (int i = 0; i < 4; ++i) values[i] = L[i];
    return;
  }
  for (int i = 0; i < 4; ++i) values[i] = L[i] * (2.0 * L[i] - 1.0);
  for (int k = 0; k < 6; ++k) values[4 + k] = 4.0 * L[tet_edges[k][0]] * L[tet_edges[k][1]];
}

void tet_shape_gradients(int order, const std::array<double, 3>& xi, double (*gradients)[3]) {
  if (order == 1) {
    for (int i = 0; i < 4; ++i)
      for (int d = 0; d < 3; ++d) gradients[i][d] = tet_dL[i][d];
    return;
  }
  double L[4];
  tet_barycentric(xi, L);
  for (int i = 0; i < 4; ++i)
    for (int d = 0; d < 3; ++d) gradients[i][d] = (4.0 * L[i] - 1.0) * tet_dL[i][d];
  for (int k = 0; k < 6; ++k) {
    const int a = tet_edges[k][0], b = tet_edges[k][1];
    for (int d = 0; d < 3; ++d) gradients[4 + k][d] = 4.0 * (L[a] * tet_dL[b][d] + L[b] * tet_dL[a][d]);
  }
}

void triangle_shape_values(int order, double s, double t, double* values) {
  const double L[3] = {1.0 - s - t, s, t};
  if (order == 1) {
    for (int i = 0; i < 3; ++i) values[i] = L[i];
    return;
  }
  for (int i = 0; i < 3; ++i) values[i] = L[i] * (2.0 * L[i] - 1.0);
  for (int k = 0; k < 3; ++k) values[3 + k] = 4.0 * L[triangle_edges[k][0]] * L[triangle_edges[k][1]];
}

void triangle_shape_gradients(int order, double s, double t, double (*gradients)[2]) {
  if (order == 1) {
    for (int i = 0; i < 3; ++i)
      for (int d = 0; d < 2; ++d) gradients[i][d] = tri_dL[i][d];
    return;
  }
  const double L[3] = {1.0 - s - t, s, t};
  for (int i = 0; i < 3; ++i)
    for (int d = 0; d < 2; ++d) gradients[i][d] = (4.0 * L[i] - 1.0) * tri_dL[i][d];
  for (int k = 0; k < 3; ++k) {
    const int a = triangle_edges[k][0], b = triangle_edges[k][1];
    for (int d = 0; d < 2; ++d) gradients[3 + k][d] = 4.0 * (L[a] * tri_dL[b][d] + L[b] * tri_dL[a][d]);
  }
}

std::array<double, 3> tet_node_reference(int node) {
  static constexpr double vertex[4][3] = {{0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {0, 0, 1}};
  if (node < 4) return {vertex[node][0], vertex[node][1], vertex[node][2]};
  const int a = tet_edges[node - 4][0], b = tet_edges[node - 4][1];
  return {0.5 * (vertex[a][0] + vertex[b][0]), 0.5 * (vertex[a][1] + vertex[b][1]),
          0.5 * (vertex[a][2] + vertex[b][2])};
}

}  // namespace hearth
