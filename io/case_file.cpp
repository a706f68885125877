// Case-file reader: YAML (format version 1) -> validated Case in SI units and kelvin.
//
// Three steps, in order: parse the file; apply --set overrides to the YAML tree;
// check every key against the schema table (io/case_schema.*) and then build the
// Case, converting lengths to metres and temperatures to kelvin exactly once.
#include "io/case_file.hpp"

#include <yaml-cpp/yaml.h>

#include <Eigen/Eigenvalues>
#include <cmath>
#include <cerrno>
#include <cstdio>
#include <cstring>
#include <fstream>
#include <limits>
#include <map>
#include <optional>
#include <set>
#include <sstream>

#include "io/case_schema.hpp"
#include "io/input_error.hpp"
#include "io/material_library.hpp"
#include "io/text_distance.hpp"
#include "io/yaml_values.hpp"

namespace hearth {

namespace fs = std::filesystem;

namespace {

// One key of a YAML map with its value; the key node carries the line.
struct Entry {
  std::string name;
  YAML::Node key;
  YAML::Node value;
};

std::string join(const std::vector<std::string>& words, const std::string& separator = ", ") {
  std::string text;
  for (const std::string& word : words) text += (text.empty() ? "" : separator) + word;
  return text;
}

std::string dotted(const std::string& parent, const std::string& name) {
  return parent.empty() ? name : parent + "." + name;
}

std::string suggestion(const std::string& word, const std::vector<std::string>& candidates) {
  const std::optional<std::string> nearest = nearest_word(word, candidates);
  return nearest ? "did you mean '" + *nearest + "'?" : "";
}

bool contains(const std::vector<std::string>& words, const std::string& word) {
  for (const std::string& w : words)
    if (w == word) return true;
  return false;
}

// What the reader knows while checking: the file (for places), which keys came from
// --set, and the case's units (for messages and conversion).
struct Reader {
  std::string file;                           // as the user gave it
  std::map<std::string, std::string> set_by;  // dotted key -> the --set KEY that made it
  Units units;
  mutable std::optional<MaterialLibrary> library_cache;  // read on first use of 'library:'

  // The material library, read once; a failure to find or read it is reported at `where`.
  const MaterialLibrary& library(const Place& where) const {
    if (!library_cache) {
      try {
        library_cache = load_material_library();
      } catch (const InputError& e) {
        fail(where, std::string("the material library could not be read: ") + e.what());
      }
    }
    return *library_cache;
  }

  Place place(const YAML::Node& key_node, const std::string& key) const {
    Place p;
    p.file = file;
    p.key = key;
    const auto override_key = set_by.find(key);
    if (override_key != set_by.end()) {
      p.set_by = override_key->second;
      return p;
    }
    const YAML::Mark mark = key_node.Mark();
    p.line = mark.is_null() ? 0 : mark.line + 1;
    return p;
  }

  [[noreturn]] void fail(const Place& where, const std::string& what) const {
    const std::string prefix = where.str();
    throw InputError(prefix.empty() ? what : prefix + ": " + what);
  }

  // The unit a schema entry's value is written in, for messages.
  std::string unit_of(const KeySpec& spec) const {
    if (spec.unit == "length") return units.length;
    if (spec.unit == "temperature") return units.temperature;
    return spec.unit;
  }

