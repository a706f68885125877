// Element quality: Gmsh's gamma measure of a tetrahedron.
#include "mesh/mesh_quality.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

namespace hearth {
namespace {

Point3 minus(const Point3& a, const Point3& b) { return {a[0] - b[0], a[1] - b[1], a[2] - b[2]}; }

Point3 cross(const Point3& a, const Point3& b) {
  return {a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]};
}

double dot(const Point3& a, const Point3& b) { return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]; }

double squared_distance(const Point3& a, const Point3& b) {
  const Point3 d = minus(a, b);
  return dot(d, d);
}

double triangle_area(const Point3& a, const Point3& b, const Point3& c) {
  const Point3 n = cross(minus(b, a), minus(c, a));
  return 0.5 * std::sqrt(dot(n, n));
}

}  // namespace

double tet_signed_volume(const Point3& p0, const Point3& p1, const Point3& p2, const Point3& p3) {
  return dot(minus(p1, p0), cross(minus(p2, p0), minus(p3, p0))) / 6.0;
}

double tet_gamma(const Point3& p0, const Point3& p1, const Point3& p2, const Point3& p3) {
  const double volume = std::fabs(tet_signed_volume(p0, p1, p2, p3));
  if (volume == 0.0) return 0.0;
  // Products of the lengths of opposite edges: (01, 23), (02, 13), (03, 12).
  const double a = std::sqrt(squared_distance(p0, p1) * squared_distance(p2, p3));
  const double b = std::sqrt(squared_distance(p0, p2) * squared_distance(p1, p3));
  const double c = std::sqrt(squared_distance(p0, p3) * squared_distance(p1, p2));
  const double product = (a + b + c) * (a + b - c) * (a - b + c) * (-a + b + c);
  if (product <= 0.0) return 0.0;  // (nearly) coplanar: R undetermined, quality 0
  const double circumradius = std::sqrt(product) / (24.0 * volume);
  const double face_areas = triangle_area(p0, p1, p2) + triangle_area(p0, p1, p3) +
                            triangle_area(p0, p2, p3) + triangle_area(p1, p2, p3);
  const double inradius = 3.0 * volume / face_areas;
  return std::min(1.0, 3.0 * inradius / circumradius);
}

std::vector<double> tet_qualities(const Mesh& mesh) {
  std::vector<double> quality(mesh.n_tets());
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    const std::int32_t* t = mesh.tet(e);
    quality[e] = tet_gamma(mesh.node(t[0]), mesh.node(t[1]), mesh.node(t[2]), mesh.node(t[3]));
  }
  return quality;
}

double min_jacobian_ratio(const Mesh& mesh, std::size_t e) {
  const std::int32_t* t = mesh.tet(e);
  const Point3 p0 = mesh.node(t[0]), p1 = mesh.node(t[1]), p2 = mesh.node(t[2]), p3 = mesh.node(t[3]);
  const double six_volume = 6.0 * tet_signed_volume(p0, p1, p2, p3);
  const double longest = std::sqrt(std::max({squared_distance(p0, p1), squared_distance(p0, p2), squared_distance(p0, p3),
                                             squared_distance(p1, p2), squared_distance(p1, p3), squared_distance(p2, p3)}));
  if (std::fabs(six_volume) <= 1e-12 * longest * longest * longest) return 0.0;
  if (mesh.order == 1) return six_volume > 0.0 ? 1.0 : -1.0;

  // Quadratic map x(u,v,w) = sum_k x_k N_k with barycentrics L0 = 1-u-v-w, L1 = u,
  // L2 = v, L3 = w; vertex functions L_i (2 L_i - 1), edge functions 4 L_a L_b.
  static constexpr int kEdges[6][2] = {{0, 1}, {1, 2}, {0, 2}, {0, 3}, {1, 3}, {2, 3}};
  static constexpr double kGradL[4][3] = {{-1, -1, -1}, {1, 0, 0}, {0, 1, 0}, {0, 0, 1}};
  static constexpr double kPoints[5][4] = {
      {1, 0, 0, 0}, {0, 1, 0, 0}, {0, 0, 1, 0}, {0, 0, 0, 1}, {0.25, 0.25, 0.25, 0.25}};  // barycentrics
  double smallest = std::numeric_limits<double>::max();
  for (const auto& L : kPoints) {
    double J[3][3] = {};  // J[d][j] = dx_d / du_j
    auto add = [&](std::int32_t node, const double grad[3]) {
      const Point3 x = mesh.node(node);
      for (int d = 0; d < 3; ++d)
        for (int j = 0; j < 3; ++j) J[d][j] += x[d] * grad[j];
    };
    for (int i = 0; i < 4; ++i) {
      double grad[3];
      for (int j = 0; j < 3; ++j) grad[j] = (4.0 * L[i] - 1.0) * kGradL[i][j];
      add(t[i], grad);
    }
    for (int k = 0; k < 6; ++k) {
      const int a = kEdges[k][0], b = kEdges[k][1];
      double grad[3];
      for (int j = 0; j < 3; ++j) grad[j] = 4.0 * (L[b] * kGradL[a][j] + L[a] * kGradL[b][j]);
      add(t[4 + k], grad);
    }
    const double det = J[0][0] * (J[1][1] * J[2][2] - J[1][2] * J[2][1]) -
                       J[0][1] * (J[1][0] * J[2][2] - J[1][2] * J[2][0]) +
                       J[0][2] * (J[1][0] * J[2][1] - J[1][1] * J[2][0]);
    smallest = std::min(smallest, det / six_volume);
  }
  return six_volume > 0.0 ? smallest : -std::fabs(smallest);
}

InvalidElements find_invalid_elements(const Mesh& mesh) {
  InvalidElements invalid;
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    const double ratio = min_jacobian_ratio(mesh, e);
    if (ratio > 0.0) continue;
    if (invalid.count == 0 || ratio < invalid.worst_ratio) {
      invalid.worst_ratio = ratio;
      invalid.worst_element = e;
    }
    ++invalid.count;
  }
  return invalid;
}

QualitySummary summarize_quality(const Mesh& mesh) {
  QualitySummary summary;
  const std::vector<double>& q = mesh.tet_quality;
  if (q.empty()) return summary;
  summary.min = q[0];
  double sum = 0.0;
  for (std::size_t e = 0; e < q.size(); ++e) {
    if (q[e] < summary.min) {
      summary.min = q[e];
      summary.worst_element = e;
    }
    sum += q[e];
    const int bin = std::clamp(static_cast<int>(q[e] * 10.0), 0, 9);
    ++summary.histogram[static_cast<std::size_t>(bin)];
  }
  summary.mean = sum / static_cast<double>(q.size());
  return summary;
}

}  // namespace hearth
