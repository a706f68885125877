// Point location: one pass over the elements for points named in advance, a uniform
// grid of element boxes for the rest.
#include "solver/point_locator.hpp"

#include <omp.h>

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

double largest_extent(const Point& lo, const Point& hi) {
  return std::max({hi[0] - lo[0], hi[1] - lo[1], hi[2] - lo[2]});
}

constexpr double kInfinity = std::numeric_limits<double>::infinity();

}  // namespace

PointLocator::PointLocator(const Mesh& mesh, const std::vector<Point>& expected) : mesh_(mesh) {
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
  if (!expected.empty() && mesh.n_tets() > 0) find_expected(expected);
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

bool PointLocator::consider(std::size_t e, const Point& p, Candidate& best) const {
  const auto xi = reference_coordinates(e, p);
  if (!xi) return false;
  const double L[4] = {1.0 - (*xi)[0] - (*xi)[1] - (*xi)[2], (*xi)[0], (*xi)[1], (*xi)[2]};
  const double violation = -std::min({L[0], L[1], L[2], L[3], 0.0});
  const bool better = !best.hit || violation < best.violation || (violation == best.violation && e < best.hit->element);
  if (!better) return false;
  // Accept a violation within the surface tolerance (measured in lengths of the element).
  Point lo, hi;
  element_box(mesh_, e, lo, hi);
  const double size = largest_extent(lo, hi);
  if (violation * size > 1e-9 * diagonal_ + 1e-14 * size) return false;
  best.hit = PointHit{e, *xi};
  best.violation = violation;
  return true;
}

void PointLocator::find_expected(const std::vector<Point>& requested) {
  std::vector<Point> points;
  for (const Point& p : requested)
    if (p[0] >= lo_[0] && p[0] <= hi_[0] && p[1] >= lo_[1] && p[1] <= hi_[1] && p[2] >= lo_[2] && p[2] <= hi_[2])
      points.push_back(p);
  std::sort(points.begin(), points.end());
  points.erase(std::unique(points.begin(), points.end()), points.end());
  for (const Point& p : requested) known_[p] = std::nullopt;  // outside the box, or found below
  if (points.empty()) return;
  // The points on a small grid of their own (about one a cell), so that an element
  // box looks at the points near it only.
  Point plo = points[0], phi = points[0];
  for (const Point& p : points)
    for (int d = 0; d < 3; ++d) plo[d] = std::min(plo[d], p[d]), phi[d] = std::max(phi[d], p[d]);
  const double n = static_cast<double>(points.size());
  const double h = std::max({std::cbrt((phi[0] - plo[0]) * (phi[1] - plo[1]) * (phi[2] - plo[2]) / n),
                             largest_extent(plo, phi) / n, 1e-300});
  int cells[3];
  for (int d = 0; d < 3; ++d) cells[d] = std::clamp(int((phi[d] - plo[d]) / h) + 1, 1, 256);
  auto cell_index = [&](int d, double x) { return std::clamp(int((x - plo[d]) / h), 0, cells[d] - 1); };
  const std::size_t n_cells = std::size_t(cells[0]) * cells[1] * cells[2];
  std::vector<std::size_t> start(n_cells + 1, 0), in_cell(points.size());
  auto cell_of = [&](const Point& p) {
    return (std::size_t(cell_index(2, p[2])) * cells[1] + cell_index(1, p[1])) * cells[0] + cell_index(0, p[0]);
  };
  for (const Point& p : points) ++start[cell_of(p) + 1];
  for (std::size_t c = 0; c < n_cells; ++c) start[c + 1] += start[c];
  {
    std::vector<std::size_t> fill(start.begin(), start.end() - 1);
    for (std::size_t i = 0; i < points.size(); ++i) in_cell[fill[cell_of(points[i])]++] = i;
  }
  // Each thread keeps its own best per point; they are joined by the same rule.
  const int threads = omp_get_max_threads();
  std::vector<std::vector<Candidate>> best(threads, std::vector<Candidate>(points.size()));
  const std::int64_t n_tets = static_cast<std::int64_t>(mesh_.n_tets());
#pragma omp parallel num_threads(threads)
  {
    std::vector<Candidate>& mine = best[omp_get_thread_num()];
#pragma omp for schedule(static)
    for (std::int64_t t = 0; t < n_tets; ++t) {
      const std::size_t e = static_cast<std::size_t>(t);
      Point lo, hi;
      element_box(mesh_, e, lo, hi);
      // Wide enough for every point the tolerance in consider() accepts.
      const double margin = 2e-9 * diagonal_ + 2e-14 * largest_extent(lo, hi);
      bool near = true;
      for (int d = 0; d < 3; ++d) {
        lo[d] -= margin;
        hi[d] += margin;
        near = near && hi[d] >= plo[d] && lo[d] <= phi[d];
      }
      if (!near) continue;
      for (int k = cell_index(2, lo[2]); k <= cell_index(2, hi[2]); ++k)
        for (int j = cell_index(1, lo[1]); j <= cell_index(1, hi[1]); ++j)
          for (int i = cell_index(0, lo[0]); i <= cell_index(0, hi[0]); ++i) {
            const std::size_t c = (std::size_t(k) * cells[1] + j) * cells[0] + i;
            for (std::size_t q = start[c]; q < start[c + 1]; ++q) {
              const Point& p = points[in_cell[q]];
              if (p[0] < lo[0] || p[0] > hi[0] || p[1] < lo[1] || p[1] > hi[1] || p[2] < lo[2] || p[2] > hi[2]) continue;
              consider(e, p, mine[in_cell[q]]);
            }
          }
    }
  }
  for (std::size_t i = 0; i < points.size(); ++i) {
    Candidate joined;
    for (const auto& thread_best : best) {
      const Candidate& b = thread_best[i];
      if (b.hit && (!joined.hit || b.violation < joined.violation ||
                    (b.violation == joined.violation && b.hit->element < joined.hit->element)))
        joined = b;
    }
    known_[points[i]] = joined.hit;
  }
}

void PointLocator::build_grid() const {
  grid_built_ = true;
  const double pad = 1e-9 * diagonal_;
  // About four elements' volume per cell, cells roughly cubic: an element's box then
  // overlaps about 3 cells rather than 8 (less time and memory to build), and a query
  // tests a few dozen elements.
  const double volume = std::max((hi_[0] - lo_[0]) * (hi_[1] - lo_[1]) * (hi_[2] - lo_[2]), 1e-300);
  const double cell = std::cbrt(4.0 * volume / std::max<std::size_t>(mesh_.n_tets(), 1));
  for (int d = 0; d < 3; ++d) cells_[d] = std::clamp(int((hi_[d] - lo_[d]) / cell) + 1, 1, 512);
  const std::size_t n_cells = std::size_t(cells_[0]) * cells_[1] * cells_[2];
  // Calls visit(c) for each cell c that element e's box overlaps.
  auto for_each_cell_of = [&](std::size_t e, auto visit) {
    Point lo, hi;
    element_box(mesh_, e, lo, hi);
    int first[3], last[3];
    for (int d = 0; d < 3; ++d) {
      const double h = (hi_[d] - lo_[d]) / cells_[d];
      first[d] = std::clamp(int((lo[d] - pad - lo_[d]) / h), 0, cells_[d] - 1);
      last[d] = std::clamp(int((hi[d] + pad - lo_[d]) / h), 0, cells_[d] - 1);
    }
    for (int k = first[2]; k <= last[2]; ++k)
      for (int j = first[1]; j <= last[1]; ++j)
        for (int i = first[0]; i <= last[0]; ++i) visit((std::size_t(k) * cells_[1] + j) * cells_[0] + i);
  };
  // Two parallel passes (count, then fill), then each cell's list sorted, so that the
  // lists do not depend on the threads' timing.
  const std::int64_t n_tets = static_cast<std::int64_t>(mesh_.n_tets());
  std::vector<std::int64_t> count(n_cells + 1, 0);
#pragma omp parallel for schedule(static)
  for (std::int64_t e = 0; e < n_tets; ++e)
    for_each_cell_of(static_cast<std::size_t>(e), [&](std::size_t c) {
#pragma omp atomic
      ++count[c + 1];
    });
  for (std::size_t c = 0; c < n_cells; ++c) count[c + 1] += count[c];
  cell_elements_.resize(static_cast<std::size_t>(count[n_cells]));
  std::vector<std::int64_t> fill(count.begin(), count.end() - 1);
#pragma omp parallel for schedule(static)
  for (std::int64_t e = 0; e < n_tets; ++e)
    for_each_cell_of(static_cast<std::size_t>(e), [&](std::size_t c) {
      std::int64_t slot;
#pragma omp atomic capture
      slot = fill[c]++;
      cell_elements_[static_cast<std::size_t>(slot)] = static_cast<std::int32_t>(e);
    });
  const std::int64_t cells = static_cast<std::int64_t>(n_cells);
#pragma omp parallel for schedule(dynamic, 4096)
  for (std::int64_t c = 0; c < cells; ++c)
    std::sort(cell_elements_.begin() + count[c], cell_elements_.begin() + count[c + 1]);
  cell_start_ = std::move(count);
}

std::optional<PointHit> PointLocator::locate_in_grid(const Point& p) const {
  if (!grid_built_) build_grid();
  int idx[3];
  for (int d = 0; d < 3; ++d)
    idx[d] = std::clamp(int((p[d] - lo_[d]) / ((hi_[d] - lo_[d]) / cells_[d])), 0, cells_[d] - 1);
  const std::size_t c = (std::size_t(idx[2]) * cells_[1] + idx[1]) * cells_[0] + idx[0];
  Candidate best;
  for (std::int64_t q = cell_start_[c]; q < cell_start_[c + 1]; ++q)
    if (consider(static_cast<std::size_t>(cell_elements_[q]), p, best) && best.violation == 0.0) break;
  return best.hit;
}

std::optional<PointHit> PointLocator::locate(const Point& p) const {
  if (mesh_.n_tets() == 0) return std::nullopt;
  if (const auto known = known_.find(p); known != known_.end()) return known->second;
  for (int d = 0; d < 3; ++d)
    if (p[d] < lo_[d] || p[d] > hi_[d]) return std::nullopt;
  return locate_in_grid(p);
}

double PointLocator::interpolate(const PointHit& hit, const std::vector<double>& nodal) const {
  double N[max_tet_nodes];
  tet_shape_values(mesh_.order, hit.xi, N);
  double value = 0.0;
  for (int a = 0; a < mesh_.nodes_per_tet(); ++a) value += N[a] * nodal[mesh_.tet(hit.element)[a]];
  return value;
}

}  // namespace hearth
