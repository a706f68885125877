// hearth run for analysis.type: transient: mesh (or the stored mesh of a restart),
// integrate in time, write temperature_NNNN.vtu and temperature.pvd as each output time
// completes, probes.csv with every step, and summary.json with the history.
#pragma once

#include <filesystem>

#include "io/case.hpp"
#include "tools/driver/pipeline.hpp"
#include "tools/driver/progress.hpp"

namespace hearth {

int run_transient(const CommonOptions& options, const Case& c, const std::filesystem::path& out,
                  const Progress& progress);

}  // namespace hearth
