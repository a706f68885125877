// temperature.pvd: the VTK collection file that lists a transient run's fields with
// their times, so that viewers play them as a time series.
#pragma once

#include <filesystem>
#include <string>
#include <vector>

namespace hearth {

struct TimeSeriesEntry {
  double time = 0.0;  // s
  std::string file;   // relative to the .pvd's folder
};

// Writes (atomically) a collection listing `entries` in order. Called after each new
// field file is complete, so the collection never names a file that is not whole.
void write_time_series(const std::filesystem::path& path, const std::vector<TimeSeriesEntry>& entries);

// The entries of a collection written by write_time_series (or any .pvd of DataSet
// lines with timestep and file attributes). Throws std::runtime_error if unreadable.
std::vector<TimeSeriesEntry> read_time_series(const std::filesystem::path& path);

}  // namespace hearth
