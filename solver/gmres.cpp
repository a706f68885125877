// Restarted, right-preconditioned GMRES (see gmres.hpp).
#include "solver/gmres.hpp"

#include <cmath>

namespace hearth {

namespace {
double dot(const std::vector<double>& a, const std::vector<double>& b) {
  double s = 0.0;
  for (std::size_t i = 0; i < a.size(); ++i) s += a[i] * b[i];
  return s;
}

// r = b - A x; returns |r|.
double residual(const CsrMatrix& A, const std::vector<double>& b, const std::vector<double>& x,
                std::vector<double>& r) {
  A.multiply(x, r);
  for (std::size_t i = 0; i < r.size(); ++i) r[i] = b[i] - r[i];
  return std::sqrt(dot(r, r));
}
}  // namespace

GmresOutcome gmres(const CsrMatrix& A, const std::vector<double>& b, std::vector<double>& x,
                   const Preconditioner& precondition, double tolerance, int max_iterations, int restart) {
  const std::size_t n = static_cast<std::size_t>(A.n);
  GmresOutcome out;
  x.resize(n, 0.0);
  const double b_norm = std::sqrt(dot(b, b));
  const double target = tolerance * (b_norm > 0.0 ? b_norm : 1.0);
  std::vector<double> r(n), w(n);
  double beta = residual(A, b, x, r);
  std::vector<std::vector<double>> V(restart + 1, std::vector<double>(n));
  std::vector<std::vector<double>> Z(restart, std::vector<double>(n));  // M^{-1} v_j (right preconditioning)
  std::vector<double> H((restart + 1) * restart), cs(restart), sn(restart), g(restart + 1), y(restart);
  auto h = [&](int i, int j) -> double& { return H[i * restart + j]; };
  while (beta > target && out.iterations < max_iterations) {
    for (std::size_t i = 0; i < n; ++i) V[0][i] = r[i] / beta;
    std::fill(g.begin(), g.end(), 0.0);
    g[0] = beta;
    int k = 0;
    for (; k < restart && out.iterations < max_iterations; ++k) {
      precondition(V[k], Z[k]);
      A.multiply(Z[k], w);
      ++out.iterations;
      for (int i = 0; i <= k; ++i) {  // modified Gram-Schmidt
        h(i, k) = dot(w, V[i]);
        for (std::size_t m = 0; m < n; ++m) w[m] -= h(i, k) * V[i][m];
      }
      h(k + 1, k) = std::sqrt(dot(w, w));
      if (h(k + 1, k) > 0.0)
        for (std::size_t m = 0; m < n; ++m) V[k + 1][m] = w[m] / h(k + 1, k);
      for (int i = 0; i < k; ++i) {  // earlier rotations on the new column
        const double a = h(i, k), c = h(i + 1, k);
        h(i, k) = cs[i] * a + sn[i] * c;
        h(i + 1, k) = -sn[i] * a + cs[i] * c;
      }
      const double a = h(k, k), c = h(k + 1, k), d = std::hypot(a, c);
      cs[k] = d > 0.0 ? a / d : 1.0;
      sn[k] = d > 0.0 ? c / d : 0.0;
      h(k, k) = d;
      h(k + 1, k) = 0.0;
      g[k + 1] = -sn[k] * g[k];
      g[k] = cs[k] * g[k];
      if (std::abs(g[k + 1]) <= target || h(k, k) == 0.0) {
        ++k;
        break;
      }
    }
    // x += Z y with H y = g (upper triangular after the rotations).
    for (int i = k - 1; i >= 0; --i) {
      double s = g[i];
      for (int j = i + 1; j < k; ++j) s -= h(i, j) * y[j];
      y[i] = h(i, i) != 0.0 ? s / h(i, i) : 0.0;
    }
    for (int j = 0; j < k; ++j)
      for (std::size_t m = 0; m < n; ++m) x[m] += y[j] * Z[j][m];
    const double previous = beta;
    beta = residual(A, b, x, r);
    if (k == 0 || beta >= previous) break;  // no progress: stagnation
  }
  out.relative_residual = b_norm > 0.0 ? beta / b_norm : beta;
  out.converged = beta <= target * 1.0000001;
  return out;
}

}  // namespace hearth
