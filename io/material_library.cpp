// Material library: locating, reading and checking data/materials.yaml.
#include "io/material_library.hpp"

#include <yaml-cpp/yaml.h>

#include <algorithm>
#include <cstdlib>
#include <fstream>
#include <set>
#include <sstream>
#include <tuple>

#include "io/case.hpp"
#include "io/input_error.hpp"
#include "io/text_distance.hpp"
#include "io/yaml_values.hpp"

#ifndef HEARTH_SOURCE_DATA_DIR
#define HEARTH_SOURCE_DATA_DIR ""
#endif
#ifndef HEARTH_DATA_DIR_FROM_BIN
#define HEARTH_DATA_DIR_FROM_BIN "../share/hearth"
#endif

namespace hearth {

namespace fs = std::filesystem;

namespace {

constexpr const char* library_file_name = "materials.yaml";

const std::vector<std::string> top_keys = {"format", "temperature_unit", "materials"};
const std::vector<std::string> entry_keys = {"description", "conductivity", "density", "specific_heat",
                                             "max_service_temperature", "source"};

std::string join(const std::vector<std::string>& words) {
  std::string text;
  for (const std::string& word : words) text += (text.empty() ? "" : ", ") + word;
  return text;
}

bool contains(const std::vector<std::string>& words, const std::string& word) {
  return std::find(words.begin(), words.end(), word) != words.end();
}

std::string lowered(std::string text) {
  for (char& c : text) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return text;
}

struct LibraryReader {
  std::string file;
  Units units;

  Place place(const YAML::Node& key_node, const std::string& key) const {
    Place p;
    p.file = file;
    p.key = key;
    const YAML::Mark mark = key_node.Mark();
    p.line = mark.is_null() ? 0 : mark.line + 1;
    return p;
  }

  // Every key of `map` must be one of `allowed`; returns (name, key node, value) in order.
  std::vector<std::tuple<std::string, YAML::Node, YAML::Node>> items(const YAML::Node& map, const Place& where,
                                                                     const std::vector<std::string>* allowed) const {
    std::vector<std::tuple<std::string, YAML::Node, YAML::Node>> list;
    std::set<std::string> seen;
    for (const auto& item : map) {
      if (!item.first.IsScalar()) input_error(where, "a key must be a plain name, not a list or map");
      const std::string name = item.first.Scalar();
      const Place at = place(item.first, where.key.empty() ? name : where.key + "." + name);
      if (!seen.insert(name).second) input_error(at, "'" + name + "' is given twice; keep one");
      if (allowed && !contains(*allowed, name)) {
        Place bad = at;
        bad.key = where.key;
        const std::optional<std::string> near = nearest_word(name, *allowed);
        input_error(bad, "'" + name + "' is not a key" +
                             (where.key.empty() ? std::string(" of the library file") : "") + "; " +
                             (near ? "did you mean '" + *near + "'?" : "allowed keys here: " + join(*allowed)));
      }
      list.emplace_back(name, item.first, item.second);
    }
    return list;
  }

  double positive_number(const YAML::Node& value, const Place& where, const std::string& unit) const {
    const std::optional<double> x = yaml_number(value);
    if (!x) input_error(where, yaml_text(value) + " is not a number; expected a number > 0 (" + unit + ")");
    if (!(*x > 0.0)) input_error(where, value.Scalar() + " is not allowed; must be > 0 (" + unit + ")");
    return *x;
  }

  std::string text(const YAML::Node& value, const Place& where, const std::string& what) const {
    if (!value.IsScalar() || value.Scalar().empty())
      input_error(where, "expected " + what + ", found " + yaml_text(value));
    return value.Scalar();
  }

