// hearth_bench: meshing, assembly and linear-solver figures on a ladder of meshes.
//
// Two geometries (tools/bench/bench_geometry.hpp): the unit box of the reference
// figures (k = 1, T fixed on one face, uniform source) and a layered lining panel of our
// own with a steel anchor through it (conductivity contrast 1000). For each element size
// it meshes the geometry, assembles the linear steady problem and solves it to relative
// residual 1e-8, and prints one row: unknowns, nodes, elements, seconds for meshing,
// re-assembly, solver set-up and solve, iterations, the peak memory of assembly + solve
// (measured after handing freed memory back; Gmsh's own excluded) and per unknown, and a
// reference column: the same matrix solved by raw hypre calls with the same multigrid
// settings, and hearth's solver time over it. Medians of --repeat runs.
//
//   hearth_bench [--geometry box|lining] [--order 1|2] [--sizes 0.02,0.01,...]
//                [--solvers direct,iterative] [--direct-limit N] [--repeat R]
//                [--reference on|off] [--json] [--newton on] [--transient on]
//                [--progress on]
//
// --json: the figures as one JSON document on stdout instead of the table.
// --newton on (box): k(T) Newton solve against the linear one on the same mesh;
// --progress on prints its Newton steps (residual, Krylov iterations, seconds) to stderr.
// --transient on (box): heat-up of the box (rho c = 1e6 J/(m3 K)) from 0 K with the
// face at 100 K, 20 fixed steps of 50 s by BDF2, with the linear solver kept between
// steps and set up afresh at every step: seconds for the first step and per later step.
#include <omp.h>
#include <malloc.h>
#include <unistd.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstring>
#include <fstream>
#include <sstream>
#include <stdexcept>
#include <string>
#include <vector>

#include "mesh/gmsh_mesher.hpp"
#include "solver/assembler.hpp"
#include "solver/dof_map.hpp"
#include "solver/linear_solver.hpp"
#include "solver/solve_memory.hpp"
#include "solver/steady_solver.hpp"
#include "solver/transient_solver.hpp"
#include "tools/bench/bench_geometry.hpp"
#include "tools/bench/bench_table.hpp"
#include "tools/bench/raw_hypre_reference.hpp"

