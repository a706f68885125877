// Time integration: one implicit step at a time, Newton within the step, the linear
// solver's factorisation or multigrid hierarchy reused while the matrix stays the same.
#include "solver/transient_solver.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <deque>
#include <memory>

#include "mesh/boundary_face_lookup.hpp"
#include "solver/assembler.hpp"
#include "solver/dof_map.hpp"
#include "solver/post_processing.hpp"

namespace hearth {

namespace {

using Clock = std::chrono::steady_clock;
double seconds_since(Clock::time_point t0) { return std::chrono::duration<double>(Clock::now() - t0).count(); }

std::string format(const char* fmt, double a, double b = 0, double c = 0, double d = 0, double e = 0) {
  char buffer[256];
  std::snprintf(buffer, sizeof buffer, fmt, a, b, c, d, e);
  return buffer;
}

// A 64-bit hash of the matrix values, a word at a time (FNV-1a's step on whole words,
// with a final mix): equal hashes, the same matrix as the last set-up.
std::uint64_t value_hash(const std::vector<double>& values) {
  std::uint64_t hash = 1469598103934665603ULL;
  for (const double v : values) {
    std::uint64_t word;
    std::memcpy(&word, &v, sizeof word);
    hash = (hash ^ word) * 1099511628211ULL;
    hash ^= hash >> 29;
  }
  return hash;
}

// What a linear step's matrix depends on that a run may change from step to step: the
// time-step coefficient c0 and the film coefficients (time tables may vary them). The
// mesh, the fixed nodes, the conductivities, the heat capacities and the contact
// conductances stay as the run began; fixed temperatures, heat fluxes, ambient
// temperatures and sources enter the residual only.
std::vector<double> linear_matrix_key(const ThermalProblem& problem) {
  std::vector<double> key{problem.time_levels ? problem.time_levels->c[0] : 0.0};
  for (const BoundaryCondition& b : problem.boundaries)
    key.push_back(b.convection ? b.convection->coefficient.value(0.0) : -1.0);
  return key;
}

struct StepOutcome {
  bool converged = false;
  int newton_iterations = 0;
  int linear_iterations = 0;
  std::string message;
};

// Solves the equations of one time step by Newton's method on a fixed pattern. Keeps
// the linear solver between steps: an unchanged matrix (a linear problem at the same
// step size) is not set up again at all; a changed one keeps the multigrid hierarchy
// while the Krylov iterations stay near those of a fresh hierarchy.
class StepSolver {
 public:
  StepSolver(const Mesh& mesh, const ThermalProblem& base, const LinearSolverSettings& settings,
             const NonlinearSettings& nonlinear, double update_tolerance, bool reuse)
      : mesh_(mesh), dofs_(make_dof_map(mesh, base)), assembler_(mesh, dofs_), nonlinear_(nonlinear),
        update_tolerance_(update_tolerance), linear_tolerance_(settings.tolerance), reuse_(reuse) {
    bool symmetric = true;
    for (const auto& r : base.regions) symmetric &= !r.conductivity.depends_on_temperature();
    linear_ = make_linear_solver(settings, dofs_.n_free(), symmetric);
    direct_ = linear_->name() == "cholmod" || linear_->name() == "umfpack";
  }

  const DofMap& dofs() const { return dofs_; }
  std::string solver_name() const { return linear_->name(); }
  int setups = 0, reuses = 0;
  double assembly_seconds = 0.0, setup_seconds = 0.0, solve_seconds = 0.0;

