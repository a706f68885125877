// Transient conduction: implicit time steps (backward Euler or variable-step BDF2) with
// the consistent mass matrix, Newton's method within each step for the nonlinear
// terms, and step-size control from a local error estimate.
//
// Each step solves, for T at t_{n+1},
//   int N_a [c0 H(T) + c1 H(T_n) + c2 H(T_{n-1})] dV + R_a(T, t_{n+1}) = 0,
// R the steady residual (conduction, boundaries, sources) with the values of t_{n+1}
// and H the volumetric enthalpy (solver/heat_capacity.hpp).
//
// Step control: after a (re)start, the first step is checked by step doubling (one
// backward-Euler step against two of half the size; the two halves are kept). Later
// steps compare the corrector with a polynomial predictor through the previous
// levels, which estimates the local error of the step (Milne's device); a step whose
// estimate exceeds the tolerance is redone smaller. Steps land exactly on the output
// times and on the rows of time tables, and restart at first order after a step in a
// table value.
#pragma once

#include <functional>
#include <string>
#include <vector>

#include "mesh/mesh.hpp"
#include "solver/linear_solver.hpp"
#include "solver/problem.hpp"
#include "solver/steady_solver.hpp"

namespace hearth {

enum class TimeMethod { bdf2, backward_euler };

struct TransientSettings {
  double duration = 0.0;        // s
  double initial_step = 0.0;    // s
  TimeMethod method = TimeMethod::bdf2;
  bool adaptive = true;
  double tolerance = 0.1;       // K: allowed local error of one step (max over nodes)
  std::vector<double> output_times;  // s, increasing, in (0, duration]
  NonlinearSettings nonlinear;
  // Step limits: growth and shrinkage per step, and the smallest step before the run
  // gives up (as a fraction of the duration).
  double max_growth = 2.0;
  double max_shrink = 0.2;
  double min_step_fraction = 1e-9;
  // Keep the factorisation or multigrid hierarchy between steps (off: set up the linear
  // solver afresh at every Newton iteration; for comparisons).
  bool reuse_linear_solver = true;
};

// A problem whose boundary values and sources follow time tables.
struct TransientProblem {
  ThermalProblem base;  // every region has a heat capacity
  // Sets the time-varying values of `problem` to those of time t; may be empty.
  std::function<void(double t, ThermalProblem& problem)> at_time;
  std::vector<double> break_times;  // s: table rows, where steps land exactly
  std::vector<double> step_times;   // s: values jump here; the step after restarts at first order
};

// Heat over the run so far, J: per boundary (positive into the body), from the sources,
// and the change in stored energy. Integrated with the weights of the time-stepping
// scheme itself, so that in + sources - out equals the stored change to solver tolerance.
struct EnergyTotals {
  std::vector<double> boundary;  // J per mesh boundary
  double sources = 0.0;          // J
  double stored_change = 0.0;    // J, E(t) - E(0)
};

// What the integrator reports after each accepted step and at each output time.
struct StepState {
  int step = 0;                 // accepted steps so far
  double time = 0.0;            // s
  double step_size = 0.0;       // s, of the step just taken
  int order = 1;                // 1 backward Euler, 2 BDF2
  int newton_iterations = 0;
  int linear_iterations = 0;
  double error_estimate = 0.0;  // K (0 when not estimated)
  int rejected = 0;             // tries of this step rejected before it was accepted
  bool output = false;          // time is one of the output times
  const std::vector<double>* temperature = nullptr;  // K, every node
  // The problem at this time with the step's capacity term: post_process() on it gives
  // heat rates whose balance includes the heat being stored.
  const ThermalProblem* problem = nullptr;
  const EnergyTotals* energy = nullptr;
  std::vector<double> boundary_heat_rates;  // W per boundary at this time
  double source_rate = 0.0;                 // W
};

struct TransientSolution {
  std::vector<double> temperature;  // K at the last accepted time
  double time = 0.0;                // s reached
  int steps = 0, rejected_steps = 0, failed_steps = 0;
  int newton_iterations = 0, linear_iterations = 0;
  int preconditioner_setups = 0;   // full factorisations or multigrid hierarchies built
  int matrix_reuses = 0;            // steps that reused the previous step's matrix as it was
  std::int64_t dofs = 0;
  std::string linear_solver;
  bool completed = false;           // reached the duration
  bool interrupted = false;         // stopped on request after a step
  std::string failure;              // why, when neither
  EnergyTotals energy;
  double initial_energy = 0.0;      // J, E(0)
  double seconds = 0.0, assembly_seconds = 0.0, setup_seconds = 0.0, solve_seconds = 0.0;
  double first_step_seconds = 0.0;  // the first accepted step, for comparisons
};

struct TransientCallbacks {
  std::function<void(const StepState&)> on_step;    // every accepted step
  std::function<void(const StepState&)> on_output;  // at each output time (after on_step)
  std::function<bool()> stop_requested;             // checked after each accepted step
  std::function<void(const std::string&)> progress;
};

// Integrates from `initial` (K, every node) over settings.duration. Failure to converge
// even at the smallest step ends the run with `failure` set and the last accepted state.
TransientSolution solve_transient(const Mesh& mesh, const TransientProblem& problem, const std::vector<double>& initial,
                                  const TransientSettings& settings, const LinearSolverSettings& linear,
                                  const TransientCallbacks& callbacks = {});

// The BDF2 coefficients c0, c1, c2 (1/s) for a step h after a step h_previous.
std::array<double, 3> bdf2_coefficients(double h, double h_previous);

}  // namespace hearth
