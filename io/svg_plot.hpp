// Log-log convergence plots as standalone SVG files (for reports and browsers).
#pragma once

#include <filesystem>
#include <string>
#include <vector>

namespace hearth {

struct ConvergencePlot {
  std::string title;               // quantity name
  std::string unit;                // of the values, e.g. "W"
  std::vector<double> h;           // representative cell sizes, in the case's length unit
  std::vector<double> values;      // one per level
  double extrapolated = 0.0;       // Richardson value (NaN: none)
  double observed_order = 0.0;     // NaN: none
  std::string length_unit = "m";
};

// Plots |value - extrapolated| against h on log-log axes with the fitted slope, or, when
// there is no extrapolated value, the values against log h. Written atomically.
void write_convergence_svg(const std::filesystem::path& path, const ConvergencePlot& plot);

}  // namespace hearth
