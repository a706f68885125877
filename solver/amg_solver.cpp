// hypre BoomerAMG-preconditioned conjugate gradients, in one process.
//
// Debian builds hypre with MPI: the solver initialises MPI once (singleton, no
// launcher needed) and works on MPI_COMM_SELF. The distributed path later replaces
// the communicator and the row ranges, not this interface.
#include <HYPRE.h>
#include <HYPRE_IJ_mv.h>
#include <HYPRE_parcsr_ls.h>
#include <_hypre_parcsr_mv.h>
#include <mpi.h>

#include <sched.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <mutex>
#include <stdexcept>

#include "solver/linear_solver.hpp"
#include "solver/loop_threads.hpp"

namespace hearth {

namespace {

double seconds_since(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

std::string scientific(double value) {
  char buffer[32];
  std::snprintf(buffer, sizeof buffer, "%.2e", value);
  return buffer;
}

void ensure_mpi() {
  static std::once_flag once;
  std::call_once(once, [] {
    int initialised = 0;
    MPI_Initialized(&initialised);
    if (!initialised) {
      // Open MPI binds a singleton process to one core, which would leave the OpenMP
      // threads of assembly and post-processing sharing it: keep the process's own
      // CPU set, before and after.
      setenv("OMPI_MCA_hwloc_base_binding_policy", "none", 0);
      cpu_set_t cpus;
      const bool have_cpus = sched_getaffinity(0, sizeof cpus, &cpus) == 0;
      int provided = 0;
      MPI_Init_thread(nullptr, nullptr, MPI_THREAD_FUNNELED, &provided);
      if (have_cpus) sched_setaffinity(0, sizeof cpus, &cpus);
      std::atexit([] {
        int finalised = 0;
        MPI_Finalized(&finalised);
        if (!finalised) MPI_Finalize();
      });
    }
    HYPRE_Init();
  });
}

// One process holds the whole matrix as the diagonal block of a ParCSR matrix. Writing
// hearth's CSR arrays straight into that block, each row's diagonal entry first as
// hypre's smoothers expect, takes a few hundredths of a second where the IJ interface's
// entry-by-entry insertion took about half a second at 880 000 unknowns; it also spares
// the IJ interface's auxiliary copy at the peak. The value order is kept, so that a new
// matrix on the same pattern is copied in place (copy_values).
void copy_values(const CsrMatrix& A, hypre_ParCSRMatrix* M) {
  hypre_CSRMatrix* diag = hypre_ParCSRMatrixDiag(M);
  HYPRE_Complex* data = hypre_CSRMatrixData(diag);
#pragma omp parallel for schedule(static) num_threads(loop_threads(A.n))
  for (std::int32_t r = 0; r < A.n; ++r) {
    const std::int64_t begin = A.row_ptr[r], end = A.row_ptr[r + 1];
    // Row r in hypre: the diagonal, then the other columns in increasing order.
    std::int64_t out = begin;
    for (std::int64_t k = begin; k < end; ++k)
      if (A.col[k] == r) data[out++] = A.val[k];
    for (std::int64_t k = begin; k < end; ++k)
      if (A.col[k] != r) data[out++] = A.val[k];
  }
}

hypre_ParCSRMatrix* make_parcsr(const CsrMatrix& A) {
  HYPRE_BigInt starts[2] = {0, A.n};
  hypre_ParCSRMatrix* M = hypre_ParCSRMatrixCreate(MPI_COMM_SELF, A.n, A.n, starts, starts, 0,
                                                   static_cast<HYPRE_Int>(A.nnz()), 0);
  hypre_ParCSRMatrixInitialize(M);
  hypre_CSRMatrix* diag = hypre_ParCSRMatrixDiag(M);
  HYPRE_Int* i = hypre_CSRMatrixI(diag);
  HYPRE_Int* j = hypre_CSRMatrixJ(diag);
  for (std::int32_t r = 0; r <= A.n; ++r) i[r] = static_cast<HYPRE_Int>(A.row_ptr[r]);
  std::int32_t rows_without_diagonal = 0;
#pragma omp parallel for schedule(static) reduction(+ : rows_without_diagonal) num_threads(loop_threads(A.n))
  for (std::int32_t r = 0; r < A.n; ++r) {
    const std::int64_t begin = A.row_ptr[r], end = A.row_ptr[r + 1];
    if (!std::binary_search(A.col.begin() + begin, A.col.begin() + end, r)) {
      ++rows_without_diagonal;
      continue;
    }
    std::int64_t out = begin;
    j[out++] = r;
    for (std::int64_t k = begin; k < end; ++k)
      if (A.col[k] != r) j[out++] = A.col[k];
  }
  if (rows_without_diagonal) {
    hypre_ParCSRMatrixDestroy(M);
    // Every free node couples to itself through its own elements; a row without a
    // diagonal entry is a defect of the pattern, not of the input.
    throw std::logic_error("matrix handed to multigrid has " + std::to_string(rows_without_diagonal) +
                           " rows without a diagonal entry");
  }
  copy_values(A, M);
  hypre_CSRMatrixSetRownnz(diag);
  hypre_ParCSRMatrixSetNumNonzeros(M);
  hypre_ParCSRMatrixSetDNumNonzeros(M);
  hypre_MatvecCommPkgCreate(M);
  return M;
}

class AmgCgSolver final : public LinearSolver {
 public:
  AmgCgSolver(double tolerance, int max_iterations, bool symmetric)
      : tolerance_(tolerance), max_iterations_(max_iterations), symmetric_(symmetric) {
    ensure_mpi();
  }
  ~AmgCgSolver() override { release(); }
  std::string name() const override { return symmetric_ ? "boomeramg-pcg" : "boomeramg-gmres"; }

  void keep_preconditioner(bool keep) override { keep_ = keep; }

  void set_tolerance(double relative_residual) override {
    tolerance_ = relative_residual;
    if (pcg_) symmetric_ ? HYPRE_PCGSetTol(pcg_, tolerance_) : HYPRE_GMRESSetTol(pcg_, tolerance_);
  }

  void setup(const CsrMatrix& A) override {
    const auto t0 = std::chrono::steady_clock::now();
    if (keep_ && amg_ && A_ && A_->n == A.n && A_->nnz() == A.nnz()) {
      // New matrix for the Krylov method; the hierarchy (and the matrix it was built
      // on, which its finest level refers to) stays. A second kept matrix overwrites
      // the first one's values: the Krylov method's set-up does not depend on them.
      A_ = &A;
      if (parcsr_ == amg_matrix_) {
        destroy_krylov();
        parcsr_ = make_parcsr(A);
        create_krylov(true);
      } else {
        copy_values(A, parcsr_);
      }
      setup_seconds_ = seconds_since(t0);
      return;
    }
    release();
    A_ = &A;
    parcsr_ = amg_matrix_ = make_parcsr(A);
    create_vector(&ij_b_, &par_b_);
    create_vector(&ij_x_, &par_x_);

    // Settings for 3D elliptic problems: HMIS coarsening with one level of aggressive
    // coarsening, extended+i interpolation truncated to 4 entries, strength 0.5,
    // symmetric hybrid Gauss-Seidel smoothing (keeps the preconditioner symmetric).
    HYPRE_BoomerAMGCreate(&amg_);
    HYPRE_BoomerAMGSetCoarsenType(amg_, 10);
    HYPRE_BoomerAMGSetAggNumLevels(amg_, 1);
    HYPRE_BoomerAMGSetInterpType(amg_, 6);
    HYPRE_BoomerAMGSetPMaxElmts(amg_, 4);
    HYPRE_BoomerAMGSetStrongThreshold(amg_, 0.5);
    HYPRE_BoomerAMGSetRelaxType(amg_, 6);
    HYPRE_BoomerAMGSetNumSweeps(amg_, 1);
    HYPRE_BoomerAMGSetMaxIter(amg_, 1);
    HYPRE_BoomerAMGSetTol(amg_, 0.0);
    HYPRE_BoomerAMGSetPrintLevel(amg_, 0);
    create_krylov(false);
    setup_seconds_ = seconds_since(t0);
  }

 private:
  static HYPRE_Int keep_hierarchy(HYPRE_Solver, HYPRE_Matrix, HYPRE_Vector, HYPRE_Vector) { return 0; }

  // CG or GMRES on parcsr_, preconditioned by amg_ (set up now unless it is kept).
  void create_krylov(bool kept) {
    const HYPRE_PtrToSolverFcn amg_setup = kept ? reinterpret_cast<HYPRE_PtrToSolverFcn>(keep_hierarchy)
                                                : reinterpret_cast<HYPRE_PtrToSolverFcn>(HYPRE_BoomerAMGSetup);
    if (symmetric_) {
      HYPRE_ParCSRPCGCreate(MPI_COMM_SELF, &pcg_);
      HYPRE_PCGSetTol(pcg_, tolerance_);
      HYPRE_PCGSetAbsoluteTol(pcg_, 0.0);
      HYPRE_PCGSetMaxIter(pcg_, max_iterations_);
      HYPRE_PCGSetTwoNorm(pcg_, 1);
      HYPRE_PCGSetPrintLevel(pcg_, 0);
      HYPRE_PCGSetLogging(pcg_, 1);
      HYPRE_PCGSetPrecond(pcg_, reinterpret_cast<HYPRE_PtrToSolverFcn>(HYPRE_BoomerAMGSolve), amg_setup, amg_);
      HYPRE_ParCSRPCGSetup(pcg_, parcsr_, par_b_, par_x_);
    } else {
      // Restarted GMRES(50) with right preconditioning; the relative residual it
      // tests is of the preconditioned system, so the true residual is checked after.
      HYPRE_ParCSRGMRESCreate(MPI_COMM_SELF, &pcg_);
      HYPRE_GMRESSetKDim(pcg_, 50);
      HYPRE_GMRESSetTol(pcg_, tolerance_);
      HYPRE_GMRESSetAbsoluteTol(pcg_, 0.0);
      HYPRE_GMRESSetMaxIter(pcg_, max_iterations_);
      HYPRE_GMRESSetPrintLevel(pcg_, 0);
      HYPRE_GMRESSetLogging(pcg_, 1);
      HYPRE_GMRESSetPrecond(pcg_, reinterpret_cast<HYPRE_PtrToSolverFcn>(HYPRE_BoomerAMGSolve), amg_setup, amg_);
      HYPRE_ParCSRGMRESSetup(pcg_, parcsr_, par_b_, par_x_);
    }
  }

  void destroy_krylov() {
    if (pcg_) symmetric_ ? HYPRE_ParCSRPCGDestroy(pcg_) : HYPRE_ParCSRGMRESDestroy(pcg_);
    pcg_ = nullptr;
  }

 public:
  LinearSolveReport solve(const std::vector<double>& b, std::vector<double>& x) override {
    LinearSolveReport report;
    report.solver = name();
    report.setup_seconds = setup_seconds_;
    const auto t0 = std::chrono::steady_clock::now();
    x.resize(A_->n, 0.0);
    std::copy(b.begin(), b.end(), local_values(par_b_));
    std::copy(x.begin(), x.end(), local_values(par_x_));
    HYPRE_Int iterations = 0;
    if (symmetric_) {
      HYPRE_ParCSRPCGSolve(pcg_, parcsr_, par_b_, par_x_);
      HYPRE_PCGGetNumIterations(pcg_, &iterations);
    } else {
      HYPRE_ParCSRGMRESSolve(pcg_, parcsr_, par_b_, par_x_);
      HYPRE_GMRESGetNumIterations(pcg_, &iterations);
    }
    HYPRE_ClearAllErrors();
    std::copy(local_values(par_x_), local_values(par_x_) + A_->n, x.begin());
    report.iterations = iterations;
    report.solve_seconds = seconds_since(t0);
    report.relative_residual = relative_residual(*A_, b, x);
    if (!(report.relative_residual <= 10.0 * tolerance_)) {
      report.status = report.relative_residual == report.relative_residual ? SolveStatus::not_converged
                                                                             : SolveStatus::breakdown;
      report.message = std::string(symmetric_ ? "multigrid-preconditioned CG" : "multigrid-preconditioned GMRES") +
                       " reached relative residual " + scientific(report.relative_residual) + " after " +
                       std::to_string(iterations) + " iterations (tolerance " + scientific(tolerance_) + ")";
    }
    return report;
  }

 private:
  void create_vector(HYPRE_IJVector* ij, HYPRE_ParVector* par) {
    HYPRE_IJVectorCreate(MPI_COMM_SELF, 0, A_->n - 1, ij);
    HYPRE_IJVectorSetObjectType(*ij, HYPRE_PARCSR);
    HYPRE_IJVectorInitialize(*ij);
    HYPRE_IJVectorAssemble(*ij);
    HYPRE_IJVectorGetObject(*ij, reinterpret_cast<void**>(par));
  }
  // One process owns every row, so a vector's values are its local vector's array: read
  // and written in place, as the matrix is, without the IJ interface's index lists.
  static HYPRE_Complex* local_values(HYPRE_ParVector par) {
    return hypre_VectorData(hypre_ParVectorLocalVector(par));
  }
  void release() {
    destroy_krylov();
    if (amg_) HYPRE_BoomerAMGDestroy(amg_);
    if (ij_b_) HYPRE_IJVectorDestroy(ij_b_);
    if (ij_x_) HYPRE_IJVectorDestroy(ij_x_);
    if (parcsr_ && parcsr_ != amg_matrix_) hypre_ParCSRMatrixDestroy(parcsr_);
    if (amg_matrix_) hypre_ParCSRMatrixDestroy(amg_matrix_);
    amg_ = nullptr;
    ij_b_ = ij_x_ = nullptr;
    parcsr_ = amg_matrix_ = nullptr;
  }

  double tolerance_;
  int max_iterations_;
  bool symmetric_;
  bool keep_ = false;
  const CsrMatrix* A_ = nullptr;
  hypre_ParCSRMatrix* amg_matrix_ = nullptr;  // the matrix the hierarchy was built on
  hypre_ParCSRMatrix* parcsr_ = nullptr;      // the matrix the Krylov method solves
  HYPRE_IJVector ij_b_ = nullptr, ij_x_ = nullptr;
  HYPRE_ParVector par_b_ = nullptr, par_x_ = nullptr;
  HYPRE_Solver amg_ = nullptr, pcg_ = nullptr;
  double setup_seconds_ = 0.0;
};

}  // namespace

std::unique_ptr<LinearSolver> make_amg_krylov_solver(double tolerance, int max_iterations, bool symmetric) {
  return std::make_unique<AmgCgSolver>(tolerance, max_iterations, symmetric);
}

}  // namespace hearth
