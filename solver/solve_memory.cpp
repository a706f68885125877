// Memory estimate of a steady solve from the unknowns, the element order and the solver.
#include "solver/solve_memory.hpp"

#include <algorithm>
#include <cmath>

namespace hearth {

SolveMemoryEstimate estimate_solve_memory(std::int64_t unknowns, int order, const LinearSolverSettings& settings,
                                          bool symmetric) {
  const double n = static_cast<double>(std::max<std::int64_t>(unknowns, 1));
  const bool quadratic = order == 2;
  const double matrix = (quadratic ? 28.0 : 15.0) * 12.0;
  const double position_map = quadratic ? 0.72 * 100 * 4 : 6.0 * 16 * 4;
  const double vectors = 25.0 * 8;
  const bool direct = settings.kind == LinearSolverKind::direct ||
                      (settings.kind == LinearSolverKind::automatic && unknowns <= settings.direct_limit);
  SolveMemoryEstimate estimate;
  double solver = 0.0;
  if (direct) {
    const double measured = quadratic ? 6400.0 : 3400.0, at = quadratic ? 213e3 : 53e3;
    solver = measured * std::max(1.0, std::cbrt(n / at));
    if (!symmetric) solver *= 2.0;
    estimate.linear_solver = symmetric ? "cholmod" : "umfpack";
  } else {
    solver = (quadratic ? 880.0 : 430.0) + (symmetric ? 0.0 : 30.0 * 8);
    estimate.linear_solver = symmetric ? "boomeramg-pcg" : "boomeramg-gmres";
  }
  estimate.bytes = n * (matrix + position_map + vectors + solver);
  return estimate;
}

}  // namespace hearth
