// hearth_bench: meshing, assembly and linear-solver figures on a unit box.
//
// The problem is the design's reference: unit conductivity, fixed temperature on one
// face, uniform source, relative residual 1e-8. For each size it prints nodes, elements,
// seconds for meshing, assembly, solver set-up and solve, iterations and the peak memory
// of assembly + solve per unknown, measured after handing freed memory back (Gmsh's own excluded).
//
//   hearth_bench [--order 1|2] [--sizes 0.05,0.03,...] [--solvers direct,iterative]
//                [--direct-limit N] [--repeat R] [--newton on] [--transient on]
//
// --transient on: heat-up of the box (rho c = 1e6 J/(m3 K)) from 0 K with the face at
// 100 K, 20 fixed steps of 50 s by BDF2, with the linear solver kept between steps
// and set up afresh at every step: seconds for the first step and per later step.
#include <omp.h>
#include <malloc.h>
#include <unistd.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstring>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "mesh/gmsh_mesher.hpp"
#include "solver/assembler.hpp"
#include "solver/dof_map.hpp"
#include "solver/linear_solver.hpp"
#include "solver/steady_solver.hpp"
#include "solver/transient_solver.hpp"

namespace {

using namespace hearth;
using Clock = std::chrono::steady_clock;

double seconds_since(Clock::time_point t0) { return std::chrono::duration<double>(Clock::now() - t0).count(); }

// Resident-set figures of this process, from /proc/self/status (kB -> bytes).
double status_bytes(const char* key) {
  std::ifstream in("/proc/self/status");
  std::string line;
  while (std::getline(in, line))
    if (line.rfind(key, 0) == 0) return std::stod(line.substr(std::strlen(key))) * 1024.0;
  return 0.0;
}

std::vector<double> parse_list(const std::string& s) {
  std::vector<double> v;
  std::stringstream in(s);
  std::string item;
  while (std::getline(in, item, ',')) v.push_back(std::stod(item));
  return v;
}

double median(std::vector<double> v) {
  std::sort(v.begin(), v.end());
  return v[v.size() / 2];
}

struct Measurement {
  bool ok = false;
  double assembly = 0, setup = 0, solve = 0, peak_bytes = 0;
  int iterations = 0;
};

// Assembly and solve in this process. Freed memory is handed back to the system and
// the peak counter reset first, so the peak (VmHWM minus the resident size at the
// start) is this measurement's own.
Measurement measure(const Mesh& mesh, const DofMap& dofs, const ThermalProblem& problem, bool direct) {
  malloc_trim(0);
  std::ofstream("/proc/self/clear_refs") << "5";
  Measurement m;
  const double baseline = status_bytes("VmRSS:");
  {
    const Assembler assembler(mesh, dofs);
    CsrMatrix A;
    std::vector<double> b;
    assembler.assemble(problem, A, b);  // first pass: allocates and touches the storage
    const auto t_assembly = Clock::now();
    assembler.assemble(problem, A, b);  // timed: re-assembly, as in Newton and time steps
    m.assembly = seconds_since(t_assembly);
    LinearSolverSettings settings;
    settings.kind = direct ? LinearSolverKind::direct : LinearSolverKind::iterative;
    settings.tolerance = 1e-8;
    auto linear = make_linear_solver(settings, dofs.n_free());
    linear->setup(A);
    std::vector<double> x(dofs.n_free(), 0.0);
    const LinearSolveReport report = linear->solve(b, x);
    m.setup = report.setup_seconds;
    m.solve = report.solve_seconds;
    m.iterations = report.iterations;
    m.peak_bytes = status_bytes("VmHWM:") - baseline;
    m.ok = report.converged();
  }
  return m;
}

}  // namespace

