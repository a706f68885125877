// The case-file schema (format version 1): every key once, with its kind, default,
// allowed values, unit and one line of documentation. The reader validates against
// this table and takes defaults from it; case_file_reference() prints it for docs/.
#pragma once

#include <limits>
#include <string>
#include <vector>

namespace hearth {

enum class KeyKind {
  section,      // a map with the fixed keys listed under it
  names,        // a map from names the user chooses to entries of the "*" child
  number,       // a finite real number
  integer,      // a whole number
  boolean,      // true | false
  text,         // any scalar, kept as text
  choice,       // one of `choices`
  path,         // a file or folder, relative to the case file's folder
  point,        // [x, y, z], three numbers
  number_list,  // [a, b, ...], numbers
  name_list,    // [a, b, ...], names
};

// Allowed interval of a number or integer; each end open or closed.
struct Range {
  double low = -std::numeric_limits<double>::infinity();
  double high = std::numeric_limits<double>::infinity();
  bool low_open = false;
  bool high_open = false;

  bool contains(double x) const;
  std::string str() const;  // "> 0", ">= 2", "in (0, 1)", "" for any number
};

struct KeySpec {
  std::string key;            // dotted path; "*" stands for a name the user chooses
  KeyKind kind = KeyKind::text;
  bool required = false;      // names: required means present and not empty
  std::string default_value;  // as it would be written in the file; "" when none
  std::string choices;        // choice: "m|mm"
  Range range;                // number, integer, number_list
  std::string unit;           // "length" / "temperature" (the case's units) or an SI unit
  std::string doc;            // one line
  // Forms recognised by the format but not implemented in this build: "*" for the
  // whole key; else '|'-separated map forms ("vs_temperature"), the word "table" for a
  // list of pairs, or (for a choice) choice values.
  std::string not_yet;
  // number: '|'-separated map forms accepted besides a plain number ("vs_temperature",
  // "principal", "tensor"); the reader checks their contents when it builds the Case.
  std::string forms;
};

// The whole table, parents before children, in the order of the reference.
const std::vector<KeySpec>& case_schema();

// The entry whose `key` is exactly `pattern` (e.g. "boundaries.*.convection"), or null.
const KeySpec* find_key_spec(const std::string& pattern);

// The entries directly under `pattern` ("" for the top level).
std::vector<const KeySpec*> child_key_specs(const std::string& pattern);

// The last component of a dotted key: "size" for "mesh.size".
std::string last_key_part(const std::string& key);

// Splits "a|b|c" into {"a", "b", "c"}; "" gives {}.
std::vector<std::string> split_choices(const std::string& choices);

// How a map form of a number is written, for messages and the reference:
// "{vs_temperature: [[T, value], ...]}" for "vs_temperature".
std::string form_syntax(const std::string& form);

// Markdown reference of every key (a table per top-level section) for docs/.
std::string case_file_reference();

}  // namespace hearth
