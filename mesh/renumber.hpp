// Node renumbering for memory locality: reverse Cuthill-McKee over the element graph.
#pragma once

#include <cstddef>
#include <cstdint>
#include <vector>

#include "mesh/mesh.hpp"

namespace hearth {

// Reverse Cuthill-McKee ordering of the nodes of `mesh`, two nodes being neighbours
// when they share an element (all 4 or 10 nodes of a tetrahedron). Each connected
// component starts from a pseudo-peripheral node (George and Liu's search).
// Returns new_number[old_number], a permutation of 0 .. n_nodes()-1.
std::vector<std::int32_t> reverse_cuthill_mckee_order(const Mesh& mesh);

// Renumbers the nodes of `mesh` in place: node i becomes node new_number[i] in coords,
// tet_nodes and face_nodes. `new_number` must be a permutation of 0 .. n_nodes()-1.
void apply_node_numbering(Mesh& mesh, const std::vector<std::int32_t>& new_number);

// Orders the elements by their lowest node number (stable), carrying tet_region and
// tet_quality along, so that a pass over the elements walks the nodes in order.
void sort_elements_by_lowest_node(Mesh& mesh);

// reverse_cuthill_mckee_order, apply_node_numbering, then sort_elements_by_lowest_node.
void renumber_reverse_cuthill_mckee(Mesh& mesh);

// Largest |i - j| over node pairs sharing an element: the half-bandwidth of the
// assembled matrix.
std::size_t node_bandwidth(const Mesh& mesh);

}  // namespace hearth
