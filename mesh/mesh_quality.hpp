// Element quality: Gmsh's gamma measure of a tetrahedron, per element and summarised.
#pragma once

#include <array>
#include <cstddef>
#include <vector>

#include "mesh/mesh.hpp"

namespace hearth {

using Point3 = std::array<double, 3>;

// Signed volume of the tetrahedron (p0, p1, p2, p3), positive when (p1-p0, p2-p0,
// p3-p0) is right-handed. Units: cube of the input length unit.
double tet_signed_volume(const Point3& p0, const Point3& p1, const Point3& p2, const Point3& p3);

// Gmsh's gamma of the straight tetrahedron through the four vertices:
//   gamma = 3 r / R,   r = 3 V / (sum of face areas)  (inscribed radius),
//                      R = sqrt((aA+bB+cC)(aA+bB-cC)(aA-bB+cC)(-aA+bB+cC)) / (24 V)
// (circumscribed radius; a,A b,B c,C the lengths of opposite edge pairs). 1 for the
// regular tetrahedron, 0 for a flat one; independent of orientation and scale.
double tet_gamma(const Point3& p0, const Point3& p1, const Point3& p2, const Point3& p3);

// gamma of every element of `mesh` from its four vertices (edge nodes ignored, as Gmsh
// does), in element order.
std::vector<double> tet_qualities(const Mesh& mesh);

// Smallest ratio det(J) / (6 V) of element `e`, J the Jacobian of the map from the
// reference tetrahedron and V the signed volume of the straight tetrahedron through its
// vertices. Order 1: det(J) is constant and the ratio is 1 (or 0 for a flat element,
// |6V| below 1e-12 of the longest edge cubed). Order 2: the smallest over the four
// vertices and the centroid; 1 for straight edges, <= 0 where curving folds the
// element.
double min_jacobian_ratio(const Mesh& mesh, std::size_t e);

// Elements whose Jacobian is zero or negative somewhere (min_jacobian_ratio <= 0).
struct InvalidElements {
  std::size_t count = 0;
  std::size_t worst_element = 0;  // meaningful when count > 0
  double worst_ratio = 1.0;       // min_jacobian_ratio of worst_element
};

InvalidElements find_invalid_elements(const Mesh& mesh);

// The figures `hearth mesh` and summary.json quote.
struct QualitySummary {
  double min = 0.0;             // smallest gamma (0 for an empty mesh)
  double mean = 0.0;
  std::size_t worst_element = 0;  // index of the element with the smallest gamma
  // Elements with gamma in [0, 0.1), [0.1, 0.2), ... [0.9, 1.0].
  std::array<std::size_t, 10> histogram{};
};

// Summarises mesh.tet_quality (which must hold one value per element).
QualitySummary summarize_quality(const Mesh& mesh);

}  // namespace hearth
