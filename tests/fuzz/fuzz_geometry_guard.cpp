// libFuzzer target: the geometry guard (mesh/geometry_guard) on arbitrary script text,
// Expected behaviour, not results: the reader or guard returns, or refuses with a named place (common practice, no source).
// held to the contract in geometry_guard_contract.hpp. Built with clang when
// HEARTH_FUZZ=ON. Only the text scanner runs; no file is read and Gmsh is not called.
#include <cstddef>
#include <cstdint>
#include <random>
#include <string_view>

#include "tests/fuzz/geometry_guard_contract.hpp"
#include "tests/fuzz/number_edges.hpp"

extern "C" std::size_t LLVMFuzzerMutate(std::uint8_t* data, std::size_t size, std::size_t max_size);

// As for the case file: one mutation in eight puts an edge value in place of a number.
extern "C" std::size_t LLVMFuzzerCustomMutator(std::uint8_t* data, std::size_t size, std::size_t max_size,
                                               unsigned int seed) {
  std::minstd_rand random(seed);
  if (random() % 8 == 0) {
    const std::size_t replaced = hearth::fuzz::replace_a_number_with_an_edge_value(data, size, max_size, random);
    if (replaced > 0) return replaced;
  }
  return LLVMFuzzerMutate(data, size, max_size);
}

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  hearth::fuzz::scan_under_contract(std::string_view(reinterpret_cast<const char*>(data), size));
  return 0;
}
