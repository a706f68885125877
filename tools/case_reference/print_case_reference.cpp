// hearth_case_reference: prints the case-file reference (a Markdown table per section)
// from the schema table in io/case_schema.cpp, for docs/case-file.md. The test
// docs.case_file_reference_is_current checks that the document holds this output.
#include <cstdio>
#include <exception>
#include <string>

#include "io/case_schema.hpp"

int main() {
  try {
    const std::string reference = hearth::case_file_reference();
    std::fwrite(reference.data(), 1, reference.size(), stdout);
    return std::fflush(stdout) == 0 ? 0 : 3;
  } catch (const std::exception& e) {
    std::fprintf(stderr, "internal error: %s\n", e.what());
    return 3;
  }
}