int main(int argc, char** argv) {
  int order = 1, repeat = 3;
  std::vector<double> sizes = {0.08, 0.05, 0.03, 0.02, 0.0135};
  std::vector<std::string> solvers = {"direct", "iterative"};
  std::int64_t direct_limit = 250000;
  bool newton = false, transient = false;
  for (int i = 1; i + 1 < argc; i += 2) {
    const std::string key = argv[i], value = argv[i + 1];
    if (key == "--order") order = std::stoi(value);
    else if (key == "--sizes") sizes = parse_list(value);
    else if (key == "--repeat") repeat = std::stoi(value);
    else if (key == "--direct-limit") direct_limit = std::stoll(value);
    else if (key == "--newton") newton = value == "on";
    else if (key == "--transient") transient = value == "on";
    else if (key == "--solvers") {
      solvers.clear();
      std::stringstream in(value);
      std::string item;
      while (std::getline(in, item, ',')) solvers.push_back(item);
    } else {
      std::fprintf(stderr, "hearth_bench: unknown option %s\n", key.c_str());
      return 1;
    }
  }
  const std::string script = std::string("/tmp/hearth_bench_box_") + std::to_string(::getpid()) + ".geo";
  std::ofstream(script) << "SetFactory(\"OpenCASCADE\");\nBox(1) = {0, 0, 0, 1, 1, 1};\n"
                           "Physical Volume(\"box\") = {1};\nPhysical Surface(\"fixed\") = {1};\n";
  std::printf("hearth_bench: unit box, k = 1, T fixed on x = 0, uniform source, relative residual 1e-8, "
              "P%d, %d threads, medians of %d\n",
              order, omp_get_max_threads(), repeat);
  std::printf("%8s %9s %9s %8s %8s | %-14s %8s %8s %8s %6s %10s\n", "size", "nodes", "elements", "mesh_s",
              "assem_s", "solver", "setup_s", "solve_s", "total_s", "iters", "peak_B/dof");
  for (const double size : sizes) {
    MeshRequest request;
    request.geometry_file = script;
    request.size = size;
    request.order = order;
    const auto t_mesh = Clock::now();
    const Mesh mesh = build_mesh(request);
    const double mesh_seconds = seconds_since(t_mesh);

    ThermalProblem problem;
    problem.regions = {RegionProperties{"unit", 1.0, 1.0, std::nullopt}};
    problem.boundaries.resize(mesh.boundaries.size());
    problem.boundaries[0].temperature = 0.0;
    if (newton) {
      // Nonlinear figures: the same box with k(T) = 1 + T/1000 (T in K, a table) and the
      // source raised so that k varies by half, against the linear problem on the same mesh.
      ThermalProblem nonlinear = problem;
      nonlinear.regions[0].conductivity = Conductivity::isotropic(PiecewiseLinear({0.0, 3000.0}, {1.0, 4.0}));
      nonlinear.boundaries[0].temperature = 300.0;
      nonlinear.regions[0].heat_source = 2000.0;  // about 600 K of rise: k changes by half
      LinearSolverSettings settings;
      settings.tolerance = 1e-8;
      const auto t_linear = Clock::now();
      const SteadySolution lin = solve_steady(mesh, problem, settings);
      const double linear_seconds = seconds_since(t_linear);
      const auto t_newton = Clock::now();
      const SteadySolution non = solve_steady(mesh, nonlinear, settings);
      const double newton_seconds = seconds_since(t_newton);
      std::printf("%8.4f %9zu %9zu %8.2f | linear %s %.2f s (%d iterations) | k(T) Newton: %d steps, %s, %d linear "
                  "iterations in all, %.2f s (%.1f x the linear solve)%s\n",
                  size, mesh.n_nodes(), mesh.n_tets(), mesh_seconds, lin.linear.solver.c_str(), linear_seconds,
                  lin.linear_iterations, non.nonlinear_iterations, non.linear.solver.c_str(), non.linear_iterations,
                  newton_seconds, newton_seconds / linear_seconds, non.converged() ? "" : " NOT CONVERGED");
      std::fflush(stdout);
      continue;
    }
    if (transient) {
      TransientProblem heat_up;
      heat_up.base = problem;
      heat_up.base.boundaries[0].temperature = 100.0;
      heat_up.base.regions[0].heat_source = 0.0;
      heat_up.base.regions[0].capacity = HeatCapacity(PiecewiseLinear(1000.0), PiecewiseLinear(1000.0));
      for (const bool reuse : {true, false}) {
        TransientSettings ts;
        ts.duration = 1000.0;
        ts.initial_step = 50.0;
        ts.adaptive = false;
        ts.output_times = {1000.0};
        ts.reuse_linear_solver = reuse;
        LinearSolverSettings settings;
        settings.tolerance = 1e-8;
        const TransientSolution run =
            solve_transient(mesh, heat_up, std::vector<double>(mesh.n_nodes(), 0.0), ts, settings);
        const double later = (run.seconds - run.first_step_seconds) / std::max(1, run.steps - 1);
        std::printf("%8.4f %9zu %9zu %8.2f | transient %s, %s: %d steps, first %.2f s, later %.3f s a step "
                    "(%.2f x), total %.2f s, %d set-ups, %d reuses, %d linear iterations%s\n",
                    size, mesh.n_nodes(), mesh.n_tets(), mesh_seconds, run.linear_solver.c_str(),
                    reuse ? "solver kept" : "solver set up every step", run.steps, run.first_step_seconds, later,
                    later / run.first_step_seconds, run.seconds, run.preconditioner_setups, run.matrix_reuses,
                    run.linear_iterations, run.completed ? "" : " NOT COMPLETED");
        std::fflush(stdout);
      }
      continue;
    }
    for (const auto& name : solvers) {
      const bool direct = name == "direct";
      const DofMap dofs = make_dof_map(mesh, problem);
      if (direct && dofs.n_free() > direct_limit) {
        std::printf("%8.4f %9zu %9zu %8.2f %8s | %-14s (skipped: %d unknowns > --direct-limit)\n", size, mesh.n_nodes(),
                    mesh.n_tets(), mesh_seconds, "", "cholmod", dofs.n_free());
        continue;
      }
      std::vector<double> assembly, setup, solve, peak;
      int iterations = 0;
      for (int r = 0; r < repeat; ++r) {
        const Measurement m = measure(mesh, dofs, problem, direct);
        if (!m.ok) {
          std::printf("%8.4f %9zu %9zu %8.2f | %s failed (out of memory?)\n", size, mesh.n_nodes(), mesh.n_tets(),
                      mesh_seconds, name.c_str());
          break;
        }
        assembly.push_back(m.assembly);
        setup.push_back(m.setup);
        solve.push_back(m.solve);
        peak.push_back(m.peak_bytes / dofs.n_free());
        iterations = m.iterations;
      }
      if (assembly.empty()) continue;
      const std::string solver_name = direct ? "cholmod" : "boomeramg-pcg";
      std::printf("%8.4f %9zu %9zu %8.2f %8.3f | %-14s %8.2f %8.2f %8.2f %6d %10.0f\n", size, mesh.n_nodes(),
                  mesh.n_tets(), mesh_seconds, median(assembly), solver_name.c_str(), median(setup), median(solve),
                  median(setup) + median(solve), iterations, median(peak));
      std::fflush(stdout);
    }
  }
  std::remove(script.c_str());
  return 0;
}
