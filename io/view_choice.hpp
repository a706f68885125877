// Where the report's cameras look from, chosen from the body's extent and its field:
// plain geometry, no rendering, so that the choices can be tested by hand.
#pragma once

#include <array>
#include <optional>
#include <string>
#include <vector>

namespace hearth {

using Vector3 = std::array<double, 3>;
using Bounds = std::array<double, 6>;  // xmin xmax ymin ymax zmin zmax

// A parallel-projection camera: the direction it looks along and the image's up.
struct ViewDirection {
  Vector3 direction{0, 0, -1};  // unit, from the camera towards the body
  Vector3 view_up{0, 1, 0};     // unit, perpendicular to direction
};

// Up for a camera looking along `direction`: the z axis made perpendicular to it, or
// the y axis when the camera looks nearly along z.
Vector3 view_up_for(const Vector3& direction);

// The isometric view along a diagonal of the bounding box, from above (z up; a view
// from below reads like a look inside a hollow box), from the quadrant in x and y that
// holds `hottest`, so that the hot side faces the camera.
ViewDirection isometric_view(const Bounds& bounds, const Vector3& hottest);

// An exterior named boundary, as its triangles: area (any unit) and outward unit normal.
struct BoundaryPatch {
  std::string name;
  std::vector<double> areas;
  std::vector<Vector3> normals;
  double temperature_range = 0.0;  // max - min over the boundary
  double area() const;
};

struct BoundaryView {
  std::string name;
  ViewDirection view;
};

// The view onto the largest boundary (of those within 1 % of the largest area, the one
// whose temperatures vary most; then the first): the camera looks against the mean
// outward normal of the part of the boundary that faces one way, the direction (of 26:
// the faces, edges and corners of a cube) that the largest share of its area faces.
// Nothing when there is no patch with area.
std::optional<BoundaryView> largest_boundary_view(const std::vector<BoundaryPatch>& patches);

// A plane through the hottest point, normal to the coordinate axis most nearly
// perpendicular to `flow`, the way heat flows there (so that the plane contains it);
// ties go to the axis along which the body is thinnest (the larger cut), then to the
// later axis. A plane that would lie on a face of the bounding box (the hottest point on
// that face) is moved a thousandth of the extent inside, where there is material to cut.
// The camera looks onto the plane with the image's right pointing along a positive axis.
struct SectionPlane {
  Vector3 origin{};
  int normal_axis = 2;  // 0 x, 1 y, 2 z
  ViewDirection view;
};
SectionPlane section_through(const Vector3& hottest, const Vector3& flow, const Bounds& bounds);

}  // namespace hearth
