// RunRecord: everything a finished (or failed) run reports, for summary.json and the
// terminal. Temperatures in K, lengths in metres; writers convert to the case's units.
#pragma once

#include <array>
#include <optional>
#include <string>
#include <vector>

#include "solver/results.hpp"

namespace hearth {

struct ProbeRecord {
  std::string name;
  std::array<double, 3> point{};  // m
  double temperature = 0.0;       // K
};

struct ServiceRecord {
  std::string material;
  double max = 0.0;                  // K, hottest node in that material
  std::array<double, 3> location{};  // m
  double limit = 0.0;                // K
};

// A surface people may touch, against the touch limit.
struct TouchRecord {
  std::string surface;
  double max = 0.0;                  // K, hottest node of the surface
  std::array<double, 3> location{};  // m
  double limit = 0.0;                // K
};

struct RunRecord {
  std::string title;
  std::string case_file;
  std::string hearth_version;
  // mesh
  std::size_t nodes = 0, elements = 0;
  int order = 1;
  double min_quality = 0.0;
  // solve
  std::int64_t dofs = 0;
  std::string linear_solver;
  int linear_iterations = 0;
  int nonlinear_iterations = 0;
  double linear_relative_residual = 0.0;
  double seconds = 0.0;
  bool converged = true;
  std::string failure;  // why, when not converged
  std::string blas;
  // results
  Results results;
  std::vector<std::string> boundary_conditions;  // per boundary: "temperature", "convection+heat_flux", "insulated", ...
  std::vector<ProbeRecord> probes;
  std::vector<ServiceRecord> service;
  std::vector<TouchRecord> touch;
  std::vector<std::string> warnings;
};

}  // namespace hearth
