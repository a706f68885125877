// SuiteSparse UMFPACK sparse LU for the non-symmetric Newton Jacobian (k(T)).
#include <umfpack.h>

#include <chrono>
#include <stdexcept>

#include "solver/linear_solver.hpp"

namespace hearth {

namespace {

class UmfpackSolver final : public LinearSolver {
 public:
  ~UmfpackSolver() override { release(); }
  std::string name() const override { return "umfpack"; }

  void setup(const CsrMatrix& A) override {
    const auto t0 = std::chrono::steady_clock::now();
    // CSR arrays read as CSC describe A^T; solving with UMFPACK_At then solves A x = b.
    const bool same_pattern = symbolic_ && A_ && A_->n == A.n && A_->nnz() == A.nnz();
    A_ = &A;
    ptr_.assign(A.row_ptr.begin(), A.row_ptr.end());
    idx_.assign(A.col.begin(), A.col.end());
    if (numeric_) umfpack_dl_free_numeric(&numeric_);
    if (!same_pattern) {  // the symbolic analysis is reused across Newton iterations
      if (symbolic_) umfpack_dl_free_symbolic(&symbolic_);
      if (umfpack_dl_symbolic(A.n, A.n, ptr_.data(), idx_.data(), A.val.data(), &symbolic_, nullptr, nullptr) !=
          UMFPACK_OK)
        throw std::runtime_error("UMFPACK symbolic analysis failed (out of memory?)");
    }
    status_ = umfpack_dl_numeric(ptr_.data(), idx_.data(), A.val.data(), symbolic_, &numeric_, nullptr, nullptr);
    if (status_ != UMFPACK_OK && status_ != UMFPACK_WARNING_singular_matrix)
      throw std::runtime_error("UMFPACK factorisation failed (status " + std::to_string(status_) + ")");
    setup_seconds_ = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  }

  void apply_factorisation(const std::vector<double>& r, std::vector<double>& z) override {
    double control[UMFPACK_CONTROL];
    umfpack_dl_defaults(control);
    control[UMFPACK_IRSTEP] = 0;  // no refinement: the outer Krylov method corrects
    z.assign(A_->n, 0.0);
    umfpack_dl_solve(UMFPACK_At, ptr_.data(), idx_.data(), A_->val.data(), z.data(), r.data(), numeric_, control,
                     nullptr);
  }

  LinearSolveReport solve(const std::vector<double>& b, std::vector<double>& x) override {
    LinearSolveReport report;
    report.solver = name();
    report.setup_seconds = setup_seconds_;
    if (status_ == UMFPACK_WARNING_singular_matrix) {
      report.status = SolveStatus::breakdown;
      report.message = "the Jacobian is singular (is the temperature fixed anywhere?)";
      return report;
    }
    const auto t0 = std::chrono::steady_clock::now();
    x.assign(A_->n, 0.0);
    umfpack_dl_solve(UMFPACK_At, ptr_.data(), idx_.data(), A_->val.data(), x.data(), b.data(), numeric_, nullptr,
                     nullptr);
    report.solve_seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    report.relative_residual = relative_residual(*A_, b, x);
    if (!(report.relative_residual < 1e-6)) {
      report.status = SolveStatus::breakdown;
      report.message = "direct solve left a residual of " + std::to_string(report.relative_residual);
    }
    return report;
  }

 private:
  void release() {
    if (numeric_) umfpack_dl_free_numeric(&numeric_);
    if (symbolic_) umfpack_dl_free_symbolic(&symbolic_);
  }
  const CsrMatrix* A_ = nullptr;
  std::vector<SuiteSparse_long> ptr_, idx_;
  void* symbolic_ = nullptr;
  void* numeric_ = nullptr;
  int status_ = 0;
  double setup_seconds_ = 0.0;
};

}  // namespace

std::unique_ptr<LinearSolver> make_umfpack_solver() { return std::make_unique<UmfpackSolver>(); }

}  // namespace hearth
