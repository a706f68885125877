// The case reader's contract on arbitrary bytes: accepted values in range, refusals
// that say where.
#include "tests/fuzz/case_reader_contract.hpp"

#include <cmath>
#include <fstream>
#include <random>

#include "io/case_file.hpp"
#include "io/input_error.hpp"

namespace hearth::fuzz {

namespace fs = std::filesystem;

namespace {

const std::string set_prefix = "#--set ";

[[noreturn]] void violated(const std::string& what) { throw ContractViolation("case reader contract: " + what); }

void require(bool condition, const std::string& what) {
  if (!condition) violated(what);
}

bool finite_positive(double x) { return std::isfinite(x) && x > 0.0; }
bool finite_kelvin(double t) { return std::isfinite(t) && t >= 0.0; }

// A table in temperature: x strictly increasing kelvin, y finite and > 0.
void check_table(const PiecewiseLinear& table, const std::string& name) {
  require(!table.y.empty() && table.x.size() == table.y.size(), name + ": a table with no rows or ragged columns");
  for (std::size_t i = 0; i < table.x.size(); ++i) {
    require(finite_positive(table.y[i]), name + ": value " + std::to_string(table.y[i]) + " is not > 0");
    if (table.x.size() > 1) require(finite_kelvin(table.x[i]), name + ": temperature below 0 K");
    if (i > 0) require(table.x[i] > table.x[i - 1], name + ": temperatures not increasing");
  }
}

// K symmetric positive definite by Sylvester's criterion (leading minors > 0).
void check_tensor(const Matrix3& K, const std::string& name) {
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j) require(std::isfinite(K[i][j]) && K[i][j] == K[j][i], name + ": not symmetric");
  const double minor_2 = K[0][0] * K[1][1] - K[0][1] * K[1][0];
  const double det = K[0][0] * (K[1][1] * K[2][2] - K[1][2] * K[2][1]) -
                     K[0][1] * (K[1][0] * K[2][2] - K[1][2] * K[2][0]) +
                     K[0][2] * (K[1][0] * K[2][1] - K[1][1] * K[2][0]);
  require(K[0][0] > 0.0 && minor_2 > 0.0 && det > 0.0, name + ": not positive definite");
}

void check_conductivity(const Conductivity& k, const std::string& name) {
  switch (k.kind) {
    case Conductivity::Kind::isotropic:
      check_table(k.principal[0], name);
      return;
    case Conductivity::Kind::orthotropic:
      for (const PiecewiseLinear& table : k.principal) check_table(table, name);
      for (const auto& axis : k.axes) {
        const double length = std::sqrt(axis[0] * axis[0] + axis[1] * axis[1] + axis[2] * axis[2]);
        require(std::abs(length - 1.0) < 1e-9, name + ": principal axis not of unit length");
      }
      return;
    case Conductivity::Kind::tensor:
      check_tensor(k.tensor, name);
      return;
  }
  violated(name + ": unknown conductivity kind");
}

void check_point(const std::array<double, 3>& p, const std::string& name) {
  for (double x : p) require(std::isfinite(x), name + ": coordinate not finite");
}

// A transient analysis: positive duration and first step no longer than it, a starting
// field, output times increasing in (0, duration] and ending at the duration, and the
// heat capacity of every material used.
void check_transient(const Case& c) {
  const TransientSpec& t = c.transient;
  require(finite_positive(t.duration), "analysis.duration not > 0");
  require(finite_positive(t.time_step) && t.time_step <= t.duration, "analysis.time_step not in (0, duration]");
  require(finite_positive(t.step_tolerance), "analysis.time_stepping.tolerance not > 0");
  require(t.method == "bdf2" || t.method == "backward_euler", "analysis.time_stepping.method unknown");
  const int starts = int(t.initial_temperature.has_value()) + int(!t.initial_by_region.empty()) +
                     int(t.initial_result.has_value());
  require(starts == 1, "analysis.initial_temperature: not exactly one starting field");
  if (t.initial_temperature) require(finite_kelvin(*t.initial_temperature), "analysis.initial_temperature below 0 K");
  if (!t.initial_by_region.empty())
    for (const auto& [region, material] : c.regions) {
      require(t.initial_by_region.count(region) == 1, "analysis.initial_temperature: no value for region " + region);
      require(finite_kelvin(t.initial_by_region.at(region)), "analysis.initial_temperature." + region + " below 0 K");
    }
  if (t.initial_result) require(t.initial_result->is_absolute(), "analysis.initial_temperature.result not absolute");
  require(!t.output_times.empty() && t.output_times.back() == t.duration, "output times do not end at the duration");
  for (std::size_t i = 0; i < t.output_times.size(); ++i) {
    require(t.output_times[i] > 0.0 && t.output_times[i] <= t.duration, "an output time outside (0, duration]");
    if (i > 0) require(t.output_times[i] > t.output_times[i - 1], "output times not increasing");
  }
  for (const auto& [region, material] : c.regions) {
    const MaterialSpec& m = c.materials.at(material);
    require(m.density && m.specific_heat, "materials." + material + ": no heat capacity in a transient analysis");
  }
}

// A {vs_time: ...} table: times from 0 on, not decreasing, a time at most twice (a
// step); values finite, temperatures not below 0 K, film coefficients > 0; it belongs to
// a boundary or region of the case.
void check_time_table(const TimeVaryingValue& value, const Case& c) {
  using Target = TimeVaryingValue::Target;
  const std::string name = "vs_time table of " + value.name;
  const TimeTable& table = value.table;
  require(c.analysis_type == "transient", name + " in a steady analysis");
  require(!table.t.empty() && table.t.size() == table.v.size(), name + ": no rows or ragged columns");
  for (std::size_t i = 0; i < table.t.size(); ++i) {
    require(std::isfinite(table.t[i]) && table.t[i] >= 0.0, name + ": a time before 0 s");
    if (i > 0) require(table.t[i] >= table.t[i - 1], name + ": times decreasing");
    if (i > 1) require(!(table.t[i] == table.t[i - 1] && table.t[i] == table.t[i - 2]), name + ": a time three times");
    require(std::isfinite(table.v[i]), name + ": a value not finite");
    switch (value.target) {
      case Target::temperature:
      case Target::convection_ambient:
      case Target::radiation_surroundings:
        require(table.v[i] >= 0.0, name + ": a temperature below 0 K");
        break;
      case Target::convection_coefficient:
        require(table.v[i] > 0.0, name + ": a film coefficient not > 0");
        break;
      case Target::heat_flux:
      case Target::heat_source:
        break;
    }
  }
  const bool region = value.target == Target::heat_source;
  require(region ? c.heat_sources.count(value.name) == 1 : c.boundaries.count(value.name) == 1,
          name + ": not a " + std::string(region ? "heat source" : "boundary") + " of the case");
}

// Every value of an accepted case lies in the range io/case.hpp states.
void check_accepted(const Case& c) {
  require(finite_positive(c.mesh_size), "mesh.size not > 0");
  require(c.mesh_order == 1 || c.mesh_order == 2, "mesh.order not 1 or 2");
  require(c.mesh_refinements >= 0, "mesh.refinements negative");
  for (const auto& [name, size] : c.local_sizes) require(finite_positive(size), "mesh.local_sizes." + name + " not > 0");
  std::error_code error;
  require(fs::is_regular_file(c.geometry_file, error), "geometry.file accepted but is not a file");

  require(!c.materials.empty() && !c.regions.empty(), "a case without materials or regions accepted");
  for (const auto& [name, material] : c.materials) {
    const std::string key = "materials." + name;
    check_conductivity(material.conductivity, key + ".conductivity");
    if (material.density) check_table(*material.density, key + ".density");
    if (material.specific_heat) check_table(*material.specific_heat, key + ".specific_heat");
    if (material.max_service_temperature)
      require(finite_kelvin(*material.max_service_temperature), key + ".max_service_temperature below 0 K");
  }
  for (const auto& [region, material] : c.regions)
    require(c.materials.count(material) == 1, "regions." + region + " names an undefined material");
  for (const auto& [region, rate] : c.heat_sources) {
    require(c.regions.count(region) == 1, "heat_sources." + region + " is not a region");
    require(std::isfinite(rate), "heat_sources." + region + " not finite");
  }

  for (const auto& [name, b] : c.boundaries) {
    const std::string key = "boundaries." + name;
    require(b.temperature || b.heat_flux || b.convection || b.radiation, key + ": no condition");
    if (b.temperature) {
      require(finite_kelvin(*b.temperature), key + ".temperature below 0 K");
      require(!b.heat_flux && !b.convection && !b.radiation, key + ": temperature combined with another condition");
    }
    if (b.heat_flux) require(std::isfinite(*b.heat_flux), key + ".heat_flux not finite");
    if (b.convection) {
      check_table(b.convection->coefficient, key + ".convection.coefficient");
      require(finite_kelvin(b.convection->ambient), key + ".convection.ambient below 0 K");
    }
    if (b.radiation) {
      const double e = b.radiation->emissivity;
      require(e > 0.0 && e <= 1.0, key + ".radiation.emissivity outside (0, 1]");
      require(finite_kelvin(b.radiation->surroundings), key + ".radiation.surroundings below 0 K");
    }
  }
  for (const auto& [name, spec] : c.interfaces)
    require(finite_positive(spec.conductance), "interfaces." + name + ".conductance not > 0");

  if (c.analysis_type == "transient") check_transient(c);
  else require(c.analysis_type == "steady", "analysis.type neither steady nor transient");
  for (const TimeVaryingValue& value : c.time_varying) check_time_table(value, c);
  for (const ThresholdSpec& threshold : c.thresholds) {
    require(c.analysis_type == "transient", "thresholds." + threshold.name + " in a steady analysis");
    require(finite_kelvin(threshold.temperature), "thresholds." + threshold.name + " below 0 K");
  }

  require(c.solver.tolerance > 0.0 && c.solver.tolerance < 1.0, "solver.tolerance outside (0, 1)");
  require(c.solver.nonlinear_tolerance > 0.0 && c.solver.nonlinear_tolerance < 1.0,
          "solver.nonlinear.tolerance outside (0, 1)");
  require(c.solver.nonlinear_max_iterations >= 1, "solver.nonlinear.max_iterations < 1");
  require(finite_kelvin(c.touch_limit), "safety.touch_limit below 0 K");
  for (const ProbeSpec& probe : c.probes) check_point(probe.point, "probes." + probe.name);
  for (const LineSpec& line : c.lines) {
    check_point(line.from, "lines." + line.name + ".from");
    check_point(line.to, "lines." + line.name + ".to");
    require(line.points >= 2, "lines." + line.name + ".points < 2");
  }
  require(c.output_directory.is_absolute(), "output.directory not made absolute");
}

// A refusal names the case file (or the --set that caused it), as every input error
// must say where.
void check_refused(const InputError& e, const fs::path& case_path) {
  const std::string message = e.what();
  const bool names_place = message.rfind(case_path.string(), 0) == 0 || message.rfind("--set ", 0) == 0;
  require(names_place, "the message does not start with the case file or the --set: '" + message + "'");
}

}  // namespace

