// hearth run: read, mesh, solve, post-process, write; results staged then swapped in.
#include <omp.h>

#include <cstdio>
#include <future>
#include <optional>
#include <iostream>

#include "io/input_error.hpp"
#include "io/inputs_json.hpp"
#include "io/summary_json.hpp"
#include "io/surface_writer.hpp"
#include "io/vtu_writer.hpp"
#include "mesh/body_surface.hpp"
#include "solver/post_processing.hpp"
#include "solver/steady_solver.hpp"
#include "tools/driver/case_mesh_checks.hpp"
#include "tools/driver/commands.hpp"
#include "tools/driver/errors.hpp"
#include "tools/driver/memory_check.hpp"
#include "tools/driver/output_directory.hpp"
#include "tools/driver/output_lock.hpp"
#include "tools/driver/solve_failure.hpp"
#include "tools/driver/split_mesh.hpp"
#include "tools/driver/report.hpp"
#include "tools/driver/transient_run.hpp"
#include "tools/driver/virtual_display.hpp"

namespace hearth {

namespace {

void write_results(const Case& c, const Mesh& mesh, const std::vector<double>& temperature, const RunRecord& record,
                   const std::vector<std::vector<LineSample>>& lines, const std::filesystem::path& dir,
                   const char* vtu_name, const CommonOptions& options, double elapsed_seconds) {
  const VtkEncoding encoding = vtk_encoding(c.output_compression, options.ascii);
  VtuFields fields;
  fields.temperature = &temperature;
  fields.nodal_flux = &record.results.nodal_flux;
  fields.cell_flux = &record.results.cell_flux;
  fields.title = c.title;
  // The body's surface is found on a second thread while the volume file is written
  // (VTK compresses and writes on one): 1.3 s of a million-node run out of the way.
  std::future<BodySurface> surface = std::async(std::launch::async, [&mesh] { return body_surface(mesh); });
  write_vtu(dir / vtu_name, mesh, c.units, fields, encoding);
  write_surface_vtp(dir / "surface.vtp", mesh, surface.get(), c.units,
                    {&temperature, &record.results.nodal_flux, c.title}, encoding);
  write_summary(dir / "inputs.json", inputs_json(c));
  for (std::size_t l = 0; l < lines.size(); ++l)
    write_line_csv(dir / ("line_" + c.lines[l].name + ".csv"), lines[l], c.units);
  if (!record.probes.empty()) {
    std::vector<std::string> names;
    std::vector<double> values;
    for (const auto& p : record.probes) {
      names.push_back(p.name);
      values.push_back(p.temperature);
    }
    write_probes_csv(dir / "probes.csv", names, {{0.0, values}}, c.units);
  }
  write_summary(dir / "run.json", run_provenance(c, options, record.seconds, elapsed_seconds));
  const auto summary = summary_json(record, c.units);
  write_summary(dir / "summary.json", summary);  // last: its presence marks a whole result
  if (options.summary_only) std::cout << summary.dump(2) << std::endl;
}

}  // namespace

int run_command(const CommonOptions& options) {
  install_interrupt_handlers();
  const Progress progress(options.quiet);
  const Case c = load_case(options, progress);
  const std::filesystem::path out = output_directory(c, options);
  const bool report = c.output_report && options.report_allowed;
  if (std::string why_not; report && !display_possible(why_not))
    throw ReportUnavailable("output.report is true, but " + why_not + "; or set output.report: false");
  const OutputLock lock(out, options.command_line);  // one hearth at a time per folder
  if (c.analysis_type == "transient") return run_transient(options, c, out, progress);
  const Mesh mesh = options.base_mesh.empty() ? mesh_case(c, options.threads, progress, options.trust_geometry)
                                              : split_base_mesh(c, options.base_mesh, progress);
  check_names_against_mesh(c, mesh);
  check_interrupt("after meshing; nothing was written");
  const ThermalProblem problem = make_problem(c, mesh);
  check_determined(c, mesh, problem);
  // One locator for probes and lines; a probe, or a line, outside the body is an error before the solve.
  std::optional<PointLocator> locator;
  if (!c.probes.empty() || !c.lines.empty()) locator.emplace(mesh, sampled_points(c));
  if (locator) check_probes_and_lines(c, mesh, *locator);

  check_solve_memory(c, mesh, problem);  // refuse what the machine cannot hold, before assembling
  RunRecord record = start_record(c, mesh);
  record.warnings = c.warnings;  // from reading the case (e.g. axes made orthogonal)
  SteadySolution solution;
  solution = solve_steady(mesh, problem, linear_settings(c), [&](const std::string& s) { progress.say(s); },
                          nonlinear_settings(c));
  check_interrupt("after the solve; nothing was written");
  record.dofs = solution.dofs;
  record.linear_solver = solution.linear.solver;
  record.linear_iterations = solution.linear_iterations;
  record.nonlinear_iterations = solution.nonlinear_iterations;
  record.linear_relative_residual = solution.linear.relative_residual;
  if (solution.nonlinear_iterations > 0) record.nonlinear_relative_residual = solution.nonlinear_relative_residual;
  record.seconds = solution.seconds;
  record.converged = solution.converged();
  record.failure = solution.nonlinear_message.empty() ? solution.linear.message : solution.nonlinear_message;
  record.boundary_conditions = describe_conditions(mesh, problem);
  if (record.linear_solver == "cholmod" && record.blas.find("OpenBLAS") == std::string::npos)
    record.warnings.push_back("the direct solver runs on a slow BLAS (" + record.blas +
                              "); install Debian's libopenblas0-pthread for a several times faster factorisation");

  record.results = post_process(mesh, problem, solution.temperature);
  std::vector<std::vector<LineSample>> lines;
  if (locator) {
    record.probes = sample_probes(c, *locator, solution.temperature);
    lines = sample_lines(c, *locator, solution.temperature, record.warnings);
  }
  record.service = service_checks(c, mesh, problem, solution.temperature, record.warnings);
  record.touch = touch_checks(c, mesh, record.results, record.warnings);
  const auto insulated = insulated_boundaries(c, mesh);
  progress.say("post-processed heat rates, balance, probes and lines");

  StagedDirectory staged(out);
  staged.fill([&](const std::filesystem::path& dir) {
    write_results(c, mesh, solution.temperature, record, lines, dir,
                  record.converged ? "temperature.vtu" : "temperature_unconverged.vtu", options, progress.elapsed());
  });
  check_interrupt("before results were put in place; the previous results are unchanged");
  staged.commit();
  if (!options.quiet) print_human_summary(c, record, insulated, out);
  else if (options.warnings_to_terminal)
    for (const auto& w : record.warnings) progress.always("warning: " + w);
  const int report_status = report ? report_after_run(out, c, progress) : exit_done;
  if (!record.converged) throw SolveFailed(solve_failure_message(c, solution, out));
  return report_status;
}

}  // namespace hearth
