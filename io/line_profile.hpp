// A line of the case sampled for plotting: the run's temperatures (line_NAME.csv) with
// the heat-flux magnitude and the region at each point, and where the line passes from
// one region into another.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "io/field_grid.hpp"
#include "io/result_folder.hpp"

namespace hearth {

struct RegionCrossing {
  double distance = 0.0;  // along the line, the case's length unit
  std::string before, after;
};

struct LineProfile {
  std::string name;
  Point3 from{}, to{};
  std::vector<double> distance;
  std::vector<std::optional<double>> temperature;  // from line_NAME.csv; empty outside the body
  std::vector<std::optional<double>> heat_flux;    // |q| (W/m2) of the nodal field; empty outside
  std::vector<std::string> region;                 // "" outside
  std::vector<RegionCrossing> crossings;           // located to 1e-9 of the line's length
};

// Samples `field` at the line's points and bisects every step between two regions.
LineProfile profile_line(const LineTable& line, const FieldGrid& field);

}  // namespace hearth
