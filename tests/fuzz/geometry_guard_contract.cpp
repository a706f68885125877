// The geometry guard's contract on arbitrary script text.
// Expected behaviour, not results: the reader or guard returns, or refuses with a named place (common practice, no source).
#include "tests/fuzz/geometry_guard_contract.hpp"

#include <algorithm>
#include <string>
#include <vector>

#include "mesh/geometry_guard.hpp"

namespace hearth::fuzz {

namespace {

const std::string file_name = "part.geo";

// Findings name the file, a line of the text, the construct and the reason. (Include
// and Merge names are returned as written, so an empty one, from Include ""; or an
// unterminated quote at the end, is not a fault: the walker finds no such file.)
void check_findings(const std::vector<UnsafeConstruct>& found, std::string_view text) {
  const int lines = 1 + static_cast<int>(std::count(text.begin(), text.end(), '\n'));
  for (const UnsafeConstruct& u : found) {
    const std::string where = u.file + ":" + std::to_string(u.line) + ": " + u.construct;
    if (u.file != file_name) throw GuardContractViolation("a finding names another file: " + where);
    if (u.line < 1 || u.line > lines)
      throw GuardContractViolation("a finding on no line of the text (it has " + std::to_string(lines) + "): " + where);
    if (u.construct.empty() || u.reason.empty()) throw GuardContractViolation("a finding without what or why: " + where);
  }
}

}  // namespace

std::size_t scan_under_contract(std::string_view text) {
  std::vector<std::string> includes;
  const std::vector<UnsafeConstruct> found = find_unsafe_constructs(text, file_name, &includes);
  check_findings(found, text);

  // The same text after a shell command on a line of its own: refused, with the command
  // found on line 1.
  const std::string prefixed = "SystemCall \"true\";\n" + std::string(text);
  std::vector<std::string> prefixed_includes;
  const std::vector<UnsafeConstruct> refused = find_unsafe_constructs(prefixed, file_name, &prefixed_includes);
  check_findings(refused, prefixed);
  const bool first_line_found = std::any_of(refused.begin(), refused.end(), [](const UnsafeConstruct& u) {
    return u.line == 1 && u.construct.find("SystemCall") != std::string::npos;
  });
  if (!first_line_found)
    throw GuardContractViolation("a SystemCall on line 1 was not found once this text followed it");
  return found.size();
}

}  // namespace hearth::fuzz
