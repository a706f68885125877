// summary.json: the machine-readable result of a run (see docs/results.md).
#pragma once

#include <filesystem>
#include <nlohmann/json.hpp>

#include "io/case.hpp"
#include "io/run_record.hpp"

namespace hearth {

// Builds the summary: keys as the results contract in the design states, temperatures
// in the case's unit, lengths (locations) in its length unit, everything else SI.
nlohmann::json summary_json(const RunRecord& record, const Units& units);

void write_summary(const std::filesystem::path& path, const nlohmann::json& summary);

}  // namespace hearth
