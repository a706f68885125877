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
  // Transient: the first time the limit was crossed (s), and when the maximum occurred.
  std::optional<double> first_exceeded_time;
  std::optional<double> time_of_max;
};

// A transient threshold and when it was first crossed.
struct ThresholdRecord {
  std::string name;
  std::string kind;    // "probe" | "region_max" | "surface_mean"
  std::string target;  // the probe, region or surface
  double temperature = 0.0;               // K
  double start_value = 0.0;               // K, at t = 0
  std::optional<double> first_crossed;    // s
};

// One output time of a transient run.
struct HistoryEntry {
  double time = 0.0;  // s
  Results results;    // fluxes left empty; heat rates in W at this time
};

// What a transient run adds to the record. Energies over the run in J.
struct TransientRecord {
  std::string method;
  bool adaptive = true;
  double tolerance = 0.0;      // K per step
  double duration = 0.0;       // s asked for
  double end_time = 0.0;       // s reached
  int steps = 0, rejected_steps = 0, failed_steps = 0;
  int newton_iterations = 0;
  int preconditioner_setups = 0, matrix_reuses = 0;
  double first_step_seconds = 0.0;
  bool interrupted = false;
  double initial_min = 0.0, initial_max = 0.0;  // K, the starting field
  std::string initial_from;                     // "uniform" | "regions" | result folder
  EnergyBalance energy;                         // J over the run: in, out, sources, stored change
  std::vector<HistoryEntry> history;
  std::vector<ThresholdRecord> thresholds;
  std::vector<std::string> field_files;         // temperature_NNNN.vtu in order
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
  // Steady Newton runs: |R(T)| / |R(T0)| of the heat-balance residual at the answer.
  // Inexact Newton solves its last correction only as accurately as this needs, so the
  // last linear solve's own residual says little there.
  std::optional<double> nonlinear_relative_residual;
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
  std::optional<TransientRecord> transient;
};

}  // namespace hearth