  Conductivity conductivity(const YAML::Node& value, const Place& where) const {
    if (value.IsScalar()) return Conductivity::isotropic(PiecewiseLinear(positive_number(value, where, "W/(m K)")));
    if (value.IsMap()) {
      static const std::vector<std::string> forms = {"vs_temperature"};
      const auto list = items(value, where, &forms);
      if (list.size() == 1) {
        const Place table_place = place(std::get<1>(list[0]), where.key + ".vs_temperature");
        return Conductivity::isotropic(
            read_temperature_table(std::get<2>(list[0]), table_place, units, {"T", "k", "W/(m K)"}));
      }
    }
    input_error(where, "expected a number > 0 (W/(m K)) or {vs_temperature: [[T, k], ...]} (T in " +
                           units.temperature + "), found " + yaml_text(value));
  }

  LibraryMaterial entry(const std::string& name, const YAML::Node& key_node, const YAML::Node& value) const {
    LibraryMaterial m;
    m.name = name;
    const Place where = place(key_node, "materials." + name);
    m.line = where.line;
    if (!value.IsMap()) input_error(where, "expected the entry's keys (" + join(entry_keys) + "), found " + yaml_text(value));
    bool has_conductivity = false;
    for (const auto& [key, node, item] : items(value, where, &entry_keys)) {
      const Place at = place(node, where.key + "." + key);
      if (key == "description") m.description = text(item, at, "one line of text");
      if (key == "source") m.source = text(item, at, "the source of the values (handbook, table, temperature range)");
      if (key == "conductivity") {
        m.conductivity = conductivity(item, at);
        has_conductivity = true;
      }
      if (key == "density") m.density = positive_number(item, at, "kg/m3");
      if (key == "specific_heat") m.specific_heat = positive_number(item, at, "J/(kg K)");
      if (key == "max_service_temperature") {
        const std::optional<double> t = yaml_number(item);
        if (!t) input_error(at, yaml_text(item) + " is not a number; expected a temperature (" + units.temperature + ")");
        m.max_service_temperature = units.to_kelvin(*t);
        if (*m.max_service_temperature <= 0.0) input_error(at, item.Scalar() + " " + units.temperature + " is not above absolute zero");
      }
    }
    if (m.description.empty()) input_error(where, "description: required key is missing; give one line of text");
    if (m.source.empty())
      input_error(where, "source: required key is missing; every entry names the source of its values "
                         "(handbook, table, temperature range)");
    if (!has_conductivity)
      input_error(where, "conductivity: required key is missing; give a number > 0 (W/(m K)) or {vs_temperature: ...}");
    return m;
  }
};

fs::path program_folder() {
  std::error_code error;
  const fs::path exe = fs::read_symlink("/proc/self/exe", error);
  return error ? fs::path() : exe.parent_path();
}

}  // namespace

const LibraryMaterial* MaterialLibrary::find(const std::string& name) const {
  for (const LibraryMaterial& m : materials)
    if (m.name == name) return &m;
  return nullptr;
}

std::vector<std::string> MaterialLibrary::names() const {
  std::vector<std::string> list;
  for (const LibraryMaterial& m : materials) list.push_back(m.name);
  return list;
}

std::vector<std::string> MaterialLibrary::nearest_names(const std::string& name, std::size_t count) const {
  const std::string word = lowered(name);
  struct Ranked {
    int group;
    std::size_t distance;
    std::size_t order;
    std::string name;
  };
  std::vector<Ranked> ranked;
  for (std::size_t i = 0; i < materials.size(); ++i) {
    const std::string candidate = lowered(materials[i].name);
    const bool related = !word.empty() && (candidate.find(word) != std::string::npos || word.find(candidate) != std::string::npos);
    ranked.push_back({related ? 0 : 1, edit_distance(word, candidate), i, materials[i].name});
  }
  std::sort(ranked.begin(), ranked.end(), [](const Ranked& a, const Ranked& b) {
    return std::tie(a.group, a.distance, a.order) < std::tie(b.group, b.distance, b.order);
  });
  std::vector<std::string> nearest;
  for (std::size_t i = 0; i < ranked.size() && i < count; ++i) nearest.push_back(ranked[i].name);
  return nearest;
}

LibraryLocation locate_material_library() {
  std::error_code error;
  if (const char* env = std::getenv("HEARTH_DATA_DIR"); env && *env) {
    const fs::path given(env);
    if (fs::is_regular_file(given, error)) return {given, "HEARTH_DATA_DIR"};
    const fs::path file = given / library_file_name;
    if (fs::is_regular_file(file, error)) return {file, "HEARTH_DATA_DIR"};
    throw InputError("HEARTH_DATA_DIR=" + given.string() + ": no " + library_file_name +
                     " there; point HEARTH_DATA_DIR at the folder that holds the material library, or unset it "
                     "to use the installed one");
  }
  std::vector<std::string> looked;
  const fs::path folder = program_folder();
  if (!folder.empty()) {
    const fs::path installed = (folder / HEARTH_DATA_DIR_FROM_BIN / library_file_name).lexically_normal();
    if (fs::is_regular_file(installed, error)) return {installed, "installed"};
    looked.push_back(installed.string());
  }
  if (*HEARTH_SOURCE_DATA_DIR) {
    const fs::path source = fs::path(HEARTH_SOURCE_DATA_DIR) / library_file_name;
    if (fs::is_regular_file(source, error)) return {source, "source tree"};
    looked.push_back(source.string());
  }
  throw InputError("the material library (" + std::string(library_file_name) + ") was not found; looked in " +
                   join(looked) + "; install hearth with 'cmake --install', or set HEARTH_DATA_DIR to the folder "
                   "that holds " + library_file_name);
}

MaterialLibrary load_material_library(const fs::path& file) {
  LibraryReader reader;
  reader.file = file.string();
  std::ifstream stream(file, std::ios::binary);
  if (!stream) throw InputError(reader.file + ": the material library cannot be opened for reading");
  std::ostringstream content;
  content << stream.rdbuf();
  YAML::Node root;
  try {
    root = YAML::Load(content.str());
  } catch (const YAML::ParserException& e) {
    throw InputError(reader.file + ":" + std::to_string(e.mark.line + 1) + ":" + std::to_string(e.mark.column + 1) +
                     ": YAML syntax error in the material library: " + e.msg);
  }
  const Place top{reader.file, 0, "", ""};
  if (!root.IsMap()) input_error(top, "expected the keys " + join(top_keys) + " at the top level of the material library");

  YAML::Node entries;
  bool has_format = false, has_unit = false;
  for (const auto& [key, node, value] : reader.items(root, top, &top_keys)) {
    const Place at = reader.place(node, key);
    if (key == "format") {
      if (!value.IsScalar() || value.Scalar() != "1")
        input_error(at, "'" + yaml_text(value) + "' is not a library format this version reads; allowed: 1");
      has_format = true;
    }
    if (key == "temperature_unit") {
      if (!value.IsScalar() || (value.Scalar() != "K" && value.Scalar() != "degC"))
        input_error(at, "'" + yaml_text(value) + "' is not allowed; allowed: K, degC");
      reader.units.temperature = value.Scalar();
      has_unit = true;
    }
    if (key == "materials") {
      if (!value.IsMap() || value.size() == 0) input_error(at, "expected at least one entry (name: properties)");
      entries = value;
    }
  }
  if (!has_format) input_error(top, "format: required key is missing; write 'format: 1' at the top");
  if (!has_unit)
    input_error(top, "temperature_unit: required key is missing; write 'temperature_unit: K' (or degC) at the top");
  if (!entries) input_error(top, "materials: required section is missing; give the entries under it");

  MaterialLibrary library;
  library.file = file;
  library.located_by = "given";
  for (const auto& [name, node, value] : reader.items(entries, reader.place(root, "materials"), nullptr))
    library.materials.push_back(reader.entry(name, node, value));
  return library;
}

MaterialLibrary load_material_library() {
  const LibraryLocation location = locate_material_library();
  MaterialLibrary library = load_material_library(location.file);
  library.located_by = location.located_by;
  return library;
}

}  // namespace hearth