  // "a number > 0 (W/(m K))": what a key expects, for messages.
  std::string expected(const KeySpec& spec) const {
    std::string text;
    switch (spec.kind) {
      case KeyKind::number: text = "a number"; break;
      case KeyKind::integer: text = "a whole number"; break;
      case KeyKind::boolean: text = "true or false"; break;
      case KeyKind::text: text = "a name or text"; break;
      case KeyKind::choice: text = "one of " + join(split_choices(spec.choices)); break;
      case KeyKind::path: text = "a file or folder name"; break;
      case KeyKind::point: text = "a point [x, y, z]"; break;
      case KeyKind::number_list: text = "a list of numbers [a, b, ...]"; break;
      case KeyKind::name_list: text = "a list of names [a, b, ...]"; break;
      case KeyKind::section: text = "keys under it"; break;
      case KeyKind::names: text = "name: value entries under it"; break;
    }
    const std::string range = spec.range.str();
    if (!range.empty() && spec.kind != KeyKind::choice) text += " " + range;
    const std::string unit = unit_of(spec);
    if (!unit.empty()) text += " (" + unit + ")";
    const std::vector<std::string> forms = split_choices(spec.forms);
    for (std::size_t i = 0; i < forms.size(); ++i)
      text += (i + 1 == forms.size() ? " or " : ", ") + form_syntax(forms[i]);
    return text;
  }
};

// The entries of a map in file order; a null node (a key with nothing under it) has none.
std::vector<Entry> entries(const Reader& reader, const YAML::Node& map, const Place& where) {
  std::vector<Entry> list;
  if (!map.IsMap()) return list;
  for (const auto& item : map) {
    if (!item.first.IsScalar())
      reader.fail(where, "a key must be a plain name, not a list or map");
    list.push_back({item.first.Scalar(), item.first, item.second});
  }
  return list;
}

// The value of `name` in `map`, if present. `map` is a map or null (checked before).
std::optional<Entry> find_entry(const YAML::Node& map, const std::string& name) {
  if (!map.IsMap()) return std::nullopt;
  for (const auto& item : map)
    if (item.first.IsScalar() && item.first.Scalar() == name)
      return Entry{name, item.first, item.second};
  return std::nullopt;
}

// The value of `name` in `map`; null if absent (never yaml-cpp's invalid node).
YAML::Node child(const YAML::Node& map, const std::string& name) {
  const std::optional<Entry> entry = find_entry(map, name);
  return entry ? entry->value : YAML::Node();
}

// ---------------------------------------------------------------------------------
// Step 1: read the file and parse the text.

std::string read_file_text(const fs::path& path) {
  const std::string file = path.string();
  std::error_code error;
  if (!fs::exists(path, error))
    throw InputError(file + ": the case file does not exist (looked for " +
                     fs::absolute(path, error).string() + ")");
  if (fs::is_directory(path, error))
    throw InputError(file + ": is a folder; give the case file (a .yaml file) inside it");
  errno = 0;
  std::ifstream stream(path, std::ios::binary);
  if (!stream)
    throw InputError(file + ": the case file cannot be opened for reading (" +
                     (errno ? std::strerror(errno) : "unknown reason") + "); check its permissions");
  std::ostringstream text;
  text << stream.rdbuf();
  return text.str();
}

YAML::Node parse_text(const std::string& text, const std::string& file) {
  try {
    return YAML::Load(text);
  } catch (const YAML::ParserException& e) {
    const bool tabs = text.find('\t') != std::string::npos;
    throw InputError(file + ":" + std::to_string(e.mark.line + 1) + ":" +
                     std::to_string(e.mark.column + 1) + ": YAML syntax error: " + e.msg +
                     "; check the indentation, the ':' after each key and the brackets here or just above" +
                     (tabs ? " (the file contains tabs: YAML indents with spaces only)" : ""));
  }
}

// ---------------------------------------------------------------------------------
// Step 2: --set KEY=VALUE overrides, applied to the tree before any check.

std::vector<std::string> split_key(const std::string& key) {
  std::vector<std::string> parts;
  std::size_t start = 0;
  while (true) {
    const std::size_t dot = key.find('.', start);
    parts.push_back(key.substr(start, dot == std::string::npos ? std::string::npos : dot - start));
    if (dot == std::string::npos) break;
    start = dot + 1;
  }
  return parts;
}

// The schema pattern of a dotted path ("boundaries.*.convection"), or "" if unknown.
std::string pattern_of(const std::vector<std::string>& parts) {
  std::string pattern;
  for (const std::string& part : parts) {
    if (find_key_spec(dotted(pattern, part)))
      pattern = dotted(pattern, part);
    else if (find_key_spec(dotted(pattern, "*")))
      pattern = dotted(pattern, "*");
    else
      return "";
  }
  return pattern;
}

// The override's value as YAML: a scalar or a flow list ("[0, 0, 0.1]"), or a flow map
// ("{vs_temperature: [[20, 0.06], [400, 0.09]]}") where the key accepts map forms of a
// number (`forms` in the schema); anything else is kept as the text it is.
YAML::Node override_value(const std::string& text, bool map_allowed) {
  try {
    YAML::Node value = YAML::Load(text);
    if (value.IsScalar() || value.IsSequence() || value.IsNull() || (map_allowed && value.IsMap())) return value;
  } catch (const YAML::Exception&) {
  }
  return YAML::Node(text);
}

void apply_override(Reader& reader, YAML::Node& root, const std::string& text) {
  const std::size_t equals = text.find('=');
  if (equals == std::string::npos || equals == 0)
    throw InputError("--set " + text + ": expected KEY=VALUE with KEY a dotted path, e.g. --set mesh.size=0.01");
  const std::string key = text.substr(0, equals);
  const std::vector<std::string> parts = split_key(key);
  for (const std::string& part : parts)
    if (part.empty())
      throw InputError("--set " + key + ": empty part in the dotted key; write e.g. --set mesh.size=0.01");

  YAML::Node node = root;
  std::string path;
  for (std::size_t i = 0; i + 1 < parts.size(); ++i) {
    path = dotted(path, parts[i]);
    YAML::Node child = node[parts[i]];
    if (!child.IsDefined() || child.IsNull()) {
      node[parts[i]] = YAML::Node(YAML::NodeType::Map);
      if (!reader.set_by.count(path)) reader.set_by[path] = key;
    } else if (!child.IsMap()) {
      throw InputError("--set " + key + ": " + path +
                       " holds a value, not keys, so it has no '" + parts[i + 1] +
                       "'; KEY must be the dotted path of a value, e.g. --set mesh.size=0.01");
    }
    node.reset(node[parts[i]]);
  }
  const KeySpec* spec = find_key_spec(pattern_of(parts));
  const YAML::Node existing = node[parts.back()];
  if (existing.IsDefined() && existing.IsMap()) {
    if (!spec || spec->kind == KeyKind::section || spec->kind == KeyKind::names) {
      std::vector<std::string> names;
      for (const auto& item : existing)
        if (item.first.IsScalar()) names.push_back(key + "." + item.first.Scalar());
      throw InputError("--set " + key + ": is a group of keys, not a value; set one of its values" +
                       (names.empty() ? std::string() : ", e.g. " + names.front()));
    }
  }
  node[parts.back()] = override_value(text.substr(equals + 1), spec && !spec->forms.empty());
  reader.set_by[key] = key;
}

// ---------------------------------------------------------------------------------
// Step 3a: check the tree against the schema: known keys, kinds, ranges, choices,
// required keys, features this build does not have yet.

void check_value(const Reader& reader, const Entry& entry, const std::string& key,
                 const KeySpec& spec);

std::string describe_scalar(const YAML::Node& value) {
  if (value.IsScalar()) return "'" + value.Scalar() + "'";
  if (value.IsSequence()) return "a list";
  if (value.IsMap()) return "keys";
  return "nothing";
}

// A section (fixed keys) or a names map (keys the user chooses).
void check_map(const Reader& reader, const YAML::Node& map, const Place& where,
               const std::string& key, const std::string& pattern, KeyKind kind, bool required) {
  if (!map.IsNull() && !map.IsMap())
    reader.fail(where, "expected " + std::string(kind == KeyKind::names ? "name: value entries" : "keys") +
                           " under it, found " + describe_scalar(map));
  std::vector<std::string> allowed;
  for (const KeySpec* child : child_key_specs(pattern)) allowed.push_back(last_key_part(child->key));

  std::map<std::string, int> seen;  // name -> line of its first appearance
  for (const Entry& entry : entries(reader, map, where)) {
    const std::string child_key = dotted(key, entry.name);
    const Place child_place = reader.place(entry.key, child_key);
    if (seen.count(entry.name))
      reader.fail(child_place, "'" + entry.name + "' is given twice (first at line " +
                                   std::to_string(seen[entry.name]) + "); keep one");
    seen[entry.name] = child_place.line;

    const std::string child_pattern = dotted(pattern, kind == KeyKind::names ? "*" : entry.name);
    const KeySpec* spec = find_key_spec(child_pattern);
    if (!spec) {
      Place bad = child_place;
      bad.key = key;
      const std::string hint = suggestion(entry.name, allowed);
      reader.fail(bad, "'" + entry.name + "' is not a key; " +
                           (hint.empty() ? "allowed keys here: " + join(allowed) : hint));
    }
    check_value(reader, entry, child_key, *spec);
  }

  if (kind == KeyKind::section) {
    for (const KeySpec* child : child_key_specs(pattern)) {
      const std::string name = last_key_part(child->key);
      if (!child->required || seen.count(name)) continue;
      Place missing = where;
      missing.key = dotted(key, name);
      if (child->kind == KeyKind::section) {
        std::vector<std::string> needed;
        for (const KeySpec* grandchild : child_key_specs(child->key))
          if (grandchild->required) needed.push_back(last_key_part(grandchild->key));
        reader.fail(missing, "required section is missing (" + child->doc + "); it needs " +
                                 join(needed, " and "));
      }
      if (child->kind == KeyKind::names)
        reader.fail(missing, "required section is missing; give at least one entry (" + child->doc + ")");
      if (!missing.set_by.empty())  // the section was made by a --set: say which other key it needs
        reader.fail(missing, missing.key + " is needed too (" + child->doc + ", " + reader.expected(*child) +
                                 "); add --set " + missing.key + "=VALUE");
      reader.fail(missing, "required key is missing; give " + child->doc + ", " + reader.expected(*child));
    }
  } else if (required && seen.empty()) {
    reader.fail(where, "is empty; give at least one entry (" + find_key_spec(pattern)->doc + ")");
  }
}

double number_or_fail(const Reader& reader, const YAML::Node& value, const Place& where,
                      const KeySpec& spec) {
  double x = 0.0;
  if (!value.IsScalar() || !YAML::convert<double>::decode(value, x))
    reader.fail(where, describe_scalar(value) + " is not a number; expected " + reader.expected(spec));
  if (!std::isfinite(x))
    reader.fail(where, describe_scalar(value) + " is not a finite number; expected " + reader.expected(spec));
  if (!spec.range.contains(x))
    reader.fail(where, value.Scalar() + " is not allowed; must be " + spec.range.str() +
                           (reader.unit_of(spec).empty() ? "" : " (" + reader.unit_of(spec) + ")"));
  return x;
}

// A number given as a map ({vs_temperature: ...}) or a list. Returns if the map is a
// form the key accepts (its contents are checked when the Case is built); else fails:
// a form this build does not have yet, or no form at all.
void check_number_form(const Reader& reader, const YAML::Node& value, const Place& where,
                       const KeySpec& spec) {
  const std::vector<std::string> later = split_choices(spec.not_yet);
  const std::vector<std::string> accepted = split_choices(spec.forms);
  const std::string name = last_key_part(spec.key) == "*" ? "this value" : last_key_part(spec.key);
  if (value.IsSequence()) {
    const std::string table = contains(accepted, "vs_temperature")
                                  ? "; write a table in temperature as " + form_syntax("vs_temperature")
                                  : "";
    reader.fail(where, "a list is not allowed here; expected " + reader.expected(spec) + table);
  }
  // A form may bring companion keys ({principal: ..., axis_1: ..., axis_2: ...}): the
  // form's own key decides.
  const std::vector<Entry> items = entries(reader, value, where);
  for (const Entry& item : items)
    if (contains(later, item.name))
      reader.fail(where, name + " as {" + item.name + ": ...} is not supported by this version of hearth yet; give " +
                             reader.expected(spec));
  for (const Entry& item : items)
    if (contains(accepted, item.name)) return;
  std::vector<std::string> forms = accepted;
  forms.insert(forms.end(), later.begin(), later.end());
  for (const Entry& item : items) {
    const std::string hint = suggestion(item.name, forms);
    reader.fail(where, "'" + item.name + "' is not a form of " + name + "; " +
                           (hint.empty() ? "expected " + reader.expected(spec) : hint));
  }
  reader.fail(where, "expected " + reader.expected(spec) + ", found empty keys {}");
}

void check_value(const Reader& reader, const Entry& entry, const std::string& key,
                 const KeySpec& spec) {
  const Place where = reader.place(entry.key, key);
  const YAML::Node& value = entry.value;
  if (spec.not_yet == "*")
    reader.fail(where, last_key_part(key) + " (" + spec.doc +
                           ") is not supported by this version of hearth yet; remove it for now");

  switch (spec.kind) {
    case KeyKind::section:
    case KeyKind::names:
      check_map(reader, value, where, key, spec.key, spec.kind, spec.required);
      return;
    default:
      break;
  }
  if (value.IsNull())
    reader.fail(where, "has no value; expected " + reader.expected(spec));

  switch (spec.kind) {
    case KeyKind::number:
      if (value.IsMap() || value.IsSequence()) {
        check_number_form(reader, value, where, spec);
        return;
      }
      number_or_fail(reader, value, where, spec);
      return;
    case KeyKind::integer: {
      // The Case keeps whole numbers as int: a value beyond it is refused here, not left
      // to fail in the conversion when the Case is built.
      constexpr double largest = std::numeric_limits<int>::max();
      long long n = 0;
      double x = 0.0;
      if (value.IsScalar() && YAML::convert<long long>::decode(value, n))
        x = static_cast<double>(n);
      else if (!value.IsScalar() || !YAML::convert<double>::decode(value, x) || !(std::abs(x) > largest))
        reader.fail(where, describe_scalar(value) + " is not a whole number; expected " + reader.expected(spec));
      if (!spec.range.contains(x))
        reader.fail(where, value.Scalar() + " is not allowed; must be " + spec.range.str());
      if (std::abs(x) > largest)
        reader.fail(where, value.Scalar() + " is too large; must be " + spec.range.str() +
                               (std::isfinite(spec.range.high) ? "" : " and at most 2147483647"));
      return;
    }
    case KeyKind::boolean: {
      bool b = false;
      if (!value.IsScalar() || !YAML::convert<bool>::decode(value, b))
        reader.fail(where, describe_scalar(value) + " is not true or false");
      return;
    }
    case KeyKind::choice: {
      const std::vector<std::string> choices = split_choices(spec.choices);
      if (!value.IsScalar())
        reader.fail(where, "expected one of " + join(choices) + ", found " + describe_scalar(value));
      const std::string& text = value.Scalar();
      const std::vector<std::string> later = split_choices(spec.not_yet);
      if (contains(later, text)) {
        std::vector<std::string> now;
        for (const std::string& choice : choices)
          if (!contains(later, choice)) now.push_back(choice);
        reader.fail(where, "'" + text + "' is not supported by this version of hearth yet; allowed now: " + join(now));
      }
      if (!contains(choices, text)) {
        const std::string hint = suggestion(text, choices);
        reader.fail(where, "'" + text + "' is not allowed; allowed: " + join(choices) +
                               (hint.empty() ? "" : "; " + hint));
      }
      return;
    }
    case KeyKind::text:
    case KeyKind::path:
      if (!value.IsScalar() || value.Scalar().empty())
        reader.fail(where, "expected " + reader.expected(spec) + ", found " + describe_scalar(value));
      return;
    case KeyKind::point:
      if (!value.IsSequence() || value.size() != 3)
        reader.fail(where, "expected a point [x, y, z] (" + reader.unit_of(spec) + "), found " +
                               (value.IsSequence() ? std::to_string(value.size()) + " values" : describe_scalar(value)));
      for (const auto& coordinate : value) number_or_fail(reader, coordinate, where, spec);
      return;
    case KeyKind::number_list:
      if (!value.IsSequence())
        reader.fail(where, "expected a list [a, b, ...] (" + reader.unit_of(spec) + "), found " + describe_scalar(value));
      for (const auto& item : value) number_or_fail(reader, item, where, spec);
      return;
    case KeyKind::name_list:
      if (!value.IsSequence())
        reader.fail(where, "expected " + reader.expected(spec) + ", found " + describe_scalar(value));
      for (const auto& item : value)
        if (!item.IsScalar() || item.Scalar().empty())
          reader.fail(place_at(where, item), "expected a name in the list, found " + yaml_text(item));
      return;
    case KeyKind::section:
    case KeyKind::names:
      return;
  }
}

// The units, read before the check so that messages can name them. Values that are
// not valid choices are left at the default; the check reports them.
Units peek_units(const YAML::Node& root) {
  Units units;
  const YAML::Node section = child(root, "units");
  if (!section.IsMap()) return units;
  const YAML::Node length = child(section, "length"), temperature = child(section, "temperature");
  if (length.IsScalar() && contains(split_choices(find_key_spec("units.length")->choices), length.Scalar()))
    units.length = length.Scalar();
  if (temperature.IsScalar() &&
      contains(split_choices(find_key_spec("units.temperature")->choices), temperature.Scalar()))
    units.temperature = temperature.Scalar();
  return units;
}

// ---------------------------------------------------------------------------------
// Step 3b: build the Case from the checked tree. Absent keys take the schema default.

// The value of `name` in `map`, else the schema default of `pattern` (undefined if none).
YAML::Node value_or_default(const YAML::Node& map, const std::string& name, const std::string& pattern) {
  if (const std::optional<Entry> entry = find_entry(map, name)) return entry->value;
  const KeySpec* spec = find_key_spec(pattern);
  if (spec && !spec->default_value.empty()) return YAML::Node(spec->default_value);
  return YAML::Node(YAML::NodeType::Undefined);
}

// Path resolved against the case file's folder.
fs::path resolve(const fs::path& directory, const std::string& text) {
  const fs::path given(text);
  return (given.is_absolute() ? given : directory / given).lexically_normal();
}

double to_metres(const Units& units, const YAML::Node& value) {
  return value.as<double>() * units.metres_per_length();
}

std::string number_text(double x);

// An element size in metres. The check against the schema's "> 0" saw the number as
// written; in millimetres a tiny one (4.9e-324 mm) becomes 0 m or a subnormal number
// once converted, which no mesher can use.
double element_size_in_metres(const Reader& reader, const YAML::Node& value, const Place& where) {
  const double metres = to_metres(reader.units, value);
  if (!std::isnormal(metres))
    reader.fail(where, value.Scalar() + " " + reader.units.length + " is too small for an element size (" +
                           number_text(metres) + " m, below the smallest normal number, " +
                           number_text(std::numeric_limits<double>::min()) + " m); give the size of the elements wanted");
  return metres;
}

std::array<double, 3> point_in_metres(const Units& units, const YAML::Node& value) {
  return {to_metres(units, value[0]), to_metres(units, value[1]), to_metres(units, value[2])};
}

double to_kelvin(const Reader& reader, const YAML::Node& value, const Place& where) {
  const double t = reader.units.to_kelvin(value.as<double>());
  if (t < 0.0)
    reader.fail(where, value.Scalar() + " " + reader.units.temperature +
                           " is below absolute zero (" + (reader.units.temperature == "K" ? "0 K" : "-273.15 degC") +
                           "); temperatures are in " + reader.units.temperature + " (units.temperature)");
  return t;
}

std::vector<std::string> names_of(const std::map<std::string, MaterialSpec>& materials) {
  std::vector<std::string> names;
  for (const auto& item : materials) names.push_back(item.first);
  return names;
}

void read_geometry_and_mesh(const Reader& reader, const YAML::Node& root, Case& c) {
  const YAML::Node geometry = child(root, "geometry");
  const Entry file = *find_entry(geometry, "file");
  c.geometry_place = reader.place(file.key, "geometry.file");
  c.geometry_file = resolve(c.directory, file.value.Scalar());
  std::string extension = c.geometry_file.extension().string();
  for (char& ch : extension) ch = static_cast<char>(std::tolower(static_cast<unsigned char>(ch)));
  const std::vector<std::string> types = {".geo", ".step", ".stp", ".brep", ".msh"};
  if (!contains(types, extension))
    reader.fail(c.geometry_place, "'" + file.value.Scalar() + "' is not a known geometry type; allowed: " +
                                      join(types) + " (Gmsh script, CAD file, or mesh)");
  std::error_code error;
  if (fs::is_directory(c.geometry_file, error))
    reader.fail(c.geometry_place, "'" + file.value.Scalar() + "' is a folder (" + c.geometry_file.string() +
                                      "); give the geometry file inside it");
  if (!fs::is_regular_file(c.geometry_file, error))
    reader.fail(c.geometry_place, "'" + file.value.Scalar() + "' does not exist (looked for " +
                                      c.geometry_file.string() + "); the path is relative to the case file's folder");
  errno = 0;
  if (!std::ifstream(c.geometry_file, std::ios::binary))
    reader.fail(c.geometry_place, "'" + file.value.Scalar() + "' cannot be opened for reading (" +
                                      (errno ? std::strerror(errno) : "unknown reason") + "); check its permissions");

  const YAML::Node mesh = child(root, "mesh");
  const Entry size = *find_entry(mesh, "size");  // required: the schema check made sure it is there
  c.mesh_size_place = reader.place(size.key, "mesh.size");
  c.mesh_size = element_size_in_metres(reader, size.value, c.mesh_size_place);
  c.mesh_order = value_or_default(mesh, "order", "mesh.order").as<int>();
  c.mesh_refinements = value_or_default(mesh, "refinements", "mesh.refinements").as<int>();
  if (const std::optional<Entry> local = find_entry(mesh, "local_sizes")) {
    for (const Entry& entry : entries(reader, local->value, Place{})) {
      const Place where = reader.place(entry.key, "mesh.local_sizes." + entry.name);
      c.local_sizes[entry.name] = element_size_in_metres(reader, entry.value, where);
      c.local_size_places[entry.name] = where;
    }
  }
}

// ---------------------------------------------------------------------------------
// Conductivity forms: a number, {vs_temperature: ...}, {principal: ..., axis_1: ...,
// axis_2: ...} and {tensor: ...}. The schema check has made sure that a map holds one
// of the form keys and none that this build lacks; the rest is checked here.

using Vector3 = std::array<double, 3>;

std::string number_text(double x) {
  if (x == 0.0) x = 0.0;  // no "-0"
  char text[32];
  std::snprintf(text, sizeof text, "%.6g", x);
  return text;
}

// A unit vector for messages, without round-off dust ("0", not "1.2e-17").
std::string vector_text(const Vector3& v) {
  auto clean = [](double x) { return number_text(std::abs(x) < 1e-12 ? 0.0 : x); };
  return "[" + clean(v[0]) + ", " + clean(v[1]) + ", " + clean(v[2]) + "]";
}

double dot(const Vector3& a, const Vector3& b) { return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]; }

Vector3 cross(const Vector3& a, const Vector3& b) {
  return {a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]};
}

