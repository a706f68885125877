// Uniform-grid bucketing of element boxes and point inversion.
#include "solver/point_locator.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

namespace hearth {

namespace {
void element_box(const Mesh& mesh, std::size_t e, Point& lo, Point& hi) {
  lo = hi = mesh.node(mesh.tet(e)[0]);
  for (int a = 1; a < mesh.nodes_per_tet(); ++a) {
    const Point x = mesh.node(mesh.tet(e)[a]);
    for (int d = 0; d < 3; ++d) {
      lo[d] = std::min(lo[d], x[d]);
      hi[d] = std::max(hi[d], x[d]);
    }
  }
}
}  // namespace

PointLocator::PointLocator(const Mesh& mesh) : mesh_(mesh) {
  if (mesh.n_nodes() == 0) return;
  lo_ = hi_ = mesh.node(0);
  for (std::size_t i = 0; i < mesh.n_nodes(); ++i)
    for (int d = 0; d < 3; ++d) {
      lo_[d] = std::min(lo_[d], mesh.coords[3 * i + d]);
      hi_[d] = std::max(hi_[d], mesh.coords[3 * i + d]);
    }
  diagonal_ = std::sqrt((hi_[0] - lo_[0]) * (hi_[0] - lo_[0]) + (hi_[1] - lo_[1]) * (hi_[1] - lo_[1]) +
                        (hi_[2] - lo_[2]) * (hi_[2] - lo_[2]));
  const double pad = 1e-9 * diagonal_;
  for (int d = 0; d < 3; ++d) {
    lo_[d] -= pad;
    hi_[d] += pad;
  }
  // About one element per cell, cells roughly cubic.
  const double volume = std::max((hi_[0] - lo_[0]) * (hi_[1] - lo_[1]) * (hi_[2] - lo_[2]), 1e-300);
  const double cell = std::cbrt(volume / std::max<std::size_t>(mesh.n_tets(), 1));
  for (int d = 0; d < 3; ++d) cells_[d] = std::clamp(int((hi_[d] - lo_[d]) / cell) + 1, 1, 512);
  const std::size_t n_cells = std::size_t(cells_[0]) * cells_[1] * cells_[2];
  auto cell_range = [&](const Point& lo, const Point& hi, int first[3], int last[3]) {
    for (int d = 0; d < 3; ++d) {
      const double h = (hi_[d] - lo_[d]) / cells_[d];
      first[d] = std::clamp(int((lo[d] - pad - lo_[d]) / h), 0, cells_[d] - 1);
      last[d] = std::clamp(int((hi[d] + pad - lo_[d]) / h), 0, cells_[d] - 1);
    }
  };
  std::vector<std::int64_t> count(n_cells + 1, 0);
  for (int pass = 0; pass < 2; ++pass) {
    std::vector<std::int64_t> fill;
    if (pass == 1) {
      for (std::size_t c = 0; c < n_cells; ++c) count[c + 1] += count[c];
      cell_elements_.resize(count[n_cells]);
      fill.assign(count.begin(), count.end() - 1);
    }
    for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
      Point lo, hi;
      element_box(mesh, e, lo, hi);
      int first[3], last[3];
      cell_range(lo, hi, first, last);
      for (int i = first[0]; i <= last[0]; ++i)
        for (int j = first[1]; j <= last[1]; ++j)
          for (int k = first[2]; k <= last[2]; ++k) {
            const std::size_t c = (std::size_t(k) * cells_[1] + j) * cells_[0] + i;
            if (pass == 0)
              ++count[c + 1];
            else
              cell_elements_[fill[c]++] = static_cast<std::int32_t>(e);
          }
    }
  }
  cell_start_ = std::move(count);
}

std::optional<Point> PointLocator::reference_coordinates(std::size_t e, const Point& p) const {
  TetGeometry g;
  g.order = mesh_.order;
  for (int a = 0; a < mesh_.nodes_per_tet(); ++a) g.x[a] = mesh_.node(mesh_.tet(e)[a]);
  // Newton on x(xi) = p; exact in one step for straight elements.
  Point xi{0.25, 0.25, 0.25};
  for (int iter = 0; iter < 20; ++iter) {
    const Point x = tet_map(g, xi);
    const Point r{p[0] - x[0], p[1] - x[1], p[2] - x[2]};
    double J[3][3];
    const double det = tet_jacobian(g, xi, J);
    if (!(std::abs(det) > 0)) return std::nullopt;
    // Solve J dxi = r by Cramer's rule.
    Point dxi;
    for (int c = 0; c < 3; ++c) {
      double M[3][3];
      for (int i = 0; i < 3; ++i)
        for (int j = 0; j < 3; ++j) M[i][j] = (j == c) ? r[i] : J[i][j];
      dxi[c] = (M[0][0] * (M[1][1] * M[2][2] - M[1][2] * M[2][1]) - M[0][1] * (M[1][0] * M[2][2] - M[1][2] * M[2][0]) +
                M[0][2] * (M[1][0] * M[2][1] - M[1][1] * M[2][0])) /
               det;
    }
    for (int d = 0; d < 3; ++d) xi[d] += dxi[d];
    if (std::abs(dxi[0]) + std::abs(dxi[1]) + std::abs(dxi[2]) < 1e-13) break;
  }
  return xi;
}

std::optional<PointHit> PointLocator::locate(const Point& p) const {
  if (mesh_.n_tets() == 0) return std::nullopt;
  for (int d = 0; d < 3; ++d)
    if (p[d] < lo_[d] || p[d] > hi_[d]) return std::nullopt;
  int idx[3];
  for (int d = 0; d < 3; ++d)
    idx[d] = std::clamp(int((p[d] - lo_[d]) / ((hi_[d] - lo_[d]) / cells_[d])), 0, cells_[d] - 1);
  const std::size_t c = (std::size_t(idx[2]) * cells_[1] + idx[1]) * cells_[0] + idx[0];
  // Accept the element with the least violation of the barycentric bounds, if that
  // violation is within the surface tolerance (measured in lengths of the element).
  std::optional<PointHit> best;
  double best_violation = std::numeric_limits<double>::infinity();
  for (std::int64_t q = cell_start_[c]; q < cell_start_[c + 1]; ++q) {
    const std::size_t e = cell_elements_[q];
    const auto xi = reference_coordinates(e, p);
    if (!xi) continue;
    const double L[4] = {1.0 - (*xi)[0] - (*xi)[1] - (*xi)[2], (*xi)[0], (*xi)[1], (*xi)[2]};
    const double violation = -std::min({L[0], L[1], L[2], L[3], 0.0});
    if (violation < best_violation) {
      Point lo, hi;
      element_box(mesh_, e, lo, hi);
      const double size = std::max({hi[0] - lo[0], hi[1] - lo[1], hi[2] - lo[2]});
      if (violation * size <= 1e-9 * diagonal_ + 1e-14 * size) {
        best_violation = violation;
        best = PointHit{e, *xi};
        if (violation == 0.0) break;
      }
    }
  }
  return best;
}

double PointLocator::interpolate(const PointHit& hit, const std::vector<double>& nodal) const {
  double N[max_tet_nodes];
  tet_shape_values(mesh_.order, hit.xi, N);
  double value = 0.0;
  for (int a = 0; a < mesh_.nodes_per_tet(); ++a) value += N[a] * nodal[mesh_.tet(hit.element)[a]];
  return value;
}

}  // namespace hearth
