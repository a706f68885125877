// Reading back a finished results folder (steady, transient or study) for the report.
#pragma once

#include <array>
#include <filesystem>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <vector>

namespace hearth {

// line_NAME.csv: one row per sample point (lengths in the case's unit).
struct LineTable {
  std::string name;
  std::vector<double> distance;
  std::vector<std::array<double, 3>> points;
  std::vector<std::optional<double>> temperature;  // empty where the point is outside the body
};

// probes.csv: time_s and one column per probe, one row per written time.
struct ProbeTable {
  std::vector<std::string> names;
  std::vector<double> times;                 // s
  std::vector<std::vector<double>> values;   // [row][probe], the case's temperature unit
};

// One entry of temperature.pvd.
struct SeriesStep {
  double time = 0.0;  // s
  std::filesystem::path file;
};

struct ResultFolder {
  std::filesystem::path directory;
  nlohmann::json summary;   // summary.json
  nlohmann::json run;       // run.json, {} when absent
  nlohmann::json inputs;    // inputs.json, {} when absent
  std::vector<SeriesStep> series;        // temperature.pvd, in file order (empty: steady)
  std::filesystem::path field_file;      // the VTU to picture: the last step of the series,
                                         // temperature.vtu, or temperature_unconverged.vtu
  std::optional<double> field_time;      // s, when from a series
  std::filesystem::path surface_file;    // surface.vtp
  std::vector<LineTable> lines;          // by name
  std::optional<ProbeTable> probes;
  bool converged = true;                 // summary.json solve.converged
};

// A study folder: study.json and its levels, coarse (level_0) to fine.
struct StudyFolder {
  std::filesystem::path directory;
  nlohmann::json study;  // study.json
  std::vector<std::filesystem::path> levels;
  std::vector<std::filesystem::path> plots;  // the study's NAME.svg files, in study.json's order
};

// A name as hearth puts it into file names: characters other than letters, digits, '-'
// and '_' become '_' (hearth study's NAME.svg, the report's plot_line_NAME.svg).
std::string file_safe(const std::string& name);

// InputError unless `directory` is a folder (the first check of read_result_folder).
void read_result_folder_exists(const std::filesystem::path& directory);

// Reads a results folder. Throws InputError (what is missing, and what to do) when it
// is not the folder of a finished hearth run.
ResultFolder read_result_folder(const std::filesystem::path& directory);

// The study in `directory` when it holds study.json, else nothing. Throws InputError
// for a study.json that does not parse or a study without levels.
std::optional<StudyFolder> read_study_folder(const std::filesystem::path& directory);

}  // namespace hearth
