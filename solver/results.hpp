// Results: what post-processing derives from a temperature field, in SI and kelvin.
#pragma once

#include <array>
#include <string>
#include <vector>

namespace hearth {

struct Stats {
  double min = 0.0, max = 0.0, mean = 0.0;
};

struct RegionResult {
  std::string name;
  double volume = 0.0;          // m3
  Stats temperature;            // K; mean is the volume average
  std::array<double, 3> hottest{};  // location of the maximum nodal temperature, m
  double heat_generated = 0.0;  // W, integral of the volumetric source
};

struct BoundaryResult {
  std::string name;
  double area = 0.0;            // m2
  // W. Exterior boundary: positive into the body. Internal surface: positive in the
  // direction of the surface normal.
  double heat_rate = 0.0;
  Stats temperature;            // K; mean is the area average
  std::array<double, 3> hottest{};
  bool internal = false;        // every face between two elements
};

struct EnergyBalance {
  double boundary_in = 0.0;     // W entering through exterior boundaries (sum of positive rates)
  double boundary_out = 0.0;    // W leaving (sum of negative rates, as a positive number)
  double sources = 0.0;         // W generated inside
  double stored = 0.0;          // W (steady: 0)
  // (in + sources - out - stored) / max(in + |sources|, out, tiny)
  double relative_imbalance = 0.0;
};

struct Results {
  std::vector<double> nodal_flux;  // W/m2, 3 per node, recovered
  std::vector<double> cell_flux;   // W/m2, 3 per element, at its centroid
  std::vector<RegionResult> regions;
  std::vector<BoundaryResult> boundaries;
  EnergyBalance balance;
};

}  // namespace hearth
