// The benchmark's rows: printed as a table for people or as JSON for scripts.
#pragma once

#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

namespace hearth::bench {

struct BenchRow {
  double size = 0.0;  // element size, m
  std::size_t nodes = 0, elements = 0;
  std::int64_t unknowns = 0;
  double mesh_seconds = 0.0;
  double assembly_seconds = 0.0;  // re-assembly into allocated storage, median
  std::string solver;             // "cholmod" | "boomeramg-pcg"
  double setup_seconds = 0.0, solve_seconds = 0.0;  // medians
  int iterations = 0;
  double peak_bytes = 0.0;         // growth of the resident set during assembly + solve
  double estimated_bytes = 0.0;    // estimate_solve_memory before assembling
  bool reference = false;          // the raw hypre columns below hold a measurement
  double reference_setup_seconds = 0.0, reference_solve_seconds = 0.0;
  int reference_iterations = 0;
  std::string note;  // "skipped: ..." or "failed: ..." when there is no measurement

  double solver_seconds() const { return setup_seconds + solve_seconds; }
  double reference_seconds() const { return reference_setup_seconds + reference_solve_seconds; }
};

struct BenchRun {
  std::string geometry, description;
  int order = 1, threads = 1, repeat = 1;
  double tolerance = 1e-8;
  std::vector<BenchRow> rows;
};

// Multigrid iterations at the largest size over those at the smallest (0 when fewer
// than two multigrid rows).
double iteration_growth(const BenchRun& run);
// p in cost ~ N^p for assembly + set-up + solve between the smallest and the largest
// multigrid rows (0 when fewer than two).
double cost_exponent(const BenchRun& run);

void print_heading(const BenchRun& run);
void print_row(const BenchRow& row);
void print_footer(const BenchRun& run);
std::string to_json(const BenchRun& run);

}  // namespace hearth::bench
