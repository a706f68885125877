// Stage functions shared by the run, check and mesh commands.
#include "tools/driver/pipeline.hpp"

#include <omp.h>

#include <algorithm>
#include <fstream>
#include <iterator>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <ctime>
#include <set>
#include <sstream>

#include "io/case_file.hpp"
#include "io/input_error.hpp"
#include "mesh/geometry_guard.hpp"
#include "mesh/gmsh_mesher.hpp"
#include "tools/driver/output_directory.hpp"
#include "tools/driver/case_mesh_checks.hpp"
#include "tools/driver/mesh_worker.hpp"
#include "mesh/interface_split.hpp"
#include "mesh/mesh_topology.hpp"
#include "solver/steady_solver.hpp"
#include "solver/point_locator.hpp"

#ifndef HEARTH_VERSION
#define HEARTH_VERSION "unknown"
#endif

namespace hearth {

namespace {

std::string join(const std::vector<std::string>& names) {
  std::string s;
  for (const auto& n : names) s += (s.empty() ? "" : ", ") + n;
  return s.empty() ? "(none)" : s;
}

std::vector<std::string> names_of(const std::vector<NamedEntity>& entities) {
  std::vector<std::string> names;
  for (const auto& e : entities) names.push_back(e.name);
  return names;
}

int index_of(const std::vector<NamedEntity>& entities, const std::string& name) { return entity_index(entities, name); }
std::string fmt(const char* format, double value) { return format_number(format, value); }

}  // namespace

std::string input_digest(const Case& c, const CommonOptions& options) {
  std::uint64_t hash = 1469598103934665603ULL;  // FNV-1a offset basis
  auto mix = [&hash](const std::string& bytes) {
    for (unsigned char b : bytes) hash = (hash ^ b) * 1099511628211ULL;
    hash = (hash ^ 0xff) * 1099511628211ULL;  // separator
  };
  auto file_bytes = [](const std::filesystem::path& path) {
    std::ifstream in(path, std::ios::binary);
    return std::string((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  };
  mix(file_bytes(c.file));
  mix(file_bytes(c.geometry_file));
  for (const auto& s : options.sets) mix(s);
  if (!options.base_mesh.empty()) mix(file_bytes(options.base_mesh));
  char text[17];
  std::snprintf(text, sizeof text, "%016llx", static_cast<unsigned long long>(hash));
  return text;
}

namespace {
std::string fnv_hex(const std::string& bytes) {
  std::uint64_t hash = 1469598103934665603ULL;
  for (unsigned char b : bytes) hash = (hash ^ b) * 1099511628211ULL;
  char text[17];
  std::snprintf(text, sizeof text, "%016llx", static_cast<unsigned long long>(hash));
  return text;
}
double min_quality(const Mesh& mesh) {
  double q = mesh.tet_quality.empty() ? 0.0 : 1.0;
  for (double v : mesh.tet_quality) q = std::min(q, v);
  return q;
}
}  // namespace

int entity_index(const std::vector<NamedEntity>& entities, const std::string& name) {
  for (std::size_t i = 0; i < entities.size(); ++i)
    if (entities[i].name == name) return static_cast<int>(i);
  return -1;
}

std::string format_number(const char* format, double value) {
  char buffer[64];
  std::snprintf(buffer, sizeof buffer, format, value);
  return buffer;
}

std::string geometry_digest(const Case& c) {
  std::ifstream in(c.geometry_file, std::ios::binary);
  return fnv_hex(std::string((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>()));
}

nlohmann::json run_provenance(const Case& c, const CommonOptions& options, double solve_seconds, double total_seconds) {
  nlohmann::json provenance = {{"hearth_version", HEARTH_VERSION},
                               {"case_file", std::filesystem::absolute(c.file).string()},
                               {"input_digest", input_digest(c, options)},
                               {"geometry_digest", geometry_digest(c)},
                               {"overrides", options.sets},
                               {"command_line", options.command_line},
                               {"threads", omp_get_max_threads()},
                               {"seconds", {{"solve", solve_seconds}, {"total", total_seconds}}},
                               {"finished", utc_now_text()}};
  if (!options.base_mesh.empty())  // a study's split level: which mesh it split
    provenance["base_mesh"] = std::filesystem::absolute(options.base_mesh).string();
  return provenance;
}

std::string utc_now_text() {
  const std::time_t now = std::time(nullptr);
  std::tm utc{};
  gmtime_r(&now, &utc);
  char text[40];
  std::strftime(text, sizeof text, "%Y-%m-%d %H:%M UTC", &utc);
  return text;
}

RunRecord start_record(const Case& c, const Mesh& mesh) {
  RunRecord record;
  record.title = c.title;
  record.case_file = c.file.string();
  record.hearth_version = HEARTH_VERSION;
  record.nodes = mesh.n_nodes();
  record.elements = mesh.n_tets();
  record.order = mesh.order;
  record.min_quality = min_quality(mesh);
  record.blas = loaded_blas();
  return record;
}

Case load_case(const CommonOptions& options, const Progress& progress) {
  Case c = read_case_file(options.case_path, options.sets);
  progress.say("read " + options.case_path + (c.title.empty() ? "" : ": " + c.title));
  return c;
}

MeshRequest mesh_request(const Case& c, int threads, const Progress& progress, bool trust_geometry) {
  MeshRequest request;
  request.geometry_file = c.geometry_file;
  request.length_unit = c.units.length;
  request.size = c.mesh_size;
  request.order = c.mesh_order;
  request.local_sizes = c.local_sizes;
  for (const auto& [name, place] : c.local_size_places) request.local_size_origins[name] = place.str();
  request.refinements = c.mesh_refinements;
  request.threads = threads;
  request.progress = [&progress](const std::string& line) { progress.say(line); };
  request.trust_geometry = trust_geometry;
  // Test hook (tests/cli/test_geometry_guard.py): skip the scan but keep the sandbox, to
  // show that the sandbox alone stops a script from writing.
  if (std::getenv("HEARTH_TEST_SANDBOX_WITHOUT_GUARD")) request.trust_geometry = true;
  return request;
}

Mesh mesh_case(const Case& c, int threads, const Progress& progress, bool trust_geometry) {
  Mesh mesh = build_mesh_isolated(mesh_request(c, threads, progress, trust_geometry), progress.quiet(),
                                  /*sandbox=*/!trust_geometry);
  cut_interfaces(c, mesh, progress);
  return mesh;
}

void cut_interfaces(const Case& c, Mesh& mesh, const Progress& progress) {
  if (c.interfaces.empty()) return;
  const std::vector<bool> internal = internal_boundaries(mesh);
  for (const auto& [name, spec] : c.interfaces) {
    const int b = index_of(mesh.boundaries, name);
    if (b < 0)
      throw InputError(spec.place.str() + ": the geometry has no surface named '" + name +
                       "'; its surfaces are: " + join(names_of(mesh.boundaries)));
    if (!internal[b])
      throw InputError(spec.place.str() + ": '" + name +
                       "' is not an internal surface (it has material on one side only); a contact conductance "
                       "joins two volumes along a surface between them: give the contact as a physical surface "
                       "shared by both volumes (BooleanFragments in the geometry script)");
    if (c.boundaries.count(name))
      throw InputError(c.boundaries.at(name).place.str() + ": '" + name +
                       "' is an interface (thermal contact) and cannot also carry a boundary condition; remove "
                       "one of the two");
    const std::size_t copies = split_interface(mesh, b);
    progress.say("interface " + name + ": " + std::to_string(copies) + " nodes doubled for the contact");
  }
}

void check_names_against_mesh(const Case& c, const Mesh& mesh) {
  const std::string volumes = join(names_of(mesh.regions));
  const std::string surfaces = join(names_of(mesh.boundaries));
  for (const auto& [name, material] : c.regions)
    if (index_of(mesh.regions, name) < 0)
      throw InputError(c.region_places.at(name).str() + ": the geometry has no volume named '" + name +
                       "'; its volumes are: " + volumes);
  for (const auto& [name, value] : c.heat_sources)
    if (index_of(mesh.regions, name) < 0)
      throw InputError(c.heat_source_places.at(name).str() + ": the geometry has no volume named '" + name +
                       "'; its volumes are: " + volumes);
  for (const auto& [name, spec] : c.boundaries)
    if (index_of(mesh.boundaries, name) < 0)
      throw InputError(spec.place.str() + ": the geometry has no surface named '" + name +
                       "'; its surfaces are: " + surfaces);
  for (const auto& name : c.touch_surfaces)
    if (index_of(mesh.boundaries, name) < 0)
      throw InputError(c.safety_place.str() + ": the geometry has no surface named '" + name +
                       "'; its surfaces are: " + surfaces);
  const std::vector<bool> internal = internal_boundaries(mesh);
  for (std::size_t b = 0; b < mesh.boundaries.size(); ++b) {
    const auto it = c.boundaries.find(mesh.boundaries[b].name);
    if (internal[b] && it != c.boundaries.end() &&
        (it->second.convection || it->second.heat_flux || it->second.radiation))
      throw InputError(it->second.place.str() + ": '" + it->first +
                       "' is an internal surface (material on both sides): convection, radiation and heat_flux act on outer "
                       "surfaces only; remove the condition to get the heat rate across it");
  }
  for (const auto& region : mesh.regions)
    if (!c.regions.count(region.name)) {
      const Place& where = c.regions_place;
      throw InputError(where.str() + ": volume '" + region.name + "' has no material; add '" + region.name +
                       ": <material>' under regions (the geometry's volumes are: " + volumes + ")");
    }
  check_one_condition_per_face(c, mesh);
}

ThermalProblem make_problem(const Case& c, const Mesh& mesh) {
  ThermalProblem problem;
  for (const auto& region : mesh.regions) {
    const MaterialSpec& m = c.materials.at(c.regions.at(region.name));
    RegionProperties p;
    p.material = m.name;
    p.conductivity = m.conductivity;
    const auto source = c.heat_sources.find(region.name);
    if (source != c.heat_sources.end()) p.heat_source = source->second;
    problem.regions.push_back(p);
  }
  problem.boundaries.resize(mesh.boundaries.size());
  for (std::size_t b = 0; b < mesh.boundaries.size(); ++b) {
    const auto contact = c.interfaces.find(mesh.boundaries[b].name);
    if (contact != c.interfaces.end()) problem.boundaries[b].contact_conductance = contact->second.conductance;
    const auto it = c.boundaries.find(mesh.boundaries[b].name);
    if (it == c.boundaries.end()) continue;
    const BoundarySpec& spec = it->second;
    BoundaryCondition& bc = problem.boundaries[b];
    bc.temperature = spec.temperature;
    bc.heat_flux = spec.heat_flux.value_or(0.0);
    if (spec.convection) bc.convection = Convection{spec.convection->coefficient, spec.convection->ambient};
    bc.radiation = spec.radiation;
  }
  return problem;
}

LinearSolverSettings linear_settings(const Case& c) {
  LinearSolverSettings s;
  s.kind = c.solver.linear == "direct"      ? LinearSolverKind::direct
           : c.solver.linear == "iterative" ? LinearSolverKind::iterative
                                            : LinearSolverKind::automatic;
  s.tolerance = c.solver.tolerance;
  return s;
}

NonlinearSettings nonlinear_settings(const Case& c) {
  NonlinearSettings s;
  s.tolerance = c.solver.nonlinear_tolerance;
  s.max_iterations = c.solver.nonlinear_max_iterations;
  return s;
}

std::vector<std::string> describe_conditions(const Mesh& mesh, const ThermalProblem& problem) {
  std::vector<std::string> out;
  const std::vector<bool> internal = internal_boundaries(mesh);
  for (std::size_t b = 0; b < mesh.boundaries.size(); ++b) {
    if (problem.boundaries[b].contact_conductance) {
      out.push_back("contact");
      continue;
    }
    if (internal[b] && !problem.boundaries[b].is_fixed()) {
      out.push_back("internal");
      continue;
    }
    const BoundaryCondition& bc = problem.boundaries[b];
    std::string d;
    if (bc.is_fixed()) d = "temperature";
    if (bc.convection) d = "convection";
    if (bc.radiation) d += d.empty() ? "radiation" : "+radiation";
    if (bc.heat_flux != 0.0) d += d.empty() ? "heat_flux" : "+heat_flux";
    out.push_back(d.empty() ? "insulated" : d);
  }
  return out;
}

std::vector<std::string> insulated_boundaries(const Case& c, const Mesh& mesh) {
  std::vector<std::string> out;
  const std::vector<bool> internal = internal_boundaries(mesh);
  for (std::size_t b = 0; b < mesh.boundaries.size(); ++b)
    if (!internal[b] && !c.boundaries.count(mesh.boundaries[b].name)) out.push_back(mesh.boundaries[b].name);
  return out;
}

void check_determined(const Case& c, const Mesh& mesh, const ThermalProblem& problem) {
  if (!temperature_is_determined(mesh, problem))
    throw InputError(c.boundaries_place.str() +
                     ": no fixed temperature, convection or radiation on any surface: the steady temperature is "
                     "undetermined; add a 'temperature' or 'convection' condition to at least one boundary");
}

Point line_point(const LineSpec& line, int k) {
  const double s = line.points > 1 ? double(k) / (line.points - 1) : 0.0;
  Point p{};
  for (int d = 0; d < 3; ++d) p[d] = line.from[d] + s * (line.to[d] - line.from[d]);
  return p;
}

std::vector<Point> sampled_points(const Case& c) {
  std::vector<Point> points;
  for (const auto& probe : c.probes) points.push_back(probe.point);
  for (const auto& line : c.lines)
    for (int k = 0; k < line.points; ++k) points.push_back(line_point(line, k));
  return points;
}

std::vector<ProbeRecord> sample_probes(const Case& c, const PointLocator& locator,
                                       const std::vector<double>& temperature) {
  std::vector<ProbeRecord> out;
  for (const auto& probe : c.probes) {
    const auto hit = locator.locate(probe.point);
    if (!hit) {
      const double s = 1.0 / c.units.metres_per_length();
      std::ostringstream where;
      where << "[" << probe.point[0] * s << ", " << probe.point[1] * s << ", " << probe.point[2] * s << "]";
      throw InputError(probe.place.str() + ": probe '" + probe.name + "' at " + where.str() + " " + c.units.length +
                       " lies outside the body; move it inside the geometry");
    }
    out.push_back({probe.name, probe.point, locator.interpolate(*hit, temperature)});
  }
  return out;
}

std::vector<std::vector<LineSample>> sample_lines(const Case& c, const PointLocator& locator,
                                                  const std::vector<double>& temperature,
                                                  std::vector<std::string>& warnings) {
  std::vector<std::vector<LineSample>> out;
  for (const auto& line : c.lines) {
    std::vector<LineSample> samples;
    const double length = std::sqrt(std::pow(line.to[0] - line.from[0], 2) + std::pow(line.to[1] - line.from[1], 2) +
                                    std::pow(line.to[2] - line.from[2], 2));
    int outside = 0;
    for (int k = 0; k < line.points; ++k) {
      const double s = line.points > 1 ? double(k) / (line.points - 1) : 0.0;
      LineSample sample;
      sample.point = line_point(line, k);
      sample.distance = s * length;
      if (const auto hit = locator.locate(sample.point))
        sample.temperature = locator.interpolate(*hit, temperature);
      else
        ++outside;
      samples.push_back(sample);
    }
    if (outside > 0)
      warnings.push_back("line '" + line.name + "': " + std::to_string(outside) + " of " +
                         std::to_string(line.points) + " points lie outside the body and are left empty");
    out.push_back(std::move(samples));
  }
  return out;
}

std::vector<ServiceRecord> service_checks(const Case& c, const Mesh& mesh, const ThermalProblem& problem,
                                          const std::vector<double>& temperature, std::vector<std::string>& warnings) {
  std::vector<ServiceRecord> out;
  for (const auto& [name, material] : c.materials) {
    if (!material.max_service_temperature) continue;
    ServiceRecord record{name, -1.0, {}, *material.max_service_temperature};
    for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
      if (problem.regions[mesh.tet_region[e]].material != name) continue;
      for (int a = 0; a < mesh.nodes_per_tet(); ++a) {
        const std::int32_t i = mesh.tet(e)[a];
        if (temperature[i] > record.max) {
          record.max = temperature[i];
          record.location = mesh.node(i);
        }
      }
    }
    if (record.max < 0) continue;  // material not used by any volume
    if (record.max > record.limit) {
      const double s = 1.0 / c.units.metres_per_length();
      std::ostringstream w;
      w << "material '" << name << "' reaches " << fmt("%.1f", c.units.from_kelvin(record.max)) << " "
        << c.units.temperature << ", " << fmt("%.1f", record.max - record.limit)
        << " K above its max_service_temperature " << fmt("%.1f", c.units.from_kelvin(record.limit)) << " at ["
        << record.location[0] * s << ", " << record.location[1] * s << ", " << record.location[2] * s << "] "
        << c.units.length;
      warnings.push_back(w.str());
    }
    out.push_back(record);
  }
  return out;
}

std::vector<TouchRecord> touch_checks(const Case& c, const Mesh& mesh, const Results& results,
                                      std::vector<std::string>& warnings) {
  std::vector<TouchRecord> out;
  for (const auto& name : c.touch_surfaces) {
    const int b = index_of(mesh.boundaries, name);
    if (b < 0) continue;  // checked against the mesh before the solve
    const BoundaryResult& r = results.boundaries[b];
    out.push_back({name, r.temperature.max, r.hottest, c.touch_limit, std::nullopt, std::nullopt});
    if (r.temperature.max > c.touch_limit) {
      const double s = 1.0 / c.units.metres_per_length();
      std::ostringstream w;
      w << "surface '" << name << "' reaches " << fmt("%.1f", c.units.from_kelvin(r.temperature.max)) << " "
        << c.units.temperature << ", " << fmt("%.1f", r.temperature.max - c.touch_limit)
        << " K above the touch limit " << fmt("%.1f", c.units.from_kelvin(c.touch_limit)) << " at [" << r.hottest[0] * s
        << ", " << r.hottest[1] * s << ", " << r.hottest[2] * s << "] " << c.units.length
        << ": guard it or insulate it (burn risk)";
      warnings.push_back(w.str());
    }
  }
  return out;
}

std::filesystem::path output_directory(const Case& c, const CommonOptions& options) {
  namespace fs = std::filesystem;
  // The inputs the folder must not hold: the case, its geometry and what that includes.
  std::vector<fs::path> inputs = {c.file, c.geometry_file};
  if (c.geometry_file.extension() == ".geo")
    for (const fs::path& file : scan_geometry_script(c.geometry_file).files) inputs.push_back(file);
  if (!options.out.empty()) return checked_output_directory(options.out, "--out", inputs);
  return checked_output_directory(c.output_directory, c.output_place.str(), inputs);
}

void print_human_summary(const Case& c, const RunRecord& record, const std::vector<std::string>& insulated,
                         const std::filesystem::path& where) {
  const std::string unit = c.units.temperature == "degC" ? "degC" : "K";
  std::fprintf(stderr, "\n%s\n", c.title.empty() ? c.file.filename().c_str() : c.title.c_str());
  std::fprintf(stderr, "  mesh: %zu nodes, %zu elements (order %d), min quality %.3f; %lld unknowns, %s",
               record.nodes, record.elements, record.order, record.min_quality, static_cast<long long>(record.dofs),
               record.linear_solver.c_str());
  if (record.linear_iterations) std::fprintf(stderr, " (%d iterations)", record.linear_iterations);
  std::fprintf(stderr, "\n  %-24s %12s %12s %12s\n", "region", ("min " + unit).c_str(), ("mean " + unit).c_str(),
               ("max " + unit).c_str());
  for (const auto& r : record.results.regions)
    std::fprintf(stderr, "  %-24s %12.2f %12.2f %12.2f\n", r.name.c_str(), c.units.from_kelvin(r.temperature.min),
                 c.units.from_kelvin(r.temperature.mean), c.units.from_kelvin(r.temperature.max));
  std::fprintf(stderr, "  %-24s %12s %12s %12s\n", "boundary", "heat rate W", "area m2", ("mean " + unit).c_str());
  for (std::size_t b = 0; b < record.results.boundaries.size(); ++b) {
    const auto& r = record.results.boundaries[b];
    const char* condition = r.internal                              ? "internal: + along its normal"
                            : b < record.boundary_conditions.size() ? record.boundary_conditions[b].c_str()
                                                                    : "";
    std::fprintf(stderr, "  %-24s %12.4g %12.4g %12.2f  %s\n", r.name.c_str(), r.heat_rate, r.area,
                 c.units.from_kelvin(r.temperature.mean), condition);
  }
  const auto& eb = record.results.balance;
  std::fprintf(stderr, "  energy balance: in %.6g W, out %.6g W, sources %.6g W, relative imbalance %.2e\n",
               eb.boundary_in, eb.boundary_out, eb.sources, eb.relative_imbalance);
  for (const auto& p : record.probes)
    std::fprintf(stderr, "  probe %-18s %12.2f %s\n", p.name.c_str(), c.units.from_kelvin(p.temperature), unit.c_str());
  if (!insulated.empty()) std::fprintf(stderr, "  insulated (no condition given): %s\n", join(insulated).c_str());
  if (record.min_quality > 0 && record.min_quality < 0.05)
    std::fprintf(stderr, "  note: poor elements (min quality %.3f) can spoil local values\n", record.min_quality);
  for (const auto& w : record.warnings) std::fprintf(stderr, "  warning: %s\n", w.c_str());
  std::fprintf(stderr, "  results in %s\n", where.c_str());
  std::fprintf(stderr, "  (engineering estimate: check against local codes and practice before use)\n");
}

}  // namespace hearth
