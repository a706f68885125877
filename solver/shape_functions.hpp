// Lagrange shape functions on the reference tetrahedron and triangle, P1 and P2.
#pragma once

#include <array>

namespace hearth {

// Node order (VTK's): tet vertices 0..3 at (0,0,0) (1,0,0) (0,1,0) (0,0,1), then edge
// midpoints (0,1) (1,2) (0,2) (0,3) (1,3) (2,3). Triangle vertices (0,0) (1,0) (0,1),
// then edge midpoints (0,1) (1,2) (2,0).
constexpr int max_tet_nodes = 10;
constexpr int max_face_nodes = 6;

constexpr int tet_edges[6][2] = {{0, 1}, {1, 2}, {0, 2}, {0, 3}, {1, 3}, {2, 3}};
constexpr int triangle_edges[3][2] = {{0, 1}, {1, 2}, {2, 0}};

// Values N[i] at reference point xi for order 1 (4 nodes) or 2 (10 nodes).
void tet_shape_values(int order, const std::array<double, 3>& xi, double* values);
// Reference gradients dN[i][d] = dN_i / dxi_d.
void tet_shape_gradients(int order, const std::array<double, 3>& xi, double (*gradients)[3]);

// Triangle: values and the two reference derivatives (d/ds, d/dt).
void triangle_shape_values(int order, double s, double t, double* values);
void triangle_shape_gradients(int order, double s, double t, double (*gradients)[2]);

// Reference coordinates of the tet's nodes (for evaluating fields at nodes).
std::array<double, 3> tet_node_reference(int node);

}  // namespace hearth
