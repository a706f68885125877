// Solver choice, residual check and BLAS identification.
#include "solver/linear_solver.hpp"

#include <cmath>
#include <dlfcn.h>

namespace hearth {

std::unique_ptr<LinearSolver> make_linear_solver(const LinearSolverSettings& settings, std::int64_t unknowns,
                                                 bool symmetric) {
  const bool direct = settings.kind == LinearSolverKind::direct ||
                      (settings.kind == LinearSolverKind::automatic && unknowns <= settings.direct_limit);
  if (direct) return symmetric ? make_cholmod_solver() : make_umfpack_solver();
  return make_amg_krylov_solver(settings.tolerance, settings.max_iterations, symmetric);
}

double relative_residual(const CsrMatrix& A, const std::vector<double>& b, const std::vector<double>& x) {
  std::vector<double> ax;
  A.multiply(x, ax);
  double r2 = 0.0, b2 = 0.0;
  for (std::int32_t i = 0; i < A.n; ++i) {
    r2 += (b[i] - ax[i]) * (b[i] - ax[i]);
    b2 += b[i] * b[i];
  }
  return b2 > 0.0 ? std::sqrt(r2 / b2) : std::sqrt(r2);
}

std::string loaded_blas() {
  using ConfigFn = char* (*)();
  if (void* sym = dlsym(RTLD_DEFAULT, "openblas_get_config")) {
    const char* config = reinterpret_cast<ConfigFn>(sym)();
    const std::string text = config ? config : "";
    return text.rfind("OpenBLAS", 0) == 0 ? text : "OpenBLAS " + text;
  }
  if (void* sym = dlsym(RTLD_DEFAULT, "dgemm_")) {
    Dl_info info;
    if (dladdr(sym, &info) && info.dli_fname) return info.dli_fname;
  }
  return "unknown";
}

}  // namespace hearth
