// Post-processing: heat flux, heat rates through named surfaces, energy balance,
// statistics per region and boundary.
#pragma once

#include <vector>

#include "mesh/mesh.hpp"
#include "solver/problem.hpp"
#include "solver/results.hpp"

namespace hearth {

// Heat rates follow the consistent-reaction method: through fixed-temperature
// boundaries, the residual of the discrete equations at their nodes (a node shared by
// several fixed boundaries is split by the faces' shares of its shape-function
// integral); through convection and flux boundaries, their own boundary integrals
// with the solved temperature. Internal named surfaces: minus the residual of the
// elements behind the surface (opposite its normal) at the surface's nodes. The
// energy balance therefore closes to the linear-solver tolerance.
Results post_process(const Mesh& mesh, const ThermalProblem& problem, const std::vector<double>& temperature);

// Residual r = K T - F at every node (W), over all elements and boundary faces; with
// masks, only over elements (and the boundary faces of elements) where mask != 0.
std::vector<double> nodal_residual(const Mesh& mesh, const ThermalProblem& problem,
                                   const std::vector<double>& temperature,
                                   const std::vector<char>* element_mask = nullptr,
                                   const std::vector<char>* face_mask = nullptr);

// Heat entering the body through each boundary, W (post_process's heat_rate for outer
// surfaces; 0 for internal and contact surfaces, which pass heat within the body).
std::vector<double> surface_heat_rates(const Mesh& mesh, const ThermalProblem& problem, const std::vector<double>& T,
                                       const std::vector<std::array<std::int32_t, 2>>& neighbours);

// Heat stored in the body, J: int H(T) dV over the regions with a heat capacity
// (relative to HeatCapacity::reference_temperature; differences are what matter).
double stored_energy(const Mesh& mesh, const ThermalProblem& problem, const std::vector<double>& T);

// The rate of heat storage of the current time step, W: the sum of the capacity terms
// (problem.time_levels); 0 for a steady problem.
double storage_rate(const Mesh& mesh, const ThermalProblem& problem, const std::vector<double>& T);

// Volume of each region, m3.
std::vector<double> region_volumes(const Mesh& mesh);

}  // namespace hearth
