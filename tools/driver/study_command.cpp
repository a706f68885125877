// hearth study: the case on a sequence of meshes, coarse to fine, with the observed
// order, Richardson extrapolation and grid convergence index of every quantity.
#include <cmath>
#include <cstdio>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>

#include "io/atomic_file.hpp"
#include "io/input_error.hpp"
#include "io/summary_json.hpp"
#include "io/svg_plot.hpp"
#include "solver/convergence_study.hpp"
#include "tools/driver/commands.hpp"
#include "tools/driver/errors.hpp"
#include "tools/driver/output_lock.hpp"
#include "tools/driver/report.hpp"
#include "tools/driver/virtual_display.hpp"

namespace hearth {

namespace fs = std::filesystem;

namespace {

nlohmann::json read_json(const fs::path& path) {
  std::ifstream in(path);
  return nlohmann::json::parse(in);
}

// Available memory from /proc/meminfo, bytes (0 when unknown).
double available_memory() {
  std::ifstream in("/proc/meminfo");
  std::string key;
  double kb = 0;
  std::string unit;
  while (in >> key >> kb >> unit)
    if (key == "MemAvailable:") return kb * 1024.0;
  return 0.0;
}

std::string file_safe(const std::string& name) {
  std::string out;
  for (char c : name) out += (std::isalnum(static_cast<unsigned char>(c)) || c == '-' || c == '_') ? c : '_';
  return out;
}

struct Quantity {
  std::string name;  // dotted path into summary.json
  std::string unit;
  std::vector<StudyLevel> levels;
};

// The quantities of one level's summary: heat rates, region max and mean, probes.
std::vector<std::pair<std::string, std::string>> default_quantities(const nlohmann::json& s) {
  std::vector<std::pair<std::string, std::string>> q;
  const std::string t = s["temperature_unit"];
  for (auto& [name, b] : s["boundaries"].items())
    if (b["condition"] != "insulated") q.push_back({"boundaries." + name + ".heat_rate", "W"});
  for (auto& [name, r] : s["regions"].items()) {
    q.push_back({"regions." + name + ".temperature.max", t});
    q.push_back({"regions." + name + ".temperature.mean", t});
  }
  for (auto& [name, p] : s["probes"].items()) q.push_back({"probes." + name + ".temperature", t});
  return q;
}

const nlohmann::json* find_path(const nlohmann::json& j, const std::string& dotted) {
  const nlohmann::json* node = &j;
  std::stringstream in(dotted);
  std::string part;
  while (std::getline(in, part, '.')) {
    if (!node->is_object() || !node->contains(part)) return nullptr;
    node = &(*node)[part];
  }
  return node->is_number() ? node : nullptr;
}

}  // namespace

int study_command(const StudyOptions& study) {
  install_interrupt_handlers();
  const CommonOptions& options = study.common;
  const Progress progress(options.quiet);
  const Case c = load_case(options, progress);
  const fs::path dir = output_directory(c, options);
  if (std::string why_not; c.output_report && !display_possible(why_not))
    throw ReportUnavailable("output.report is true, but " + why_not + "; or set output.report: false");
  const OutputLock lock(dir, options.command_line);  // one hearth at a time per folder
  const double unit = c.units.metres_per_length();

  std::vector<double> sizes = study.sizes;  // in the case's length unit
  if (sizes.empty()) {
    if (study.levels < 2) throw InputError("--levels: a study needs at least 2 levels (3 or more for an order)");
    if (!(study.ratio > 1.0)) throw InputError("--ratio: the refinement ratio must be above 1 (1.5 by default)");
    for (int k = 0; k < study.levels; ++k) sizes.push_back(c.mesh_size / unit / std::pow(study.ratio, k));
  }
  std::sort(sizes.begin(), sizes.end(), std::greater<double>());  // coarse to fine
  fs::create_directories(dir);

  const int formal_order = c.mesh_order + 1;  // L2 / point values; heat rates likewise for smooth fields
  std::vector<Quantity> quantities;
  double last_nodes = 0.0;
  for (std::size_t k = 0; k < sizes.size(); ++k) {
    CommonOptions level = options;
    // Every size of the case scales with the level: the global one and the local ones.
    const double scale = sizes[k] / (c.mesh_size / unit);
    char set[64];
    std::snprintf(set, sizeof set, "mesh.size=%.10g", sizes[k]);
    level.sets.push_back(set);
    for (const auto& [name, local] : c.local_sizes) {
      char local_set[256];
      std::snprintf(local_set, sizeof local_set, "mesh.local_sizes.%s=%.10g", name.c_str(), local / unit * scale);
      level.sets.push_back(local_set);
    }
    level.warnings_to_terminal = false;  // they stay in each level's summary.json
    level.report_allowed = false;        // one report for the study, at the end
    level.out = (dir / ("level_" + std::to_string(k))).string();
    level.quiet = true;
    level.summary_only = false;
    const Case level_case = load_case(level, Progress(true));
    const std::string digest = input_digest(level_case, level);
    const fs::path level_dir = level.out;
    bool solved = false;
    if (fs::exists(level_dir / "run.json") && fs::exists(level_dir / "summary.json")) {
      const auto run = read_json(level_dir / "run.json");
      solved = run.value("input_digest", "") == digest;
    }
    if (!solved && last_nodes > 0) {  // memory estimate from the level before
      const double nodes = last_nodes * std::pow(sizes[k - 1] / sizes[k], 3);
      const double need = nodes * (c.mesh_order == 2 ? 2600.0 : 1800.0) + 400.0 * nodes * 6;  // solve + mesh, bytes
      const double have = available_memory();
      if (have > 0 && need > 0.9 * have)
        throw InputError("level " + std::to_string(k) + " (mesh.size " + std::to_string(sizes[k]) + ") needs about " +
                         std::to_string(static_cast<long long>(need / 1e9 + 0.5)) + " GB for some " +
                         std::to_string(static_cast<long long>(nodes)) + " nodes, but " +
                         std::to_string(static_cast<long long>(have / 1e9)) +
                         " GB are available; use fewer --levels, a smaller --ratio or a larger mesh.size");
    }
    const auto t0 = progress.elapsed();
    const std::string size_text = std::string(set).substr(std::string("mesh.size=").size());
    if (solved) {
      progress.say("level " + std::to_string(k) + ": mesh.size " + size_text + " already solved with these inputs");
    } else {
      run_command(level);
      char seconds[32];
      std::snprintf(seconds, sizeof seconds, "%.2f", progress.elapsed() - t0);
      progress.say("level " + std::to_string(k) + ": mesh.size " + size_text + " solved in " + seconds + " s");
    }
    check_interrupt("between levels; the finished levels are kept");
    const auto summary = read_json(level_dir / "summary.json");
    double volume = 0.0;
    for (auto& [name, r] : summary["regions"].items()) volume += r["volume"].get<double>();
    const double elements = summary["mesh"]["elements"].get<double>();
    const double h = std::cbrt(volume / elements) / unit;  // representative size, case length unit
    last_nodes = summary["mesh"]["nodes"].get<double>();
    if (quantities.empty()) {
      for (const auto& [name, qunit] : default_quantities(summary)) quantities.push_back({name, qunit, {}});
      for (const auto& name : study.quantities) quantities.push_back({name, "", {}});
    }
    for (auto& q : quantities) {
      const nlohmann::json* value = find_path(summary, q.name);
      if (!value)
        throw InputError("--quantity " + q.name + ": no such number in summary.json; quantities are dotted paths "
                         "such as boundaries.cold_face.heat_rate or probes.tip.temperature");
      q.levels.push_back({h, summary["solve"]["dofs"].get<double>(), value->get<double>()});
    }
  }

  // Estimates, files and the table.
  nlohmann::json out = {{"case_file", c.file.string()}, {"length_unit", c.units.length},
                        {"temperature_unit", c.units.temperature}, {"formal_order", formal_order},
                        {"quantities", nlohmann::json::object()}};
  std::ostringstream csv;
  csv.precision(12);
  csv << "quantity,level,size,dofs,value\n";
  std::printf("\n%-44s %14s %10s %14s %10s %10s  %s\n", "quantity", "finest", "order", "extrapolated", "GCI fine",
              "ratio", "status");
  double safety_factor = 1.25;
  for (const auto& q : quantities) {
    const ConvergenceEstimate e = estimate_convergence(q.levels, formal_order);
    safety_factor = e.safety_factor;
    nlohmann::json entry = {{"unit", q.unit},
                            {"h", nlohmann::json::array()},
                            {"dofs", nlohmann::json::array()},
                            {"values", nlohmann::json::array()},
                            {"observed_order", e.observed_order},
                            {"extrapolated", e.extrapolated},
                            {"gci_fine", e.gci_fine},
                            {"gci_medium", e.gci_medium},
                            {"asymptotic_ratio", e.asymptotic_ratio},
                            {"safety_factor", e.safety_factor},
                            {"status", e.status}};
    ConvergencePlot plot{q.name, q.unit, {}, {}, e.extrapolated, e.observed_order, c.units.length};
    for (std::size_t k = 0; k < q.levels.size(); ++k) {
      entry["h"].push_back(q.levels[k].h);
      entry["dofs"].push_back(q.levels[k].dofs);
      entry["values"].push_back(q.levels[k].value);
      plot.h.push_back(q.levels[k].h);
      plot.values.push_back(q.levels[k].value);
      csv << q.name << ',' << k << ',' << q.levels[k].h << ',' << q.levels[k].dofs << ',' << q.levels[k].value << '\n';
    }
    out["quantities"][q.name] = entry;
    write_convergence_svg(dir / (file_safe(q.name) + ".svg"), plot);
    std::printf("%-44s %14.6g %10.3g %14.6g %9.3g%% %10.3g  %s\n", q.name.c_str(), q.levels.back().value,
                e.observed_order, e.extrapolated, 100.0 * e.gci_fine, e.asymptotic_ratio, e.status.c_str());
  }
  write_text_file(dir / "study.csv", csv.str());
  write_summary(dir / "study.json", out);
  std::printf("\nlevels in %s (level_0 coarsest); GCI with a factor of safety of %.3g; an engineering estimate of "
              "the discretisation error only\n",
              dir.c_str(), safety_factor);
  if (c.output_report) {
    const ReportOutcome report = make_report(dir, c.report_mesh_edges, progress);
    progress.say("report: " + report.html.string());
  }
  return exit_done;
}

}  // namespace hearth
