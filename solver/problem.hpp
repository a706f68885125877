// ThermalProblem: material properties and boundary conditions per mesh region and
// boundary index, in SI units and kelvin. Built by the driver from the Case.
#pragma once

#include <array>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "solver/heat_capacity.hpp"
#include "solver/material.hpp"

namespace hearth {

struct Convection {
  PiecewiseLinear coefficient;  // film coefficient h(T_surface), W/(m2 K)
  double ambient = 0.0;         // fluid temperature, K
};

// Condition on one named surface. Nothing set: insulated.
struct BoundaryCondition {
  std::optional<double> temperature;    // fixed temperature, K (excludes the others)
  double heat_flux = 0.0;               // W/m2 into the body
  std::optional<Convection> convection;
  std::optional<Radiation> radiation;   // grey surface to large surroundings
  // Fixed temperature varying over the surface, K (verification with closed forms);
  // takes the place of `temperature` where set.
  std::function<double(const std::array<double, 3>&)> temperature_field;
  // Thermal contact conductance across a cut internal surface, W/(m2 K): the heat
  // h_c (T_behind - T_in_front) crosses it (Mesh::face_twin_nodes holds the other side).
  std::optional<double> contact_conductance;

  bool is_fixed() const { return temperature.has_value() || bool(temperature_field); }
  bool is_insulated() const { return !temperature && heat_flux == 0.0 && !convection && !radiation; }
  // Terms that make the problem nonlinear in T.
  bool is_nonlinear() const { return radiation || (convection && !convection->coefficient.is_constant()); }
};

struct RegionProperties {
  std::string material;        // for messages and the summary
  Conductivity conductivity;   // W/(m K)
  double heat_source = 0.0;    // volumetric source, W/m3
  std::optional<HeatCapacity> capacity;  // density and specific heat (transient only)
};

// The capacity term of one implicit time step, set by the transient integrator:
//   C_a = int N_a [c0 H(T) + c1 H(T_1) + c2 H(T_2)] dV,
// H the volumetric enthalpy, T_1 and T_2 the nodal temperatures (K) of the two previous
// time levels; c0 + c1 + c2 = 0 (backward Euler: c0 = -c1 = 1/dt, c2 = 0).
struct TimeLevels {
  std::array<double, 3> c{};  // 1/s
  const std::vector<double>* previous = nullptr;
  const std::vector<double>* before_previous = nullptr;  // may be null when c2 = 0
};

struct ThermalProblem {
  std::vector<RegionProperties> regions;       // one per Mesh::regions entry
  std::vector<BoundaryCondition> boundaries;   // one per Mesh::boundaries entry
  // Optional source varying in space, W/m3, added to the region sources and
  // integrated with a rule of source_field_degree (manufactured-solution checks).
  std::function<double(const std::array<double, 3>&)> source_field;
  int source_field_degree = 6;
  // Set for the steps of a transient run: the heat stored enters the residual.
  std::optional<TimeLevels> time_levels;

  bool is_nonlinear() const {
    for (const auto& r : regions)
      if (r.conductivity.depends_on_temperature() ||
          (time_levels && r.capacity && r.capacity->depends_on_temperature()))
        return true;
    for (const auto& b : boundaries)
      if (b.is_nonlinear()) return true;
    return false;
  }
};

}  // namespace hearth
