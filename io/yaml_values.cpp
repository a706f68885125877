// Value forms shared by the case-file and material-library readers.
#include "io/yaml_values.hpp"

#include <cmath>
#include <sstream>

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

namespace {

// Appends `node` as written to `text`, and stops once `text` is longer than `limit`: a
// list can hold aliases of aliases (&b [*a, *a, ...], &c [*b, *b, ...]) whose form
// written out grows exponentially with the size of the file.
void append_yaml_text(const YAML::Node& node, std::string& text, std::size_t limit) {
  if (text.size() > limit) return;
  if (!node.IsDefined() || node.IsNull()) {
    text += "nothing";
  } else if (node.IsScalar()) {
    text += node.Scalar();
  } else if (node.IsMap()) {
    text += "keys";
  } else {
    text += "[";
    for (std::size_t i = 0; i < node.size() && text.size() <= limit; ++i) {
      if (i > 0) text += ", ";
      append_yaml_text(node[i], text, limit);
    }
    text += "]";
  }
}

}  // namespace

std::string yaml_text(const YAML::Node& node) {
  constexpr std::size_t limit = 200;  // characters; a message quotes the value, not pages of it
  std::string text;
  append_yaml_text(node, text, limit);
  if (text.size() > limit) text = text.substr(0, limit) + " ...";
  return text;
}

std::optional<double> yaml_number(const YAML::Node& node) {
  double x = 0.0;
  if (!node.IsDefined() || !node.IsScalar() || !YAML::convert<double>::decode(node, x) || !std::isfinite(x))
    return std::nullopt;
  return x;
}

namespace {

// A number as a person would write it: 400, 0.09, 1e-05.
std::string number_text(double x) {
  std::ostringstream out;
  out << x;
  return out.str();
}

// The shape every table shares: a list of at least 2 rows of two finite numbers. Checks
// it and returns the rows as numbers, with each row's place and its text for messages.
struct TableRow {
  double first = 0.0, second = 0.0;
  Place at;
  std::string written;  // "row 2 [400, 0.09]"
};

std::vector<TableRow> read_rows(const YAML::Node& rows, const Place& where, const std::string& row_form,
                                const std::string& row_units, const std::string& first_name,
                                const std::string& second_name, const std::string& constant_hint) {
  if (!rows.IsSequence())
    input_error(where, "expected a table [" + row_form + ", ...] " + row_units + ", found " + yaml_text(rows));
  if (rows.size() < 2)
    input_error(where, "has " + std::to_string(rows.size()) + " row" + (rows.size() == 1 ? "" : "s") +
                           "; a table needs at least 2 rows " + row_form + " " + row_units + " (for a constant " +
                           constant_hint + " write the number itself)");
  std::vector<TableRow> out;
  for (std::size_t i = 0; i < rows.size(); ++i) {
    const YAML::Node row = rows[i];
    TableRow r;
    r.at = place_at(where, row);
    const std::string name = "row " + std::to_string(i + 1);
    if (!row.IsSequence() || row.size() != 2)
      input_error(r.at, name + ": expected " + row_form + ", two numbers " + row_units + ", found " +
                            (row.IsSequence() ? std::to_string(row.size()) + " values " + yaml_text(row) : yaml_text(row)));
    r.written = name + " " + yaml_text(row);
    const std::optional<double> a = yaml_number(row[0]), b = yaml_number(row[1]);
    if (!a) input_error(r.at, r.written + ": " + first_name + " = " + yaml_text(row[0]) + " is not a finite number");
    if (!b) input_error(r.at, r.written + ": " + second_name + " = " + yaml_text(row[1]) + " is not a finite number");
    r.first = *a;
    r.second = *b;
    out.push_back(r);
  }
  return out;
}

}  // namespace

PiecewiseLinear read_temperature_table(const YAML::Node& rows, const Place& where, const Units& units,
                                       const TableColumns& columns) {
  const std::string row_form = "[" + columns.temperature + ", " + columns.value + "]";
  const std::string row_units =
      "(" + columns.temperature + " in " + units.temperature + ", " + columns.value + " in " + columns.value_unit + ")";
  PiecewiseLinear table;
  double previous = 0.0;  // as written
  for (const TableRow& r : read_rows(rows, where, row_form, row_units, columns.temperature, columns.value, columns.value)) {
    const double kelvin = units.to_kelvin(r.first);
    if (kelvin < 0.0)
      input_error(r.at, r.written + ": " + number_text(r.first) + " " + units.temperature + " is below absolute zero (" +
                            (units.temperature == "K" ? "0 K" : "-273.15 degC") + ")");
    if (!table.x.empty() && !(kelvin > table.x.back()))
      input_error(r.at, r.written + ": temperatures must increase strictly down the table; " + number_text(r.first) +
                            " " + units.temperature + " follows " + number_text(previous) + " " + units.temperature);
    if (!(r.second > 0.0))
      input_error(r.at, r.written + ": " + columns.value + " = " + number_text(r.second) + " is not allowed; must be > 0 (" +
                            columns.value_unit + ")");
    table.x.push_back(kelvin);
    table.y.push_back(r.second);
    previous = r.first;
  }
  return table;
}

TimeTable read_time_table(const YAML::Node& rows, const Place& where, const std::string& value_name,
                          const std::string& value_unit,
                          const std::function<std::string(double written, double& si)>& convert) {
  const std::string row_form = "[t, " + value_name + "]";
  const std::string row_units = "(t in s, " + value_name + " in " + value_unit + ")";
  TimeTable table;
  for (const TableRow& r : read_rows(rows, where, row_form, row_units, "t", value_name, "value")) {
    const std::size_t i = table.t.size();
    if (r.first < 0.0) input_error(r.at, r.written + ": t = " + number_text(r.first) + " s is before the start (t = 0)");
    if (i > 0 && r.first < table.t.back())
      input_error(r.at, r.written + ": times must not decrease down the table; " + number_text(r.first) +
                            " s follows " + number_text(table.t.back()) + " s");
    if (i > 1 && r.first == table.t[i - 1] && r.first == table.t[i - 2])
      input_error(r.at, r.written + ": the time " + number_text(r.first) +
                            " s is given three times; a step needs it twice (the value before and after)");
    double si = 0.0;
    const std::string bad = convert(r.second, si);
    if (!bad.empty()) input_error(r.at, r.written + ": " + bad);
    table.t.push_back(r.first);
    table.v.push_back(si);
  }
  return table;
}

}  // namespace hearth