  // T: the guess on entry (every node), the solution on return; fixed nodes are set
  // to the problem's values here.
  StepOutcome solve(const ThermalProblem& problem, std::vector<double>& T) {
    StepOutcome out;
    const DofMap now = make_dof_map(mesh_, problem);
    for (std::size_t i = 0; i < T.size(); ++i)
      if (dofs_.is_fixed(static_cast<std::int32_t>(i))) T[i] = now.fixed_value[i];
    const bool nonlinear = problem.is_nonlinear();
    double r0 = 0.0;
    // A linear step whose matrix is the last one assembled (the same step size and film
    // coefficients) assembles its residual only: the element pass then skips the
    // position map and the matrix writes, about half of its cost on large meshes.
    std::vector<double> key;
    if (!nonlinear && reuse_) key = linear_matrix_key(problem);
    const bool same_matrix = !key.empty() && key == matrix_key_;
    matrix_key_ = std::move(key);
    for (int it = 0; it <= nonlinear_.max_iterations; ++it) {
      auto t0 = Clock::now();
      assembler_.assemble_terms(problem, T, JacobianKind::exact, same_matrix ? nullptr : &A_, R_);
      assembly_seconds += seconds_since(t0);
      double r_norm = 0.0;
      for (double v : R_) {
        if (!std::isfinite(v)) {
          out.message = "the residual is not finite (NaN or infinity) after " + std::to_string(it) +
                        " Newton iterations; check the property tables and boundary values";
          return out;
        }
        r_norm += v * v;
      }
      r_norm = std::sqrt(r_norm);
      if (it == 0) r0 = r_norm;
      if (r_norm == 0.0 || (it > 0 && r_norm <= nonlinear_.tolerance * r0)) {
        out.converged = true;
        return out;
      }
      if (it == nonlinear_.max_iterations) break;
      if (!direct_) linear_->set_tolerance(krylov_tolerance(problem, T, r_norm, it));
      for (double& v : R_) v = -v;
      t0 = Clock::now();
      prepare(nonlinear, same_matrix);
      setup_seconds += seconds_since(t0);
      delta_.assign(dofs_.n_free(), 0.0);
      t0 = Clock::now();
      LinearSolveReport report = linear_->solve(R_, delta_);
      if (!report.converged() && kept_) {  // the kept hierarchy no longer serves: build a new one
        rebuild();
        delta_.assign(dofs_.n_free(), 0.0);
        report = linear_->solve(R_, delta_);
      }
      solve_seconds += seconds_since(t0);
      out.linear_iterations += report.iterations;
      if (!report.converged()) {
        out.message = report.message;
        return out;
      }
      if (!direct_) {
        if (fresh_iterations_ == 0) fresh_iterations_ = std::max(1, report.iterations);
        rebuild_next_ = kept_ && report.iterations > 2 * fresh_iterations_ + 5;
      }
      double update = 0.0;
      for (std::int32_t r = 0; r < dofs_.n_free(); ++r) {
        T[dofs_.free_nodes[r]] += delta_[r];
        update = std::max(update, std::abs(delta_[r]));
      }
      out.newton_iterations = it + 1;
      // A linear step is solved exactly by its one Newton iteration.
      if (!nonlinear || update <= update_tolerance_) {
        out.converged = true;
        return out;
      }
    }
    out.message = "Newton's method did not converge in " + std::to_string(nonlinear_.max_iterations) +
                  " iterations within a time step";
    return out;
  }

 private:
  // The Krylov tolerance of a step's solve, relative to |R(guess)|. What the step must
  // get right is its change from the last level, so the target is the linear tolerance
  // times |R(T_n)|, the residual of "nothing changes" (estimated from R(guess) by one
  // product with the Jacobian), not times the residual of the extrapolated guess, which
  // is small when the predictor is good. The first step starts at T_n and keeps the full
  // tolerance; later ones start nearer and need fewer iterations for the same accuracy.
  // Never looser than 0.1 (project choice, as for inexact Newton steps). Later Newton
  // iterations of a nonlinear step keep the plain relative tolerance, so that their
  // convergence stays quadratic.
  double krylov_tolerance(const ThermalProblem& problem, const std::vector<double>& T, double r_norm, int it) {
    if (it > 0 || r_norm <= 0.0) return linear_tolerance_;
    double reference = r_norm;
    if (problem.time_levels && problem.time_levels->previous) {
      const std::vector<double>& previous = *problem.time_levels->previous;
      difference_.resize(dofs_.n_free());
      for (std::int32_t r = 0; r < dofs_.n_free(); ++r)
        difference_[r] = previous[dofs_.free_nodes[r]] - T[dofs_.free_nodes[r]];
      A_.multiply(difference_, product_);
      double s = 0.0;
      for (std::int32_t r = 0; r < dofs_.n_free(); ++r) s += (R_[r] + product_[r]) * (R_[r] + product_[r]);
      reference = std::max(r_norm, std::sqrt(s));
    }
    return std::min(0.1, linear_tolerance_ * reference / r_norm);
  }

  // Sets the linear solver up for A_ unless A_ is the matrix it already has (known to
  // be, or found so by its hash).
  void prepare(bool nonlinear, bool same_matrix) {
    if (!reuse_) return rebuild();
    const std::uint64_t hash = same_matrix ? hash_ : value_hash(A_.val);
    if (ready_ && hash == hash_) {
      ++reuses;
      kept_ = false;
      return;
    }
    hash_ = hash;
    if (direct_ || !ready_ || rebuild_next_) return rebuild();
    // Multigrid: keep the hierarchy of an earlier matrix (step size or Newton changes).
    linear_->keep_preconditioner(true);
    linear_->setup(A_);
    kept_ = true;
    (void)nonlinear;
  }
  void rebuild() {
    linear_->keep_preconditioner(false);
    linear_->setup(A_);
    ++setups;
    ready_ = true;
    kept_ = false;
    rebuild_next_ = false;
    fresh_iterations_ = 0;
    hash_ = value_hash(A_.val);
  }