const TableColumns conductivity_columns{"T", "k", "W/(m K)"};

// Keys of a form's map other than `allowed` are errors naming the nearest allowed key.
void only_keys(const Reader& reader, const std::vector<Entry>& items, const std::vector<std::string>& allowed,
               const std::string& key, const std::string& form) {
  for (const Entry& item : items) {
    if (contains(allowed, item.name)) continue;
    Place where = reader.place(item.key, key);
    const std::string hint = suggestion(item.name, allowed);
    reader.fail(where, "'" + item.name + "' does not belong in " + form + "; " +
                           (hint.empty() ? "its keys are " + join(allowed) : hint));
  }
}

// A principal value: a number > 0 or {vs_temperature: [[T, k], ...]}.
PiecewiseLinear read_principal_value(const Reader& reader, const YAML::Node& value, const Place& where,
                                     std::size_t index) {
  const std::string name = "principal value " + std::to_string(index + 1) + " of 3";
  if (value.IsMap()) {
    const std::vector<Entry> items = entries(reader, value, where);
    if (items.size() == 1 && items[0].name == "vs_temperature")
      return read_temperature_table(items[0].value, reader.place(items[0].key, where.key + ".vs_temperature"),
                                    reader.units, conductivity_columns);
  }
  const std::optional<double> k = yaml_number(value);
  if (!k)
    reader.fail(place_at(where, value), name + ": expected a number > 0 (W/(m K)) or " +
                                            form_syntax("vs_temperature") + ", found " + yaml_text(value));
  if (!(*k > 0.0))
    reader.fail(place_at(where, value), name + " = " + value.Scalar() + " is not allowed; must be > 0 (W/(m K))");
  return PiecewiseLinear(*k);
}