namespace {

using namespace hearth;
using namespace hearth::bench;
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

std::vector<std::string> split(const std::string& s) {
  std::vector<std::string> items;
  std::stringstream in(s);
  std::string item;
  while (std::getline(in, item, ',')) items.push_back(item);
  return items;
}

double median(std::vector<double> v) {
  std::sort(v.begin(), v.end());
  return v[v.size() / 2];
}

constexpr double tolerance = 1e-8;

struct Measurement {
  bool ok = false;
  double assembly = 0, setup = 0, solve = 0, peak_bytes = 0;
  int iterations = 0;
  bool reference = false;
  ReferenceSolve raw;
};

// Assembly and solve in this process. Freed memory is handed back to the system and
// the peak counter reset first, so the peak (VmHWM minus the resident size at the
// start) is this measurement's own; it is read before the reference solve.
Measurement measure(const Mesh& mesh, const DofMap& dofs, const ThermalProblem& problem, bool direct,
                    bool reference) {
  malloc_trim(0);
  std::ofstream("/proc/self/clear_refs") << "5";
  Measurement m;
  const double baseline = status_bytes("VmRSS:");
  const Assembler assembler(mesh, dofs);
  CsrMatrix A;
  std::vector<double> b;
  assembler.assemble(problem, A, b);  // first pass: allocates and touches the storage
  const auto t_assembly = Clock::now();
  assembler.assemble(problem, A, b);  // timed: re-assembly, as in Newton and time steps
  m.assembly = seconds_since(t_assembly);
  LinearSolverSettings settings;
  settings.kind = direct ? LinearSolverKind::direct : LinearSolverKind::iterative;
  settings.tolerance = tolerance;
  {
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
  if (reference && !direct) {
    malloc_trim(0);  // the reference starts as cold as hearth's solver did
    m.raw = solve_with_raw_hypre(A, b, tolerance);
    m.reference = true;
  }
  return m;
}

BenchRow measure_row(const Mesh& mesh, const ThermalProblem& problem, const std::string& solver, int order,
                     int repeat, std::int64_t direct_limit, bool reference) {
  const bool direct = solver == "direct";
  const DofMap dofs = make_dof_map(mesh, problem);
  BenchRow row;
  row.nodes = mesh.n_nodes();
  row.elements = mesh.n_tets();
  row.unknowns = dofs.n_free();
  row.solver = direct ? "cholmod" : "boomeramg-pcg";
  if (direct && row.unknowns > direct_limit) {
    row.note = "skipped: more unknowns than --direct-limit " + std::to_string(direct_limit);
    return row;
  }
  LinearSolverSettings settings;
  settings.kind = direct ? LinearSolverKind::direct : LinearSolverKind::iterative;
  row.estimated_bytes = estimate_solve_memory(row.unknowns, order, settings, true).bytes;
  std::vector<double> assembly, setup, solve, peak, raw_setup, raw_solve;
  for (int r = 0; r < repeat; ++r) {
    const Measurement m = measure(mesh, dofs, problem, direct, reference);
    if (!m.ok) {
      row.note = "failed: the solve did not converge (or ran out of memory)";
      return row;
    }
    assembly.push_back(m.assembly);
    setup.push_back(m.setup);
    solve.push_back(m.solve);
    peak.push_back(m.peak_bytes);
    row.iterations = m.iterations;
    if (m.reference) {
      raw_setup.push_back(m.raw.setup_seconds);
      raw_solve.push_back(m.raw.solve_seconds);
      row.reference_iterations = m.raw.iterations;
    }
  }
  row.assembly_seconds = median(assembly);
  row.setup_seconds = median(setup);
  row.solve_seconds = median(solve);
  row.peak_bytes = median(peak);
  row.reference = !raw_setup.empty();
  if (row.reference) {
    row.reference_setup_seconds = median(raw_setup);
    row.reference_solve_seconds = median(raw_solve);
  }
  return row;
}

}  // namespace

int main(int argc, char** argv) {
  int order = 1, repeat = 3;
  std::string geometry_name = "box";
  std::vector<double> sizes;
  std::vector<std::string> solvers = {"iterative"};
  std::int64_t direct_limit = 250000;
  bool newton = false, transient = false, reference = true, json = false, progress = false;
  for (int i = 1; i < argc; ++i) {
    const std::string key = argv[i];
    if (key == "--json") {
      json = true;
      continue;
    }
    if (i + 1 >= argc) {
      std::fprintf(stderr, "hearth_bench: %s needs a value\n", key.c_str());
      return 1;
    }
    const std::string value = argv[++i];
    if (key == "--order") order = std::stoi(value);
    else if (key == "--geometry") geometry_name = value;
    else if (key == "--sizes") {
      for (const std::string& item : split(value)) sizes.push_back(std::stod(item));
    } else if (key == "--repeat") repeat = std::max(1, std::stoi(value));
    else if (key == "--direct-limit") direct_limit = std::stoll(value);
    else if (key == "--newton") newton = value == "on";
    else if (key == "--transient") transient = value == "on";
    else if (key == "--progress") progress = value == "on";
    else if (key == "--reference") reference = value == "on";
    else if (key == "--solvers") solvers = split(value);
    else {
      std::fprintf(stderr, "hearth_bench: unknown option %s\n", key.c_str());
      return 1;
    }
  }
  BenchGeometry geometry;
  try {
    geometry = bench_geometry(geometry_name);
  } catch (const std::invalid_argument& e) {
    std::fprintf(stderr, "hearth_bench: %s\n", e.what());
    return 1;
  }
  if ((newton || transient) && geometry.name != "box") {
    std::fprintf(stderr, "hearth_bench: --newton and --transient run on --geometry box\n");
    return 1;
  }
  if (sizes.empty()) sizes = order == 2 ? geometry.p2_sizes : geometry.p1_sizes;
  const std::string script =
      "/tmp/hearth_bench_" + geometry.name + "_" + std::to_string(::getpid()) + ".geo";
  std::ofstream(script) << geometry.script;

  BenchRun run;
  run.geometry = geometry.name;
  run.description = geometry.description;
  run.order = order;
  run.threads = omp_get_max_threads();
  run.repeat = repeat;
  run.tolerance = tolerance;
  if (!json && !newton && !transient) print_heading(run);
  for (const double size : sizes) {
    MeshRequest request;
    request.geometry_file = script;
    request.size = size;
    request.order = order;
    request.trust_geometry = true;  // our own script
    if (order == 2 && geometry.curved_region_size > 0.0 && size > geometry.curved_region_size)
      request.local_sizes[geometry.curved_region] = geometry.curved_region_size;
    const auto t_mesh = Clock::now();
    Mesh mesh;
    try {
      mesh = build_mesh(request);
    } catch (const std::exception& e) {
      BenchRow row;
      row.size = size;
      row.solver = "-";
      row.note = std::string("failed: meshing: ") + e.what();
      run.rows.push_back(row);
      if (!json) print_row(row);
      continue;
    }
    const double mesh_seconds = seconds_since(t_mesh);
    const ThermalProblem problem = bench_problem(geometry, mesh);

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
      const SteadySolution non = solve_steady(mesh, nonlinear, settings, [&](const std::string& line) {
        if (progress) std::fprintf(stderr, "  %6.2f s  %s\n", seconds_since(t_newton), line.c_str());
      });
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
        const TransientSolution heat =
            solve_transient(mesh, heat_up, std::vector<double>(mesh.n_nodes(), 0.0), ts, settings);
        const double later = (heat.seconds - heat.first_step_seconds) / std::max(1, heat.steps - 1);
        std::printf("%8.4f %9zu %9zu %8.2f | transient %s, %s: %d steps, first %.2f s, later %.3f s a step "
                    "(%.2f x), total %.2f s (assembly %.2f s, set-up %.2f s, solve %.2f s), %d set-ups, %d reuses, "
                    "%d linear iterations%s\n",
                    size, mesh.n_nodes(), mesh.n_tets(), mesh_seconds, heat.linear_solver.c_str(),
                    reuse ? "solver kept" : "solver set up every step", heat.steps, heat.first_step_seconds, later,
                    later / heat.first_step_seconds, heat.seconds, heat.assembly_seconds, heat.setup_seconds,
                    heat.solve_seconds, heat.preconditioner_setups, heat.matrix_reuses,
                    heat.linear_iterations, heat.completed ? "" : " NOT COMPLETED");
        std::fflush(stdout);
      }
      continue;
    }
    for (const std::string& solver : solvers) {
      BenchRow row = measure_row(mesh, problem, solver, order, repeat, direct_limit, reference);
      row.size = size;
      row.mesh_seconds = mesh_seconds;
      run.rows.push_back(row);
      if (!json) print_row(row);
    }
  }
  std::remove(script.c_str());
  if (json) std::printf("%s\n", to_json(run).c_str());
  else print_footer(run);
  return 0;
}
