// The memory a steady solve will need, estimated before anything is assembled, so that
// a mesh too large for the machine is refused with numbers instead of ending in an
// out-of-memory kill halfway through.
#pragma once

#include <cstdint>
#include <string>

#include "solver/linear_solver.hpp"

namespace hearth {

struct SolveMemoryEstimate {
  double bytes = 0.0;          // matrix, position map, linear solver and vectors
  std::string linear_solver;   // the one make_linear_solver will pick: "cholmod", "umfpack", "boomeramg-pcg", ...
};

// For `unknowns` free temperatures on `order` 1 or 2 tetrahedra with the solver that
// `settings` picks (`symmetric`: no temperature-dependent conductivity). Per unknown:
// - the matrix in compressed rows, 12 bytes a nonzero (value and column), about 15
//   nonzeros a row for 4-node and 28 for 10-node tetrahedra, and the per-element map of
//   matrix positions (16 or 100 entries of 4 bytes an element, about 6 elements a node
//   for 4-node and 0.72 for 10-node meshes);
// - CHOLMOD: 3.4 KB (4-node, 53 thousand unknowns) and 6.4 KB (10-node, 213 thousand),
//   measured on this project's machine (design.md), growing with the cube root of the
//   unknowns as nested-dissection fill does in 3D (common practice, no source);
//   UMFPACK keeps two triangular factors: twice that (common practice, no source);
// - BoomerAMG with CG: 430 B (4-node) and 880 B (10-node), measured at 1 million
//   unknowns (design.md), plus 30 vectors of 8 bytes for GMRES when non-symmetric;
// - 25 vectors of 8 bytes for the right-hand side, iterates and post-processing.
SolveMemoryEstimate estimate_solve_memory(std::int64_t unknowns, int order, const LinearSolverSettings& settings,
                                          bool symmetric);

}  // namespace hearth
