// Steady solve: dof map, assembler, linear solver; Newton iterations when nonlinear.
#include "solver/steady_solver.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <stdexcept>

#include "solver/assembler.hpp"
#include "solver/dof_map.hpp"

namespace hearth {

namespace {
double seconds_since(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}
std::string format(const char* fmt, double a, double b = 0, double c = 0, double d = 0) {
  char buffer[256];
  std::snprintf(buffer, sizeof buffer, fmt, a, b, c, d);
  return buffer;
}
// Overflow (input values far beyond physical ones) shows up as NaN or infinity in the
// solution, the right-hand side or the residual.
bool all_finite(const std::vector<double>& v) {
  for (double x : v)
    if (!std::isfinite(x)) return false;
  return true;
}

void mark_not_finite(LinearSolveReport& report) {
  report.status = SolveStatus::breakdown;
  report.message = "the numbers overflowed (NaN or infinity in the temperatures or their residual)";
}

double norm(const std::vector<double>& v) {
  double s = 0.0;
  for (double x : v) s += x * x;
  return std::sqrt(s);
}

// A start for Newton: the mean of the temperatures the boundaries refer to.
double reference_temperature(const ThermalProblem& problem) {
  double sum = 0.0;
  int count = 0;
  for (const auto& bc : problem.boundaries) {
    if (bc.temperature) sum += *bc.temperature, ++count;
    if (bc.temperature_field) sum += bc.temperature_field({0, 0, 0}), ++count;
    if (bc.convection) sum += bc.convection->ambient, ++count;
    if (bc.radiation) sum += bc.radiation->surroundings, ++count;
  }
  return count ? sum / count : 293.15;
}

void report_linear(const std::function<void(const std::string&)>& say, const LinearSolveReport& r) {
  say("solved with " + r.solver + format(": set-up %.2f s, solve %.2f s, ", r.setup_seconds, r.solve_seconds) +
      (r.iterations ? std::to_string(r.iterations) + " iterations, " : std::string()) +
      format("relative residual %.1e", r.relative_residual));
}
}  // namespace

bool temperature_is_determined(const Mesh& mesh, const ThermalProblem& problem) {
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    const BoundaryCondition& bc = problem.boundaries[mesh.face_boundary[f]];
    if (bc.is_fixed() || bc.convection || bc.radiation) return true;
  }
  return false;
}

