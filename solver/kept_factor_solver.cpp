// A direct solver that, when asked to keep its preconditioner (Newton steps), keeps the
// factorisation of an earlier matrix and solves the current one by GMRES preconditioned
// with it: a few triangular solves instead of a new factorisation per step. The
// factorisation is renewed when GMRES takes many iterations (the Jacobian has moved
// away from the factored one) or fails. A symmetric matrix (the Picard matrix of
// Newton's first step) is factorised by Cholesky, at the cost of a linear solve; the
// exact Jacobian with k(T) is not symmetric and, when it must be factorised, takes LU.
#include <algorithm>
#include <chrono>
#include <cmath>
#include <utility>

#include "solver/gmres.hpp"
#include "solver/linear_solver.hpp"

namespace hearth {

namespace {

// GMRES iterations beyond which the next set-up factorises afresh, and a limit after
// which the solve itself is repeated with a new factorisation. On the furnace-wall demo
// (6 000 unknowns) a GMRES iteration on the kept Cholesky factor took 2 to 12 ms against
// 0.06 to 0.09 s for a factorisation (project measurement, a loaded 2-core machine), so
// 12 iterations still cost about what a new factorisation does.
constexpr int renew_after = 12;
constexpr int give_up_after = 40;

double seconds_since(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

// Symmetric to round-off: |a_ij - a_ji| <= 1e-12 max|a| (element matrices summed in
// different orders differ in the last bits).
bool is_symmetric(const CsrMatrix& A) {
  double largest = 0.0;
  for (const double v : A.val) largest = std::max(largest, std::abs(v));
  const double allowed = 1e-12 * largest;
  for (std::int32_t r = 0; r < A.n; ++r)
    for (std::int64_t k = A.row_ptr[r]; k < A.row_ptr[r + 1]; ++k) {
      const std::int32_t c = A.col[k];
      if (c <= r) continue;
      const auto first = A.col.begin() + A.row_ptr[c], last = A.col.begin() + A.row_ptr[c + 1];
      const auto at = std::lower_bound(first, last, r);
      if (at == last || *at != r || std::abs(A.val[at - A.col.begin()] - A.val[k]) > allowed) return false;
    }
  return true;
}

class KeptFactorSolver final : public LinearSolver {
 public:
  KeptFactorSolver(std::unique_ptr<LinearSolver> cholesky, std::unique_ptr<LinearSolver> lu)
      : cholesky_(std::move(cholesky)), lu_(std::move(lu)) {}
  std::string name() const override { return (factor_ ? factor_ : lu_.get())->name(); }
  void keep_preconditioner(bool keep) override { keep_ = keep; }
  void set_tolerance(double relative_residual) override { tolerance_ = relative_residual; }

  void setup(const CsrMatrix& A) override {
    A_ = &A;
    kept_ = keep_ && !renew_ && factor_ && factored_.n == A.n && factored_.nnz() == A.nnz();
    if (!kept_) factorise(A);
  }

  LinearSolveReport solve(const std::vector<double>& b, std::vector<double>& x) override {
    if (!kept_) {
      LinearSolveReport report = factor_->solve(b, x);
      if (report.status == SolveStatus::breakdown && factor_ == cholesky_.get()) {
        // Symmetric but not positive definite: LU takes it.
        factorise(*A_, /*allow_cholesky=*/false);
        report = factor_->solve(b, x);
      }
      report.setup_seconds = setup_seconds_;
      return report;
    }
    LinearSolveReport report;
    report.solver = factor_->name() + "-gmres";
    const auto t0 = std::chrono::steady_clock::now();
    const GmresOutcome g = gmres(
        *A_, b, x, [&](const std::vector<double>& r, std::vector<double>& z) { factor_->apply_factorisation(r, z); },
        tolerance_, give_up_after);
    report.iterations = g.iterations;
    report.relative_residual = g.relative_residual;
    report.solve_seconds = seconds_since(t0);
    renew_ = g.iterations > renew_after;
    if (!g.converged) {  // the kept factorisation no longer serves: factorise this matrix
      factorise(*A_);
      LinearSolveReport direct = factor_->solve(b, x);
      direct.iterations = g.iterations;
      direct.setup_seconds = setup_seconds_;
      direct.solve_seconds += report.solve_seconds;
      return direct;
    }
    return report;
  }

 private:
  void factorise(const CsrMatrix& A, bool allow_cholesky = true) {
    const auto t0 = std::chrono::steady_clock::now();
    factored_ = A;  // the direct solver refers to its matrix in later solves
    factor_ = allow_cholesky && cholesky_ && is_symmetric(factored_) ? cholesky_.get() : lu_.get();
    factor_->setup(factored_);
    setup_seconds_ = seconds_since(t0);
    renew_ = false;
    kept_ = false;
  }

  std::unique_ptr<LinearSolver> cholesky_, lu_;
  LinearSolver* factor_ = nullptr;  // the one holding the current factorisation
  CsrMatrix factored_;
  const CsrMatrix* A_ = nullptr;
  bool keep_ = false, kept_ = false, renew_ = false;
  double tolerance_ = 1e-12;
  double setup_seconds_ = 0.0;
};

}  // namespace

std::unique_ptr<LinearSolver> keep_factor_between_steps(std::unique_ptr<LinearSolver> cholesky,
                                                        std::unique_ptr<LinearSolver> lu) {
  return std::make_unique<KeptFactorSolver>(std::move(cholesky), std::move(lu));
}

}  // namespace hearth
