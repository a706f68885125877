// Case-against-mesh checks: one condition per boundary triangle; probes and lines inside.
#include "tools/driver/case_mesh_checks.hpp"

#include <algorithm>
#include <array>
#include <map>
#include <sstream>

#include "io/input_error.hpp"
#include "tools/driver/pipeline.hpp"

namespace hearth {

namespace {

std::string point_text(const Case& c, const std::array<double, 3>& p) {
  const double s = 1.0 / c.units.metres_per_length();
  std::ostringstream text;
  text << "[" << p[0] * s << ", " << p[1] * s << ", " << p[2] * s << "]";
  return text.str();
}

}  // namespace

void check_one_condition_per_face(const Case& c, const Mesh& mesh) {
  // The corner nodes of each triangle with a condition, sorted, -> its boundary.
  std::map<std::array<std::int32_t, 3>, std::int32_t> owner;
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    const std::int32_t b = mesh.face_boundary[f];
    const auto spec = c.boundaries.find(mesh.boundaries[b].name);
    if (spec == c.boundaries.end()) continue;
    std::array<std::int32_t, 3> corners = {mesh.face(f)[0], mesh.face(f)[1], mesh.face(f)[2]};
    std::sort(corners.begin(), corners.end());
    const auto [it, fresh] = owner.emplace(corners, b);
    if (fresh || it->second == b) continue;
    const BoundarySpec& first = c.boundaries.at(mesh.boundaries[it->second].name);
    throw InputError(spec->second.place.str() + ": surface '" + spec->first + "' shares triangles with surface '" +
                     first.name + "' (" + first.place.str() +
                     ") in the geometry, and both have a condition here; a triangle takes one condition: name "
                     "the shared part once in the geometry, or give the condition to one of the two names");
  }
}

void check_probes_and_lines(const Case& c, const Mesh& mesh, const PointLocator& locator) {
  sample_probes(c, locator, std::vector<double>(mesh.n_nodes(), 0.0));  // throws for a probe outside
  for (const auto& line : c.lines) {
    bool inside = false;
    for (int k = 0; k < line.points && !inside; ++k) inside = locator.locate(line_point(line, k)).has_value();
    if (!inside)
      throw InputError(line.place.str() + ": line '" + line.name + "' from " + point_text(c, line.from) + " to " +
                       point_text(c, line.to) + " " + c.units.length + " has none of its " +
                       std::to_string(line.points) + " points inside the body; move it into the geometry (are its "
                       "coordinates in " + c.units.length + ", units.length?)");
  }
}

}  // namespace hearth
