// Reading an earlier result back: the mesh it was computed on and its temperature
// field, for a transient run that starts from it (analysis.initial_temperature:
// {result: FOLDER}).
#pragma once

#include <filesystem>
#include <string>
#include <vector>

#include "mesh/mesh.hpp"

namespace hearth {

struct StoredResult {
  Mesh mesh;                         // as the result was computed on, in metres
  std::vector<double> temperature;   // K, one per node
  double time = 0.0;                 // s: 0 for a steady result, else the last listed time
  std::filesystem::path field_file;  // the file read
  std::string input_digest;          // from run.json, when present
  std::string geometry_digest;       // from run.json, when present
};

// Reads FOLDER/temperature.vtu (steady) or the last field listed in
// FOLDER/temperature.pvd (transient). Throws std::runtime_error with a message that
// says what is missing and how to make it (the caller adds the case-file place).
StoredResult read_stored_result(const std::filesystem::path& folder);

}  // namespace hearth
