// Quadrature rules: compact Gauss rules for low degrees, collapsed products above.
#include "solver/quadrature.hpp"

#include <cmath>
#include <stdexcept>

namespace hearth {

namespace {
// P_n(x) and its derivative by the three-term recurrence (n >= 1, |x| < 1).
std::array<double, 2> legendre_and_derivative(int n, double x) {
  double p0 = 1.0, p1 = x;
  for (int k = 2; k <= n; ++k) {
    const double pk = ((2.0 * k - 1.0) * x * p1 - (k - 1.0) * p0) / k;
    p0 = p1;
    p1 = pk;
  }
  return {p1, n * (x * p1 - p0) / (x * x - 1.0)};
}
}  // namespace

std::vector<std::array<double, 2>> gauss_legendre_01(int n) {
  // Newton iteration on P_n from Chebyshev-like guesses; weights 2 / ((1 - x^2) P_n'(x)^2).
  std::vector<std::array<double, 2>> rule(n);
  const double pi = std::acos(-1.0);
  for (int i = 0; i < n; ++i) {
    double x = std::cos(pi * (i + 0.75) / (n + 0.5));
    for (int iter = 0; iter < 100; ++iter) {
      const auto [p, dp] = legendre_and_derivative(n, x);
      const double dx = p / dp;
      x -= dx;
      if (std::abs(dx) < 1e-16) break;
    }
    const double dp = legendre_and_derivative(n, x)[1];
    rule[i] = {0.5 * (1.0 - x), 1.0 / ((1.0 - x * x) * dp * dp)};  // mapped to [0, 1]
  }
  return rule;
}

namespace {

std::vector<QuadraturePoint> make_tet_rule(int degree) {
  if (degree <= 1) return {{{0.25, 0.25, 0.25}, 1.0 / 6.0}};
  if (degree == 2) {
    const double a = 0.1381966011250105, b = 0.5854101966249685;
    const double w = 1.0 / 24.0;
    return {{{a, a, a}, w}, {{b, a, a}, w}, {{a, b, a}, w}, {{a, a, b}, w}};
  }
  // Duffy map (u,v,w) in [0,1]^3 -> x = u, y = v(1-u), z = w(1-u)(1-v), Jacobian
  // (1-u)^2 (1-v). A degree-p polynomial becomes degree p+2 in u, so n points with
  // 2n - 1 >= p + 2 suffice in every direction.
  const int n = (degree + 4) / 2;
  const auto g = gauss_legendre_01(n);
  std::vector<QuadraturePoint> rule;
  for (const auto& [u, wu] : g)
    for (const auto& [v, wv] : g)
      for (const auto& [w, ww] : g) {
        const double x = u, y = v * (1 - u), z = w * (1 - u) * (1 - v);
        rule.push_back({{x, y, z}, wu * wv * ww * (1 - u) * (1 - u) * (1 - v)});
      }
  return rule;
}

std::vector<QuadraturePoint> make_triangle_rule(int degree) {
  if (degree <= 1) return {{{1.0 / 3.0, 1.0 / 3.0, 0.0}, 0.5}};
  if (degree == 2) {
    const double w = 1.0 / 6.0;
    return {{{1.0 / 6.0, 1.0 / 6.0, 0}, w}, {{2.0 / 3.0, 1.0 / 6.0, 0}, w}, {{1.0 / 6.0, 2.0 / 3.0, 0}, w}};
  }
  // Duffy map (u,v) -> s = u, t = v(1-u), Jacobian (1-u).
  const int n = (degree + 3) / 2;
  const auto g = gauss_legendre_01(n);
  std::vector<QuadraturePoint> rule;
  for (const auto& [u, wu] : g)
    for (const auto& [v, wv] : g) rule.push_back({{u, v * (1 - u), 0.0}, wu * wv * (1 - u)});
  return rule;
}

constexpr int max_degree = 16;

// All rules up to max_degree, built once (thread-safe static initialisation); lookups in
// assembly loops then cost an index, no lock.
template <class Make>
std::vector<std::vector<QuadraturePoint>> all_rules(Make make) {
  std::vector<std::vector<QuadraturePoint>> rules;
  for (int degree = 0; degree <= max_degree; ++degree) rules.push_back(make(degree));
  return rules;
}

}  // namespace

const std::vector<QuadraturePoint>& tet_rule(int degree) {
  static const auto rules = all_rules(make_tet_rule);
  if (degree < 0 || degree > max_degree) throw std::invalid_argument("tet_rule: degree out of range");
  return rules[degree];
}

const std::vector<QuadraturePoint>& triangle_rule(int degree) {
  static const auto rules = all_rules(make_triangle_rule);
  if (degree < 0 || degree > max_degree) throw std::invalid_argument("triangle_rule: degree out of range");
  return rules[degree];
}

}  // namespace hearth
