// Value forms shared by the case-file and material-library readers.
#include "io/yaml_values.hpp"

#include <cmath>

#include "io/input_error.hpp"

namespace hearth {

void input_error(const Place& where, const std::string& what) {
  const std::string prefix = where.str();
  throw InputError(prefix.empty() ? what : prefix + ": " + what);
}

Place place_at(const Place& where, const YAML::Node& node) {
  if (!where.set_by.empty() || where.line == 0 || !node.IsDefined()) return where;
  const YAML::Mark mark = node.Mark();
  Place moved = where;
  if (!mark.is_null()) moved.line = mark.line + 1;
  return moved;
}

std::string yaml_text(const YAML::Node& node) {
  if (!node.IsDefined() || node.IsNull()) return "nothing";
  if (node.IsScalar()) return node.Scalar();
  if (node.IsMap()) return "keys";
  std::string text = "[";
  for (std::size_t i = 0; i < node.size(); ++i) text += (i ? ", " : "") + yaml_text(node[i]);
  return text + "]";
}

std::optional<double> yaml_number(const YAML::Node& node) {
  double x = 0.0;
  if (!node.IsDefined() || !node.IsScalar() || !YAML::convert<double>::decode(node, x) || !std::isfinite(x))
    return std::nullopt;
  return x;
}

PiecewiseLinear read_temperature_table(const YAML::Node& rows, const Place& where, const Units& units,
                                       const TableColumns& columns) {
  const std::string row_form = "[" + columns.temperature + ", " + columns.value + "]";
  const std::string row_units =
      "(" + columns.temperature + " in " + units.temperature + ", " + columns.value + " in " + columns.value_unit + ")";
  if (!rows.IsSequence())
    input_error(where, "expected a table [" + row_form + ", ...] " + row_units + ", found " + yaml_text(rows));
  if (rows.size() < 2)
    input_error(where, "has " + std::to_string(rows.size()) + " row" + (rows.size() == 1 ? "" : "s") +
                           "; a table needs at least 2 rows " + row_form + " " + row_units +
                           " (for a constant " + columns.value + " write the number itself)");

  PiecewiseLinear table;
  for (std::size_t i = 0; i < rows.size(); ++i) {
    const YAML::Node row = rows[i];
    const Place at = place_at(where, row);
    const std::string name = "row " + std::to_string(i + 1);
    if (!row.IsSequence() || row.size() != 2)
      input_error(at, name + ": expected " + row_form + ", two numbers " + row_units + ", found " +
                          (row.IsSequence() ? std::to_string(row.size()) + " values " + yaml_text(row) : yaml_text(row)));
    const std::string written = name + " " + yaml_text(row);
    const std::optional<double> t = yaml_number(row[0]), v = yaml_number(row[1]);
    if (!t) input_error(at, written + ": " + columns.temperature + " = " + yaml_text(row[0]) + " is not a finite number");
    if (!v) input_error(at, written + ": " + columns.value + " = " + yaml_text(row[1]) + " is not a finite number");
    const double kelvin = units.to_kelvin(*t);
    if (kelvin < 0.0)
      input_error(at, written + ": " + row[0].Scalar() + " " + units.temperature + " is below absolute zero (" +
                          (units.temperature == "K" ? "0 K" : "-273.15 degC") + ")");
    if (i > 0 && !(kelvin > table.x.back()))
      input_error(at, written + ": temperatures must increase strictly down the table; " + row[0].Scalar() + " " +
                          units.temperature + " follows " + rows[i - 1][0].Scalar() + " " + units.temperature);
    if (!(*v > 0.0))
      input_error(at, written + ": " + columns.value + " = " + row[1].Scalar() + " is not allowed; must be > 0 (" +
                          columns.value_unit + ")");
    table.x.push_back(kelvin);
    table.y.push_back(*v);
  }
  return table;
}

TimeTable read_time_table(const YAML::Node& rows, const Place& where, const std::string& value_name,
                          const std::string& value_unit,
                          const std::function<std::string(double written, double& si)>& convert) {
  const std::string row_form = "[t, " + value_name + "]";
  const std::string row_units = "(t in s, " + value_name + " in " + value_unit + ")";
  if (!rows.IsSequence())
    input_error(where, "expected a table [" + row_form + ", ...] " + row_units + ", found " + yaml_text(rows));
  if (rows.size() < 2)
    input_error(where, "has " + std::to_string(rows.size()) + " row" + (rows.size() == 1 ? "" : "s") +
                           "; a table needs at least 2 rows " + row_form + " " + row_units +
                           " (for a constant value write the number itself)");
  TimeTable table;
  for (std::size_t i = 0; i < rows.size(); ++i) {
    const YAML::Node row = rows[i];
    const Place at = place_at(where, row);
    const std::string name = "row " + std::to_string(i + 1);
    if (!row.IsSequence() || row.size() != 2)
      input_error(at, name + ": expected " + row_form + ", two numbers " + row_units + ", found " +
                          (row.IsSequence() ? std::to_string(row.size()) + " values " + yaml_text(row) : yaml_text(row)));
    const std::string written = name + " " + yaml_text(row);
    const std::optional<double> t = yaml_number(row[0]), v = yaml_number(row[1]);
    if (!t) input_error(at, written + ": t = " + yaml_text(row[0]) + " is not a finite number");
    if (!v) input_error(at, written + ": " + value_name + " = " + yaml_text(row[1]) + " is not a finite number");
    if (*t < 0.0) input_error(at, written + ": t = " + row[0].Scalar() + " s is before the start (t = 0)");
    if (i > 0 && *t < table.t.back())
      input_error(at, written + ": times must not decrease down the table; " + row[0].Scalar() + " s follows " +
                          rows[i - 1][0].Scalar() + " s");
    if (i > 1 && *t == table.t[i - 1] && *t == table.t[i - 2])
      input_error(at, written + ": the time " + row[0].Scalar() +
                          " s is given three times; a step needs it twice (the value before and after)");
    double si = 0.0;
    const std::string bad = convert(*v, si);
    if (!bad.empty()) input_error(at, written + ": " + bad);
    table.t.push_back(*t);
    table.v.push_back(si);
  }
  return table;
}

}  // namespace hearth