CaseInput split_case_input(std::string_view bytes) {
  CaseInput input;
  input.text = bytes;
  std::string_view rest = bytes;
  while (rest.substr(0, set_prefix.size()) == set_prefix) {
    const std::size_t end = rest.find('\n');
    const std::string_view line = rest.substr(set_prefix.size(), end == std::string_view::npos ? end : end - set_prefix.size());
    input.overrides.emplace_back(line);
    if (end == std::string_view::npos) break;
    rest.remove_prefix(end + 1);
  }
  return input;
}

const std::vector<std::string>& CaseFolder::geometry_names() {
  // The names the example cases, the command-line tests and the dictionary use.
  static const std::vector<std::string> names = {"wall.geo",  "door.geo",   "slab.geo",     "box.geo",
                                                 "blocks.geo", "layers.geo", "standoff.geo", "bracket.step",
                                                 "part.stp",   "part.brep",  "part.msh"};
  return names;
}

CaseFolder::CaseFolder() {
  std::random_device random;
  directory_ = fs::temp_directory_path() / ("hearth_fuzz_case_" + std::to_string(random()));
  fs::create_directories(directory_);
  for (const std::string& name : geometry_names()) std::ofstream(directory_ / name) << "// placeholder\n";
}

CaseFolder::~CaseFolder() {
  std::error_code ignored;
  fs::remove_all(directory_, ignored);
}

CaseVerdict read_case_under_contract(std::string_view bytes, const CaseFolder& folder) {
  const CaseInput input = split_case_input(bytes);
  Case c;
  try {
    c = read_case_text(input.text, folder.case_path(), input.overrides);
  } catch (const InputError& e) {
    check_refused(e, folder.case_path());
    return CaseVerdict::refused;
  }
  check_accepted(c);
  return CaseVerdict::accepted;
}

}  // namespace hearth::fuzz
