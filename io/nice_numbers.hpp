// Round numbers for axes, colour bars and scale bars.
#pragma once

#include <string>
#include <vector>

namespace hearth {

// Tick values inside [low, high] at a round spacing (1, 2 or 5 times a power of ten)
// giving about `count` ticks; at least the ends when the interval is tiny.
std::vector<double> nice_ticks(double low, double high, int count = 5);

// The largest round length (1, 2 or 5 times a power of ten) not above `at_most` (> 0).
double round_length_below(double at_most);

// A value as short text with about `digits` significant digits ("1150", "0.025", "1.2e-05").
std::string short_number(double value, int digits = 4);

}  // namespace hearth
