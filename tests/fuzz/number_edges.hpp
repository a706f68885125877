// A mutation for text inputs that libFuzzer lacks: replace one number in the text with
// a value at the edge of a type or a range (2^31, 2^63, 1e309, -273.16, .nan, ...).
// libFuzzer's own integer mutation keeps the number of digits, so it never turns
// "points: 26" into a value that overflows an int; and the YAML parser is a Debian
// library without coverage instrumentation, which gives the fuzzer no feedback that
// would lead it there.
#pragma once

#include <cstddef>
#include <cstdint>
#include <random>

namespace hearth::fuzz {

// Replaces the number (a run of digits with its sign, decimals and exponent) at or
// after a random position of data[0, size) with an edge value, within max_size bytes.
// Returns the new size, or 0 (and data unchanged) when there is no number from that
// position on or the result would not fit.
std::size_t replace_a_number_with_an_edge_value(std::uint8_t* data, std::size_t size, std::size_t max_size,
                                                std::minstd_rand& random);

}  // namespace hearth::fuzz
