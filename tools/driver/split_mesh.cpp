// Straight splitting and order elevation come from mesh/straight_refinement; this file
// only applies them as the case asks and reports what it did.
#include "tools/driver/split_mesh.hpp"

#include <stdexcept>

#include "io/input_error.hpp"
#include "mesh/straight_refinement.hpp"
#include "tools/driver/mesh_file.hpp"
#include "tools/driver/pipeline.hpp"

namespace hearth {

Mesh split_base_mesh(const Case& c, const std::filesystem::path& base_mesh, const Progress& progress) {
  Mesh mesh;
  try {
    mesh = read_mesh_file(base_mesh);
  } catch (const std::runtime_error& e) {
    throw InputError("--base-mesh " + base_mesh.string() + ": " + e.what() +
                     "; run the study again: it makes its base mesh anew when it is missing");
  }
  if (mesh.order != 1)
    throw InputError("--base-mesh " + base_mesh.string() + ": holds 10-node tetrahedra; a split level needs 4-node ones");
  for (int k = 0; k < c.mesh_refinements; ++k) mesh = refine_straight(mesh);
  if (c.mesh_order == 2) mesh = elevate_straight(mesh);
  progress.say("split the base mesh " + std::to_string(c.mesh_refinements) + " times: " +
               std::to_string(mesh.n_nodes()) + " nodes, " + std::to_string(mesh.n_tets()) + " tets" +
               (mesh.order == 2 ? " (10-node)" : ""));
  cut_interfaces(c, mesh, progress);
  return mesh;
}

}  // namespace hearth
