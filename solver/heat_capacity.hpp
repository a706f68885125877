// Heat capacity of a material: density and specific heat, each constant or a table in
// temperature, and the volumetric enthalpy H(T) = int_{T_ref}^T rho(s) c(s) ds that the
// transient equations store. Storing H (not c dT/dt) keeps the energy balance exact when
// rho c depends on temperature.
#pragma once

#include "solver/material.hpp"

namespace hearth {

struct HeatCapacity {
  PiecewiseLinear density;        // kg/m3
  PiecewiseLinear specific_heat;  // J/(kg K)

  static constexpr double reference_temperature = 293.15;  // K; H(T_ref) = 0

  bool depends_on_temperature() const { return !density.is_constant() || !specific_heat.is_constant(); }
  // rho c at T, J/(m3 K).
  double volumetric(double T) const { return density.value(T) * specific_heat.value(T); }
  // H(T), J/m3: exact integral of the product of the two piecewise-linear tables.
  double enthalpy(double T) const;
};

}  // namespace hearth
