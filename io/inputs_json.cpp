// The Case back to JSON in the case's units.
#include "io/inputs_json.hpp"

namespace hearth {

namespace {

using nlohmann::json;

// A constant as a number; a table as {vs_temperature: [[T, value], ...]} (T in the case's unit).
json property_json(const PiecewiseLinear& p, const Units& units) {
  if (p.is_constant()) return p.y.empty() ? json(nullptr) : json(p.y.front());
  json rows = json::array();
  for (std::size_t i = 0; i < p.x.size(); ++i) rows.push_back({units.from_kelvin(p.x[i]), p.y[i]});
  return {{"vs_temperature", rows}};
}

json matrix_json(const Matrix3& m) {
  json rows = json::array();
  for (const auto& row : m) rows.push_back({row[0], row[1], row[2]});
  return rows;
}

json conductivity_json(const Conductivity& k, const Units& units) {
  switch (k.kind) {
    case Conductivity::Kind::isotropic:
      return {{"kind", "isotropic"}, {"value", property_json(k.principal[0], units)}};
    case Conductivity::Kind::orthotropic: {
      json principal = json::array();
      for (const auto& p : k.principal) principal.push_back(property_json(p, units));
      return {{"kind", "orthotropic"}, {"principal", principal}, {"axes", matrix_json(k.axes)}};
    }
    case Conductivity::Kind::tensor:
      return {{"kind", "tensor"}, {"tensor", matrix_json(k.tensor)}};
  }
  return nullptr;
}

json optional_property(const std::optional<PiecewiseLinear>& p, const Units& units) {
  return p ? property_json(*p, units) : json(nullptr);
}

// {vs_time: [[t, value], ...]}, temperatures in the case's unit.
json time_table_json(const TimeTable& table, bool temperature, const Units& units) {
  json rows = json::array();
  for (std::size_t i = 0; i < table.t.size(); ++i)
    rows.push_back({table.t[i], temperature ? units.from_kelvin(table.v[i]) : table.v[i]});
  return {{"vs_time", rows}};
}

json optional_temperature(const std::optional<double>& v, const Units& units) {
  return v ? json(units.from_kelvin(*v)) : json(nullptr);
}

}  // namespace

json inputs_json(const Case& c) {
  const Units& u = c.units;
  const double per_length = 1.0 / u.metres_per_length();
  json j;
  j["title"] = c.title;
  j["temperature_unit"] = u.temperature;
  j["length_unit"] = u.length;
  j["analysis"] = {{"type", c.analysis_type}};
  if (c.analysis_type == "transient") {
    const TransientSpec& t = c.transient;
    json& a = j["analysis"];
    a["duration"] = t.duration;
    a["time_step"] = t.time_step;
    a["method"] = t.method;
    a["adaptive"] = t.adaptive;
    a["tolerance"] = t.step_tolerance;
    a["output_times"] = t.output_times;
    if (t.initial_temperature) a["initial_temperature"] = u.from_kelvin(*t.initial_temperature);
    if (!t.initial_by_region.empty()) {
      a["initial_temperature"] = {{"regions", json::object()}};
      for (const auto& [region, value] : t.initial_by_region)
        a["initial_temperature"]["regions"][region] = u.from_kelvin(value);
    }
    if (t.initial_result) a["initial_temperature"] = {{"result", t.initial_result->string()}};
  }
  j["mesh"] = {{"size", c.mesh_size * per_length}, {"order", c.mesh_order}, {"refinements", c.mesh_refinements},
               {"local_sizes", json::object()}};
  for (const auto& [name, size] : c.local_sizes) j["mesh"]["local_sizes"][name] = size * per_length;

  j["materials"] = json::object();
  for (const auto& [name, m] : c.materials) {
    json regions = json::array();
    for (const auto& [region, material] : c.regions)
      if (material == name) regions.push_back(region);
    j["materials"][name] = {{"regions", regions},
                            {"library", m.library.empty() ? json(nullptr) : json(m.library)},
                            {"conductivity", conductivity_json(m.conductivity, u)},
                            {"density", optional_property(m.density, u)},
                            {"specific_heat", optional_property(m.specific_heat, u)},
                            {"max_service_temperature", optional_temperature(m.max_service_temperature, u)}};
  }
  j["regions"] = c.regions;
  j["heat_sources"] = c.heat_sources;

  j["boundaries"] = json::object();
  for (const auto& [name, b] : c.boundaries) {
    json entry = json::object();
    if (b.temperature) entry["temperature"] = u.from_kelvin(*b.temperature);
    if (b.heat_flux) entry["heat_flux"] = *b.heat_flux;
    if (b.convection)
      entry["convection"] = {{"coefficient", property_json(b.convection->coefficient, u)},
                             {"ambient", u.from_kelvin(b.convection->ambient)}};
    if (b.radiation)
      entry["radiation"] = {{"emissivity", b.radiation->emissivity},
                            {"surroundings", u.from_kelvin(b.radiation->surroundings)}};
    j["boundaries"][name] = entry;
  }
  // Values that follow a table in time replace their value at t = 0 above.
  for (const TimeVaryingValue& v : c.time_varying) {
    using T = TimeVaryingValue::Target;
    const bool temperature = v.target == T::temperature || v.target == T::convection_ambient ||
                             v.target == T::radiation_surroundings;
    const json table = time_table_json(v.table, temperature, u);
    switch (v.target) {
      case T::temperature: j["boundaries"][v.name]["temperature"] = table; break;
      case T::heat_flux: j["boundaries"][v.name]["heat_flux"] = table; break;
      case T::convection_coefficient: j["boundaries"][v.name]["convection"]["coefficient"] = table; break;
      case T::convection_ambient: j["boundaries"][v.name]["convection"]["ambient"] = table; break;
      case T::radiation_surroundings: j["boundaries"][v.name]["radiation"]["surroundings"] = table; break;
      case T::heat_source: j["heat_sources"][v.name] = table; break;
    }
  }
  j["interfaces"] = json::object();
  for (const auto& [name, i] : c.interfaces) j["interfaces"][name] = {{"conductance", i.conductance}};
  j["safety"] = {{"touch_surfaces", c.touch_surfaces}, {"touch_limit", u.from_kelvin(c.touch_limit)}};
  return j;
}

}  // namespace hearth
