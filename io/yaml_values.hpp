// Value forms shared by the case-file reader and the material-library reader: places
// of nested values, numbers, and tables in temperature ({vs_temperature: [[T, v], ...]}).
// Internal to io/ (it includes yaml-cpp).
#pragma once

#include <yaml-cpp/yaml.h>

#include <functional>
#include <optional>
#include <string>

#include "io/case.hpp"
#include "solver/material.hpp"

namespace hearth {

// Throws InputError "PLACE: what".
[[noreturn]] void input_error(const Place& where, const std::string& what);

// `where` with its line moved to the line of `node` (a table row or list item written
// on a line of its own). Unchanged for a value from --set or one without a line.
Place place_at(const Place& where, const YAML::Node& node);

// A value as it was written, for messages: "400", "[400, 0.09]", "keys"; cut after 200
// characters with " ...".
std::string yaml_text(const YAML::Node& node);

// The finite number a scalar holds, if it holds one.
std::optional<double> yaml_number(const YAML::Node& node);

// How the two columns of a table are named in messages.
struct TableColumns {
  std::string temperature = "T";  // "T" or "T_surface"
  std::string value;              // "k", "h"
  std::string value_unit;         // "W/(m K)"
};

// Reads the rows [[T, value], ...] of a {vs_temperature: ...} table: at least 2 rows of
// exactly 2 finite numbers; T in `units` converted to kelvin, not below absolute zero,
// strictly increasing down the table; values > 0. `where` names the vs_temperature key.
PiecewiseLinear read_temperature_table(const YAML::Node& rows, const Place& where, const Units& units,
                                       const TableColumns& columns);

// Reads the rows [[t, value], ...] of a {vs_time: ...} table: at least 2 rows of two
// finite numbers, t in s, >= 0 and not decreasing (a time given twice is a step, three
// times is an error). `convert` takes a value as written to SI (temperatures to kelvin)
// and returns the reason when the value is not allowed, else "".
TimeTable read_time_table(const YAML::Node& rows, const Place& where, const std::string& value_name,
                          const std::string& value_unit,
                          const std::function<std::string(double written, double& si)>& convert);

}  // namespace hearth
