// CSV results: line samples and probe series.
#pragma once

#include <array>
#include <filesystem>
#include <optional>
#include <string>
#include <vector>

#include "io/case.hpp"

namespace hearth {

struct LineSample {
  double distance = 0.0;             // m from the line's start
  std::array<double, 3> point{};     // m
  std::optional<double> temperature; // K; empty where the point is outside the body
};

// line_NAME.csv: distance, x, y, z, temperature (lengths in the case's unit); empty
// temperature for points outside the body.
void write_line_csv(const std::filesystem::path& path, const std::vector<LineSample>& samples, const Units& units);

// probes.csv: time_s, then one column per probe (temperatures in the case's unit).
void write_probes_csv(const std::filesystem::path& path, const std::vector<std::string>& names,
                      const std::vector<std::pair<double, std::vector<double>>>& rows_kelvin, const Units& units);

}  // namespace hearth