SteadySolution solve_steady(const Mesh& mesh, const ThermalProblem& problem, const LinearSolverSettings& settings,
                            const std::function<void(const std::string&)>& progress,
                            const NonlinearSettings& nonlinear) {
  auto say = [&](const std::string& line) {
    if (progress) progress(line);
  };
  if (!temperature_is_determined(mesh, problem))
    throw std::invalid_argument(
        "no fixed temperature, convection or radiation on any surface: the steady temperature is undetermined; "
        "add a 'temperature', 'convection' or 'radiation' condition to at least one boundary");
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

  if (!problem.is_nonlinear()) {  // one linear solve
    const auto t_assembly = std::chrono::steady_clock::now();
    assembler.assemble(problem, A, b);
    solution.assembly_seconds = seconds_since(t_assembly);
    say(format("assembled %.0f unknowns, %.0f nonzeros (pattern %.2f s, assembly %.3f s)", dofs.n_free(),
               double(A.nnz()), pattern_seconds, solution.assembly_seconds));
    auto linear = make_linear_solver(settings, dofs.n_free());
    linear->setup(A);
    std::vector<double> x(dofs.n_free(), 0.0);
    solution.linear = linear->solve(b, x);
    solution.linear_iterations = solution.linear.iterations;
    if (!all_finite(x) || !all_finite(b) || !std::isfinite(solution.linear.relative_residual))
      mark_not_finite(solution.linear);
    report_linear(say, solution.linear);
    for (std::int32_t r = 0; r < dofs.n_free(); ++r) solution.temperature[dofs.free_nodes[r]] = x[r];
    solution.seconds = seconds_since(t0);
    return solution;
  }

  // Newton on R(T) = 0 over the free temperatures. The exact Jacobian is symmetric
  // unless some conductivity depends on temperature.
  bool symmetric = true;
  for (const auto& r : problem.regions) symmetric &= !r.conductivity.depends_on_temperature();
  auto linear = make_linear_solver(settings, dofs.n_free(), symmetric);
  const bool direct = linear->name() == "cholmod" || linear->name() == "umfpack";
  if (direct) linear = keep_factor_between_steps(make_cholmod_solver(), make_umfpack_solver());
  std::vector<double>& T = solution.temperature;
  const double guess = reference_temperature(problem);
  for (std::int32_t r = 0; r < dofs.n_free(); ++r) T[dofs.free_nodes[r]] = guess;
  say(format("nonlinear problem: Newton's method from %.2f K (first step Picard), ", guess) +
      (symmetric ? "symmetric" : "non-symmetric") + " Jacobian");

  std::vector<double> R, R_try, delta(dofs.n_free()), T_try;
  double r0 = 0.0, r_previous = 0.0, last_update = INFINITY, t_max = 0.0;
  // Inexact Newton: far from the solution the linear solve need not be accurate, only
  // good enough for the residual to fall. The relative tolerance eta of each solve follows
  // the fall of |R| (Eisenstat & Walker, "Choosing the forcing terms in an inexact Newton
  // method", SIAM J. Sci. Comput. 17, 1996, choice 2 with gamma = 0.9, alpha = 2 and their
  // safeguard, from memory), at most 0.1. The first step is solved exactly on the direct
  // path (a fresh factorisation); later ones by GMRES on the kept one, to eta.
  const double eta_max = 0.1;
  double eta = eta_max;
  bool jacobian_ready = false;  // A and R already hold the Jacobian and residual at T
  solution.nonlinear_converged = false;
  for (int it = 0; it <= nonlinear.max_iterations; ++it) {
    const JacobianKind kind = it == 0 ? JacobianKind::picard : JacobianKind::exact;
    NewtonStep step;
    auto t_assembly = std::chrono::steady_clock::now();
    if (!jacobian_ready) assembler.assemble_terms(problem, T, kind, &A, R);
    step.assembly_seconds = seconds_since(t_assembly);
    const double r_norm = norm(R);
    if (it == 0) r0 = std::max(r_norm, 1e-300);
    solution.nonlinear_relative_residual = r_norm / r0;
    t_max = 0.0;
    for (double t : T) t_max = std::max(t_max, std::abs(t));
    if (it > 0 && r_norm <= nonlinear.tolerance * r0 && last_update <= nonlinear.tolerance * t_max) {
      solution.nonlinear_converged = true;
      break;
    }
    if (it == nonlinear.max_iterations) break;
    if (it > 0) {
      const double safeguard = 0.9 * eta * eta;
      eta = 0.9 * (r_norm / r_previous) * (r_norm / r_previous);
      if (safeguard > 0.1) eta = std::max(eta, safeguard);
      // Near the end, no more accuracy than brings |R| a tenth below the target (Kelley,
      // Iterative Methods for Linear and Nonlinear Equations, SIAM 1995, section 6.3,
      // from memory, with 0.1 for 0.5 as margin), nor than the linear solver's own.
      eta = std::min(std::max(eta, 0.1 * nonlinear.tolerance * r0 / r_norm), eta_max);
      eta = std::max(eta, settings.tolerance);
    }
    r_previous = r_norm;
    linear->set_tolerance(eta);
    for (double& v : R) v = -v;
    // From the first exact Jacobian on, keep the multigrid hierarchy or the factorisation
    // of the Picard matrix (the Krylov method still solves the current Jacobian);
    // rebuild it if that fails.
    const auto t_setup = std::chrono::steady_clock::now();
    linear->keep_preconditioner(it >= 1);
    linear->setup(A);
    step.setup_seconds = seconds_since(t_setup);
    std::fill(delta.begin(), delta.end(), 0.0);
    solution.linear = linear->solve(R, delta);
    step.linear_iterations = solution.linear.iterations;
    if (!solution.linear.converged() && it >= 1) {
      const auto t_rebuild = std::chrono::steady_clock::now();
      linear->keep_preconditioner(false);
      linear->setup(A);
      step.setup_seconds += seconds_since(t_rebuild);
      std::fill(delta.begin(), delta.end(), 0.0);
      solution.linear = linear->solve(R, delta);
      step.linear_iterations += solution.linear.iterations;
    }
    step.solve_seconds = solution.linear.solve_seconds;
    solution.linear_iterations += step.linear_iterations;
    if (!all_finite(delta) || !all_finite(R) || !std::isfinite(solution.linear.relative_residual))
      mark_not_finite(solution.linear);
    if (!solution.linear.converged()) break;
    // Backtracking line search on |R| (Armijo with c = 1e-4); the Picard start is taken
    // whole. The full step's trial also assembles the next Jacobian, which the next
    // Newton step then uses as it is when the full step is accepted.
    double alpha = 1.0;
    jacobian_ready = false;
    t_assembly = std::chrono::steady_clock::now();
    for (int halving = 0;; ++halving) {
      T_try = T;
      for (std::int32_t r = 0; r < dofs.n_free(); ++r) T_try[dofs.free_nodes[r]] += alpha * delta[r];
      if (it == 0 || halving == 8) break;  // the last, smallest step is taken as it is
      assembler.assemble_terms(problem, T_try, JacobianKind::exact, halving == 0 ? &A : nullptr, R_try);
      const double r_try = norm(R_try);
      // Accept a sufficient decrease, or a residual already at round-off level.
      if (r_try <= (1.0 - 1e-4 * alpha) * r_norm || r_try <= 1e-3 * nonlinear.tolerance * r0) {
        if (halving == 0) R.swap(R_try), jacobian_ready = true;
        break;
      }
      alpha *= 0.5;
    }
    step.assembly_seconds += seconds_since(t_assembly);
    solution.assembly_seconds += step.assembly_seconds;
    last_update = 0.0;
    for (std::int32_t r = 0; r < dofs.n_free(); ++r) last_update = std::max(last_update, std::abs(alpha * delta[r]));
    T.swap(T_try);
    solution.nonlinear_iterations = it + 1;
    step.residual = r_norm;
    step.relative_residual = r_norm / r0;
    step.update = last_update;
    step.step = alpha;
    step.linear_tolerance = eta;
    solution.history.push_back(step);
    say(format("newton %2.0f: residual %.3e W (relative %.2e), update %.3e K", it + 1, r_norm, r_norm / r0,
               last_update) +
        format(", step factor %.3g", alpha) +
        (step.linear_iterations
             ? ", " + std::to_string(step.linear_iterations) + " linear iterations to " +
                   format("%.0e (assembly %.2f s, set-up %.2f s, solve %.2f s)", eta, step.assembly_seconds,
                          step.setup_seconds, step.solve_seconds)
             : std::string()));
  }
  if (!solution.nonlinear_converged && solution.linear.converged()) {
    const auto& last = solution.history.empty() ? NewtonStep{} : solution.history.back();
    solution.nonlinear_message = format("Newton's method did not converge in %.0f iterations (relative residual %.2e, "
                                        "last update %.3g K, tolerance %.1e)",
                                        nonlinear.max_iterations, last.relative_residual, last.update,
                                        nonlinear.tolerance) +
                                 "; try more solver.nonlinear.max_iterations, a finer mesh, or check the property "
                                 "tables and film coefficients for steps and extreme values";
  }
  if (!solution.linear.converged()) solution.nonlinear_message = solution.linear.message;
  report_linear(say, solution.linear);
  solution.seconds = seconds_since(t0);
  return solution;
}

}  // namespace hearth
