// JSON with nlohmann, the PVD collection with the time-series reader, CSV by hand
// (hearth's own plain files: a header row, numbers, no quoting).
#include "io/result_folder.hpp"

#include <algorithm>
#include <cctype>
#include <cstdlib>
#include <fstream>
#include <sstream>

#include "io/input_error.hpp"
#include "io/time_series_writer.hpp"

namespace hearth {

namespace fs = std::filesystem;

namespace {

nlohmann::json read_json_file(const fs::path& path) {
  std::ifstream in(path);
  try {
    return nlohmann::json::parse(in);
  } catch (const nlohmann::json::exception& e) {
    throw InputError(path.string() + ": not valid JSON (" + e.what() + "); the file is damaged: run the case again");
  }
}

std::vector<std::string> split_csv_line(const std::string& line) {
  std::vector<std::string> cells;
  std::string cell;
  std::stringstream in(line);
  while (std::getline(in, cell, ',')) cells.push_back(cell);
  if (!line.empty() && line.back() == ',') cells.push_back("");
  return cells;
}

std::optional<double> parse_number(const std::string& text) {
  if (text.empty()) return std::nullopt;
  char* end = nullptr;
  const double v = std::strtod(text.c_str(), &end);
  if (end == text.c_str()) return std::nullopt;
  return v;
}

// Rows of a CSV file, header first.
std::vector<std::vector<std::string>> read_csv_rows(const fs::path& path) {
  std::ifstream in(path);
  std::vector<std::vector<std::string>> rows;
  std::string line;
  while (std::getline(in, line)) {
    if (!line.empty() && line.back() == '\r') line.pop_back();
    if (!line.empty()) rows.push_back(split_csv_line(line));
  }
  if (rows.empty()) throw InputError(path.string() + ": empty; the file is damaged: run the case again");
  return rows;
}

LineTable read_line_csv(const fs::path& path, const std::string& name) {
  const auto rows = read_csv_rows(path);
  const std::vector<std::string> expected = {"distance", "x", "y", "z", "temperature"};
  if (rows[0].size() < expected.size() || !std::equal(expected.begin(), expected.end(), rows[0].begin()))
    throw InputError(path.string() + ":1: expected the header distance,x,y,z,temperature; the file is not a "
                                     "hearth line file: remove it or run the case again");
  LineTable table;
  table.name = name;
  for (std::size_t r = 1; r < rows.size(); ++r) {
    std::vector<std::optional<double>> v;
    for (std::size_t k = 0; k < 5; ++k) v.push_back(k < rows[r].size() ? parse_number(rows[r][k]) : std::nullopt);
    if (!v[0] || !v[1] || !v[2] || !v[3])
      throw InputError(path.string() + ":" + std::to_string(r + 1) + ": expected numbers for distance, x, y, z");
    table.distance.push_back(*v[0]);
    table.points.push_back({*v[1], *v[2], *v[3]});
    table.temperature.push_back(v[4]);
  }
  return table;
}

ProbeTable read_probes_csv(const fs::path& path) {
  const auto rows = read_csv_rows(path);
  if (rows[0].empty() || rows[0][0] != "time_s")
    throw InputError(path.string() + ":1: expected a header starting with time_s; run the case again");
  ProbeTable table;
  table.names.assign(rows[0].begin() + 1, rows[0].end());
  for (std::size_t r = 1; r < rows.size(); ++r) {
    const auto time = parse_number(rows[r][0]);
    if (!time || rows[r].size() != rows[0].size())
      throw InputError(path.string() + ":" + std::to_string(r + 1) + ": expected " + std::to_string(rows[0].size()) +
                       " numbers; the file is damaged: run the case again");
    std::vector<double> values;
    for (std::size_t k = 1; k < rows[r].size(); ++k) values.push_back(parse_number(rows[r][k]).value_or(NAN));
    table.times.push_back(*time);
    table.values.push_back(values);
  }
  return table;
}

std::vector<SeriesStep> read_pvd(const fs::path& path) {
  std::vector<TimeSeriesEntry> entries;
  try {
    entries = read_time_series(path);
  } catch (const std::runtime_error& e) {
    throw InputError(std::string(e.what()) + "; the time series is damaged: run the case again");
  }
  if (entries.empty()) throw InputError(path.string() + ": lists no time steps; run the case again");
  std::vector<SeriesStep> steps;
  for (const auto& e : entries) {
    const fs::path given(e.file);
    steps.push_back({e.time, given.is_absolute() ? given : path.parent_path() / given});
  }
  return steps;
}

}  // namespace

std::string file_safe(const std::string& name) {
  std::string out;
  for (char c : name) out += (std::isalnum(static_cast<unsigned char>(c)) || c == '-' || c == '_') ? c : '_';
  return out;
}

void read_result_folder_exists(const fs::path& directory) {
  if (!fs::is_directory(directory))
    throw InputError(directory.string() + ": no such folder; give the results folder of a hearth run "
                                          "(output.directory of the case, 'results' by default)");
}

ResultFolder read_result_folder(const fs::path& directory) {
  read_result_folder_exists(directory);
  ResultFolder f;
  f.directory = fs::absolute(directory).lexically_normal();
  const fs::path summary = f.directory / "summary.json";
  if (!fs::is_regular_file(summary))
    throw InputError(directory.string() + ": has no summary.json, so it is not the folder of a finished hearth run "
                                          "(summary.json is written last); give the results folder of a run, or "
                                          "run the case first");
  f.summary = read_json_file(summary);
  if (fs::is_regular_file(f.directory / "run.json")) f.run = read_json_file(f.directory / "run.json");
  if (fs::is_regular_file(f.directory / "inputs.json")) f.inputs = read_json_file(f.directory / "inputs.json");
  f.converged = f.summary.value(nlohmann::json::json_pointer("/solve/converged"), true);

  if (fs::is_regular_file(f.directory / "temperature.pvd")) {
    f.series = read_pvd(f.directory / "temperature.pvd");
    f.field_file = f.series.back().file;
    f.field_time = f.series.back().time;
  } else if (fs::is_regular_file(f.directory / "temperature.vtu")) {
    f.field_file = f.directory / "temperature.vtu";
  } else if (fs::is_regular_file(f.directory / "temperature_unconverged.vtu")) {
    f.field_file = f.directory / "temperature_unconverged.vtu";
  } else {
    throw InputError(directory.string() + ": has summary.json but no temperature.vtu, temperature.pvd or "
                                          "temperature_unconverged.vtu; the folder is incomplete: run the case again");
  }
  f.surface_file = f.directory / "surface.vtp";

  std::vector<fs::path> line_files;
  for (const auto& entry : fs::directory_iterator(f.directory)) {
    const std::string name = entry.path().filename().string();
    if (entry.is_regular_file() && name.rfind("line_", 0) == 0 && entry.path().extension() == ".csv")
      line_files.push_back(entry.path());
  }
  std::sort(line_files.begin(), line_files.end());
  for (const auto& file : line_files) {
    const std::string stem = file.stem().string();
    f.lines.push_back(read_line_csv(file, stem.substr(5)));
  }
  if (fs::is_regular_file(f.directory / "probes.csv")) f.probes = read_probes_csv(f.directory / "probes.csv");
  return f;
}

std::optional<StudyFolder> read_study_folder(const fs::path& directory) {
  const fs::path file = directory / "study.json";
  if (!fs::is_regular_file(file)) return std::nullopt;
  StudyFolder s;
  s.directory = fs::absolute(directory).lexically_normal();
  s.study = read_json_file(file);
  for (int k = 0; fs::is_directory(s.directory / ("level_" + std::to_string(k))); ++k)
    s.levels.push_back(s.directory / ("level_" + std::to_string(k)));
  if (s.levels.empty())
    throw InputError(file.string() + ": the study folder has no level_0 folder; run the study again");
  if (s.study.contains("quantities"))
    for (const auto& [name, q] : s.study["quantities"].items()) {
      (void)q;
      const fs::path plot = s.directory / (file_safe(name) + ".svg");
      if (fs::is_regular_file(plot)) s.plots.push_back(plot);
    }
  return s;
}

}  // namespace hearth
