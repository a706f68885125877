// The stages of a run as named functions: the commands read like a recipe of these.
#pragma once

#include <string>
#include <vector>

#include "io/case.hpp"
#include "io/csv_writer.hpp"
#include "io/run_record.hpp"
#include "io/summary_json.hpp"
#include "mesh/mesh.hpp"
#include "mesh/mesh_request.hpp"
#include "solver/linear_solver.hpp"
#include "solver/point_locator.hpp"
#include "solver/problem.hpp"
#include "solver/steady_solver.hpp"
#include "tools/driver/progress.hpp"

namespace hearth {

struct CommonOptions {
  std::string case_path;
  std::vector<std::string> sets;  // --set KEY=VALUE
  std::string out;                // --out DIR (empty: output.directory)
  int threads = 0;                // --threads N (0: all cores)
  bool quiet = false;
  bool summary_only = false;      // also print summary.json to stdout
  std::string command_line;       // as typed, for run.json
  bool warnings_to_terminal = true;  // false for the levels of a study
  // --trust-geometry: the geometry script is handed to Gmsh unscanned and parsed outside
  // the sandbox (it may then run programs and write files, as Gmsh scripts can).
  bool trust_geometry = false;
  // A study's split level (hidden option --base-mesh): the mesh is this base mesh (a
  // mesh file, see mesh_file.hpp) split mesh.refinements times instead of a new mesh.
  std::string base_mesh;
  bool ascii = false;             // --ascii: VTK XML files in ASCII, for reading by eye
  bool report_allowed = true;     // false for the levels of a study (the study makes one report)
};

// A digest of the run's inputs (case file, geometry file, overrides, the base mesh of a
// split level; threads excluded):
// FNV-1a 64-bit of their bytes, as 16 hex digits. Equal digests: same inputs.
std::string input_digest(const Case& c, const CommonOptions& options);

// Index of the region or boundary called `name`, or -1.
int entity_index(const std::vector<NamedEntity>& entities, const std::string& name);
// One number by a printf format, for messages ("%.1f").
std::string format_number(const char* format, double value);

// FNV-1a 64-bit of the geometry file's bytes: a restart checks that its mesh still
// belongs to the case's geometry.
std::string geometry_digest(const Case& c);

// The current time as "YYYY-MM-DD HH:MM UTC".
std::string utc_now_text();

// run.json: how the result was made, so that a colleague can make it again; `finished`
// is when it was written.
nlohmann::json run_provenance(const Case& c, const CommonOptions& options, double solve_seconds, double total_seconds);

// A record with the case's title and the mesh figures filled in.
RunRecord start_record(const Case& c, const Mesh& mesh);

Case load_case(const CommonOptions& options, const Progress& progress);
// What the case asks the mesher for (sizes in metres); `trust_geometry` as below.
MeshRequest mesh_request(const Case& c, int threads, const Progress& progress, bool trust_geometry = false);
// Meshes the case's geometry in the worker process: unless `trust_geometry`, a script
// is first scanned by the geometry guard and the worker runs in the sandbox
// (tools/driver/sandbox.hpp).
Mesh mesh_case(const Case& c, int threads, const Progress& progress, bool trust_geometry = false);
// Cuts open every internal surface named under interfaces (thermal contact). Throws
// InputError for a name the geometry lacks, a surface that is not internal, or one that
// also has a boundary condition.
void cut_interfaces(const Case& c, Mesh& mesh, const Progress& progress);

// Every region and boundary named in the case exists in the mesh, and every volume has
// a material; conditions that need an exterior surface are on one; no triangle gets
// conditions from two names (check_one_condition_per_face). Throws InputError naming
// the case-file line and listing the names the geometry has.
void check_names_against_mesh(const Case& c, const Mesh& mesh);

// InputError (naming the boundaries key) when no surface fixes the temperature level.
void check_determined(const Case& c, const Mesh& mesh, const ThermalProblem& problem);

ThermalProblem make_problem(const Case& c, const Mesh& mesh);
LinearSolverSettings linear_settings(const Case& c);
NonlinearSettings nonlinear_settings(const Case& c);

// Human description of each boundary's condition, e.g. "convection+heat_flux".
std::vector<std::string> describe_conditions(const Mesh& mesh, const ThermalProblem& problem);
// Names of the exterior boundaries left insulated (no entry in the case).
std::vector<std::string> insulated_boundaries(const Case& c, const Mesh& mesh);

// Point k of a line's `points` evenly spaced samples, from `from` to `to`.
Point line_point(const LineSpec& line, int k);
// Every point the case samples (probes, then each line's points), for the PointLocator
// to find in one pass.
std::vector<Point> sampled_points(const Case& c);

// Probes (InputError for one outside the body) and lines (outside points left empty),
// located with one PointLocator built for the mesh and sampled_points(c).
std::vector<ProbeRecord> sample_probes(const Case& c, const PointLocator& locator,
                                       const std::vector<double>& temperature);
std::vector<std::vector<LineSample>> sample_lines(const Case& c, const PointLocator& locator,
                                                  const std::vector<double>& temperature,
                                                  std::vector<std::string>& warnings);

// Service-temperature records and warnings per material with a limit.
std::vector<ServiceRecord> service_checks(const Case& c, const Mesh& mesh, const ThermalProblem& problem,
                                          const std::vector<double>& temperature, std::vector<std::string>& warnings);

// Touch-limit records and warnings for the case's touch_surfaces.
std::vector<TouchRecord> touch_checks(const Case& c, const Mesh& mesh, const Results& results,
                                      std::vector<std::string>& warnings);

// The output folder: --out, else output.directory, resolved and checked by
// checked_output_directory (tools/driver/output_directory.hpp) against the case's inputs.
std::filesystem::path output_directory(const Case& c, const CommonOptions& options);

// The short human summary on stderr after a run.
void print_human_summary(const Case& c, const RunRecord& record, const std::vector<std::string>& insulated,
                         const std::filesystem::path& where);

}  // namespace hearth
