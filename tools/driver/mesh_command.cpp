// hearth mesh: mesh only; mesh.vtu with region and quality, and mesh.json with figures.
#include <algorithm>
#include <cstdio>
#include <nlohmann/json.hpp>

#include "io/summary_json.hpp"
#include "io/vtu_writer.hpp"
#include "tools/driver/commands.hpp"
#include "tools/driver/output_directory.hpp"
#include "tools/driver/output_lock.hpp"

namespace hearth {

int mesh_command(const CommonOptions& options) {
  const Progress progress(options.quiet);
  const Case c = load_case(options, progress);
  const std::filesystem::path out = output_directory(c, options);
  const OutputLock lock(out, options.command_line);  // one hearth at a time per folder
  const Mesh mesh = mesh_case(c, options.threads, progress, options.trust_geometry);

  // Quality figures: minimum, mean and a histogram of Gmsh's gamma.
  std::vector<std::size_t> histogram(10, 0);
  double qmin = 1.0, qsum = 0.0;
  for (double q : mesh.tet_quality) {
    qmin = std::min(qmin, q);
    qsum += q;
    ++histogram[std::min<std::size_t>(9, static_cast<std::size_t>(q * 10))];
  }
  nlohmann::json figures = {{"nodes", mesh.n_nodes()},
                            {"elements", mesh.n_tets()},
                            {"order", mesh.order},
                            {"boundary_triangles", mesh.n_faces()},
                            {"min_quality", qmin},
                            {"mean_quality", mesh.n_tets() ? qsum / mesh.n_tets() : 0.0},
                            {"quality_histogram", {{"bin_width", 0.1}, {"counts", histogram}}},
                            {"length_unit", c.units.length}};
  for (const auto& r : mesh.regions) figures["regions"].push_back(r.name);
  for (const auto& b : mesh.boundaries) figures["boundaries"].push_back(b.name);

  StagedDirectory staged(out);
  VtuFields fields;
  fields.quality = true;
  staged.fill([&](const std::filesystem::path& dir) {
    write_vtu(dir / "mesh.vtu", mesh, c.units, fields, vtk_encoding(c.output_compression, options.ascii));
    write_summary(dir / "mesh.json", figures);
  });
  staged.commit();
  if (options.quiet) return 0;
  std::fprintf(stderr, "mesh: %zu nodes, %zu elements, min quality %.3f, mean %.3f\n", mesh.n_nodes(), mesh.n_tets(),
               qmin, mesh.n_tets() ? qsum / mesh.n_tets() : 0.0);
  std::fprintf(stderr, "quality (gamma) histogram, bins of 0.1:");
  for (auto n : histogram) std::fprintf(stderr, " %zu", n);
  std::fprintf(stderr, "\nwritten to %s\n", (out / "mesh.vtu").c_str());
  return 0;
}

}  // namespace hearth
