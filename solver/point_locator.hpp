// PointLocator: finds the element containing a point and interpolates nodal fields.
#pragma once

#include <cstdint>
#include <map>
#include <optional>
#include <vector>

#include "mesh/mesh.hpp"
#include "solver/tet_element.hpp"

namespace hearth {

struct PointHit {
  std::size_t element = 0;
  Point xi{};  // reference coordinates inside the element
};

// Finds points in the mesh. Points named in advance (probes, line samples) are found
// in one parallel pass over the elements, which needs no index; any other point is
// found through a uniform grid of element bounding boxes (about four elements per
// cell, so a query touches a few dozen elements), built at its first use: at a
// million nodes the grid took 2 s and 200 MB, held through the solve, for two probes.
// Both ways give the same element: the least violation of the barycentric bounds, the
// lowest element number among equals. Curved 10-node elements are inverted by Newton
// iteration on the isoparametric map. locate() may be called from one thread at a time.
class PointLocator {
 public:
  explicit PointLocator(const Mesh& mesh, const std::vector<Point>& expected = {});
  // The element containing p; a point on the surface within 1e-9 of the body's size
  // counts as inside. Empty when p lies outside the mesh.
  std::optional<PointHit> locate(const Point& p) const;
  double interpolate(const PointHit& hit, const std::vector<double>& nodal) const;
  double body_size() const { return diagonal_; }

 private:
  // The best element so far for one point.
  struct Candidate {
    std::optional<PointHit> hit;
    double violation = 0.0;
  };
  // Tries element e for p; true when it replaced `best`.
  bool consider(std::size_t e, const Point& p, Candidate& best) const;
  std::optional<Point> reference_coordinates(std::size_t element, const Point& p) const;
  void find_expected(const std::vector<Point>& points);
  void build_grid() const;
  std::optional<PointHit> locate_in_grid(const Point& p) const;

  const Mesh& mesh_;
  Point lo_{}, hi_{};
  double diagonal_ = 0.0;
  std::map<Point, std::optional<PointHit>> known_;  // the expected points' answers
  mutable bool grid_built_ = false;
  mutable int cells_[3] = {1, 1, 1};
  mutable std::vector<std::int64_t> cell_start_;
  mutable std::vector<std::int32_t> cell_elements_;
};

}  // namespace hearth
