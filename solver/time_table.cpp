#include "solver/time_table.hpp"

#include <algorithm>

namespace hearth {

double TimeTable::value(double time) const {
  if (t.empty()) return 0.0;
  if (time <= t.front()) return v.front();
  if (time > t.back()) return v.back();
  // First row with t >= time: at a repeated time this is the earlier row (the old value).
  const std::size_t k = static_cast<std::size_t>(std::lower_bound(t.begin(), t.end(), time) - t.begin());
  if (t[k] == time) return v[k];
  const double s = (time - t[k - 1]) / (t[k] - t[k - 1]);
  return v[k - 1] + s * (v[k] - v[k - 1]);
}

std::vector<double> TimeTable::break_times() const {
  std::vector<double> out;
  for (double x : t)
    if (out.empty() || x != out.back()) out.push_back(x);
  return out;
}

std::vector<double> TimeTable::step_times() const {
  std::vector<double> out;
  for (std::size_t k = 1; k < t.size(); ++k)
    if (t[k] == t[k - 1] && v[k] != v[k - 1]) out.push_back(t[k]);
  return out;
}

}  // namespace hearth
