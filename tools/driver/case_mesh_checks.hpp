// Checks of the case against its mesh that need the mesh's faces or a point locator,
// made before the solve so that a mistake costs no solve. Each throws InputError
// naming the case-file line and key.
#pragma once

#include "io/case.hpp"
#include "mesh/mesh.hpp"
#include "solver/point_locator.hpp"

namespace hearth {

// A boundary triangle takes the condition of one named surface only: two named
// surfaces of the geometry that share triangles (a face in two physical groups) may
// not both carry a condition in the case.
void check_one_condition_per_face(const Case& c, const Mesh& mesh);

// A probe outside the body is refused (as sample_probes does); so is a line with no
// point inside it (a line that is partly outside is sampled, with empty values there).
void check_probes_and_lines(const Case& c, const Mesh& mesh, const PointLocator& locator);

}  // namespace hearth
