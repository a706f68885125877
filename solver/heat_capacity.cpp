#include "solver/heat_capacity.hpp"

#include <algorithm>

namespace hearth {


HeatCapacity::HeatCapacity(PiecewiseLinear density, PiecewiseLinear specific_heat)
    : density_(std::move(density)), specific_heat_(std::move(specific_heat)) {
  if (!depends_on_temperature()) return;
  for (const auto* table : {&density_, &specific_heat_})
    if (!table->is_constant()) points_.insert(points_.end(), table->x.begin(), table->x.end());
  std::sort(points_.begin(), points_.end());
  points_.erase(std::unique(points_.begin(), points_.end()), points_.end());
  cumulative_.assign(points_.size(), 0.0);
  quadratic_.assign(points_.size(), {0.0, 0.0, 0.0});
  auto product = [&](double T) { return density_.value(T) * specific_heat_.value(T); };
  for (std::size_t k = 0; k < points_.size(); ++k) {
    if (k + 1 == points_.size()) {  // held constant beyond the last point
      quadratic_[k] = {product(points_[k]), 0.0, 0.0};
      break;
    }
    // The product of two linears through its values at both ends and the middle.
    const double h = points_[k + 1] - points_[k];
    const double f0 = product(points_[k]), fm = product(points_[k] + 0.5 * h), f1 = product(points_[k + 1]);
    const double q2 = 2.0 * (f0 - 2.0 * fm + f1) / (h * h);
    const double q1 = (f1 - f0) / h - q2 * h;
    quadratic_[k] = {f0, q1, q2};
    cumulative_[k + 1] = cumulative_[k] + h * (f0 + h * (q1 / 2.0 + h * q2 / 3.0));
  }
  reference_offset_ = from_first_point(reference_temperature);
}

double HeatCapacity::volumetric(double T) const {
  if (points_.empty()) return density_.value(T) * specific_heat_.value(T);
  if (T <= points_.front()) return quadratic_.front()[0];
  const std::size_t k = static_cast<std::size_t>(std::upper_bound(points_.begin(), points_.end(), T) - points_.begin()) - 1;
  const double s = T - points_[k];
  const auto& q = quadratic_[k];
  return q[0] + s * (q[1] + s * q[2]);
}

double HeatCapacity::from_first_point(double T) const {
  if (T <= points_.front()) return quadratic_.front()[0] * (T - points_.front());  // held constant below
  const std::size_t k = static_cast<std::size_t>(std::upper_bound(points_.begin(), points_.end(), T) - points_.begin()) - 1;
  const double s = T - points_[k];
  const auto& q = quadratic_[k];
  return cumulative_[k] + s * (q[0] + s * (q[1] / 2.0 + s * q[2] / 3.0));
}

double HeatCapacity::enthalpy(double T) const {
  if (!depends_on_temperature()) return volumetric(T) * (T - reference_temperature);
  return from_first_point(T) - reference_offset_;
}

}  // namespace hearth
