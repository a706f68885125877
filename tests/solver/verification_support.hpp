// Helpers for the verification tests: mesh a Gmsh script, set conditions by name,
// solve, post-process and sample. Keeps each test a statement of set-up and target.
#pragma once

#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <map>
#include <string>
#include <unistd.h>

#include "mesh/gmsh_mesher.hpp"
#include "solver/linear_solver.hpp"
#include "solver/point_locator.hpp"
#include "solver/post_processing.hpp"
#include "solver/steady_solver.hpp"

namespace hearth::testing {

constexpr double celsius = 273.15;  // K at 0 degC

inline std::filesystem::path scratch_file(const std::string& name, const std::string& text) {
  const auto dir = std::filesystem::temp_directory_path() / ("hearth_verification_" + std::to_string(::getpid()));
  std::filesystem::create_directories(dir);
  const auto path = dir / name;
  std::ofstream(path) << text;
  return path;
}

inline Mesh mesh_script(const std::string& name, const std::string& script, double size, int order,
                        int refinements = 0) {
  MeshRequest request;
  request.geometry_file = scratch_file(name, script);
  request.size = size;
  request.order = order;
  request.refinements = refinements;
  return build_mesh(request);
}

// Box 0 <= x <= length, 0 <= y, z <= width: region "wall", x = 0 face "x0", x = length
// face "x1" (OCC box surfaces 1 and 2); the four lateral faces unnamed (insulated).
inline std::string prism(double length, double width) {
  return "SetFactory(\"OpenCASCADE\");\nBox(1) = {0, 0, 0, " + std::to_string(length) + ", " + std::to_string(width) +
         ", " + std::to_string(width) +
         "};\nPhysical Volume(\"wall\") = {1};\nPhysical Surface(\"x0\") = {1};\nPhysical Surface(\"x1\") = {2};\n";
}

inline int region_index(const Mesh& mesh, const std::string& name) {
  for (std::size_t i = 0; i < mesh.regions.size(); ++i)
    if (mesh.regions[i].name == name) return static_cast<int>(i);
  ADD_FAILURE() << "no region " << name;
  return -1;
}

inline int boundary_index(const Mesh& mesh, const std::string& name) {
  for (std::size_t i = 0; i < mesh.boundaries.size(); ++i)
    if (mesh.boundaries[i].name == name) return static_cast<int>(i);
  ADD_FAILURE() << "no boundary " << name;
  return -1;
}

// A problem with the given conductivity per region name; boundaries insulated.
inline ThermalProblem problem_for(const Mesh& mesh, const std::map<std::string, double>& conductivity,
                                  const std::map<std::string, double>& sources = {}) {
  ThermalProblem p;
  p.regions.resize(mesh.regions.size());
  for (std::size_t i = 0; i < mesh.regions.size(); ++i) {
    p.regions[i].material = mesh.regions[i].name;
    p.regions[i].conductivity = conductivity.at(mesh.regions[i].name);
    const auto s = sources.find(mesh.regions[i].name);
    if (s != sources.end()) p.regions[i].heat_source = s->second;
  }
  p.boundaries.resize(mesh.boundaries.size());
  return p;
}

inline BoundaryCondition& condition(const Mesh& mesh, ThermalProblem& p, const std::string& name) {
  return p.boundaries[boundary_index(mesh, name)];
}

struct Solved {
  SteadySolution solution;
  Results results;
  double heat_rate(const Mesh& mesh, const std::string& boundary) const {
    return results.boundaries[boundary_index(mesh, boundary)].heat_rate;
  }
};

inline Solved solve(const Mesh& mesh, const ThermalProblem& p, LinearSolverKind kind = LinearSolverKind::automatic,
                    double tolerance = 1e-12) {
  LinearSolverSettings settings;
  settings.kind = kind;
  settings.tolerance = tolerance;
  Solved s;
  s.solution = solve_steady(mesh, p, settings);
  EXPECT_TRUE(s.solution.converged()) << s.solution.linear.message;
  s.results = post_process(mesh, p, s.solution.temperature);
  return s;
}

inline double temperature_at(const Mesh& mesh, const std::vector<double>& T, const Point& x) {
  const PointLocator locator(mesh, {x});
  const auto hit = locator.locate(x);
  if (!hit) {
    ADD_FAILURE() << "point outside the mesh";
    return 0.0;
  }
  return locator.interpolate(*hit, T);
}

}  // namespace hearth::testing
