// The geometries hearth_bench meshes and the conduction problem it solves on each.
#pragma once

#include <string>
#include <vector>

#include "mesh/mesh.hpp"
#include "solver/problem.hpp"

namespace hearth::bench {

struct BenchGeometry {
  std::string name;         // "box" | "lining"
  std::string description;  // one line for the table's heading
  std::string script;       // Gmsh geometry script (OpenCASCADE kernel), metres
  // Default ladder of element sizes (m) for P1 and for P2, from about 50 thousand to
  // about 2 million unknowns.
  std::vector<double> p1_sizes, p2_sizes;
  // 10-node elements only: a local size (m) for a curved region, so that its curved
  // elements keep a positive Jacobian at the coarse end of the ladder; 0: none.
  std::string curved_region;
  double curved_region_size = 0.0;
};

// "box": the unit box of the reference figures (k = 1, T fixed on x = 0, uniform source).
// "lining": a layered lining panel of our own with a steel anchor through it (a
// conductivity contrast of 1000 between the insulating layer and the steel).
// Throws std::invalid_argument for another name.
BenchGeometry bench_geometry(const std::string& name);

// The linear steady problem of `geometry` on a mesh of it (regions and boundaries
// matched by name).
ThermalProblem bench_problem(const BenchGeometry& geometry, const Mesh& mesh);

}  // namespace hearth::bench
