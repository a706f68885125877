// ThermalProblem: material properties and boundary conditions per mesh region and
// boundary index, in SI units and kelvin. Built by the driver from the Case.
#pragma once

#include <array>
#include <functional>
#include <optional>
#include <string>
#include <vector>

namespace hearth {

struct Convection {
  double coefficient = 0.0;  // film coefficient h, W/(m2 K)
  double ambient = 0.0;      // fluid temperature, K
};

// Condition on one named surface. Nothing set: insulated.
struct BoundaryCondition {
  std::optional<double> temperature;    // fixed temperature, K (excludes the others)
  double heat_flux = 0.0;               // W/m2 into the body
  std::optional<Convection> convection;

  bool is_fixed() const { return temperature.has_value(); }
  bool is_insulated() const { return !temperature && heat_flux == 0.0 && !convection; }
};

struct RegionProperties {
  std::string material;        // for messages and the summary
  double conductivity = 0.0;   // W/(m K), isotropic, > 0
  double heat_source = 0.0;    // volumetric source, W/m3
};

struct ThermalProblem {
  std::vector<RegionProperties> regions;       // one per Mesh::regions entry
  std::vector<BoundaryCondition> boundaries;   // one per Mesh::boundaries entry
  // Optional source varying in space, W/m3, added to the region sources and
  // integrated with a rule of source_field_degree (manufactured-solution checks).
  std::function<double(const std::array<double, 3>&)> source_field;
  int source_field_degree = 6;
};

}  // namespace hearth
