// Table lookups and tensor assembly from principal values.
#include "solver/material.hpp"

#include <algorithm>

namespace hearth {

double PiecewiseLinear::value(double t) const {
  if (x.empty()) return 0.0;
  if (t <= x.front()) return y.front();
  if (t >= x.back()) return y.back();
  const std::size_t i = std::upper_bound(x.begin(), x.end(), t) - x.begin();
  const double s = (t - x[i - 1]) / (x[i] - x[i - 1]);
  return y[i - 1] + s * (y[i] - y[i - 1]);
}

double PiecewiseLinear::slope(double t) const {
  if (x.size() < 2 || t <= x.front() || t >= x.back()) return 0.0;
  const std::size_t i = std::upper_bound(x.begin(), x.end(), t) - x.begin();
  return (y[i] - y[i - 1]) / (x[i] - x[i - 1]);
}

Conductivity Conductivity::isotropic(PiecewiseLinear k) {
  Conductivity c;
  c.principal[0] = std::move(k);
  return c;
}

Conductivity Conductivity::orthotropic(std::array<PiecewiseLinear, 3> k, const Matrix3& axes) {
  Conductivity c;
  c.kind = Kind::orthotropic;
  c.principal = std::move(k);
  c.axes = axes;
  return c;
}

Conductivity Conductivity::full(const Matrix3& tensor) {
  Conductivity c;
  c.kind = Kind::tensor;
  c.tensor = tensor;
  return c;
}

bool Conductivity::depends_on_temperature() const {
  if (kind == Kind::tensor) return false;
  for (int i = 0; i < (kind == Kind::isotropic ? 1 : 3); ++i)
    if (!principal[i].is_constant()) return true;
  return false;
}

void Conductivity::at(double t, Matrix3& K, Matrix3* dK) const {
  for (auto& row : K) row = {0, 0, 0};
  if (dK)
    for (auto& row : *dK) row = {0, 0, 0};
  switch (kind) {
    case Kind::isotropic: {
      const double k = principal[0].value(t), dk = dK ? principal[0].slope(t) : 0.0;
      for (int i = 0; i < 3; ++i) {
        K[i][i] = k;
        if (dK) (*dK)[i][i] = dk;
      }
      return;
    }
    case Kind::orthotropic:
      for (int p = 0; p < 3; ++p) {
        const double k = principal[p].value(t), dk = dK ? principal[p].slope(t) : 0.0;
        for (int i = 0; i < 3; ++i)
          for (int j = 0; j < 3; ++j) {
            K[i][j] += k * axes[p][i] * axes[p][j];
            if (dK) (*dK)[i][j] += dk * axes[p][i] * axes[p][j];
          }
      }
      return;
    case Kind::tensor:
      K = tensor;
      return;
  }
}

double Conductivity::typical(double t) const {
  Matrix3 K;
  at(t, K);
  return (K[0][0] + K[1][1] + K[2][2]) / 3.0;
}

}  // namespace hearth
