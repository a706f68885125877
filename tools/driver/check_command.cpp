// hearth check: validate the case and mesh; list every name and count; no solve.
#include <cmath>
#include <cstdio>

#include "mesh/mesh_topology.hpp"
#include "solver/assembler.hpp"
#include "solver/point_locator.hpp"
#include "solver/steady_solver.hpp"
#include "tools/driver/case_mesh_checks.hpp"
#include "tools/driver/commands.hpp"
#include "tools/driver/memory_check.hpp"
#include "tools/driver/pipeline.hpp"  // sampled_points

namespace hearth {

int check_command(const CommonOptions& options) {
  const Progress progress(options.quiet);
  const Case c = load_case(options, progress);
  const Mesh mesh = mesh_case(c, options.threads, progress, options.trust_geometry);
  check_names_against_mesh(c, mesh);
  const ThermalProblem problem = make_problem(c, mesh);
  if (c.analysis_type != "transient") check_determined(c, mesh, problem);  // stored heat sets the level
  const SolveMemoryEstimate memory = check_solve_memory(c, mesh, problem);
  if (!c.probes.empty() || !c.lines.empty())  // throws for a probe or a whole line outside
    check_probes_and_lines(c, mesh, PointLocator(mesh, sampled_points(c)));

  double qmin = 1.0;
  for (double q : mesh.tet_quality) qmin = std::min(qmin, q);
  const auto conditions = describe_conditions(mesh, problem);
  const std::vector<bool> internal = internal_boundaries(mesh);
  std::printf("%s\n", c.title.empty() ? c.file.c_str() : c.title.c_str());
  std::printf("geometry: %s\n", c.geometry_file.c_str());
  std::printf("mesh: %zu nodes, %zu elements (%d-node tetrahedra), %zu boundary triangles, min quality %.3f\n",
              mesh.n_nodes(), mesh.n_tets(), mesh.nodes_per_tet(), mesh.n_faces(), qmin);
  std::printf("unknowns: about %zu; the solve needs about %s of memory (%s)\n", mesh.n_nodes(),
              memory_text(memory.bytes).c_str(), memory.linear_solver.c_str());
  std::printf("volumes (%zu):\n", mesh.regions.size());
  std::vector<double> volume(mesh.regions.size(), 0.0);
  std::vector<std::size_t> count(mesh.regions.size(), 0);
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    ++count[mesh.tet_region[e]];
    volume[mesh.tet_region[e]] += tet_volume(tet_geometry(mesh, e));
  }
  const double l3 = std::pow(c.units.metres_per_length(), 3);
  for (std::size_t r = 0; r < mesh.regions.size(); ++r)
    std::printf("  %-24s material %-20s %9zu elements  volume %.6g %s3\n", mesh.regions[r].name.c_str(),
                c.regions.at(mesh.regions[r].name).c_str(), count[r], volume[r] / l3, c.units.length.c_str());
  std::printf("surfaces (%zu):\n", mesh.boundaries.size());
  std::vector<std::size_t> faces(mesh.boundaries.size(), 0);
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) ++faces[mesh.face_boundary[f]];
  for (std::size_t b = 0; b < mesh.boundaries.size(); ++b)
    std::printf("  %-24s %-22s %9zu triangles%s%s\n", mesh.boundaries[b].name.c_str(), conditions[b].c_str(), faces[b],
                internal[b] ? "  (internal: heat rate across it reported)" : "",
                internal[b] || c.boundaries.count(mesh.boundaries[b].name) ? "" : "  <- insulated by default");
  if (mesh.unnamed_exterior_faces)
    std::printf("  %zu exterior triangles on unnamed surfaces: insulated\n", mesh.unnamed_exterior_faces);
  for (const auto& p : c.probes) std::printf("probe %s: inside\n", p.name.c_str());
  for (const auto& w : c.warnings) std::printf("warning: %s\n", w.c_str());
  std::printf("case is valid\n");
  return 0;
}

}  // namespace hearth
