// libFuzzer target: the case reader (io/case_file) on arbitrary bytes, held to the
// Expected behaviour, not results: the reader or guard returns, or refuses with a named place (common practice, no source).
// contract in case_reader_contract.hpp. Built with clang when HEARTH_FUZZ=ON.
#include <cstddef>
#include <cstdint>
#include <random>
#include <string_view>

#include "tests/fuzz/case_reader_contract.hpp"
#include "tests/fuzz/number_edges.hpp"

extern "C" std::size_t LLVMFuzzerMutate(std::uint8_t* data, std::size_t size, std::size_t max_size);

// One mutation in eight puts an edge value in place of a number (number_edges.hpp);
// the rest are libFuzzer's own, which use the dictionary.
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
  // One folder for the whole run: the reader only reads from it.
  static const hearth::fuzz::CaseFolder folder;
  hearth::fuzz::read_case_under_contract(std::string_view(reinterpret_cast<const char*>(data), size), folder);
  return 0;
}
