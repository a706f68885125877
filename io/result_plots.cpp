// Plot layout: fixed sizes in pixels, ranges from the data with a 5 % margin.
#include "io/result_plots.hpp"

#include <algorithm>
#include <cmath>

#include "io/field_pictures.hpp"
#include "io/nice_numbers.hpp"
#include "io/svg_canvas.hpp"

namespace hearth {

namespace {

using Points = std::vector<std::pair<double, double>>;

// Stretches of consecutive defined values, as (x, y) point lists.
std::vector<Points> stretches(const std::vector<double>& x, const std::vector<std::optional<double>>& y) {
  std::vector<Points> out;
  Points current;
  for (std::size_t k = 0; k < x.size(); ++k) {
    if (y[k] && std::isfinite(*y[k])) {
      current.push_back({x[k], *y[k]});
    } else if (!current.empty()) {
      out.push_back(current);
      current.clear();
    }
  }
  if (!current.empty()) out.push_back(current);
  return out;
}

std::pair<double, double> range_of(const std::vector<std::optional<double>>& values) {
  double low = INFINITY, high = -INFINITY;
  for (const auto& v : values)
    if (v && std::isfinite(*v)) low = std::min(low, *v), high = std::max(high, *v);
  if (!std::isfinite(low)) return {0.0, 1.0};
  return {low, high};
}

std::string point_text(const Point3& p) {
  return "(" + short_number(p[0]) + ", " + short_number(p[1]) + ", " + short_number(p[2]) + ")";
}

}  // namespace

std::string line_plot_svg(const LineProfile& line, const std::string& temperature_unit,
                          const std::string& length_unit) {
  const double width = 760, height = 560;
  SvgCanvas svg(width, height,
                "Line " + line.name + ": " + point_text(line.from) + " to " + point_text(line.to) + " " + length_unit);
  const double x_max = line.distance.empty() ? 1.0 : std::max(line.distance.back(), 1e-12);
  const auto [t_low, t_high] = padded_range(range_of(line.temperature).first, range_of(line.temperature).second);
  const auto flux_range = range_of(line.heat_flux);
  const auto [q_low, q_high] = padded_range(std::min(0.0, flux_range.first), flux_range.second);
  const PlotPanel top{0.0, x_max, t_low, t_high, 90, 70, 630, 190};
  const PlotPanel bottom{0.0, x_max, q_low, q_high, 90, 320, 630, 170};
  const std::string symbol = temperature_symbol(temperature_unit);

  svg.begin_panel(top, "", "temperature (" + symbol + ")", "temperature");
  for (const auto& c : line.crossings) svg.vertical_marker(top, c.distance, "region-boundary");
  for (const auto& s : stretches(line.distance, line.temperature))
    svg.polyline(top, s, series_colours()[0], "temperature");
  // Region names centred over the stretch each occupies.
  std::vector<double> edges{0.0};
  for (const auto& c : line.crossings) edges.push_back(c.distance);
  edges.push_back(x_max);
  std::vector<std::string> names;
  for (std::size_t k = 0; k < line.region.size(); ++k)
    if (!line.region[k].empty()) {
      names.push_back(line.region[k]);
      break;
    }
  for (const auto& c : line.crossings) names.push_back(c.after);
  for (std::size_t k = 0; k < names.size() && k + 1 < edges.size(); ++k)
    svg.text(top.px((edges[k] + edges[k + 1]) / 2), top.top - 8, names[k], "middle", 12, "#444");
  svg.end_panel();

  svg.begin_panel(bottom, "distance along the line (" + length_unit + ")", "heat flux |q| (W/m\u00b2)", "heat-flux");
  for (const auto& c : line.crossings) svg.vertical_marker(bottom, c.distance, "region-boundary");
  for (const auto& s : stretches(line.distance, line.heat_flux))
    svg.polyline(bottom, s, series_colours()[1], "heat-flux");
  svg.end_panel();
  svg.text(90, height - 26, "Temperature: line_" + line.name + ".csv. Heat flux: magnitude of the recovered nodal "
           "heat flux.", "start", 11, "#555");
  svg.text(90, height - 11, "Dashed lines: borders between regions.", "start", 11, "#555");
  return svg.str();
}

std::string probe_history_svg(const ProbeTable& probes, const std::string& temperature_unit) {
  const double width = 760, height = 440;
  SvgCanvas svg(width, height, "Probe temperatures against time");
  double low = INFINITY, high = -INFINITY;
  for (const auto& row : probes.values)
    for (double v : row)
      if (std::isfinite(v)) low = std::min(low, v), high = std::max(high, v);
  if (!std::isfinite(low)) low = 0, high = 1;
  const auto [t_low, t_high] = padded_range(low, high);
  const double t_end = probes.times.empty() ? 1.0 : std::max(probes.times.back(), 1e-12);
  const PlotPanel panel{probes.times.empty() ? 0.0 : std::min(0.0, probes.times.front()), t_end, t_low, t_high,
                        90, 60, 630, 280};
  svg.begin_panel(panel, "time (s)", "temperature (" + temperature_symbol(temperature_unit) + ")", "probes");
  std::vector<std::pair<std::string, std::string>> legend;
  for (std::size_t p = 0; p < probes.names.size(); ++p) {
    Points points;
    for (std::size_t r = 0; r < probes.times.size(); ++r)
      if (std::isfinite(probes.values[r][p])) points.push_back({probes.times[r], probes.values[r][p]});
    const std::string& colour = series_colours()[p % series_colours().size()];
    svg.polyline(panel, points, colour, "probe probe-" + std::to_string(p));
    legend.push_back({probes.names[p], colour});
  }
  svg.end_panel();
  svg.legend(90, height - 22, legend);
  return svg.str();
}

}  // namespace hearth