// A direction [x, y, z], normalised.
Vector3 read_axis(const Reader& reader, const Entry& entry, const Place& where) {
  const YAML::Node& value = entry.value;
  const std::string expected = "expected a direction [x, y, z] (three numbers, in the global axes of the geometry)";
  if (!value.IsSequence() || value.size() != 3)
    reader.fail(where, expected + ", found " + (value.IsSequence() ? std::to_string(value.size()) + " values" : yaml_text(value)));
  Vector3 a{};
  for (std::size_t i = 0; i < 3; ++i) {
    const std::optional<double> x = yaml_number(value[i]);
    if (!x) reader.fail(where, expected + "; '" + yaml_text(value[i]) + "' is not a finite number");
    a[i] = *x;
  }
  const double length = std::sqrt(dot(a, a));
  if (!(length > 0.0) || !std::isfinite(length))
    reader.fail(where, yaml_text(value) + " is not a direction (zero length); give a non-zero vector, e.g. [1, 0, 0]");
  for (double& x : a) x /= length;
  return a;
}

Conductivity read_orthotropic(const Reader& reader, const Entry& conductivity, const std::vector<Entry>& items,
                              const std::string& key, std::vector<std::string>& warnings) {
  only_keys(reader, items, {"principal", "axis_1", "axis_2"}, key, "{principal: ..., axis_1: ..., axis_2: ...}");
  const Place where = reader.place(conductivity.key, key);
  const std::optional<Entry> principal = find_entry(conductivity.value, "principal");
  const std::optional<Entry> axis_1 = find_entry(conductivity.value, "axis_1");
  const std::optional<Entry> axis_2 = find_entry(conductivity.value, "axis_2");
  const Place principal_place = reader.place(principal->key, key + ".principal");
  if (!principal->value.IsSequence() || principal->value.size() != 3)
    reader.fail(principal_place, "expected three principal values [k1, k2, k3] (W/(m K)) along axis_1, axis_2 and "
                                 "axis_3 = axis_1 x axis_2, found " +
                                     (principal->value.IsSequence() ? std::to_string(principal->value.size()) + " values"
                                                                    : yaml_text(principal->value)));
  std::array<PiecewiseLinear, 3> k;
  for (std::size_t i = 0; i < 3; ++i) k[i] = read_principal_value(reader, principal->value[i], principal_place, i);

  if (!axis_1 || !axis_2) {
    Place missing = where;
    missing.key = key + (axis_1 ? ".axis_2" : ".axis_1");
    reader.fail(missing, "required key is missing; the orthotropic form needs axis_1 and axis_2, the directions of "
                         "the first two principal values in the global axes (axis_3 = axis_1 x axis_2); for principal "
                         "values along x, y and z write axis_1: [1, 0, 0], axis_2: [0, 1, 0]");
  }
  const Place place_1 = reader.place(axis_1->key, key + ".axis_1");
  const Place place_2 = reader.place(axis_2->key, key + ".axis_2");
  const Vector3 a1 = read_axis(reader, *axis_1, place_1);
  const Vector3 given_2 = read_axis(reader, *axis_2, place_2);
  // Gram-Schmidt: remove axis_2's component along axis_1.
  const double along = dot(a1, given_2);
  Vector3 a2{given_2[0] - along * a1[0], given_2[1] - along * a1[1], given_2[2] - along * a1[2]};
  const double across = std::sqrt(dot(a2, a2));  // sine of the angle between them
  if (across < 1e-6)
    reader.fail(place_2, yaml_text(axis_2->value) + " is parallel to axis_1 " + yaml_text(axis_1->value) +
                             "; axis_2 must be a second principal direction at right angles to axis_1");
  for (double& x : a2) x /= across;
  if (std::abs(along) > 1e-9) {
    const double degrees = std::acos(std::max(-1.0, std::min(1.0, along))) * 180.0 / 3.14159265358979323846;
    warnings.push_back(place_2.str() + ": " + yaml_text(axis_2->value) + " is not at right angles to axis_1 " +
                       yaml_text(axis_1->value) + " (" + number_text(degrees) +
                       " degrees apart); made orthogonal to it (Gram-Schmidt): axis_2 = " + vector_text(a2));
  }
  const Vector3 a3 = cross(a1, a2);
  Matrix3 axes{};
  axes[0] = a1;
  axes[1] = a2;
  axes[2] = a3;
  return Conductivity::orthotropic(std::move(k), axes);
}

