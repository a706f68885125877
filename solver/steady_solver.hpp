// Steady linear conduction: assemble, solve, expand to all nodes.
#pragma once

#include <functional>
#include <string>
#include <vector>

#include "mesh/mesh.hpp"
#include "solver/linear_solver.hpp"
#include "solver/problem.hpp"

namespace hearth {

struct SteadySolution {
  std::vector<double> temperature;  // K, one per mesh node
  LinearSolveReport linear;
  std::int64_t dofs = 0;            // free unknowns in the linear system
  double assembly_seconds = 0.0;
  double seconds = 0.0;             // pattern + assembly + solve
  bool converged() const { return linear.converged(); }
};

// Solves -div(k grad T) = f with the problem's boundary conditions. Throws
// std::invalid_argument when the temperature is undetermined (no fixed temperature or
// convection anywhere). A linear solver that does not converge is reported in the
// returned value (linear.status), with the best temperature it reached.
SteadySolution solve_steady(const Mesh& mesh, const ThermalProblem& problem, const LinearSolverSettings& settings,
                            const std::function<void(const std::string&)>& progress = {});

// True when some boundary fixes the temperature level (fixed temperature or convection
// on faces that exist in the mesh).
bool temperature_is_determined(const Mesh& mesh, const ThermalProblem& problem);

}  // namespace hearth
