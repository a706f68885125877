// The shipped material library (data/materials.yaml): typical handbook properties of
// common engineering materials, each entry with its source. A case uses an entry with
// materials: {shell: {library: carbon_steel}} and may override single properties.
#pragma once

#include <cstddef>
#include <filesystem>
#include <optional>
#include <string>
#include <vector>

#include "solver/material.hpp"

namespace hearth {

struct LibraryMaterial {
  std::string name;         // the entry's key, e.g. "carbon_steel"
  std::string description;  // one line
  std::string source;       // handbook, table, temperature range; "from memory" where so
  Conductivity conductivity;                       // isotropic: a constant or a table in K
  std::optional<double> density;                   // kg/m3
  std::optional<double> specific_heat;             // J/(kg K)
  std::optional<double> max_service_temperature;   // K
  int line = 0;                                    // of the entry's key in the file
};

struct MaterialLibrary {
  std::filesystem::path file;  // where it was read from
  std::string located_by;      // how the file was found: "HEARTH_DATA_DIR", "installed", "source tree", "given"
  std::vector<LibraryMaterial> materials;  // in file order

  const LibraryMaterial* find(const std::string& name) const;  // null if absent
  std::vector<std::string> names() const;
  // Up to `count` entry names nearest to `name`: names containing it (or contained in
  // it) first, then by edit distance.
  std::vector<std::string> nearest_names(const std::string& name, std::size_t count = 3) const;
};

struct LibraryLocation {
  std::filesystem::path file;
  std::string located_by;
};

// Where materials.yaml is: $HEARTH_DATA_DIR/materials.yaml if HEARTH_DATA_DIR is set
// (it may also name the file itself); else <folder of the program>/../share/hearth/
// materials.yaml (installed); else data/materials.yaml of the source tree this build
// came from. Throws InputError saying where it looked.
LibraryLocation locate_material_library();

// Reads and checks a library file. Throws InputError "FILE:LINE: key: what; how to fix".
MaterialLibrary load_material_library(const std::filesystem::path& file);

// locate_material_library() then load_material_library().
MaterialLibrary load_material_library();

}  // namespace hearth
