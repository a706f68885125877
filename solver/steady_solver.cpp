// Steady solve: dof map, assembler, linear solver, then fixed values put back.
#include "solver/steady_solver.hpp"

#include <chrono>
#include <cstdio>
#include <stdexcept>

#include "solver/assembler.hpp"
#include "solver/dof_map.hpp"

namespace hearth {

namespace {
double seconds_since(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}
std::string format(const char* fmt, double a, double b = 0, double c = 0) {
  char buffer[256];
  std::snprintf(buffer, sizeof buffer, fmt, a, b, c);
  return buffer;
}
}  // namespace

bool temperature_is_determined(const Mesh& mesh, const ThermalProblem& problem) {
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    const BoundaryCondition& bc = problem.boundaries[mesh.face_boundary[f]];
    if (bc.is_fixed() || bc.convection) return true;
  }
  return false;
}

SteadySolution solve_steady(const Mesh& mesh, const ThermalProblem& problem, const LinearSolverSettings& settings,
                            const std::function<void(const std::string&)>& progress) {
  auto say = [&](const std::string& line) {
    if (progress) progress(line);
  };
  if (!temperature_is_determined(mesh, problem))
    throw std::invalid_argument(
        "no fixed temperature or convection on any surface: the steady temperature is undetermined; "
        "add a 'temperature' or 'convection' condition to at least one boundary");
  const auto t0 = std::chrono::steady_clock::now();
  SteadySolution solution;
  const DofMap dofs = make_dof_map(mesh, problem);
  solution.dofs = dofs.n_free();
  solution.temperature = dofs.fixed_value;
  if (dofs.n_free() == 0) {
    solution.linear.solver = "none";
    solution.seconds = seconds_since(t0);
    return solution;
  }

  const auto t_pattern = std::chrono::steady_clock::now();
  const Assembler assembler(mesh, dofs);
  const double pattern_seconds = seconds_since(t_pattern);
  CsrMatrix A;
  std::vector<double> b;
  const auto t_assembly = std::chrono::steady_clock::now();
  assembler.assemble(problem, A, b);
  solution.assembly_seconds = seconds_since(t_assembly);
  say(format("assembled %.0f unknowns, %.0f nonzeros (pattern %.2f s, ", dofs.n_free(), double(A.nnz()),
             pattern_seconds) +
      format("assembly %.3f s)", solution.assembly_seconds));

  auto linear = make_linear_solver(settings, dofs.n_free());
  linear->setup(A);
  std::vector<double> x(dofs.n_free(), 0.0);
  solution.linear = linear->solve(b, x);
  say("solved with " + solution.linear.solver +
      format(": set-up %.2f s, solve %.2f s, ", solution.linear.setup_seconds, solution.linear.solve_seconds) +
      (solution.linear.iterations ? std::to_string(solution.linear.iterations) + " iterations, " : std::string()) +
      format("relative residual %.1e", solution.linear.relative_residual));
  for (std::int32_t r = 0; r < dofs.n_free(); ++r) solution.temperature[dofs.free_nodes[r]] = x[r];
  solution.seconds = seconds_since(t0);
  return solution;
}

}  // namespace hearth