  const Mesh& mesh_;
  DofMap dofs_;
  Assembler assembler_;
  NonlinearSettings nonlinear_;
  double update_tolerance_;
  double linear_tolerance_;
  std::vector<double> difference_, product_;
  bool reuse_;
  std::unique_ptr<LinearSolver> linear_;
  bool direct_ = false, ready_ = false, kept_ = false, rebuild_next_ = false;
  int fresh_iterations_ = 0;
  std::uint64_t hash_ = 0;
  std::vector<double> matrix_key_;  // of the matrix in A_ when it is a linear step's, else empty
  CsrMatrix A_;
  std::vector<double> R_, delta_;
};

struct Level {
  double t = 0.0;
  std::vector<double> T;
};

// Value at t of the polynomial through the given levels (Lagrange form).
void extrapolate(const std::deque<Level>& levels, std::size_t count, double t, std::vector<double>& out) {
  const std::size_t first = levels.size() - count;
  out.assign(levels.back().T.size(), 0.0);
  for (std::size_t j = first; j < levels.size(); ++j) {
    double w = 1.0;
    for (std::size_t m = first; m < levels.size(); ++m)
      if (m != j) w *= (t - levels[m].t) / (levels[j].t - levels[m].t);
    const std::vector<double>& T = levels[j].T;
    for (std::size_t i = 0; i < out.size(); ++i) out[i] += w * T[i];
  }
}

double max_free_difference(const DofMap& dofs, const std::vector<double>& a, const std::vector<double>& b) {
  double d = 0.0;
  for (const std::int32_t node : dofs.free_nodes) d = std::max(d, std::abs(a[node] - b[node]));
  return d;
}

bool close_to(double a, double b, double scale) { return std::abs(a - b) <= 1e-9 * scale; }

}  // namespace

std::array<double, 3> bdf2_coefficients(double h, double h_previous) {
  const double w = h / h_previous;
  return {(1.0 + 2.0 * w) / ((1.0 + w) * h), -(1.0 + w) / h, w * w / ((1.0 + w) * h)};
}

TransientSolution solve_transient(const Mesh& mesh, const TransientProblem& problem, const std::vector<double>& initial,
                                  const TransientSettings& settings, const LinearSolverSettings& linear,
                                  const TransientCallbacks& callbacks) {
  auto say = [&](const std::string& line) {
    if (callbacks.progress) callbacks.progress(line);
  };
  const auto t_start = Clock::now();
  const double duration = settings.duration;
  TransientSolution solution;
  solution.energy.boundary.assign(mesh.boundaries.size(), 0.0);
  solution.temperature = initial;
  solution.initial_energy = stored_energy(mesh, problem.base, initial);

  // Every time a step must land on: output times, table rows, the end.
  std::vector<double> targets = settings.output_times;
  for (double t : problem.break_times)
    if (t > 0.0 && t < duration) targets.push_back(t);
  targets.push_back(duration);
  std::sort(targets.begin(), targets.end());
  targets.erase(std::unique(targets.begin(), targets.end(),
                            [&](double a, double b) { return close_to(a, b, duration); }),
                targets.end());
  auto is_output = [&](double t) {
    for (double o : settings.output_times)
      if (close_to(o, t, duration)) return true;
    return close_to(t, duration, duration);
  };
  auto is_step_time = [&](double t) {
    for (double s : problem.step_times)
      if (close_to(s, t, duration)) return true;
    return false;
  };

  StepSolver stepper(mesh, problem.base, linear, settings.nonlinear, std::min(1e-4, 1e-3 * settings.tolerance),
                     settings.reuse_linear_solver);
  solution.dofs = stepper.dofs().n_free();
  solution.linear_solver = stepper.solver_name();
  const auto neighbours = boundary_face_elements(mesh);
  const std::vector<double> volumes = region_volumes(mesh);

  std::deque<Level> levels{{0.0, initial}};
  std::vector<double> last_increment(mesh.boundaries.size(), 0.0);  // J per boundary, last step
  double last_source_increment = 0.0;
  double h = settings.initial_step, h_previous = 0.0;
  bool restart = true;
  double t = 0.0;
  const double min_step = settings.min_step_fraction * duration;
  std::vector<double> predicted, full, half;

  // The problem at time `time` with a step's capacity term.
  auto problem_at = [&](double time, const std::array<double, 3>& c, const std::vector<double>* T1,
                        const std::vector<double>* T2) {
    ThermalProblem p = problem.base;
    if (problem.at_time) problem.at_time(time, p);
    p.time_levels = TimeLevels{c, T1, T2};
    return p;
  };
  // Solves one step to `time` from the given levels; T holds the guess, then the result.
  auto take_step = [&](double time, const std::array<double, 3>& c, const std::vector<double>* T1,
                       const std::vector<double>* T2, std::vector<double>& T, StepOutcome& total) {
    const ThermalProblem p = problem_at(time, c, T1, T2);
    const StepOutcome o = stepper.solve(p, T);
    total.newton_iterations += o.newton_iterations;
    total.linear_iterations += o.linear_iterations;
    total.converged = o.converged;
    total.message = o.message;
    return o.converged;
  };
  int accepted = 0;
  // Accepts a new level: energy accounting with the scheme's own weights, callbacks.
  auto accept = [&](double time, double step, int order, const std::array<double, 3>& c,
                    const std::vector<double>* T1, const std::vector<double>* T2, std::vector<double> T,
                    const StepOutcome& outcome, double error, int rejected) {
    const ThermalProblem p = problem_at(time, c, T1, T2);
    StepState state;
    state.boundary_heat_rates = surface_heat_rates(mesh, p, T, neighbours);
    for (std::size_t r = 0; r < volumes.size(); ++r) state.source_rate += volumes[r] * p.regions[r].heat_source;
    // c0 D_{n+1} - c2 D_n = Q_{n+1}, D the stored change of a step: each boundary's share
    // of D follows the same recursion.
    for (std::size_t b = 0; b < last_increment.size(); ++b) {
      last_increment[b] = (state.boundary_heat_rates[b] + c[2] * last_increment[b]) / c[0];
      solution.energy.boundary[b] += last_increment[b];
    }
    last_source_increment = (state.source_rate + c[2] * last_source_increment) / c[0];
    solution.energy.sources += last_source_increment;
    const bool output = is_output(time);
    // The stored energy itself (a pass over the elements) only where it is reported; the
    // recursion above already keeps the balance.
    if (output) solution.energy.stored_change = stored_energy(mesh, p, T) - solution.initial_energy;
    levels.push_back({time, std::move(T)});
    while (levels.size() > 3) levels.pop_front();
    ++accepted;
    solution.steps = accepted;
    solution.time = time;
    solution.newton_iterations += outcome.newton_iterations;
    solution.linear_iterations += outcome.linear_iterations;
    if (accepted == 1) solution.first_step_seconds = seconds_since(t_start);
    state.step = accepted;
    state.time = time;
    state.step_size = step;
    state.order = order;
    state.newton_iterations = outcome.newton_iterations;
    state.linear_iterations = outcome.linear_iterations;
    state.error_estimate = error;
    state.rejected = rejected;
    state.output = output;
    state.temperature = &levels.back().T;
    state.problem = &p;
    state.energy = &solution.energy;
    if (callbacks.on_step) callbacks.on_step(state);
    if (state.output && callbacks.on_output) callbacks.on_output(state);
  };

  std::size_t next = 0;  // index of the next target
  int rejected_here = 0;
  while (next < targets.size()) {
    const double target = targets[next];
    // Land on the target exactly; stretch by up to 10 % rather than leave a sliver.
    double step = h;
    bool truncated = false;
    if (t + 1.1 * step >= target) {
      step = target - t;
      truncated = step < h;
    }
    const double t_new = (step == target - t) ? target : t + step;
    const bool bdf2 = settings.method == TimeMethod::bdf2 && !restart && levels.size() >= 2;
    const int order = bdf2 ? 2 : 1;
    StepOutcome outcome;
    double error = 0.0;
    bool ok = false;
    const std::vector<double>& Tn = levels.back().T;
    const std::array<double, 3> be{1.0 / step, -1.0 / step, 0.0};

    if (settings.adaptive && restart) {
      // Step doubling: one step of `step` against two of half of it.
      full = Tn;
      half = Tn;
      const std::array<double, 3> be_half{2.0 / step, -2.0 / step, 0.0};
      ok = take_step(t_new, be, &Tn, nullptr, full, outcome) &&
           take_step(t + 0.5 * step, be_half, &Tn, nullptr, half, outcome);
      std::vector<double> mid = half;
      ok = ok && take_step(t_new, be_half, &mid, nullptr, half, outcome);
      error = ok ? max_free_difference(stepper.dofs(), full, half) : 0.0;
      if (ok && error <= settings.tolerance) {
        accept(t + 0.5 * step, 0.5 * step, 1, be_half, &Tn, nullptr, mid, outcome, error, rejected_here);
        const std::vector<double> first_half = levels.back().T;
        StepOutcome none;
        accept(t_new, 0.5 * step, 1, be_half, &first_half, nullptr, half, none, error, rejected_here);
      }
    } else {
      const std::array<double, 3> c = bdf2 ? bdf2_coefficients(step, h_previous) : be;
      const std::size_t points = std::min<std::size_t>(levels.size(), order + 1);
      extrapolate(levels, points, t_new, predicted);
      full = predicted;
      const std::vector<double>* T2 = bdf2 ? &levels[levels.size() - 2].T : nullptr;
      ok = take_step(t_new, c, &Tn, T2, full, outcome);
      if (ok && settings.adaptive) {
        // Local error from corrector - predictor: backward Euler against the linear
        // predictor, h / (2h + h_prev) (variable-step Taylor expansion); BDF2 against the
        // quadratic predictor, 2/11 (constant-step error constants; the safety factor
        // below covers the change with the step ratio). With fewer levels than the
        // order needs, the whole difference is taken.
        const bool full_predictor = points == static_cast<std::size_t>(order + 1);
        const double constant =
            !full_predictor ? 1.0 : (order == 1 ? step / (2.0 * step + h_previous) : 2.0 / 11.0);
        error = constant * max_free_difference(stepper.dofs(), full, predicted);
      }
      if (ok && (!settings.adaptive || error <= settings.tolerance)) {
        std::vector<double> T1 = Tn;
        std::vector<double> T2copy = T2 ? *T2 : std::vector<double>();
        accept(t_new, step, order, c, &T1, T2 ? &T2copy : nullptr, full, outcome, error, rejected_here);
      }
    }

    if (!ok) {  // Newton (or the linear solve) failed: retry smaller
      ++solution.failed_steps;
      say(format("step to t = %.6g s failed (", t_new) + outcome.message + format("); retrying with %.3g s", step / 4));
      h = step / 4.0;
      if (h < min_step) {
        solution.failure = "the time step fell below " + format("%.3g s", min_step) + " at t = " +
                           format("%.6g s", t) + ": " + outcome.message;
        break;
      }
      continue;
    }
    const double exponent = 1.0 / (order + 1);
    if (settings.adaptive && error > settings.tolerance) {  // rejected: redo smaller
      ++solution.rejected_steps;
      ++rejected_here;
      h = step * std::max(settings.max_shrink, 0.9 * std::pow(settings.tolerance / error, exponent));
      if (h < min_step) {
        solution.failure = "the local error estimate stays above the tolerance down to a step of " +
                           format("%.3g s", min_step) + format(" at t = %.6g s", t) +
                           "; raise analysis.time_stepping.tolerance or check for steps in the loads";
        break;
      }
      continue;
    }
    rejected_here = 0;
    const double taken = t_new - t;
    t = t_new;
    h_previous = restart && settings.adaptive ? 0.5 * taken : taken;
    restart = false;
    if (close_to(t, target, duration)) ++next;
    if (is_step_time(t)) {  // a value jumps now: start again at first order from this level
      restart = true;
      levels.erase(levels.begin(), levels.end() - 1);
    }
    if (settings.adaptive) {
      double factor = error > 0 ? 0.9 * std::pow(settings.tolerance / error, exponent) : settings.max_growth;
      factor = std::min(settings.max_growth, factor);
      // Small changes are not worth a new matrix: keep the step unless it can grow by 20 %.
      if (factor >= 1.0 && factor < 1.2) factor = 1.0;
      h = truncated ? std::max(h, taken * factor) : taken * factor;
    } else {
      h = settings.initial_step;
    }
    say(format("t = %.6g s: step %.4g s (order %.0f), ", t, taken, order) +
        format("error %.3g K, %.0f Newton iterations", error, outcome.newton_iterations) +
        (outcome.linear_iterations ? format(", %.0f linear iterations", outcome.linear_iterations) : std::string()));
    if (callbacks.stop_requested && callbacks.stop_requested()) {
      solution.interrupted = true;
      break;
    }
  }
  solution.completed = !solution.interrupted && solution.failure.empty();
  solution.temperature = levels.back().T;
  solution.energy.stored_change = stored_energy(mesh, problem.base, solution.temperature) - solution.initial_energy;
  solution.preconditioner_setups = stepper.setups;
  solution.matrix_reuses = stepper.reuses;
  solution.assembly_seconds = stepper.assembly_seconds;
  solution.setup_seconds = stepper.setup_seconds;
  solution.solve_seconds = stepper.solve_seconds;
  solution.seconds = seconds_since(t_start);
  return solution;
}

}  // namespace hearth
