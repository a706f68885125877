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

nlohmann::json heat_rates_json(const Results& results) {
  nlohmann::json out = nlohmann::json::object();
  for (const auto& b : results.boundaries) out[b.name] = b.heat_rate;
  return out;
}

// Transient: the run's settings and counts, the history per output time, thresholds,
// the touch check over time, and the energy balance over the whole run (J).
void add_transient(nlohmann::json& j, const RunRecord& r, const TransientRecord& t, const Units& units) {
  j["analysis"] = {{"type", "transient"},
                   {"method", t.method},
                   {"adaptive", t.adaptive},
                   {"tolerance", t.tolerance},
                   {"duration", t.duration},
                   {"end_time", t.end_time},
                   {"completed", !t.interrupted && t.end_time >= t.duration * (1 - 1e-12)},
                   {"interrupted", t.interrupted},
                   {"steps", t.steps},
                   {"rejected_steps", t.rejected_steps},
                   {"failed_steps", t.failed_steps},
                   {"initial_temperature", {{"from", t.initial_from},
                                            {"min", units.from_kelvin(t.initial_min)},
                                            {"max", units.from_kelvin(t.initial_max)}}},
                   {"fields", t.field_files}};
  j["solve"]["time_steps"] = t.steps;
  j["solve"]["newton_iterations"] = t.newton_iterations;
  j["solve"]["preconditioner_setups"] = t.preconditioner_setups;
  j["solve"]["matrix_reuses"] = t.matrix_reuses;
  j["solve"]["first_step_seconds"] = t.first_step_seconds;
  const EnergyBalance& eb = t.energy;
  j["energy_balance"] = {{"boundary_in", eb.boundary_in},
                         {"boundary_out", eb.boundary_out},
                         {"sources", eb.sources},
                         {"stored", eb.stored},
                         {"relative_imbalance", eb.relative_imbalance},
                         {"unit", "J"},
                         {"over", "the whole run: heat in and out through the surfaces, generated, and the change "
                                  "in stored energy"}};
  j["final_rates"] = {{"heat_rates", heat_rates_json(r.results)},
                      {"storage_rate", r.results.balance.stored},
                      {"unit", "W"}};
  nlohmann::json history = nlohmann::json::array();
  for (const auto& h : t.history) {
    nlohmann::json entry = {{"time", h.time}};
    entry["regions"] = nlohmann::json::object();
    for (const auto& region : h.results.regions) entry["regions"][region.name] = stats_json(region.temperature, units);
    entry["boundaries"] = nlohmann::json::object();
    for (const auto& b : h.results.boundaries)
      entry["boundaries"][b.name] = {{"heat_rate", b.heat_rate}, {"temperature", stats_json(b.temperature, units)}};
    entry["storage_rate"] = h.results.balance.stored;
    history.push_back(entry);
  }
  j["history"] = history;
  j["thresholds"] = nlohmann::json::object();
  for (const auto& th : t.thresholds)
    j["thresholds"][th.name] = {{th.kind, th.target},
                                {"temperature", units.from_kelvin(th.temperature)},
                                {"start_value", units.from_kelvin(th.start_value)},
                                {"first_crossed_time", th.first_crossed ? nlohmann::json(*th.first_crossed) : nullptr}};
  for (const auto& touch : r.touch) {
    auto& entry = j["safety"]["touch"][touch.surface];
    entry["first_exceeded_time"] = touch.first_exceeded_time ? nlohmann::json(*touch.first_exceeded_time) : nullptr;
    entry["time_of_max"] = touch.time_of_max ? nlohmann::json(*touch.time_of_max) : nullptr;
  }
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
  if (r.nonlinear_relative_residual) j["solve"]["nonlinear_relative_residual"] = *r.nonlinear_relative_residual;
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
                         {"relative_imbalance", eb.relative_imbalance},
                         {"unit", "W"}};
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
  if (r.transient) add_transient(j, r, *r.transient, units);
  return j;
}

void write_summary(const std::filesystem::path& path, const nlohmann::json& summary) {
  write_text_file(path, summary.dump(2) + "\n");
}

}  // namespace hearth
