// PointLocator: finds the element containing a point and interpolates nodal fields.
#pragma once

#include <optional>
#include <vector>

#include "mesh/mesh.hpp"
#include "solver/tet_element.hpp"

namespace hearth {

struct PointHit {
  std::size_t element = 0;
  Point xi{};  // reference coordinates inside the element
};

// Buckets element bounding boxes on a uniform grid (about one element per cell), so a
// query touches a handful of elements. Curved 10-node elements are inverted by Newton
// iteration on the isoparametric map.
class PointLocator {
 public:
  explicit PointLocator(const Mesh& mesh);
  // The element containing p; a point on the surface within 1e-9 of the body's size
  // counts as inside. Empty when p lies outside the mesh.
  std::optional<PointHit> locate(const Point& p) const;
  double interpolate(const PointHit& hit, const std::vector<double>& nodal) const;
  double body_size() const { return diagonal_; }

 private:
  std::optional<Point> reference_coordinates(std::size_t element, const Point& p) const;
  const Mesh& mesh_;
  Point lo_{}, hi_{};
  double diagonal_ = 0.0;
  int cells_[3] = {1, 1, 1};
  std::vector<std::int64_t> cell_start_;
  std::vector<std::int32_t> cell_elements_;
};

}  // namespace hearth
