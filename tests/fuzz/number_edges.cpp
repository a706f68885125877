// Replacing a number of a text input with an edge value (see number_edges.hpp).
// Expected behaviour, not results: the reader or guard returns, or refuses with a named place (common practice, no source).
#include "tests/fuzz/number_edges.hpp"

#include <cctype>
#include <cstring>
#include <string_view>

namespace hearth::fuzz {

namespace {

// Edges of int, long long and double, of the ranges the case file checks (zero,
// absolute zero) and YAML's own non-finite spellings.
constexpr std::string_view edge_values[] = {
    "0",          "-0",          "-1",          "1",
    "2147483647", "2147483648",  "-2147483649", "4294967296",
    "9223372036854775807", "9223372036854775808", "-9223372036854775809", "18446744073709551616",
    "1e308",      "1e309",       "-1e309",      "1e-320",
    "4.9e-324",   "-273.15",     "-273.16",     "0x7fffffff",
    "0x80000000", ".nan",        ".inf",        "-.inf"};

bool is_digit(std::uint8_t c) { return std::isdigit(c) != 0; }

}  // namespace

std::size_t replace_a_number_with_an_edge_value(std::uint8_t* data, std::size_t size, std::size_t max_size,
                                                std::minstd_rand& random) {
  if (size == 0) return 0;
  std::size_t begin = random() % size;
  while (begin < size && !is_digit(data[begin])) ++begin;
  if (begin == size) return 0;
  while (begin > 0 && is_digit(data[begin - 1])) --begin;
  if (begin > 0 && data[begin - 1] == '-') --begin;
  std::size_t end = begin;
  while (end < size && (is_digit(data[end]) || std::strchr(".eE+-", data[end]) != nullptr)) ++end;

  const std::string_view edge = edge_values[random() % (sizeof edge_values / sizeof edge_values[0])];
  const std::size_t new_size = size - (end - begin) + edge.size();
  if (new_size > max_size) return 0;
  std::memmove(data + begin + edge.size(), data + end, size - end);
  std::memcpy(data + begin, edge.data(), edge.size());
  return new_size;
}

}  // namespace hearth::fuzz
