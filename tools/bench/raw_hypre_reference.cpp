// Direct hypre calls on the benchmark's matrix (see raw_hypre_reference.hpp).
#include "tools/bench/raw_hypre_reference.hpp"

#include <HYPRE.h>
#include <HYPRE_IJ_mv.h>
#include <HYPRE_parcsr_ls.h>
#include <mpi.h>

#include <chrono>
#include <numeric>

#include "solver/linear_solver.hpp"

namespace hearth::bench {

namespace {

double seconds_since(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

void make_vector(HYPRE_BigInt last, const double* values, HYPRE_IJVector* ij, HYPRE_ParVector* par) {
  HYPRE_IJVectorCreate(MPI_COMM_SELF, 0, last, ij);
  HYPRE_IJVectorSetObjectType(*ij, HYPRE_PARCSR);
  HYPRE_IJVectorInitialize(*ij);
  std::vector<HYPRE_BigInt> rows(static_cast<std::size_t>(last) + 1);
  std::iota(rows.begin(), rows.end(), HYPRE_BigInt(0));
  HYPRE_IJVectorSetValues(*ij, static_cast<HYPRE_Int>(rows.size()), rows.data(), values);
  HYPRE_IJVectorAssemble(*ij);
  HYPRE_IJVectorGetObject(*ij, reinterpret_cast<void**>(par));
}

}  // namespace

ReferenceSolve solve_with_raw_hypre(const CsrMatrix& A, const std::vector<double>& b, double tolerance) {
  ReferenceSolve result;
  const auto t_setup = std::chrono::steady_clock::now();
  const HYPRE_BigInt last = A.n - 1;
  HYPRE_IJMatrix ij_A;
  HYPRE_IJMatrixCreate(MPI_COMM_SELF, 0, last, 0, last, &ij_A);
  HYPRE_IJMatrixSetObjectType(ij_A, HYPRE_PARCSR);
  std::vector<HYPRE_Int> sizes(A.n);
  std::vector<HYPRE_BigInt> rows(A.n);
  for (std::int32_t i = 0; i < A.n; ++i) {
    sizes[i] = static_cast<HYPRE_Int>(A.row_ptr[i + 1] - A.row_ptr[i]);
    rows[i] = i;
  }
  HYPRE_IJMatrixSetRowSizes(ij_A, sizes.data());
  HYPRE_IJMatrixInitialize(ij_A);
  HYPRE_IJMatrixSetValues(ij_A, A.n, sizes.data(), rows.data(), A.col.data(), A.val.data());
  HYPRE_IJMatrixAssemble(ij_A);
  HYPRE_ParCSRMatrix par_A;
  HYPRE_IJMatrixGetObject(ij_A, reinterpret_cast<void**>(&par_A));
  const std::vector<double> zero(A.n, 0.0);
  HYPRE_IJVector ij_b, ij_x;
  HYPRE_ParVector par_b, par_x;
  make_vector(last, b.data(), &ij_b, &par_b);
  make_vector(last, zero.data(), &ij_x, &par_x);

  HYPRE_Solver amg, pcg;
  HYPRE_BoomerAMGCreate(&amg);
  HYPRE_BoomerAMGSetCoarsenType(amg, 10);
  HYPRE_BoomerAMGSetAggNumLevels(amg, 1);
  HYPRE_BoomerAMGSetInterpType(amg, 6);
  HYPRE_BoomerAMGSetPMaxElmts(amg, 4);
  HYPRE_BoomerAMGSetStrongThreshold(amg, 0.5);
  HYPRE_BoomerAMGSetRelaxType(amg, 6);
  HYPRE_BoomerAMGSetMaxIter(amg, 1);
  HYPRE_BoomerAMGSetTol(amg, 0.0);
  HYPRE_ParCSRPCGCreate(MPI_COMM_SELF, &pcg);
  HYPRE_PCGSetTol(pcg, tolerance);
  HYPRE_PCGSetMaxIter(pcg, 1000);
  HYPRE_PCGSetTwoNorm(pcg, 1);
  HYPRE_PCGSetPrecond(pcg, reinterpret_cast<HYPRE_PtrToSolverFcn>(HYPRE_BoomerAMGSolve),
                      reinterpret_cast<HYPRE_PtrToSolverFcn>(HYPRE_BoomerAMGSetup), amg);
  HYPRE_ParCSRPCGSetup(pcg, par_A, par_b, par_x);
  result.setup_seconds = seconds_since(t_setup);

  const auto t_solve = std::chrono::steady_clock::now();
  HYPRE_ParCSRPCGSolve(pcg, par_A, par_b, par_x);
  result.solve_seconds = seconds_since(t_solve);
  HYPRE_Int iterations = 0;
  HYPRE_PCGGetNumIterations(pcg, &iterations);
  result.iterations = iterations;

  std::vector<double> x(A.n, 0.0);
  HYPRE_IJVectorGetValues(ij_x, A.n, rows.data(), x.data());
  result.relative_residual = relative_residual(A, b, x);

  HYPRE_ParCSRPCGDestroy(pcg);
  HYPRE_BoomerAMGDestroy(amg);
  HYPRE_IJVectorDestroy(ij_x);
  HYPRE_IJVectorDestroy(ij_b);
  HYPRE_IJMatrixDestroy(ij_A);
  return result;
}

}  // namespace hearth::bench
