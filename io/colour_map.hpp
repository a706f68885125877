// The colour map of every temperature picture: "inferno", a perceptually uniform,
// colour-blind-safe sequential map from black through purple and red to pale yellow.
#pragma once

#include <array>
#include <string>

namespace hearth {

using Rgb = std::array<double, 3>;  // red, green, blue in [0, 1] (sRGB)

// The 256 entries of the published map, coldest first.
const std::array<Rgb, 256>& inferno_table();

// The colour of a value at `fraction` of the range (0 coldest, 1 hottest; clamped),
// linear between entries.
Rgb inferno_colour(double fraction);

// One sentence naming the map and where it comes from, for captions and reports.
std::string colour_map_credit();

}  // namespace hearth
