// A temperature field read back from a result VTU, for the report: its extent, its
// extremes and its values at any point.
#pragma once

#include <array>
#include <filesystem>
#include <memory>
#include <optional>
#include <string>
#include <vector>

class vtkUnstructuredGrid;

namespace hearth {

using Point3 = std::array<double, 3>;

// The field at one point inside the body (coordinates in the file's length unit).
struct FieldSample {
  double temperature = 0.0;      // the file's temperature unit
  Point3 heat_flux{};            // W/m2, from the nodal (recovered) field; 0 when the file has none
  std::string region;            // name of the region of the element that holds the point
};

class FieldGrid {
 public:
  // Reads `vtu` (a hearth temperature file). Throws InputError when the file cannot
  // be read or has no point field "temperature".
  explicit FieldGrid(const std::filesystem::path& vtu);
  ~FieldGrid();
  FieldGrid(FieldGrid&&) noexcept;
  FieldGrid& operator=(FieldGrid&&) noexcept;

  // The field at x, from the element x lies deepest in, or nothing when x lies outside
  // every element (a point on the surface counts as inside, within VTK's parametric
  // tolerance of the element).
  std::optional<FieldSample> sample(const Point3& x) const;

  std::array<double, 6> bounds() const;  // xmin xmax ymin ymax zmin zmax
  double min_temperature() const { return t_min_; }
  double max_temperature() const { return t_max_; }
  // The node of highest (lowest) temperature; where several share the extreme value
  // (a face held at it), the one nearest the centre of the body's bounding box, so that
  // a cut through it runs through the middle.
  Point3 hottest_point() const { return hottest_; }
  Point3 coldest_point() const { return coldest_; }
  bool has_heat_flux() const { return has_flux_; }
  // The nodal heat flux (W/m2) at hottest_point(), and the largest magnitude anywhere;
  // zero when the file has no heat flux.
  Point3 heat_flux_at_hottest() const { return flux_at_hottest_; }
  double max_heat_flux() const { return max_flux_; }
  std::size_t n_points() const;
  std::size_t n_cells() const;
  std::string region_name(int tag) const;  // "region <tag>" when the file does not name it

  vtkUnstructuredGrid& grid() const;  // for the picture code in io/

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
  double t_min_ = 0.0, t_max_ = 0.0;
  Point3 hottest_{}, coldest_{};
  bool has_flux_ = false;
  Point3 flux_at_hottest_{};
  double max_flux_ = 0.0;
};

}  // namespace hearth
