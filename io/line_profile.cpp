// Point sampling and bisection along a straight line.
#include "io/line_profile.hpp"

#include <cmath>

namespace hearth {

LineProfile profile_line(const LineTable& line, const FieldGrid& field) {
  LineProfile p;
  p.name = line.name;
  if (line.points.empty()) return p;
  p.from = line.points.front();
  p.to = line.points.back();
  const double length = line.distance.back();
  auto point_at = [&](double d) {
    const double s = length > 0 ? d / length : 0.0;
    return Point3{p.from[0] + s * (p.to[0] - p.from[0]), p.from[1] + s * (p.to[1] - p.from[1]),
                  p.from[2] + s * (p.to[2] - p.from[2])};
  };
  for (std::size_t k = 0; k < line.points.size(); ++k) {
    p.distance.push_back(line.distance[k]);
    p.temperature.push_back(line.temperature[k]);
    std::optional<FieldSample> s = line.temperature[k] ? field.sample(line.points[k]) : std::nullopt;
    if (line.temperature[k] && !s && length > 0) {
      // An end on the surface that round-off puts a hair outside: look just inside.
      const double inward = line.distance[k] < length / 2 ? 1e-7 * length : -1e-7 * length;
      s = field.sample(point_at(line.distance[k] + inward));
    }
    if (s) {
      const auto& q = s->heat_flux;
      p.heat_flux.push_back(field.has_heat_flux() ? std::optional<double>(std::sqrt(q[0] * q[0] + q[1] * q[1] + q[2] * q[2]))
                                                  : std::nullopt);
      p.region.push_back(s->region);
    } else {
      p.heat_flux.push_back(std::nullopt);
      p.region.push_back("");
    }
  }
  for (std::size_t k = 0; k + 1 < p.region.size(); ++k) {
    if (p.region[k].empty() || p.region[k + 1].empty() || p.region[k] == p.region[k + 1]) continue;
    double lo = p.distance[k], hi = p.distance[k + 1];
    for (int i = 0; i < 60 && hi - lo > 1e-9 * length; ++i) {
      const double mid = (lo + hi) / 2;
      const auto s = field.sample(point_at(mid));
      if (!s) break;  // a gap between the two regions: take the middle
      (s->region == p.region[k] ? lo : hi) = mid;
    }
    p.crossings.push_back({(lo + hi) / 2, p.region[k], p.region[k + 1]});
  }
  return p;
}

}  // namespace hearth
