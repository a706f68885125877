// The reference solve of the benchmark: the assembled matrix handed straight to hypre
// (IJ interface, ParCSR PCG with BoomerAMG), with nothing of hearth around the calls.
// hearth's time over this one is the overhead of our own code.
#pragma once

#include <vector>

#include "solver/csr_matrix.hpp"

namespace hearth::bench {

struct ReferenceSolve {
  double setup_seconds = 0.0;  // matrix into hypre and BoomerAMG set-up
  double solve_seconds = 0.0;  // PCG iterations
  int iterations = 0;
  double relative_residual = 0.0;
};

// Solves A x = b from x = 0 to the relative residual `tolerance` with the settings hypre
// recommends for 3D diffusion (HMIS with one level of aggressive coarsening, extended+i
// interpolation, strength 0.5, hybrid symmetric Gauss-Seidel). MPI and hypre must be
// initialised already: hearth's own multigrid solver, created first, does that.
ReferenceSolve solve_with_raw_hypre(const CsrMatrix& A, const std::vector<double>& b, double tolerance);

}  // namespace hearth::bench
