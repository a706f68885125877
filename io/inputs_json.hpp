// inputs.json: the case as hearth understood it (library entries filled in, overrides
// applied), for the report's tables and for anyone checking what was solved.
#pragma once

#include <filesystem>
#include <nlohmann/json.hpp>

#include "io/case.hpp"

namespace hearth {

// Materials (with the regions that use them), boundary conditions, interfaces, heat
// sources, safety limits and mesh settings. Temperatures (also those of tables) in the
// case's temperature unit, lengths in its length unit, everything else SI; see
// docs/results.md.
nlohmann::json inputs_json(const Case& c);

}  // namespace hearth
