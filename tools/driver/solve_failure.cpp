// Failed-solve messages.
#include "tools/driver/solve_failure.hpp"

#include <cmath>
#include <cstdio>

namespace hearth {

namespace {

struct Candidate {
  double magnitude = -1.0;
  std::string key;
  std::string place;
};

void consider(Candidate& largest, double value, const std::string& key, const Place& place) {
  if (std::isfinite(value) && std::abs(value) > largest.magnitude) largest = {std::abs(value), key, place.str()};
}

// The input of largest magnitude among conductivities, film coefficients, heat sources
// and heat fluxes: the usual cause of an overflow is one of them typed far too large.
std::string largest_input(const Case& c) {
  Candidate largest;
  for (const auto& [name, m] : c.materials) {
    for (const auto& k : m.conductivity.principal)
      for (double v : k.y) consider(largest, v, "materials." + name + ".conductivity", m.place);
    for (const auto& row : m.conductivity.tensor)
      for (double v : row) consider(largest, v, "materials." + name + ".conductivity", m.place);
  }
  for (const auto& [name, q] : c.heat_sources) consider(largest, q, "heat_sources." + name, c.heat_source_places.at(name));
  for (const auto& [name, b] : c.boundaries) {
    if (b.heat_flux) consider(largest, *b.heat_flux, "boundaries." + name + ".heat_flux", b.place);
    if (b.convection)
      for (double h : b.convection->coefficient.y) consider(largest, h, "boundaries." + name + ".convection", b.place);
  }
  if (largest.magnitude < 0) return "";
  char value[32];
  std::snprintf(value, sizeof value, "%.3g", largest.magnitude);
  return "; the largest of the case's conductivities, film coefficients, heat sources and fluxes is " + largest.key +
         " = " + value + " (" + largest.place + "): check it for a typing or unit mistake";
}

bool finite(const std::vector<double>& values) {
  for (double v : values)
    if (!std::isfinite(v)) return false;
  return true;
}

}  // namespace

std::string solve_failure_message(const Case& c, const SteadySolution& solution, const std::filesystem::path& out) {
  const std::string where = "; results marked unconverged are in " + out.string();
  if (!finite(solution.temperature) || !std::isfinite(solution.linear.relative_residual))
    return "the solve failed: the numbers overflowed (NaN or infinity in the temperatures or their residual)" +
           largest_input(c) + where;
  const std::string failure = solution.nonlinear_message.empty() ? solution.linear.message : solution.nonlinear_message;
  return "the solve did not converge: " + failure + where +
         (solution.nonlinear_message.empty() ? ". Try solver.linear: direct, or check for very large conductivity contrasts"
                                             : "");
}

}  // namespace hearth
