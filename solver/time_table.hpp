// TimeTable: a value that follows a table in time, {vs_time: [[t, v], ...]} in the case
// file. Piecewise linear between rows, held constant beyond the ends; a time given twice
// is a step (the value jumps there).
#pragma once

#include <vector>

namespace hearth {

struct TimeTable {
  std::vector<double> t, v;  // s, non-decreasing; at most two rows share a time

  TimeTable() = default;
  TimeTable(double constant) : t{0.0}, v{constant} {}  // NOLINT: a number is a constant table
  TimeTable(std::vector<double> times, std::vector<double> values) : t(std::move(times)), v(std::move(values)) {}

  bool is_constant() const { return t.size() <= 1; }
  // The value at time `time`. At a step the value before it: an implicit step that ends
  // at the step's time sees the old value, the next step the new one.
  double value(double time) const;
  // The distinct times of the table's rows, where the time stepper lands exactly.
  std::vector<double> break_times() const;
  // Times at which the value jumps (a time given twice).
  std::vector<double> step_times() const;
};

}  // namespace hearth
