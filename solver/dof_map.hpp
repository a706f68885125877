// DofMap: which nodes carry a fixed temperature and the numbering of the free ones.
#pragma once

#include <cstdint>
#include <vector>

#include "mesh/mesh.hpp"
#include "solver/problem.hpp"

namespace hearth {

// Every node is a degree of freedom (P1 and P2 alike). Nodes on the faces of a
// fixed-temperature boundary are eliminated from the linear system (symmetric
// elimination): free_index[node] = -1 and fixed_value[node] holds the temperature (K).
// A node on two fixed boundaries takes the value of the later one in mesh order.
struct DofMap {
  std::vector<std::int32_t> free_index;  // per node: row in the reduced system, or -1
  std::vector<double> fixed_value;       // per node: K where fixed (else 0)
  std::vector<std::int32_t> free_nodes;  // row -> node
  std::int32_t n_free() const { return static_cast<std::int32_t>(free_nodes.size()); }
  bool is_fixed(std::int32_t node) const { return free_index[node] < 0; }
};

DofMap make_dof_map(const Mesh& mesh, const ThermalProblem& problem);

}  // namespace hearth
