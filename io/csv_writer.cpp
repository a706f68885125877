// Plain CSV with a header row, full double precision.
#include "io/csv_writer.hpp"

#include <iomanip>
#include <sstream>

#include "io/atomic_file.hpp"

namespace hearth {

void write_line_csv(const std::filesystem::path& path, const std::vector<LineSample>& samples, const Units& units) {
  std::ostringstream out;
  out << std::setprecision(12);
  out << "distance,x,y,z,temperature\n";
  const double s = 1.0 / units.metres_per_length();
  for (const auto& p : samples) {
    out << p.distance * s << ',' << p.point[0] * s << ',' << p.point[1] * s << ',' << p.point[2] * s << ',';
    if (p.temperature) out << units.from_kelvin(*p.temperature);
    out << '\n';
  }
  write_text_file(path, out.str());
}

void write_probes_csv(const std::filesystem::path& path, const std::vector<std::string>& names,
                      const std::vector<std::pair<double, std::vector<double>>>& rows_kelvin, const Units& units) {
  std::ostringstream out;
  out << std::setprecision(12);
  out << "time_s";
  for (const auto& n : names) out << ',' << n;
  out << '\n';
  for (const auto& [time, values] : rows_kelvin) {
    out << time;
    for (double v : values) out << ',' << units.from_kelvin(v);
    out << '\n';
  }
  write_text_file(path, out.str());
}

}  // namespace hearth
