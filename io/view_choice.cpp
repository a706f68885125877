// View choices: vector arithmetic only.
#include "io/view_choice.hpp"

#include <cmath>

namespace hearth {

namespace {

double dot(const Vector3& a, const Vector3& b) { return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]; }

Vector3 cross(const Vector3& a, const Vector3& b) {
  return {a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]};
}

Vector3 normalised(const Vector3& a) {
  const double n = std::sqrt(dot(a, a));
  return n > 0 ? Vector3{a[0] / n, a[1] / n, a[2] / n} : a;
}

ViewDirection looking_along(const Vector3& direction) {
  const Vector3 d = normalised(direction);
  return {d, view_up_for(d)};
}

// The 26 directions from a cube's centre to its face centres, edge midpoints and corners.
std::vector<Vector3> cube_directions() {
  std::vector<Vector3> out;
  for (int i = -1; i <= 1; ++i)
    for (int j = -1; j <= 1; ++j)
      for (int k = -1; k <= 1; ++k)
        if (i || j || k) out.push_back(normalised({double(i), double(j), double(k)}));
  return out;
}

}  // namespace

Vector3 view_up_for(const Vector3& direction) {
  const Vector3 d = normalised(direction);
  const Vector3 axis = std::abs(d[2]) > 0.9 ? Vector3{0, 1, 0} : Vector3{0, 0, 1};
  const double along = dot(axis, d);
  return normalised({axis[0] - along * d[0], axis[1] - along * d[1], axis[2] - along * d[2]});
}

ViewDirection isometric_view(const Bounds& b, const Vector3& hottest) {
  Vector3 side{1, 1, 1};  // always from above
  for (int k = 0; k < 2; ++k) {
    const double centre = (b[2 * k] + b[2 * k + 1]) / 2, extent = b[2 * k + 1] - b[2 * k];
    side[k] = hottest[k] < centre - 1e-9 * extent ? -1.0 : 1.0;
  }
  // The camera sits on the hottest point's side and looks back through the centre.
  return looking_along({-side[0], -side[1], -side[2]});
}

double BoundaryPatch::area() const {
  double sum = 0;
  for (double a : areas) sum += a;
  return sum;
}

std::optional<BoundaryView> largest_boundary_view(const std::vector<BoundaryPatch>& patches) {
  double largest = 0;
  for (const auto& p : patches) largest = std::max(largest, p.area());
  if (!(largest > 0)) return std::nullopt;
  const BoundaryPatch* chosen = nullptr;
  for (const auto& p : patches)
    if (p.area() >= 0.99 * largest && (!chosen || p.temperature_range > chosen->temperature_range)) chosen = &p;

  const std::vector<Vector3> directions = cube_directions();
  std::vector<double> area(directions.size(), 0.0);
  std::vector<Vector3> weighted(directions.size(), Vector3{0, 0, 0});
  for (std::size_t t = 0; t < chosen->areas.size(); ++t) {
    std::size_t best = 0;
    for (std::size_t k = 1; k < directions.size(); ++k)
      if (dot(chosen->normals[t], directions[k]) > dot(chosen->normals[t], directions[best])) best = k;
    area[best] += chosen->areas[t];
    for (int d = 0; d < 3; ++d) weighted[best][d] += chosen->areas[t] * chosen->normals[t][d];
  }
  std::size_t facing = 0;
  for (std::size_t k = 1; k < directions.size(); ++k)
    if (area[k] > area[facing]) facing = k;
  const Vector3 outward = normalised(weighted[facing]);
  return BoundaryView{chosen->name, looking_along({-outward[0], -outward[1], -outward[2]})};
}

SectionPlane section_through(const Vector3& hottest, const Vector3& heat_flow, const Bounds& b) {
  Vector3 flow = normalised(heat_flow);
  if (!(dot(flow, flow) > 0)) flow = {1, 0, 0};  // a uniform field: any plane shows it
  int axis = 2;
  for (int k = 1; k >= 0; --k) {
    const double score = std::abs(flow[k]), best = std::abs(flow[axis]);
    const double extent = b[2 * k + 1] - b[2 * k], best_extent = b[2 * axis + 1] - b[2 * axis];
    if (score < best - 1e-6 || (std::abs(score - best) <= 1e-6 && extent < best_extent * (1 - 1e-9))) axis = k;
  }
  SectionPlane plane;
  plane.origin = hottest;
  plane.normal_axis = axis;
  const double low = b[2 * axis], high = b[2 * axis + 1], extent = high - low;
  if (plane.origin[axis] <= low + 1e-6 * extent) plane.origin[axis] = low + 1e-3 * extent;
  if (plane.origin[axis] >= high - 1e-6 * extent) plane.origin[axis] = high - 1e-3 * extent;
  Vector3 direction{0, 0, 0};
  direction[axis] = -1.0;
  plane.view = looking_along(direction);
  const Vector3 right = cross(plane.view.direction, plane.view.view_up);
  if (right[0] + right[1] + right[2] < 0) {
    direction[axis] = 1.0;
    plane.view = looking_along(direction);
  }
  return plane;
}

}  // namespace hearth