Conductivity read_tensor(const Reader& reader, const Entry& tensor, const std::string& key) {
  const Place where = reader.place(tensor.key, key);
  const YAML::Node& rows = tensor.value;
  const std::string shape = "expected a symmetric 3 x 3 tensor [[k11, k12, k13], [k12, k22, k23], [k13, k23, k33]] "
                            "(W/(m K), global axes)";
  if (!rows.IsSequence() || rows.size() != 3)
    reader.fail(where, shape + ", found " + (rows.IsSequence() ? std::to_string(rows.size()) + " rows" : yaml_text(rows)));
  Matrix3 K{};
  double scale = 0.0;
  for (std::size_t i = 0; i < 3; ++i) {
    const YAML::Node row = rows[i];
    const Place at = place_at(where, row);
    if (!row.IsSequence() || row.size() != 3)
      reader.fail(at, shape + "; row " + std::to_string(i + 1) + " is " + yaml_text(row));
    for (std::size_t j = 0; j < 3; ++j) {
      const std::optional<double> x = yaml_number(row[j]);
      if (!x)
        reader.fail(at, "entry (" + std::to_string(i + 1) + ", " + std::to_string(j + 1) + ") '" + yaml_text(row[j]) +
                            "' is not a finite number");
      K[i][j] = *x;
      scale = std::max(scale, std::abs(*x));
    }
  }
  for (std::size_t i = 0; i < 3; ++i)
    for (std::size_t j = i + 1; j < 3; ++j)
      if (std::abs(K[i][j] - K[j][i]) > 1e-12 * scale)
        reader.fail(where, "the tensor is not symmetric: entry (" + std::to_string(i + 1) + ", " + std::to_string(j + 1) +
                               ") = " + yaml_text(rows[i][j]) + " but entry (" + std::to_string(j + 1) + ", " +
                               std::to_string(i + 1) + ") = " + yaml_text(rows[j][i]) +
                               " (row, column); a conductivity tensor is symmetric: make them equal");
  for (std::size_t i = 0; i < 3; ++i)
    for (std::size_t j = i + 1; j < 3; ++j) K[i][j] = K[j][i] = 0.5 * (K[i][j] + K[j][i]);
  Eigen::Matrix3d matrix;
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j) matrix(i, j) = K[i][j];
  const Eigen::SelfAdjointEigenSolver<Eigen::Matrix3d> eigen(matrix, Eigen::EigenvaluesOnly);
  const Eigen::Vector3d values = eigen.eigenvalues();  // ascending
  if (!(values(0) > 0.0))
    reader.fail(where, "the tensor is not positive definite: its eigenvalues are " + number_text(values(0)) + ", " +
                           number_text(values(1)) + " and " + number_text(values(2)) +
                           " W/(m K); all must be > 0 (heat flows from hot to cold in every direction); check the "
                           "signs of the entries and that the off-diagonal ones are not too large");
  return Conductivity::full(K);
}

Conductivity read_conductivity(const Reader& reader, const Entry& conductivity, const std::string& key,
                               std::vector<std::string>& warnings) {
  const Place where = reader.place(conductivity.key, key);
  if (!conductivity.value.IsMap()) return Conductivity::isotropic(PiecewiseLinear(conductivity.value.as<double>()));
  const std::vector<Entry> items = entries(reader, conductivity.value, where);
  std::vector<std::string> forms;
  for (const Entry& item : items)
    if (contains({"vs_temperature", "principal", "tensor"}, item.name)) forms.push_back(item.name);
  if (forms.size() > 1)
    reader.fail(where, "give one form of conductivity, not both '" + forms[0] + "' and '" + forms[1] + "'");
  const std::string form = forms.at(0);  // the schema check made sure there is one
  if (form == "principal") return read_orthotropic(reader, conductivity, items, key, warnings);
  only_keys(reader, items, {form}, key, form_syntax(form));
  const Entry& item = items.front();
  if (form == "tensor") return read_tensor(reader, item, key + ".tensor");
  return Conductivity::isotropic(
      read_temperature_table(item.value, reader.place(item.key, key + ".vs_temperature"), reader.units, conductivity_columns));
}

// A number or {vs_temperature: [[T_surface, h], ...]} (film coefficient).
PiecewiseLinear read_film_coefficient(const Reader& reader, const Entry& coefficient, const std::string& key) {
  if (!coefficient.value.IsMap()) return PiecewiseLinear(coefficient.value.as<double>());
  const std::vector<Entry> items = entries(reader, coefficient.value, reader.place(coefficient.key, key));
  only_keys(reader, items, {"vs_temperature"}, key, form_syntax("vs_temperature"));
  return read_temperature_table(items.front().value, reader.place(items.front().key, key + ".vs_temperature"),
                                reader.units, {"T_surface", "h", "W/(m2 K)"});
}

