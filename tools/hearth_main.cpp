// hearth: command-line entry. Parses arguments, dispatches to a command, and maps
// outcomes to exit statuses: 0 done, 1 bad input (or results that cannot be written),
// 2 solve failed, 3 internal error, 130/143 interrupted.
#include <CLI/CLI.hpp>
#include <omp.h>

#include <cstdio>
#include <exception>

#include "io/input_error.hpp"
#include "io/write_error.hpp"
#include "mesh/mesh_error.hpp"
#include "tools/driver/commands.hpp"
#include "tools/driver/errors.hpp"
#include "tools/driver/mesh_worker.hpp"

#ifndef HEARTH_VERSION
#define HEARTH_VERSION "unknown"
#endif

namespace {

void add_common(CLI::App* command, hearth::CommonOptions& options, bool with_out, bool with_run_flags) {
  command->add_option("CASE", options.case_path, "case file (YAML)")->required();
  command->add_option("--set", options.sets,
                      "override a value by its dotted path, e.g. mesh.size=0.01 or "
                      "boundaries.cold_face.convection.coefficient=8; lists as [a, b], tables as "
                      "{vs_temperature: [[T, v], ...]}")
      ->type_name("KEY=VALUE")
      ->take_all()
      ->allow_extra_args(false);
  command->add_option("--threads", options.threads, "threads for assembly and post-processing (default: all cores; meshes under 50 000 elements use one) and meshing (default: 2)")
      ->check(CLI::Range(1, 4096));
  command->add_flag("--quiet", options.quiet, "no progress lines; warnings and errors only");
  command->add_flag("--trust-geometry", options.trust_geometry,
                    "hand the geometry script to Gmsh unchecked and outside the sandbox, even if it runs programs or "
                    "writes files (only for scripts you trust)");
  if (with_out) command->add_option("--out", options.out, "output folder (default: output.directory of the case)");
  if (with_run_flags) {
    command->add_flag("--summary-only", options.summary_only, "also print summary.json to stdout");
    command->add_flag("--ascii", options.ascii, "write the VTK files (temperature.vtu, surface.vtp) as ASCII XML, "
                                                "for reading by eye; larger and slower");
  }
}

}  // namespace

