// Reading and validating a case file (YAML, format version 1) into a Case.
#pragma once

#include <filesystem>
#include <string>
#include <string_view>
#include <vector>

#include "io/case.hpp"

namespace hearth {

// Reads `path`, applies `overrides` ("dotted.key=value", as from --set) to the YAML
// tree, validates every key against the schema and converts to SI and kelvin.
// Throws InputError naming file, line and key, with the nearest valid key for a
// misspelt one. Does not look at the geometry (names are checked against the mesh
// later by check_names_against_mesh in the driver).
Case read_case_file(const std::filesystem::path& path,
                    const std::vector<std::string>& overrides = {});

// The same from text already in memory (a fuzzer's bytes, an editor's buffer): `text`
// is read as if it were the file `path`, which need not exist. Messages name `path`,
// and relative paths in the case (geometry.file, output.directory) resolve against
// its folder, so the geometry file must still exist there.
Case read_case_text(std::string_view text, const std::filesystem::path& path,
                    const std::vector<std::string>& overrides = {});

}  // namespace hearth
