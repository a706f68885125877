// CHOLMOD sparse Cholesky (supernodal on the system BLAS).
#include <cholmod.h>

#include <chrono>
#include <stdexcept>

#include "solver/linear_solver.hpp"

namespace hearth {

namespace {

double seconds_since(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

class CholmodSolver final : public LinearSolver {
 public:
  CholmodSolver() {
    cholmod_l_start(&common_);
    common_.supernodal = CHOLMOD_AUTO;
    common_.print = 0;
  }
  ~CholmodSolver() override {
    if (factor_) cholmod_l_free_factor(&factor_, &common_);
    cholmod_l_finish(&common_);
  }
  std::string name() const override { return "cholmod"; }

  void setup(const CsrMatrix& A) override {
    const auto t0 = std::chrono::steady_clock::now();
    A_ = &A;
    // A symmetric CSR matrix is its own CSC; stype = 1 reads the upper triangle only.
    cholmod_sparse view{};
    col_ptr_.assign(A.row_ptr.begin(), A.row_ptr.end());
    row_idx_.assign(A.col.begin(), A.col.end());
    view.nrow = view.ncol = A.n;
    view.nzmax = A.nnz();
    view.p = col_ptr_.data();
    view.i = row_idx_.data();
    view.x = const_cast<double*>(A.val.data());
    view.stype = 1;
    view.itype = CHOLMOD_LONG;
    view.xtype = CHOLMOD_REAL;
    view.dtype = CHOLMOD_DOUBLE;
    view.sorted = 1;
    view.packed = 1;
    // The symbolic analysis (ordering, supernodes) is kept for a matrix of the same
    // pattern, as in Newton steps; only the numerical factorisation is redone.
    const bool same_pattern = factor_ && A_ && analysed_n_ == A.n && analysed_nnz_ == A.nnz();
    if (!same_pattern) {
      if (factor_) cholmod_l_free_factor(&factor_, &common_);
      factor_ = cholmod_l_analyze(&view, &common_);
      analysed_n_ = A.n;
      analysed_nnz_ = A.nnz();
    }
    if (!factor_) throw std::runtime_error("CHOLMOD analysis failed (status " + std::to_string(common_.status) + ")");
    cholmod_l_factorize(&view, factor_, &common_);
    not_positive_definite_ = common_.status == CHOLMOD_NOT_POSDEF;
    if (common_.status < CHOLMOD_OK) throw std::runtime_error("CHOLMOD factorisation failed: out of memory?");
    setup_seconds_ = seconds_since(t0);
  }

  void apply_factorisation(const std::vector<double>& r, std::vector<double>& z) override {
    cholmod_dense* solution = solve_dense(r);
    const double* values = static_cast<const double*>(solution->x);
    z.assign(values, values + A_->n);
    cholmod_l_free_dense(&solution, &common_);
  }

  LinearSolveReport solve(const std::vector<double>& b, std::vector<double>& x) override {
    LinearSolveReport report;
    report.solver = name();
    report.setup_seconds = setup_seconds_;
    if (not_positive_definite_) {
      report.status = SolveStatus::breakdown;
      report.message = "the matrix is not positive definite (is the temperature fixed anywhere?)";
      return report;
    }
    const auto t0 = std::chrono::steady_clock::now();
    cholmod_dense* solution = solve_dense(b);
    const double* values = static_cast<const double*>(solution->x);
    x.assign(values, values + A_->n);
    cholmod_l_free_dense(&solution, &common_);
    report.solve_seconds = seconds_since(t0);
    report.relative_residual = relative_residual(*A_, b, x);
    if (!(report.relative_residual < 1e-6)) {
      report.status = SolveStatus::breakdown;
      report.message = "direct solve left a residual of " + std::to_string(report.relative_residual);
    }
    return report;
  }

 private:
  cholmod_dense* solve_dense(const std::vector<double>& b) {
    cholmod_dense rhs{};
    rhs.nrow = A_->n;
    rhs.ncol = 1;
    rhs.nzmax = A_->n;
    rhs.d = A_->n;
    rhs.x = const_cast<double*>(b.data());
    rhs.xtype = CHOLMOD_REAL;
    rhs.dtype = CHOLMOD_DOUBLE;
    cholmod_dense* solution = cholmod_l_solve(CHOLMOD_A, factor_, &rhs, &common_);
    if (!solution) throw std::runtime_error("CHOLMOD solve failed");
    return solution;
  }

  cholmod_common common_{};
  cholmod_factor* factor_ = nullptr;
  const CsrMatrix* A_ = nullptr;
  std::vector<SuiteSparse_long> col_ptr_, row_idx_;
  bool not_positive_definite_ = false;
  std::int64_t analysed_n_ = -1, analysed_nnz_ = -1;
  double setup_seconds_ = 0.0;
};

}  // namespace

std::unique_ptr<LinearSolver> make_cholmod_solver() { return std::make_unique<CholmodSolver>(); }

}  // namespace hearth
