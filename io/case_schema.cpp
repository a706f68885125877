// The case-file schema table (format version 1) and its Markdown reference.
#include "io/case_schema.hpp"

#include <cmath>
#include <sstream>

namespace hearth {

namespace {

constexpr double inf = std::numeric_limits<double>::infinity();

const Range any_value{};
const Range positive{0.0, inf, true, false};
const Range non_negative{0.0, inf, false, false};
const Range open_unit{0.0, 1.0, true, true};
const Range above_zero_to_one{0.0, 1.0, true, false};
const Range at_least_one{1.0, inf, false, false};
const Range at_least_two{2.0, inf, false, false};
const Range only_one{1.0, 1.0, false, false};

using K = KeyKind;

// Columns: key, kind, required, default, choices, range, unit, doc, not yet supported,
// accepted map forms of a number.
// Parents come before their children.
const std::vector<KeySpec> schema_table = {
    {"version", K::integer, false, "1", "", only_one, "", "case-file format version", "", ""},
    {"title", K::text, false, "", "", any_value, "", "free text for reports", "", ""},

    {"units", K::section, false, "", "", any_value, "", "units that lengths and temperatures are written in", "", ""},
    {"units.length", K::choice, false, "m", "m|mm", any_value, "", "unit of every length in this file and of result coordinates", "", ""},
    {"units.temperature", K::choice, false, "degC", "degC|K", any_value, "", "unit of every temperature in this file and in results", "", ""},

    {"geometry", K::section, true, "", "", any_value, "", "the solid", "", ""},
    {"geometry.file", K::path, true, "", "", any_value, "", "geometry script (.geo), CAD file (.step, .stp, .brep) or mesh (.msh), relative to this file", "", ""},

    {"mesh", K::section, true, "", "", any_value, "", "meshing", "", ""},
    {"mesh.size", K::number, true, "", "", positive, "length", "target element size", "", ""},
    {"mesh.order", K::choice, false, "1", "1|2", any_value, "", "1: 4-node tets, 2: 10-node tets", "", ""},
    {"mesh.local_sizes", K::names, false, "", "", any_value, "", "smaller element sizes near named boundaries or regions", "", ""},
    {"mesh.local_sizes.*", K::number, false, "", "", positive, "length", "element size near this boundary or region", "", ""},
    {"mesh.refinements", K::integer, false, "0", "", non_negative, "", "uniform splits of every element after meshing", "", ""},

    {"materials", K::names, true, "", "", any_value, "", "material name -> properties", "", ""},
    {"materials.*", K::section, false, "", "", any_value, "", "one material", "", ""},
    {"materials.*.library", K::text, false, "", "", any_value, "", "name of an entry of the shipped material library ('hearth materials' lists them); keys given beside it override single properties", "", ""},
    {"materials.*.conductivity", K::number, false, "", "", positive, "W/(m K)", "thermal conductivity (required unless library is given): isotropic constant, table in temperature, orthotropic in principal axes or a full symmetric positive-definite tensor", "", "vs_temperature|principal|tensor"},
    {"materials.*.density", K::number, false, "", "", positive, "kg/m3", "density (transient only): a constant or a table in temperature", "", "vs_temperature"},
    {"materials.*.specific_heat", K::number, false, "", "", positive, "J/(kg K)", "specific heat capacity (transient only): a constant or a table in temperature", "", "vs_temperature"},
    {"materials.*.max_service_temperature", K::number, false, "", "", any_value, "temperature", "exceeding it anywhere in the material gives a warning", "", ""},

    {"regions", K::names, true, "", "", any_value, "", "physical volume name -> material name; every volume must be assigned", "", ""},
    {"regions.*", K::text, false, "", "", any_value, "", "name of a material defined under materials", "", ""},

    {"heat_sources", K::names, false, "", "", any_value, "", "physical volume name -> volumetric heat source", "", ""},
    {"heat_sources.*", K::number, false, "", "", any_value, "W/m3", "heat generated per unit volume: a constant or (transient) a table in time", "", "vs_time"},

    {"boundaries", K::names, false, "", "", any_value, "", "physical surface name -> condition; unlisted surfaces are insulated", "", ""},
    {"boundaries.*", K::section, false, "", "", any_value, "", "one surface's condition: temperature, or any of heat_flux, convection and radiation", "", ""},
    {"boundaries.*.temperature", K::number, false, "", "", any_value, "temperature", "fixed temperature; excludes the other conditions", "", "vs_time"},
    {"boundaries.*.heat_flux", K::number, false, "", "", any_value, "W/m2", "heat flux into the body; 0 is insulated", "", "vs_time"},
    {"boundaries.*.convection", K::section, false, "", "", any_value, "", "heat exchange with a fluid: q = h (T_ambient - T)", "", ""},
    {"boundaries.*.convection.coefficient", K::number, true, "", "", positive, "W/(m2 K)", "film coefficient h: a constant, a table in the surface temperature, or (transient) a table in time", "", "vs_temperature|vs_time"},
    {"boundaries.*.convection.ambient", K::number, true, "", "", any_value, "temperature", "fluid temperature away from the surface", "", "vs_time"},
    {"boundaries.*.radiation", K::section, false, "", "", any_value, "", "grey surface radiating to large surroundings: q = emissivity sigma (T_surroundings^4 - T^4), absolute temperatures", "", ""},
    {"boundaries.*.radiation.emissivity", K::number, true, "", "", above_zero_to_one, "", "emissivity of the surface (grey)", "", ""},
    {"boundaries.*.radiation.surroundings", K::number, true, "", "", any_value, "temperature", "temperature of the surroundings", "", "vs_time"},

    {"interfaces", K::names, false, "", "", any_value, "", "thermal contact conductance across named internal surfaces (the temperature jumps across them)", "", ""},
    {"interfaces.*", K::section, false, "", "", any_value, "", "one internal surface between two regions", "", ""},
    {"interfaces.*.conductance", K::number, true, "", "", positive, "W/(m2 K)", "contact conductance", "", ""},

    {"safety", K::section, false, "", "", any_value, "", "surfaces people may touch, checked against a temperature limit", "", ""},
    {"safety.touch_surfaces", K::name_list, true, "", "", any_value, "", "physical surface names; any above touch_limit is a warning", "", ""},
    {"safety.touch_limit", K::number, false, "", "", any_value, "temperature", "highest temperature allowed on the touch surfaces; default 60 degC (common practice, no source: see the contact-burn standards and local regulations)", "", ""},

    {"analysis", K::section, false, "", "", any_value, "", "what to solve", "", ""},
    {"analysis.type", K::choice, false, "steady", "steady|transient", any_value, "", "steady state or time history", "", ""},
    {"analysis.duration", K::number, false, "", "", positive, "s", "transient (required): time simulated", "", ""},
    {"analysis.time_step", K::number, false, "", "", positive, "s", "transient (required): first step, or every step when adaptive is false", "", ""},
    {"analysis.time_stepping", K::section, false, "", "", any_value, "", "transient: time integration", "", ""},
    {"analysis.time_stepping.method", K::choice, false, "bdf2", "bdf2|backward_euler", any_value, "", "implicit time-integration method", "", ""},
    {"analysis.time_stepping.adaptive", K::boolean, false, "true", "", any_value, "", "adapt the step to the local error estimate", "", ""},
    {"analysis.time_stepping.tolerance", K::number, false, "0.1", "", positive, "K", "allowed local temperature error per step", "", ""},
    {"analysis.initial_temperature", K::number, false, "", "", any_value, "temperature", "transient (required): starting temperature: a number, {regions: {NAME: number, ...}} for every region, or {result: FOLDER} for the field of an earlier result (its mesh is reused)", "", "regions|result"},
    {"analysis.output_times", K::number_list, false, "", "", non_negative, "s", "transient: times at which fields are written (the end time is always written; default: ten even intervals)", "", ""},

    {"thresholds", K::names, false, "", "", any_value, "", "transient: name -> a temperature whose first crossing time is reported", "", ""},
    {"thresholds.*", K::section, false, "", "", any_value, "", "one threshold: exactly one of probe, region_max and surface_mean, and the temperature", "", ""},
    {"thresholds.*.probe", K::text, false, "", "", any_value, "", "a probe's name: its temperature is watched", "", ""},
    {"thresholds.*.region_max", K::text, false, "", "", any_value, "", "a region's name: its hottest point is watched", "", ""},
    {"thresholds.*.surface_mean", K::text, false, "", "", any_value, "", "a surface's name: its area-mean temperature is watched", "", ""},
    {"thresholds.*.temperature", K::number, true, "", "", any_value, "temperature", "the level; crossed in either direction from the starting value", "", ""},

    {"solver", K::section, false, "", "", any_value, "", "linear and nonlinear solution settings", "", ""},
    {"solver.linear", K::choice, false, "auto", "auto|direct|iterative", any_value, "", "linear solver: sparse Cholesky, multigrid-preconditioned CG, or chosen by size", "", ""},
    {"solver.tolerance", K::number, false, "1e-10", "", open_unit, "", "relative residual of the linear solve", "", ""},
    {"solver.nonlinear", K::section, false, "", "", any_value, "", "Newton iterations for temperature-dependent conductivity, film coefficients and radiation", "", ""},
    {"solver.nonlinear.tolerance", K::number, false, "1e-8", "", open_unit, "", "relative size of the Newton update", "", ""},
    {"solver.nonlinear.max_iterations", K::integer, false, "30", "", at_least_one, "", "most Newton iterations", "", ""},

    {"probes", K::names, false, "", "", any_value, "", "probe name -> point where the temperature is reported", "", ""},
    {"probes.*", K::point, false, "", "", any_value, "length", "[x, y, z]", "", ""},

    {"lines", K::names, false, "", "", any_value, "", "line name -> straight line sampled at evenly spaced points (CSV)", "", ""},
    {"lines.*", K::section, false, "", "", any_value, "", "one line", "", ""},
    {"lines.*.from", K::point, true, "", "", any_value, "length", "start point [x, y, z]", "", ""},
    {"lines.*.to", K::point, true, "", "", any_value, "length", "end point [x, y, z]", "", ""},
    {"lines.*.points", K::integer, false, "101", "", at_least_two, "", "number of sample points, ends included", "", ""},

    {"output", K::section, false, "", "", any_value, "", "where results go", "", ""},
    {"output.directory", K::path, false, "results", "", any_value, "", "results folder, relative to this file unless --out is given", "", ""},
    {"output.report", K::boolean, false, "false", "", any_value, "", "also make the report at the end of the run (pictures, plots and report.html, as hearth report does)", "", ""},
    {"output.report_mesh_edges", K::boolean, false, "false", "", any_value, "", "draw the element edges on the report's surface pictures", "", ""},
    {"output.compression", K::choice, false, "lz4", "lz4|zlib|none", any_value, "", "compression of the binary VTK files: lz4 (fast to write and read), zlib (about a quarter smaller, some fifteen times slower to write) or none", "", ""},
};

std::string parent_of(const std::string& key) {
  const std::size_t dot = key.rfind('.');
  return dot == std::string::npos ? std::string() : key.substr(0, dot);
}

std::string number_text(double x) {
  std::ostringstream out;
  out << x;
  return out.str();
}

const char* kind_name(KeyKind kind) {
  switch (kind) {
    case KeyKind::section: return "section";
    case KeyKind::names: return "names";
    case KeyKind::number: return "number";
    case KeyKind::integer: return "integer";
    case KeyKind::boolean: return "true/false";
    case KeyKind::text: return "text";
    case KeyKind::choice: return "choice";
    case KeyKind::path: return "path";
    case KeyKind::point: return "[x, y, z]";
    case KeyKind::number_list: return "list of numbers";
    case KeyKind::name_list: return "list of names";
  }
  return "";
}

std::string allowed_text(const KeySpec& spec) {
  if (spec.kind == KeyKind::choice) {
    std::string text;
    for (const std::string& choice : split_choices(spec.choices))
      text += (text.empty() ? "`" : ", `") + choice + "`";
    return text;
  }
  return spec.range.str();
}

std::string unit_text(const std::string& unit) {
  if (unit == "length") return "units.length";
  if (unit == "temperature") return "units.temperature";
  return unit;
}

}  // namespace

bool Range::contains(double x) const {
  const bool above = low_open ? x > low : x >= low;
  const bool below = high_open ? x < high : x <= high;
  return above && below;
}

std::string Range::str() const {
  const bool has_low = std::isfinite(low), has_high = std::isfinite(high);
  if (has_low && has_high) {
    if (low == high) return number_text(low);
    return std::string("in ") + (low_open ? "(" : "[") + number_text(low) + ", " +
           number_text(high) + (high_open ? ")" : "]");
  }
  if (has_low) return (low_open ? "> " : ">= ") + number_text(low);
  if (has_high) return (high_open ? "< " : "<= ") + number_text(high);
  return "";
}

const std::vector<KeySpec>& case_schema() { return schema_table; }

const KeySpec* find_key_spec(const std::string& pattern) {
  for (const KeySpec& spec : schema_table)
    if (spec.key == pattern) return &spec;
  return nullptr;
}

std::vector<const KeySpec*> child_key_specs(const std::string& pattern) {
  std::vector<const KeySpec*> children;
  for (const KeySpec& spec : schema_table)
    if (parent_of(spec.key) == pattern) children.push_back(&spec);
  return children;
}

std::string last_key_part(const std::string& key) {
  const std::size_t dot = key.rfind('.');
  return dot == std::string::npos ? key : key.substr(dot + 1);
}

std::vector<std::string> split_choices(const std::string& choices) {
  std::vector<std::string> parts;
  std::size_t start = 0;
  while (start < choices.size()) {
    std::size_t bar = choices.find('|', start);
    if (bar == std::string::npos) bar = choices.size();
    parts.push_back(choices.substr(start, bar - start));
    start = bar + 1;
  }
  return parts;
}

std::string form_syntax(const std::string& form) {
  if (form == "vs_temperature") return "{vs_temperature: [[T, value], ...]}";
  if (form == "principal") return "{principal: [k1, k2, k3], axis_1: [x, y, z], axis_2: [x, y, z]}";
  if (form == "tensor") return "{tensor: [[k11, k12, k13], [k12, k22, k23], [k13, k23, k33]]}";
  if (form == "vs_time") return "{vs_time: [[t, value], ...]}";
  if (form == "regions") return "{regions: {NAME: value, ...}}";
  if (form == "result") return "{result: FOLDER}";
  return "{" + form + ": ...}";
}

std::string case_file_reference() {
  std::ostringstream out;
  out << "# Case-file reference (format version 1)\n\n"
         "A case file is YAML. Lengths are written in `units.length` and temperatures in\n"
         "`units.temperature`; every other quantity is SI. In a key, `*` stands for a name\n"
         "you choose (a material, a physical volume or surface of the geometry, a probe).\n"
         "Unknown keys are an error. Any value can be overridden from the command line with\n"
         "`--set KEY=VALUE`, KEY its dotted path: `--set mesh.size=0.01`,\n"
         "`--set materials.board.conductivity=0.08`,\n"
         "`--set boundaries.cold_face.convection.coefficient=8`; a list as\n"
         "`--set probes.tip=[0.1, 0, 0.05]`, a table as\n"
         "`--set 'materials.board.conductivity={vs_temperature: [[20, 0.06], [800, 0.14]]}'`.\n"
         "A key the file lacks is created, with the sections above it.\n"
         "A value that depends on temperature is written `{vs_temperature: [[T, value], ...]}`\n"
         "with T in `units.temperature`: at least 2 rows, T strictly increasing, linear between\n"
         "rows and held constant beyond the ends.\n";
  std::string section;
  for (const KeySpec& spec : schema_table) {
    const std::string top = spec.key.substr(0, spec.key.find('.'));
    const bool top_scalar = top == spec.key && spec.kind != KeyKind::section &&
                            spec.kind != KeyKind::names;
    const std::string heading = top_scalar ? "top level" : top;
    if (heading != section) {
      section = heading;
      out << "\n## " << (top_scalar ? section : "`" + section + "`") << "\n\n"
          << "| key | kind | required / default | allowed | unit | meaning |\n"
          << "| --- | --- | --- | --- | --- | --- |\n";
    }
    std::string status = spec.required ? "required" : "";
    if (!spec.default_value.empty()) status = "`" + spec.default_value + "`";
    std::string meaning = spec.doc;
    if (!spec.forms.empty()) {
      const std::vector<std::string> list = split_choices(spec.forms);
      std::string forms;
      for (std::size_t i = 0; i < list.size(); ++i)
        forms += std::string(i == 0 ? "" : i + 1 == list.size() ? " or " : ", ") + "`" + form_syntax(list[i]) + "`";
      meaning += "; besides a number: " + forms;
    }
    if (spec.not_yet == "*") {
      meaning += " (not supported by this version yet)";
    } else if (!spec.not_yet.empty()) {
      std::string forms;
      for (const std::string& form : split_choices(spec.not_yet))
        forms += (forms.empty() ? "" : ", ") +
                 (spec.kind == KeyKind::choice ? form : "{" + form + ": ...}");
      meaning += " (recognised but not supported by this version yet: " + forms + ")";
    }
    out << "| `" << spec.key << "` | " << kind_name(spec.kind) << " | " << status << " | "
        << allowed_text(spec) << " | " << unit_text(spec.unit) << " | " << meaning << " |\n";
  }
  return out.str();
}

}  // namespace hearth
