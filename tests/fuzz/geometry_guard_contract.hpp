// The geometry guard's contract on arbitrary script text, shared by the libFuzzer
// target (fuzz_geometry_guard.cpp) and the replay of the inputs it found (tests/mesh).
//
// Whatever the text, find_unsafe_constructs must return (no exception, crash, hang or
// sanitiser report), every finding must name the file, a line of the text, what it
// found and why, and a script whose first statement runs a shell command must be refused
// whatever follows it: nothing later in a file can hide its first line.
#pragma once

#include <stdexcept>
#include <string>
#include <string_view>

namespace hearth::fuzz {

// The guard broke its contract; what() says how.
class GuardContractViolation : public std::logic_error {
 public:
  explicit GuardContractViolation(const std::string& what) : std::logic_error(what) {}
};

// Scans `text` and, with a shell command put before it, the text again; throws
// GuardContractViolation when either scan breaks the contract. Returns how many unsafe
// constructs the text itself holds.
std::size_t scan_under_contract(std::string_view text);

}  // namespace hearth::fuzz
