// Linear solvers for the symmetric positive-definite conduction system, behind one
// interface: CHOLMOD sparse Cholesky and hypre BoomerAMG-preconditioned CG.
#pragma once

#include <memory>
#include <string>
#include <vector>

#include "solver/csr_matrix.hpp"

namespace hearth {

enum class LinearSolverKind { automatic, direct, iterative };

struct LinearSolverSettings {
  LinearSolverKind kind = LinearSolverKind::automatic;
  double tolerance = 1e-10;      // relative residual |b - A x| / |b| (iterative)
  int max_iterations = 1000;
  // automatic: direct up to this many unknowns, multigrid above (see docs/methods.md
  // for the measurements behind the number).
  std::int64_t direct_limit = 20000;
};

enum class SolveStatus { converged, not_converged, breakdown };

// The outcome of one solve, as a value: the driver turns failures into messages.
struct LinearSolveReport {
  SolveStatus status = SolveStatus::converged;
  std::string solver;               // "cholmod" | "umfpack" | "boomeramg-pcg" | "boomeramg-gmres"
  int iterations = 0;               // 0 for the direct solver
  double relative_residual = 0.0;   // |b - A x| / |b|, measured after the solve
  double setup_seconds = 0.0;       // factorisation or multigrid hierarchy
  double solve_seconds = 0.0;
  std::string message;              // why, when not converged
  bool converged() const { return status == SolveStatus::converged; }
};

class LinearSolver {
 public:
  virtual ~LinearSolver() = default;
  virtual std::string name() const = 0;
  // Prepares for A (factorisation or hierarchy). A must stay alive until the last solve.
  virtual void setup(const CsrMatrix& A) = 0;
  // When true, the next setup() of a matrix with the same pattern may keep the
  // preconditioner built for an earlier one (Newton steps): the Krylov method still
  // solves the new matrix. Plain direct solvers keep their symbolic analysis in any
  // case and ignore it (see keep_factor_between_steps).
  virtual void keep_preconditioner(bool /*keep*/) {}
  // Iterative solvers: the relative residual the next solves stop at (inexact Newton
  // loosens it while far from the solution). Direct solvers ignore it.
  virtual void set_tolerance(double /*relative_residual*/) {}
  // Solves A x = b; x holds the initial guess on entry (used by iterative solvers).
  virtual LinearSolveReport solve(const std::vector<double>& b, std::vector<double>& x) = 0;
  // z = A^{-1} r by the factorisation alone, without iterative refinement or a residual
  // check: a direct solver used as the preconditioner of a nearby matrix. Defaults to solve().
  virtual void apply_factorisation(const std::vector<double>& r, std::vector<double>& z) { solve(r, z); }
};

std::unique_ptr<LinearSolver> make_cholmod_solver();
std::unique_ptr<LinearSolver> make_umfpack_solver();
// Direct solves for Newton's method: each matrix set up afresh is factorised, by
// `cholesky` when symmetric (and positive definite), else by `lu`; with
// keep_preconditioner(true), later matrices of the same pattern are solved by GMRES (to
// set_tolerance) preconditioned with the kept factorisation (reported as
// "cholmod-gmres" / "umfpack-gmres"), renewed when GMRES needs many iterations or fails.
std::unique_ptr<LinearSolver> keep_factor_between_steps(std::unique_ptr<LinearSolver> cholesky,
                                                        std::unique_ptr<LinearSolver> lu);
// BoomerAMG-preconditioned CG (symmetric) or GMRES (non-symmetric matrices).
std::unique_ptr<LinearSolver> make_amg_krylov_solver(double tolerance, int max_iterations, bool symmetric);
// Picks by settings.kind, and for automatic by the number of unknowns: CHOLMOD or
// AMG-CG for symmetric matrices, UMFPACK or AMG-GMRES for non-symmetric ones.
std::unique_ptr<LinearSolver> make_linear_solver(const LinearSolverSettings& settings, std::int64_t unknowns,
                                                 bool symmetric = true);

// Relative residual |b - A x| / |b| (|b| = 0: absolute residual).
double relative_residual(const CsrMatrix& A, const std::vector<double>& b, const std::vector<double>& x);

// Which BLAS the process has loaded (CHOLMOD's speed depends on it), e.g. "OpenBLAS 0.3.21 ...".
std::string loaded_blas();

}  // namespace hearth
