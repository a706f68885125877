// Material and film-coefficient models: tables in temperature, orthotropic and full
// conductivity tensors. Temperatures in K, conductivities in W/(m K).
#pragma once

#include <array>
#include <vector>

namespace hearth {

// Piecewise-linear function of temperature, held constant beyond its end points.
// x strictly increasing (K), y the values; a single point is a constant.
struct PiecewiseLinear {
  std::vector<double> x, y;

  PiecewiseLinear() = default;
  PiecewiseLinear(double constant) : x{0.0}, y{constant} {}  // NOLINT: a number is a constant table
  PiecewiseLinear(std::vector<double> xs, std::vector<double> ys) : x(std::move(xs)), y(std::move(ys)) {}

  bool is_constant() const { return x.size() <= 1; }
  double value(double t) const;
  double slope(double t) const;  // d value / d t (0 beyond the ends)
};

using Matrix3 = std::array<std::array<double, 3>, 3>;

// Fourier's law q = -K(T) grad T with K symmetric positive definite.
//   isotropic:   K = k(T) I
//   orthotropic: K = sum_i k_i(T) a_i a_i^T, a_i orthonormal principal axes
//   tensor:      K constant, given in global axes
struct Conductivity {
  enum class Kind { isotropic, orthotropic, tensor };
  Kind kind = Kind::isotropic;
  std::array<PiecewiseLinear, 3> principal;  // isotropic uses principal[0]
  Matrix3 axes{};                            // rows a_1, a_2, a_3 (orthotropic)
  Matrix3 tensor{};                          // (tensor)

  Conductivity() = default;
  Conductivity(double k) { principal[0] = PiecewiseLinear(k); }  // NOLINT: isotropic constant
  static Conductivity isotropic(PiecewiseLinear k);
  static Conductivity orthotropic(std::array<PiecewiseLinear, 3> k, const Matrix3& axes);
  static Conductivity full(const Matrix3& tensor);

  bool depends_on_temperature() const;
  bool is_isotropic() const { return kind == Kind::isotropic; }
  // K(T) and dK/dT (dK may be null).
  void at(double t, Matrix3& K, Matrix3* dK = nullptr) const;
  // Isotropic value (or the mean of the eigenvalues), for messages and estimates.
  double typical(double t) const;
};

struct Radiation {
  double emissivity = 0.0;    // grey surface, (0, 1]
  double surroundings = 0.0;  // K, large enclosure
};

// Stefan-Boltzmann constant, CODATA 2018 (exact in the SI since 2019), W/(m2 K4).
constexpr double stefan_boltzmann = 5.670374419e-8;

}  // namespace hearth
