// Table and JSON forms of the benchmark's figures.
#include "tools/bench/bench_table.hpp"

#include <cmath>
#include <cstdio>

#include <nlohmann/json.hpp>

namespace hearth::bench {

namespace {

std::vector<const BenchRow*> multigrid_rows(const BenchRun& run) {
  std::vector<const BenchRow*> rows;
  for (const BenchRow& row : run.rows)
    if (row.solver == "boomeramg-pcg" && row.note.empty()) rows.push_back(&row);
  return rows;
}

}  // namespace

double iteration_growth(const BenchRun& run) {
  const auto rows = multigrid_rows(run);
  if (rows.size() < 2 || rows.front()->iterations == 0) return 0.0;
  return double(rows.back()->iterations) / rows.front()->iterations;
}

double cost_exponent(const BenchRun& run) {
  const auto rows = multigrid_rows(run);
  if (rows.size() < 2 || rows.back()->unknowns == rows.front()->unknowns) return 0.0;
  const double cost_first = rows.front()->assembly_seconds + rows.front()->solver_seconds();
  const double cost_last = rows.back()->assembly_seconds + rows.back()->solver_seconds();
  return std::log(cost_last / cost_first) / std::log(double(rows.back()->unknowns) / rows.front()->unknowns);
}

void print_heading(const BenchRun& run) {
  std::printf("hearth_bench: %s; P%d, %d threads, relative residual %.0e, medians of %d\n", run.description.c_str(),
              run.order, run.threads, run.tolerance, run.repeat);
  std::printf("%8s %9s %9s %9s %7s %7s | %-13s %7s %7s %5s %7s %6s | %-17s %5s %6s\n", "size_m", "unknowns",
              "nodes", "elements", "mesh_s", "assem_s", "solver", "setup_s", "solve_s", "iters", "peak_MB", "B/dof",
              "raw_hypre_s", "iters", "ratio");
}

void print_row(const BenchRow& r) {
  std::printf("%8.4f %9lld %9zu %9zu %7.2f", r.size, static_cast<long long>(r.unknowns), r.nodes, r.elements,
              r.mesh_seconds);
  if (!r.note.empty()) {
    std::printf(" %7s | %-13s (%s)\n", "", r.solver.c_str(), r.note.c_str());
  } else {
    std::printf(" %7.3f | %-13s %7.2f %7.2f %5d %7.0f %6.0f |", r.assembly_seconds, r.solver.c_str(),
                r.setup_seconds, r.solve_seconds, r.iterations, r.peak_bytes / 1e6, r.peak_bytes / r.unknowns);
    if (r.reference)
      std::printf(" %5.2f + %5.2f = %5.2f %5d %6.2f\n", r.reference_setup_seconds, r.reference_solve_seconds,
                  r.reference_seconds(), r.reference_iterations, r.solver_seconds() / r.reference_seconds());
    else
      std::printf(" %-17s\n", "-");
  }
  std::fflush(stdout);
}

void print_footer(const BenchRun& run) {
  const double growth = iteration_growth(run), exponent = cost_exponent(run);
  if (growth > 0.0)
    std::printf("multigrid iterations grow %.2fx over the ladder; assembly + solve cost grows as N^%.2f\n", growth,
                exponent);
}

std::string to_json(const BenchRun& run) {
  nlohmann::json rows = nlohmann::json::array();
  for (const BenchRow& r : run.rows) {
    nlohmann::json row = {{"size_m", r.size},
                          {"unknowns", r.unknowns},
                          {"nodes", r.nodes},
                          {"elements", r.elements},
                          {"mesh_seconds", r.mesh_seconds},
                          {"solver", r.solver}};
    if (!r.note.empty()) {
      row["note"] = r.note;
    } else {
      row["assembly_seconds"] = r.assembly_seconds;
      row["setup_seconds"] = r.setup_seconds;
      row["solve_seconds"] = r.solve_seconds;
      row["iterations"] = r.iterations;
      row["peak_bytes"] = r.peak_bytes;
      row["bytes_per_unknown"] = r.peak_bytes / r.unknowns;
      row["estimated_bytes"] = r.estimated_bytes;
      if (r.reference)
        row["raw_hypre"] = {{"setup_seconds", r.reference_setup_seconds},
                            {"solve_seconds", r.reference_solve_seconds},
                            {"iterations", r.reference_iterations},
                            {"ratio", r.solver_seconds() / r.reference_seconds()}};
    }
    rows.push_back(row);
  }
  const nlohmann::json document = {{"geometry", run.geometry},
                                   {"description", run.description},
                                   {"order", run.order},
                                   {"threads", run.threads},
                                   {"repeat", run.repeat},
                                   {"relative_residual", run.tolerance},
                                   {"rows", rows},
                                   {"iteration_growth", iteration_growth(run)},
                                   {"cost_exponent", cost_exponent(run)}};
  return document.dump(2);
}

}  // namespace hearth::bench
