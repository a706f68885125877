// Steady conduction: one linear solve for linear problems, Newton's method (Picard
// start, backtracking line search) when k(T), h(T) or radiation make it nonlinear.
#pragma once

#include <functional>
#include <string>
#include <vector>

#include "mesh/mesh.hpp"
#include "solver/linear_solver.hpp"
#include "solver/problem.hpp"

namespace hearth {

struct NonlinearSettings {
  // Converged when |R| <= tolerance * |R(T0)| and the last update <= tolerance * max|T|.
  double tolerance = 1e-8;
  int max_iterations = 30;
};

struct NewtonStep {
  double residual = 0.0;        // |R| (W) at the start of the step
  double relative_residual = 0.0;
  double update = 0.0;          // max |alpha delta T| (K)
  double step = 1.0;            // line-search factor alpha
  int linear_iterations = 0;
  double linear_tolerance = 0.0;  // relative residual the linear solve was asked for
  double assembly_seconds = 0.0, setup_seconds = 0.0, solve_seconds = 0.0;
};

struct SteadySolution {
  std::vector<double> temperature;  // K, one per mesh node
  LinearSolveReport linear;         // the last linear solve
  std::int64_t dofs = 0;            // free unknowns in the linear system
  int linear_iterations = 0;        // summed over Newton steps
  int nonlinear_iterations = 0;     // 0 for a linear problem
  double nonlinear_relative_residual = 0.0;  // |R(T)| / |R(T0)| at the returned T (Newton)
  bool nonlinear_converged = true;
  std::string nonlinear_message;    // why, when not converged
  std::vector<NewtonStep> history;  // one entry per Newton step
  double assembly_seconds = 0.0;
  double seconds = 0.0;             // pattern + assembly + solve
  bool converged() const { return linear.converged() && nonlinear_converged; }
};

// Solves -div(K(T) grad T) = f with the problem's boundary conditions. Throws
// std::invalid_argument when the temperature is undetermined (no fixed temperature,
// convection or radiation anywhere). Non-convergence is reported in the returned value,
// with the last iterate as the temperature; so are temperatures that overflowed to NaN
// or infinity (linear.status breakdown, with a message saying so).
SteadySolution solve_steady(const Mesh& mesh, const ThermalProblem& problem, const LinearSolverSettings& settings,
                            const std::function<void(const std::string&)>& progress = {},
                            const NonlinearSettings& nonlinear = {});

// True when some boundary fixes the temperature level (fixed temperature, convection or
// radiation on faces that exist in the mesh).
bool temperature_is_determined(const Mesh& mesh, const ThermalProblem& problem);

}  // namespace hearth
