// Summary assembly with nlohmann::json; written atomically.
#include "io/summary_json.hpp"

#include "io/atomic_file.hpp"

namespace hearth {

namespace {

nlohmann::json stats_json(const Stats& s, const Units& units) {
  return {{"min", units.from_kelvin(s.min)}, {"max", units.from_kelvin(s.max)}, {"mean", units.from_kelvin(s.mean)}};
}

nlohmann::json location_json(const std::array<double, 3>& x, const Units& units) {
  const double s = 1.0 / units.metres_per_length();
  return nlohmann::json::array({x[0] * s, x[1] * s, x[2] * s});
}

}  // namespace

nlohmann::json summary_json(const RunRecord& r, const Units& units) {
  nlohmann::json j;
  j["title"] = r.title;
  j["case_file"] = r.case_file;
  j["hearth_version"] = r.hearth_version;
  j["temperature_unit"] = units.temperature;
  j["length_unit"] = units.length;
  j["caution"] =
      "Engineering estimate from a finite-element model. Results depend on the inputs (properties, film "
      "coefficients, geometry) and must be checked by a qualified person against local codes and practice "
      "before they are used for design or safety decisions.";
  j["mesh"] = {{"nodes", r.nodes}, {"elements", r.elements}, {"order", r.order}, {"min_quality", r.min_quality}};
  j["solve"] = {{"dofs", r.dofs},
                {"linear_solver", r.linear_solver},
                {"linear_iterations", r.linear_iterations},
                {"nonlinear_iterations", r.nonlinear_iterations},
                {"linear_relative_residual", r.linear_relative_residual},
                {"seconds", r.seconds},
                {"converged", r.converged},
                {"blas", r.blas}};
  if (!r.failure.empty()) j["solve"]["failure"] = r.failure;

  j["regions"] = nlohmann::json::object();
  for (const auto& region : r.results.regions)
    j["regions"][region.name] = {{"volume", region.volume},
                                 {"temperature", stats_json(region.temperature, units)},
                                 {"hottest_point", location_json(region.hottest, units)},
                                 {"heat_generated", region.heat_generated}};
  j["boundaries"] = nlohmann::json::object();
  for (std::size_t b = 0; b < r.results.boundaries.size(); ++b) {
    const auto& boundary = r.results.boundaries[b];
    auto& entry = j["boundaries"][boundary.name];
    entry = {{"area", boundary.area},
             {"heat_rate", boundary.heat_rate},
             {"temperature", stats_json(boundary.temperature, units)},
             {"internal", boundary.internal}};
    if (b < r.boundary_conditions.size()) entry["condition"] = r.boundary_conditions[b];
  }
  const auto& eb = r.results.balance;
  j["energy_balance"] = {{"boundary_in", eb.boundary_in},
                         {"boundary_out", eb.boundary_out},
                         {"sources", eb.sources},
                         {"stored", eb.stored},
                         {"relative_imbalance", eb.relative_imbalance}};
  j["probes"] = nlohmann::json::object();
  for (const auto& p : r.probes)
    j["probes"][p.name] = {{"temperature", units.from_kelvin(p.temperature)}, {"point", location_json(p.point, units)}};
  j["safety"] = {{"touch", nlohmann::json::object()}, {"service", nlohmann::json::object()}};
  for (const auto& s : r.service)
    j["safety"]["service"][s.material] = {{"max", units.from_kelvin(s.max)},
                                          {"location", location_json(s.location, units)},
                                          {"limit", units.from_kelvin(s.limit)},
                                          {"exceeded", s.max > s.limit}};
  for (const auto& t : r.touch)
    j["safety"]["touch"][t.surface] = {{"max", units.from_kelvin(t.max)},
                                       {"location", location_json(t.location, units)},
                                       {"limit", units.from_kelvin(t.limit)},
                                       {"exceeded", t.max > t.limit},
                                       {"first_exceeded_time", nullptr}};  // steady: no time
  j["warnings"] = r.warnings;
  return j;
}

void write_summary(const std::filesystem::path& path, const nlohmann::json& summary) {
  write_text_file(path, summary.dump(2) + "\n");
}

}  // namespace hearth
