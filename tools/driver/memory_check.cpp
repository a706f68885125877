// Solve memory against MemAvailable.
#include "tools/driver/memory_check.hpp"

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <fstream>

#include "io/input_error.hpp"
#include "tools/driver/pipeline.hpp"

namespace hearth {

std::string memory_text(double bytes) {
  char text[32];
  if (bytes >= 1e9) std::snprintf(text, sizeof text, "%.3g GB", bytes / 1e9);
  else std::snprintf(text, sizeof text, "%.3g MB", bytes / 1e6);
  return text;
}

double available_memory_bytes() {
  const char* fake = std::getenv("HEARTH_TEST_MEMINFO");
  std::ifstream in(fake && *fake ? fake : "/proc/meminfo");
  std::string key, unit;
  double kilobytes = 0;
  while (in >> key >> kilobytes) {
    std::getline(in, unit);
    if (key == "MemAvailable:") return kilobytes * 1024.0;
  }
  return 0.0;
}

SolveMemoryEstimate check_solve_memory(const Case& c, const Mesh& mesh, const ThermalProblem& problem) {
  bool symmetric = true;
  for (const auto& r : problem.regions) symmetric &= !r.conductivity.depends_on_temperature();
  const auto unknowns = static_cast<std::int64_t>(mesh.n_nodes());
  const LinearSolverSettings settings = linear_settings(c);
  const SolveMemoryEstimate need = estimate_solve_memory(unknowns, mesh.order, settings, symmetric);
  const double have = available_memory_bytes();
  if (have <= 0.0 || need.bytes <= have) return need;

  // Nodes go with the cube of 1 / size: the size at which the estimate would fit, with 10% to spare.
  const double fitting_size = c.mesh_size * std::cbrt(1.1 * need.bytes / have) / c.units.metres_per_length();
  char size_text[32];
  std::snprintf(size_text, sizeof size_text, "%.3g", fitting_size);
  std::string alternatives = "use a larger mesh.size (about " + std::string(size_text) + " " + c.units.length +
                             " would fit)";
  if (mesh.order == 2) alternatives += ", or mesh.order: 1 (fewer nodes)";
  LinearSolverSettings iterative = settings;
  iterative.kind = LinearSolverKind::iterative;
  const SolveMemoryEstimate multigrid = estimate_solve_memory(unknowns, mesh.order, iterative, symmetric);
  if (need.linear_solver != multigrid.linear_solver && multigrid.bytes <= have)
    alternatives += ", or solver.linear: iterative (" + multigrid.linear_solver + ", about " +
                    memory_text(multigrid.bytes) + ")";
  throw InputError(c.mesh_size_place.str() + ": the mesh has " + std::to_string(unknowns) + " nodes (order " +
                   std::to_string(mesh.order) + "); solving for them with " + need.linear_solver + " needs about " +
                   memory_text(need.bytes) + " of memory, but " + memory_text(have) +
                   " are available (MemAvailable in /proc/meminfo); " + alternatives);
}

}  // namespace hearth
