// Cutting a named internal surface open, so that the two sides can differ in temperature
// (a thermal contact conductance couples them).
#pragma once

#include "mesh/mesh.hpp"

namespace hearth {

// Gives the elements in front of internal boundary `boundary` (on the side its normal
// points to) their own copies of the surface's nodes, and records the copies in
// Mesh::face_twin_nodes. A node is copied only where the surface separates the elements
// around it into two groups; where the surface ends inside the material (its rim away from
// the outside), the node stays shared. Exterior faces of elements in front take the
// copies too. Throws MeshError if the boundary has faces with no element on either side.
// Returns the number of nodes copied.
std::size_t split_interface(Mesh& mesh, int boundary);

}  // namespace hearth