// A number or {vs_time: [[t, value], ...]}: returns the value at t = 0 and files a table
// under c.time_varying for `target` and `name`. `temperature`: the value is a
// temperature in the case's unit; `positive`: it must be > 0.
double read_value_in_time(const Reader& reader, const Entry& entry, const std::string& key, Case& c,
                          TimeVaryingValue::Target target, const std::string& name, bool temperature,
                          const std::string& unit, bool positive) {
  const Place where = reader.place(entry.key, key);
  if (!entry.value.IsMap()) return temperature ? to_kelvin(reader, entry.value, where) : entry.value.as<double>();
  const std::vector<Entry> items = entries(reader, entry.value, where);
  only_keys(reader, items, {"vs_time"}, key, form_syntax("vs_time"));
  const Place table_place = reader.place(items.front().key, key + ".vs_time");
  const std::string value_name = key.substr(key.rfind('.') + 1);
  const Units& units = reader.units;
  auto convert = [&](double written, double& si) -> std::string {
    si = temperature ? units.to_kelvin(written) : written;
    if (temperature && si < 0.0)
      return number_text(written) + " " + units.temperature + " is below absolute zero";
    if (positive && !(si > 0.0)) return value_name + " = " + number_text(written) + " is not allowed; must be > 0 (" + unit + ")";
    return "";
  };
  TimeTable table = read_time_table(items.front().value, table_place, value_name,
                                    temperature ? units.temperature : unit, convert);
  const double at_start = table.value(0.0);
  c.time_varying.push_back({target, name, std::move(table), table_place});
  return at_start;
}

// Density or specific heat: a number > 0 or {vs_temperature: [[T, value], ...]}.
PiecewiseLinear read_capacity_property(const Reader& reader, const Entry& entry, const std::string& key,
                                       const TableColumns& columns) {
  if (!entry.value.IsMap()) return PiecewiseLinear(entry.value.as<double>());
  const std::vector<Entry> items = entries(reader, entry.value, reader.place(entry.key, key));
  only_keys(reader, items, {"vs_temperature"}, key, form_syntax("vs_temperature"));
  return read_temperature_table(items.front().value, reader.place(items.front().key, key + ".vs_temperature"),
                                reader.units, columns);
}

void read_materials_and_regions(const Reader& reader, const YAML::Node& root, Case& c) {
  for (const Entry& entry : entries(reader, child(root, "materials"), Place{})) {
    const std::string key = "materials." + entry.name;
    MaterialSpec material;
    material.name = entry.name;
    material.place = reader.place(entry.key, key);
    const std::optional<Entry> library = find_entry(entry.value, "library");
    if (library) {
      const Place where = reader.place(library->key, key + ".library");
      const MaterialLibrary& shipped = reader.library(where);
      const std::string& name = library->value.Scalar();
      const LibraryMaterial* found = shipped.find(name);
      if (!found) {
        const std::string hint = suggestion(name, shipped.names());
        reader.fail(where, "'" + name + "' is not an entry of the material library (" + shipped.file.string() +
                               "); " + (hint.empty() ? "" : hint + " ") + "Nearest entries: " +
                               join(shipped.nearest_names(name)) + "; 'hearth materials' lists them all");
      }
      material.library = found->name;
      material.conductivity = found->conductivity;
      if (found->density) material.density = PiecewiseLinear(*found->density);
      if (found->specific_heat) material.specific_heat = PiecewiseLinear(*found->specific_heat);
      material.max_service_temperature = found->max_service_temperature;
    }
    if (const std::optional<Entry> conductivity = find_entry(entry.value, "conductivity")) {
      material.conductivity = read_conductivity(reader, *conductivity, key + ".conductivity", c.warnings);
    } else if (!library) {
      Place missing = material.place;
      missing.key = key + ".conductivity";
      reader.fail(missing, "required key is missing; give thermal conductivity, " +
                               reader.expected(*find_key_spec("materials.*.conductivity")) +
                               ", or library: NAME, an entry of the material library ('hearth materials' lists them)");
    }
    if (const auto density = find_entry(entry.value, "density"))
      material.density = read_capacity_property(reader, *density, key + ".density", {"T", "density", "kg/m3"});
    if (const auto heat = find_entry(entry.value, "specific_heat"))
      material.specific_heat =
          read_capacity_property(reader, *heat, key + ".specific_heat", {"T", "specific_heat", "J/(kg K)"});
    if (const auto limit = find_entry(entry.value, "max_service_temperature"))
      material.max_service_temperature =
          to_kelvin(reader, limit->value, reader.place(limit->key, key + ".max_service_temperature"));
    c.materials[entry.name] = material;
  }

  if (const auto section = find_entry(root, "regions")) c.regions_place = reader.place(section->key, "regions");
  for (const Entry& entry : entries(reader, child(root, "regions"), Place{})) {
    const Place where = reader.place(entry.key, "regions." + entry.name);
    const std::string& material = entry.value.Scalar();
    if (!c.materials.count(material)) {
      const std::vector<std::string> defined = names_of(c.materials);
      const std::string hint = suggestion(material, defined);
      reader.fail(where, "material '" + material + "' is not defined under materials; defined: " +
                             join(defined) + (hint.empty() ? "" : "; " + hint));
    }
    c.regions[entry.name] = material;
    c.region_places[entry.name] = where;
  }

  for (const Entry& entry : entries(reader, child(root, "heat_sources"), Place{})) {
    const Place where = reader.place(entry.key, "heat_sources." + entry.name);
    if (!c.regions.count(entry.name)) {
      std::vector<std::string> regions;
      for (const auto& item : c.regions) regions.push_back(item.first);
      const std::string hint = suggestion(entry.name, regions);
      reader.fail(where, "'" + entry.name + "' is not a region; a heat source names a volume listed under regions (" +
                             join(regions) + ")" + (hint.empty() ? "" : "; " + hint));
    }
    c.heat_sources[entry.name] = read_value_in_time(reader, entry, "heat_sources." + entry.name, c,
                                                    TimeVaryingValue::Target::heat_source, entry.name, false,
                                                    "W/m3", false);
    c.heat_source_places[entry.name] = where;
  }
}

void read_boundaries(const Reader& reader, const YAML::Node& root, Case& c) {
  c.boundaries_place = Place{reader.file, 0, "boundaries", ""};
  if (const auto section = find_entry(root, "boundaries")) c.boundaries_place = reader.place(section->key, "boundaries");
  for (const Entry& entry : entries(reader, child(root, "boundaries"), Place{})) {
    const std::string key = "boundaries." + entry.name;
    BoundarySpec boundary;
    boundary.name = entry.name;
    boundary.place = reader.place(entry.key, key);
    using Target = TimeVaryingValue::Target;
    const std::string& name = entry.name;
    if (const auto temperature = find_entry(entry.value, "temperature"))
      boundary.temperature =
          read_value_in_time(reader, *temperature, key + ".temperature", c, Target::temperature, name, true, "", false);
    if (const auto flux = find_entry(entry.value, "heat_flux"))
      boundary.heat_flux =
          read_value_in_time(reader, *flux, key + ".heat_flux", c, Target::heat_flux, name, false, "W/m2", false);
    if (const auto convection = find_entry(entry.value, "convection")) {
      const Entry ambient = *find_entry(convection->value, "ambient");
      const Entry coefficient = *find_entry(convection->value, "coefficient");
      const std::string coefficient_key = key + ".convection.coefficient";
      ConvectionSpec spec;
      if (coefficient.value.IsMap() && find_entry(coefficient.value, "vs_time"))
        spec.coefficient = read_value_in_time(reader, coefficient, coefficient_key, c, Target::convection_coefficient,
                                              name, false, "W/(m2 K)", true);
      else
        spec.coefficient = read_film_coefficient(reader, coefficient, coefficient_key);
      spec.ambient = read_value_in_time(reader, ambient, key + ".convection.ambient", c, Target::convection_ambient,
                                        name, true, "", false);
      boundary.convection = spec;
    }
    if (const auto radiation = find_entry(entry.value, "radiation")) {
      const Entry surroundings = *find_entry(radiation->value, "surroundings");
      Radiation spec;
      spec.emissivity = child(radiation->value, "emissivity").as<double>();
      spec.surroundings = read_value_in_time(reader, surroundings, key + ".radiation.surroundings", c,
                                             Target::radiation_surroundings, name, true, "", false);
      boundary.radiation = spec;
    }
    if (boundary.temperature && (boundary.heat_flux || boundary.convection || boundary.radiation)) {
      std::vector<std::string> others;
      if (boundary.heat_flux) others.push_back("heat_flux");
      if (boundary.convection) others.push_back("convection");
      if (boundary.radiation) others.push_back("radiation");
      reader.fail(boundary.place, "temperature excludes the other conditions; remove " + join(others, " and ") +
                                      " or the temperature (heat_flux, convection and radiation may be combined)");
    }
    if (!boundary.temperature && !boundary.heat_flux && !boundary.convection && !boundary.radiation)
      reader.fail(boundary.place, "no condition given; give temperature, heat_flux, convection or radiation "
                                  "(a surface not listed under boundaries is insulated)");
    c.boundaries[entry.name] = boundary;
  }
}

