// The report's SVG plots: temperature and heat flux along a line, probe histories.
#pragma once

#include <string>

#include "io/line_profile.hpp"
#include "io/result_folder.hpp"

namespace hearth {

// Two panels sharing the distance axis: temperature (top) and heat-flux magnitude
// (bottom), one polyline per stretch of points inside the body (class "temperature" /
// "heat-flux"), a dashed line (class "region-boundary", data-x the distance) where the
// line passes from one region to another, the regions named between them.
std::string line_plot_svg(const LineProfile& line, const std::string& temperature_unit,
                          const std::string& length_unit);

// Temperature against time, one polyline per probe (class "probe"), in the order of
// probes.csv's columns, with a legend naming them.
std::string probe_history_svg(const ProbeTable& probes, const std::string& temperature_unit);

}  // namespace hearth
