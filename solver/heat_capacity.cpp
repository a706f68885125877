#include "solver/heat_capacity.hpp"

#include <algorithm>
#include <vector>

namespace hearth {

namespace {

// int_a^b rho(s) c(s) ds where both are linear on [a, b]: the product is quadratic, so
// Simpson's rule is exact.
double simpson(const HeatCapacity& k, double a, double b) {
  return (b - a) / 6.0 * (k.volumetric(a) + 4.0 * k.volumetric(0.5 * (a + b)) + k.volumetric(b));
}

}  // namespace

double HeatCapacity::enthalpy(double T) const {
  if (!depends_on_temperature()) return volumetric(T) * (T - reference_temperature);
  // Break points of both tables between T_ref and T: each piece is a product of linears.
  const double lo = std::min(T, reference_temperature), hi = std::max(T, reference_temperature);
  std::vector<double> points{lo};
  for (const auto* table : {&density, &specific_heat})
    for (double x : table->x)
      if (x > lo && x < hi) points.push_back(x);
  points.push_back(hi);
  std::sort(points.begin(), points.end());
  double integral = 0.0;
  for (std::size_t k = 1; k < points.size(); ++k) integral += simpson(*this, points[k - 1], points[k]);
  return T >= reference_temperature ? integral : -integral;
}

}  // namespace hearth
