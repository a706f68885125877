// Heat capacity of a material: density and specific heat, each constant or a table in
// temperature, and the volumetric enthalpy H(T) = int_{T_ref}^T rho(s) c(s) ds that the
// transient equations store. Storing H (not c dT/dt) keeps the energy balance exact when
// rho c depends on temperature.
#pragma once

#include <array>
#include <vector>

#include "solver/material.hpp"

namespace hearth {

class HeatCapacity {
 public:
  static constexpr double reference_temperature = 293.15;  // K; H(T_ref) = 0

  HeatCapacity() = default;
  HeatCapacity(PiecewiseLinear density, PiecewiseLinear specific_heat);

  const PiecewiseLinear& density() const { return density_; }            // kg/m3
  const PiecewiseLinear& specific_heat() const { return specific_heat_; }  // J/(kg K)
  bool depends_on_temperature() const { return !density_.is_constant() || !specific_heat_.is_constant(); }
  // rho c at T, J/(m3 K).
  double volumetric(double T) const;
  // H(T), J/m3: the exact integral of the product of the two piecewise-linear tables.
  double enthalpy(double T) const;

 private:
  double from_first_point(double T) const;  // int_{points_[0]}^T rho c

  PiecewiseLinear density_, specific_heat_;
  // Break points of both tables, and on each interval rho c = q0 + q1 s + q2 s^2
  // (s = T - point) with the integral up to the point: H(T) costs a search and a cubic.
  std::vector<double> points_, cumulative_;
  std::vector<std::array<double, 3>> quadratic_;
  double reference_offset_ = 0.0;
};

}  // namespace hearth
