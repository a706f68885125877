// Quadrature rules on the reference tetrahedron and triangle.
#pragma once

#include <array>
#include <vector>

namespace hearth {

// Reference tetrahedron {x,y,z >= 0, x+y+z <= 1} (volume 1/6); reference triangle
// {s,t >= 0, s+t <= 1} (area 1/2). Weights sum to the reference measure.
struct QuadraturePoint {
  std::array<double, 3> xi;  // (x, y, z) in the tet, (s, t, 0) in the triangle
  double weight;
};

// Rule integrating every polynomial of total degree <= `degree` exactly.
// Degrees 1 and 2 use the classical compact rules (1 and 4 points in the tet, 1 and 3
// in the triangle); degrees 3 to 16 use conical (collapsed) Gauss-Legendre products.
const std::vector<QuadraturePoint>& tet_rule(int degree);
const std::vector<QuadraturePoint>& triangle_rule(int degree);

// Gauss-Legendre nodes and weights on [0, 1], n points (exact to degree 2n - 1).
std::vector<std::array<double, 2>> gauss_legendre_01(int n);

}  // namespace hearth