int main(int argc, char** argv) {
  // The meshing process the driver starts (tools/driver/mesh_worker.hpp); not for users.
  if (argc >= 4 && std::string(argv[1]) == hearth::mesh_worker_verb)
    return hearth::mesh_worker_command(argv[2], argv[3], argc >= 5 && std::string(argv[4]) == "--quiet");
  CLI::App app{"hearth " HEARTH_VERSION
               ": steady heat conduction in 3D solids by finite elements.\n"
               "Results are engineering estimates: have them checked by a qualified person against local codes "
               "and practice."};
  app.set_version_flag("--version", "hearth " HEARTH_VERSION);
  app.require_subcommand(1);
  hearth::CommonOptions options;
  auto* run = app.add_subcommand("run", "mesh and solve a case; write temperature.vtu, surface.vtp, summary.json, CSV "
                                        "files (and the report with output.report)");
  add_common(run, options, true, true);
  // Used by hearth study for the levels it makes by splitting one mesh; not for users.
  run->add_option("--base-mesh", options.base_mesh, "")->group("");
  // Used by hearth study for its levels: the study makes one report at the end.
  bool no_report = false;
  run->add_flag("--no-report", no_report, "")->group("");
  run->callback([&] { options.report_allowed = !no_report; });
  auto* check = app.add_subcommand("check", "validate the case and its mesh, list names and counts; no solve");
  add_common(check, options, false, false);
  auto* mesh = app.add_subcommand("mesh", "mesh only: mesh.vtu with region and quality, mesh.json");
  add_common(mesh, options, true, false);
  auto* materials = app.add_subcommand(
      "materials", "list the shipped material library: each entry's properties and source, and where the file is");

  hearth::StudyOptions study_options;
  auto* study = app.add_subcommand("study", "mesh-convergence study: the case on a sequence of meshes, coarse to fine, "
                                            "with observed order, extrapolated value and GCI of every quantity");
  add_common(study, options, true, false);
  study->add_option("--levels", study_options.levels, "number of meshes (default 3; 3 or more for an order)")
      ->check(CLI::Range(2, 12));
  study->add_option("--ratio", study_options.ratio,
                    "mesh.size divided by this from level to level (default 1.5); 2 splits every element of one "
                    "mesh into eight instead, so that the levels are nested");
  study->add_option("--sizes", study_options.sizes, "explicit mesh sizes instead of --levels/--ratio, e.g. 0.04,0.03,0.02")
      ->delimiter(',');
  study->add_option("--quantity", study_options.quantities,
                    "also follow this number of summary.json, as a dotted path (e.g. probes.tip.temperature)");
  study->add_option("--order", study_options.orders,
                    "element orders to study and compare, e.g. 1,2 (default: mesh.order of the case)")
      ->delimiter(',')
      ->check(CLI::IsMember({1, 2}));
  study->add_option("--jobs", study_options.jobs,
                    "levels solved at the same time, as memory allows (default 1); each gets its share of the cores")
      ->check(CLI::Range(1, 64));

  hearth::ReportOptions report_options;
  auto* report = app.add_subcommand("report", "pictures, plots and report.html for a finished run or study, written "
                                              "into its folder (renders off screen; starts Xvfb when no display is set)");
  report->add_option("RESULTS_DIR", report_options.results_dir, "results folder of hearth run or hearth study")
      ->required();
  report->add_flag("--mesh-edges", report_options.mesh_edges, "draw the element edges on the surface pictures");
  report->add_flag("--quiet", report_options.quiet, "no progress lines; warnings and errors only");

  // CLI11 answers an unknown command with "A subcommand is required": name it instead.
  if (argc >= 2 && argv[1][0] != '-') {
    std::string commands;
    bool known = false;
    for (const CLI::App* sub : app.get_subcommands([](CLI::App*) { return true; })) {
      known |= sub->get_name() == argv[1];
      commands += (commands.empty() ? "" : ", ") + sub->get_name();
    }
    if (!known) {
      std::fprintf(stderr, "error: '%s' is not a hearth command; the commands are %s (hearth --help)\n", argv[1],
                   commands.c_str());
      return hearth::exit_bad_input;
    }
  }
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    const int status = app.exit(e);
    return status == 0 ? 0 : hearth::exit_bad_input;
  }
  if (options.threads > 0) omp_set_num_threads(options.threads);
  for (int i = 0; i < argc; ++i) options.command_line += (i ? " " : "") + std::string(argv[i]);

  try {
    if (*materials) return hearth::materials_command();
    if (*run) return hearth::run_command(options);
    if (*report) return hearth::report_command(report_options);
    if (*study) {
      study_options.common = options;
      return hearth::study_command(study_options);
    }
    if (*check) return hearth::check_command(options);
    if (*mesh) return hearth::mesh_command(options);
  } catch (const hearth::InputError& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return hearth::exit_bad_input;
  } catch (const hearth::MeshError& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return hearth::exit_bad_input;
  } catch (const hearth::ReportUnavailable& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return hearth::exit_bad_input;
  } catch (const hearth::WriteError& e) {  // disk full, no permission: the user can fix it
    std::fprintf(stderr, "error: %s\n", e.what());
    return hearth::exit_bad_input;
  } catch (const hearth::SolveFailed& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return hearth::exit_solve_failed;
  } catch (const hearth::Interrupted& e) {
    std::fprintf(stderr, "%s\n", e.what());
    return e.status();
  } catch (const std::bad_alloc&) {
    std::fprintf(stderr, "internal error: out of memory; try a larger mesh.size or fewer elements\n");
    return hearth::exit_internal;
  } catch (const std::exception& e) {
    std::fprintf(stderr, "internal error: %s\n", e.what());
    return hearth::exit_internal;
  }
  return hearth::exit_internal;
}
