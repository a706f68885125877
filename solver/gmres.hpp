// Restarted GMRES with right preconditioning, for small and mid-sized systems whose
// preconditioner is an exact factorisation of a nearby matrix (Newton steps with a
// kept direct factorisation). Saad, Iterative Methods for Sparse Linear Systems, 2nd
// ed., 2003, algorithm 9.5 (from memory): Arnoldi by modified Gram-Schmidt, Givens
// rotations on the Hessenberg matrix, so the residual norm is known at every step.
#pragma once

#include <functional>
#include <vector>

#include "solver/csr_matrix.hpp"

namespace hearth {

struct GmresOutcome {
  int iterations = 0;              // matrix-vector products in all
  double relative_residual = 0.0;  // |b - A x| / |b|, recomputed at the end
  bool converged = false;
};

// z = M^{-1} r, M close to A.
using Preconditioner = std::function<void(const std::vector<double>& r, std::vector<double>& z)>;

// Solves A x = b to |b - A x| <= tolerance |b|; x holds the initial guess on entry.
GmresOutcome gmres(const CsrMatrix& A, const std::vector<double>& b, std::vector<double>& x,
                   const Preconditioner& precondition, double tolerance, int max_iterations, int restart = 30);

}  // namespace hearth
