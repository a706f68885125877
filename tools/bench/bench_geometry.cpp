// The benchmark geometries. The lining panel (lining_panel/lining.geo) is a scenario
// of our own with invented dimensions. Refractory k = 1, board k = 0.05, steel k = 50
// W/(m K): the board and the steel differ by a factor of 1000, which is what multigrid
// has to cope with in a real lining.
#include "tools/bench/bench_geometry.hpp"

#include <fstream>
#include <sstream>
#include <stdexcept>

namespace hearth::bench {

namespace {

const char* const box_script =
    "SetFactory(\"OpenCASCADE\");\n"
    "Box(1) = {0, 0, 0, 1, 1, 1};\n"
    "Physical Volume(\"box\") = {1};\n"
    "Physical Surface(\"fixed\") = {1};\n";

// The lining's script is the file the end-to-end case uses too (one copy of it).
std::string file_text(const std::string& path) {
  std::ifstream in(path);
  if (!in) throw std::invalid_argument("cannot read " + path + " (built from another source tree?)");
  std::stringstream text;
  text << in.rdbuf();
  return text.str();
}

}  // namespace

BenchGeometry bench_geometry(const std::string& name) {
  if (name == "box")
    return {"box", "unit box, k = 1, T fixed on x = 0, uniform source", box_script,
            {0.03, 0.02, 0.0135, 0.009, 0.0072}, {0.06, 0.04, 0.027, 0.018, 0.0144}, "", 0.0};
  if (name == "lining")
    return {"lining",
            "lining panel 1 x 1 x 0.45 m: refractory k = 1, board k = 0.05, steel shell and anchor k = 50; "
            "hot face 1000 degC, cold face h = 10 W/(m2 K) to 27 degC",
            file_text(std::string(HEARTH_BENCH_DIR) + "/lining_panel/lining.geo"),
            {0.019, 0.012, 0.0088, 0.0069, 0.0054}, {0.038, 0.024, 0.0176, 0.0138, 0.0108},
            "anchor", 0.012};  // a third of the anchor's radius
  throw std::invalid_argument("unknown bench geometry '" + name + "' (box or lining)");
}

ThermalProblem bench_problem(const BenchGeometry& geometry, const Mesh& mesh) {
  ThermalProblem problem;
  for (const NamedEntity& region : mesh.regions) {
    RegionProperties p{region.name, 1.0, 0.0, std::nullopt};
    if (geometry.name == "box") p.heat_source = 1.0;
    else if (region.name == "refractory") p.conductivity = 1.0;
    else if (region.name == "board") p.conductivity = 0.05;
    else p.conductivity = 50.0;  // shell and anchor: carbon steel
    problem.regions.push_back(p);
  }
  problem.boundaries.resize(mesh.boundaries.size());
  for (std::size_t b = 0; b < mesh.boundaries.size(); ++b) {
    const std::string& name = mesh.boundaries[b].name;
    if (name == "fixed") problem.boundaries[b].temperature = 0.0;
    if (name == "hot_face") problem.boundaries[b].temperature = 1273.15;
    if (name == "cold_face") problem.boundaries[b].convection = Convection{PiecewiseLinear(10.0), 300.15};
  }
  return problem;
}

}  // namespace hearth::bench