// analysis.initial_temperature: a number, {regions: {NAME: number}} or {result: FOLDER}.
void read_initial_temperature(const Reader& reader, const Entry& initial, Case& c) {
  TransientSpec& transient = c.transient;
  const std::string key = "analysis.initial_temperature";
  transient.initial_place = reader.place(initial.key, key);
  if (!initial.value.IsMap()) {
    transient.initial_temperature = to_kelvin(reader, initial.value, transient.initial_place);
    return;
  }
  const std::vector<Entry> items = entries(reader, initial.value, transient.initial_place);
  only_keys(reader, items, {"regions", "result"}, key, form_syntax("regions") + " or " + form_syntax("result"));
  if (items.size() != 1)
    reader.fail(transient.initial_place, "give either regions or result, not both");
  const Entry& form = items.front();
  const Place where = reader.place(form.key, key + "." + form.name);
  if (form.name == "result") {
    if (!form.value.IsScalar() || form.value.Scalar().empty())
      reader.fail(where, "expected the folder of an earlier hearth result, found " + yaml_text(form.value));
    transient.initial_result = resolve(c.directory, form.value.Scalar());
    return;
  }
  if (!form.value.IsMap())
    reader.fail(where, "expected region: temperature entries, e.g. {regions: {lining: 20}}, found " +
                           yaml_text(form.value));
  for (const Entry& region : entries(reader, form.value, where)) {
    const Place at = reader.place(region.key, key + ".regions." + region.name);
    if (!c.regions.count(region.name)) {
      std::vector<std::string> regions;
      for (const auto& item : c.regions) regions.push_back(item.first);
      const std::string hint = suggestion(region.name, regions);
      reader.fail(at, "'" + region.name + "' is not a region; regions: " + join(regions) +
                          (hint.empty() ? "" : "; " + hint));
    }
    if (!yaml_number(region.value))
      reader.fail(at, yaml_text(region.value) + " is not a number; give the starting temperature in " +
                          reader.units.temperature);
    transient.initial_by_region[region.name] = to_kelvin(reader, region.value, at);
  }
  std::vector<std::string> missing;
  for (const auto& item : c.regions)
    if (!transient.initial_by_region.count(item.first)) missing.push_back(item.first);
  if (!missing.empty())
    reader.fail(where, "no starting temperature for " + join(missing) + "; give every region one");
}

// The transient keys are checked together once the analysis type is known.
void check_transient(const Reader& reader, const YAML::Node& analysis, Case& c) {
  TransientSpec& transient = c.transient;
  auto missing = [&](const std::string& name, const std::string& what) {
    Place at = c.analysis_place;
    at.key = "analysis." + name;
    reader.fail(at, "required for a transient analysis; give " + what);
  };
  if (!find_entry(analysis, "duration")) missing("duration", "the time to simulate in s, e.g. duration: 7200");
  if (!find_entry(analysis, "time_step")) missing("time_step", "the first time step in s, e.g. time_step: 10");
  if (!find_entry(analysis, "initial_temperature"))
    missing("initial_temperature", "a number, {regions: {NAME: number}} or {result: FOLDER}");
  const Place step_place = reader.place(find_entry(analysis, "time_step")->key, "analysis.time_step");
  // The check against "> 0" let a subnormal step through, whose heat capacity over the
  // step (rho c / dt) is infinite: no solver can use it.
  if (transient.time_step < 1e-300)
    reader.fail(step_place, number_text(transient.time_step) + " s is too small to step with; give a first step of " +
                                "at least 1e-300 s (in practice a fraction of the duration)");
  if (transient.time_step > transient.duration) {
    reader.fail(step_place,
                number_text(transient.time_step) + " s is longer than the duration " +
                    number_text(transient.duration) + " s; give a shorter first step");
  }
  if (const auto times = find_entry(analysis, "output_times")) {
    const Place where = reader.place(times->key, "analysis.output_times");
    for (std::size_t i = 0; i < transient.output_times.size(); ++i) {
      const double t = transient.output_times[i];
      if (!(t > 0.0) || t > transient.duration)
        reader.fail(where, number_text(t) + " s is outside the run (0, " + number_text(transient.duration) +
                               "] s; output times lie after the start and no later than analysis.duration");
      if (i > 0 && !(t > transient.output_times[i - 1]))
        reader.fail(where, "output times must increase; " + number_text(t) + " s follows " +
                               number_text(transient.output_times[i - 1]) + " s");
    }
  }
  if (transient.output_times.empty())  // ten even intervals
    for (int k = 1; k < 10; ++k) {
      // duration * k / 10 is exact for whole seconds, but overflows near the largest
      // double, where duration / 10 * k does not; for a subnormal duration the first
      // times round to 0 s or onto their predecessor and are left out.
      const double d = transient.duration;
      const double t = d <= std::numeric_limits<double>::max() / 10.0 ? d * k / 10.0 : d / 10.0 * k;
      const double previous = transient.output_times.empty() ? 0.0 : transient.output_times.back();
      if (t > previous && t < d) transient.output_times.push_back(t);
    }
  if (transient.output_times.empty() || transient.output_times.back() < transient.duration)
    transient.output_times.push_back(transient.duration);
  for (const auto& [region, material_name] : c.regions) {
    const MaterialSpec& m = c.materials.at(material_name);
    if (m.density && m.specific_heat) continue;
    Place at = m.place;
    at.key = m.place.key + (m.density ? ".specific_heat" : ".density");
    reader.fail(at, "a transient analysis needs the density and specific heat of every material used (region '" +
                        region + "'); give " + (m.density ? "specific_heat (J/(kg K))" : "density (kg/m3)") +
                        " as a number or {vs_temperature: [[T, value], ...]}");
  }
}

