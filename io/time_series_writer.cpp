#include "io/time_series_writer.hpp"

#include <cstdio>
#include <fstream>
#include <regex>
#include <sstream>
#include <stdexcept>

#include "io/atomic_file.hpp"

namespace hearth {

void write_time_series(const std::filesystem::path& path, const std::vector<TimeSeriesEntry>& entries) {
  std::ostringstream out;
  out << "<?xml version=\"1.0\"?>\n"
      << "<VTKFile type=\"Collection\" version=\"0.1\" byte_order=\"LittleEndian\">\n  <Collection>\n";
  for (const auto& e : entries) {
    char time[40];
    std::snprintf(time, sizeof time, "%.17g", e.time);
    out << "    <DataSet timestep=\"" << time << "\" group=\"\" part=\"0\" file=\"" << e.file << "\"/>\n";
  }
  out << "  </Collection>\n</VTKFile>\n";
  write_text_file(path, out.str());
}

std::vector<TimeSeriesEntry> read_time_series(const std::filesystem::path& path) {
  std::ifstream in(path);
  if (!in) throw std::runtime_error("cannot read " + path.string());
  std::stringstream text;
  text << in.rdbuf();
  const std::string s = text.str();
  std::vector<TimeSeriesEntry> entries;
  const std::regex dataset("<DataSet[^>]*>");
  const std::regex timestep("timestep=\"([^\"]*)\""), file("file=\"([^\"]*)\"");
  for (auto it = std::sregex_iterator(s.begin(), s.end(), dataset); it != std::sregex_iterator(); ++it) {
    const std::string tag = it->str();
    std::smatch t, f;
    if (!std::regex_search(tag, t, timestep) || !std::regex_search(tag, f, file))
      throw std::runtime_error(path.string() + ": a DataSet without timestep or file");
    entries.push_back({std::stod(t[1].str()), f[1].str()});
  }
  return entries;
}

}  // namespace hearth