void read_analysis_and_solver(const Reader& reader, const YAML::Node& root, Case& c) {
  const YAML::Node analysis = child(root, "analysis");
  c.analysis_place = Place{reader.file, 0, "analysis", ""};
  if (const auto section = find_entry(root, "analysis")) c.analysis_place = reader.place(section->key, "analysis");
  c.analysis_type = value_or_default(analysis, "type", "analysis.type").Scalar();
  TransientSpec& transient = c.transient;
  if (const auto duration = find_entry(analysis, "duration")) transient.duration = duration->value.as<double>();
  if (const auto step = find_entry(analysis, "time_step")) transient.time_step = step->value.as<double>();
  const YAML::Node stepping = child(analysis, "time_stepping");
  transient.method = value_or_default(stepping, "method", "analysis.time_stepping.method").Scalar();
  transient.adaptive = value_or_default(stepping, "adaptive", "analysis.time_stepping.adaptive").as<bool>();
  transient.step_tolerance = value_or_default(stepping, "tolerance", "analysis.time_stepping.tolerance").as<double>();
  if (const auto initial = find_entry(analysis, "initial_temperature")) read_initial_temperature(reader, *initial, c);
  if (const auto times = find_entry(analysis, "output_times")) {
    transient.output_times_given = true;
    for (const auto& time : times->value) transient.output_times.push_back(time.as<double>());
  }
  if (c.analysis_type == "transient") {
    check_transient(reader, analysis, c);
  } else if (!c.time_varying.empty()) {
    reader.fail(c.time_varying.front().place, "a table in time needs analysis.type: transient; give a number for a "
                                              "steady analysis (or set analysis.type: transient)");
  }

  const YAML::Node solver = child(root, "solver");
  c.solver.linear = value_or_default(solver, "linear", "solver.linear").Scalar();
  c.solver.tolerance = value_or_default(solver, "tolerance", "solver.tolerance").as<double>();
  const YAML::Node nonlinear = child(solver, "nonlinear");
  c.solver.nonlinear_tolerance = value_or_default(nonlinear, "tolerance", "solver.nonlinear.tolerance").as<double>();
  c.solver.nonlinear_max_iterations =
      value_or_default(nonlinear, "max_iterations", "solver.nonlinear.max_iterations").as<int>();
}

void read_safety(const Reader& reader, const YAML::Node& root, Case& c) {
  c.safety_place = Place{reader.file, 0, "safety", ""};
  const std::optional<Entry> safety = find_entry(root, "safety");
  if (!safety) return;
  c.safety_place = reader.place(safety->key, "safety");
  if (const std::optional<Entry> surfaces = find_entry(safety->value, "touch_surfaces")) {
    c.safety_place = reader.place(surfaces->key, "safety.touch_surfaces");
    std::set<std::string> seen;
    for (const auto& item : surfaces->value) {
      const std::string& name = item.Scalar();
      if (!seen.insert(name).second)
        reader.fail(place_at(c.safety_place, item), "'" + name + "' is listed twice; keep one");
      c.touch_surfaces.push_back(name);
    }
    if (c.touch_surfaces.empty())
      reader.fail(c.safety_place, "the list is empty; name at least one physical surface, e.g. [cold_face], "
                                  "or remove the safety section");
  }
  if (const std::optional<Entry> limit = find_entry(safety->value, "touch_limit"))
    c.touch_limit = to_kelvin(reader, limit->value, reader.place(limit->key, "safety.touch_limit"));
}

void read_thresholds(const Reader& reader, const YAML::Node& root, Case& c) {
  for (const Entry& entry : entries(reader, child(root, "thresholds"), Place{})) {
    const std::string key = "thresholds." + entry.name;
    ThresholdSpec spec;
    spec.name = entry.name;
    spec.place = reader.place(entry.key, key);
    if (c.analysis_type != "transient")
      reader.fail(spec.place, "thresholds are crossing times of a transient analysis; set analysis.type: transient "
                              "or remove the thresholds section");
    int given = 0;
    for (const auto& [form, kind] : {std::pair{"probe", ThresholdSpec::Kind::probe},
                                     std::pair{"region_max", ThresholdSpec::Kind::region_max},
                                     std::pair{"surface_mean", ThresholdSpec::Kind::surface_mean}})
      if (const auto item = find_entry(entry.value, form)) {
        ++given;
        spec.kind = kind;
        spec.target = item->value.Scalar();
      }
    if (given != 1)
      reader.fail(spec.place, "give exactly one of probe, region_max and surface_mean (found " +
                                  std::to_string(given) + ")");
    if (spec.kind == ThresholdSpec::Kind::probe) {
      bool found = false;
      std::vector<std::string> names;
      for (const auto& p : c.probes) {
        found |= p.name == spec.target;
        names.push_back(p.name);
      }
      if (!found)
        reader.fail(spec.place, "'" + spec.target + "' is not a probe; probes: " +
                                    (names.empty() ? std::string("(none)") : join(names)));
    }
    if (spec.kind == ThresholdSpec::Kind::region_max && !c.regions.count(spec.target))
      reader.fail(spec.place, "'" + spec.target + "' is not a region listed under regions");
    const Entry level = *find_entry(entry.value, "temperature");
    spec.temperature = to_kelvin(reader, level.value, reader.place(level.key, key + ".temperature"));
    c.thresholds.push_back(spec);
  }
}

void read_interfaces(const Reader& reader, const YAML::Node& root, Case& c) {
  for (const Entry& entry : entries(reader, child(root, "interfaces"), Place{})) {
    InterfaceSpec spec;
    spec.name = entry.name;
    spec.place = reader.place(entry.key, "interfaces." + entry.name);
    spec.conductance = child(entry.value, "conductance").as<double>();
    c.interfaces[entry.name] = spec;
  }
}

void read_probes_lines_output(const Reader& reader, const YAML::Node& root, Case& c) {
  for (const Entry& entry : entries(reader, child(root, "probes"), Place{}))
    c.probes.push_back({entry.name, point_in_metres(c.units, entry.value),
                        reader.place(entry.key, "probes." + entry.name)});

  for (const Entry& entry : entries(reader, child(root, "lines"), Place{})) {
    LineSpec line;
    line.name = entry.name;
    line.place = reader.place(entry.key, "lines." + entry.name);
    line.from = point_in_metres(c.units, child(entry.value, "from"));
    line.to = point_in_metres(c.units, child(entry.value, "to"));
    line.points = value_or_default(entry.value, "points", "lines.*.points").as<int>();
    c.lines.push_back(line);
  }

  const YAML::Node output = child(root, "output");
  c.output_directory = resolve(c.directory, value_or_default(output, "directory", "output.directory").Scalar());
  const std::optional<Entry> directory = find_entry(output, "directory");
  c.output_place = directory ? reader.place(directory->key, "output.directory") : Place{reader.file, 0, "output.directory", ""};
  c.output_report = value_or_default(output, "report", "output.report").as<bool>();
  c.report_mesh_edges = value_or_default(output, "report_mesh_edges", "output.report_mesh_edges").as<bool>();
  c.output_compression = value_or_default(output, "compression", "output.compression").Scalar();
}

}  // namespace

Case read_case_file(const fs::path& path, const std::vector<std::string>& overrides) {
  return read_case_text(read_file_text(path), path, overrides);
}

Case read_case_text(std::string_view text, const fs::path& path, const std::vector<std::string>& overrides) {
  Reader reader;
  reader.file = path.string();

  YAML::Node root = parse_text(std::string(text), reader.file);
  if (root.IsNull())
    throw InputError(reader.file + ": the case file is empty; it needs at least geometry, mesh, materials and regions");
  if (!root.IsMap())
    throw InputError(reader.file + ":1: expected keys at the top level (geometry:, mesh:, ...), found " +
                     describe_scalar(root));
  for (const std::string& override_text : overrides) apply_override(reader, root, override_text);

  reader.units = peek_units(root);
  check_map(reader, root, Place{reader.file, 0, "", ""}, "", "", KeyKind::section, true);

  Case c;
  c.file = path;
  c.directory = fs::absolute(path).parent_path().lexically_normal();
  c.version = value_or_default(root, "version", "version").as<int>();
  if (const auto title = find_entry(root, "title")) c.title = title->value.Scalar();
  c.units = reader.units;
  read_geometry_and_mesh(reader, root, c);
  read_materials_and_regions(reader, root, c);
  read_boundaries(reader, root, c);
  read_analysis_and_solver(reader, root, c);
  read_safety(reader, root, c);
  read_interfaces(reader, root, c);
  read_probes_lines_output(reader, root, c);
  read_thresholds(reader, root, c);
  return c;
}

}  // namespace hearth
