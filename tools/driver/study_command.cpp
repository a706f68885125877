// hearth study: the case on a sequence of meshes, coarse to fine, for one or several
// element orders, with the observed order, Richardson extrapolation and grid
// convergence index of every quantity. Each level is a `hearth run` of its own
// (level_runner.hpp), so that levels can be solved side by side without sharing
// anything; a level already solved with the same inputs is not solved again.
#include <omp.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>

#include "io/atomic_file.hpp"
#include "io/input_error.hpp"
#include "io/summary_json.hpp"
#include "tools/driver/commands.hpp"
#include "tools/driver/errors.hpp"
#include "tools/driver/level_runner.hpp"
#include "tools/driver/mesh_file.hpp"
#include "tools/driver/mesh_worker.hpp"
#include "tools/driver/output_lock.hpp"
#include "tools/driver/study_report.hpp"
#include "tools/driver/report.hpp"
#include "tools/driver/virtual_display.hpp"

namespace hearth {

namespace fs = std::filesystem;

namespace {

// --ratio 2 (and no --sizes): the levels are one mesh split 0, 1, 2, ... times.
enum class LevelsBy { remeshing, splitting };

struct Level {
  int element_order = 1;
  int index = 0;            // 0: coarsest of its order
  CommonOptions options;    // the level's own run: overrides, folder, base mesh, threads
  std::string label;        // "level 2", "order 2, level 2"
  std::string description;  // "mesh.size 0.04", "base mesh split 2 times"
  double size = 0.0;        // remeshing: mesh.size in the case's length unit
  int splits = 0;           // splitting: times the base mesh is split
  bool solved = false;      // solved before with the same inputs (resume)
  double nodes = 0.0;       // once solved: from its summary.json
};

nlohmann::json read_json(const fs::path& path) {
  std::ifstream in(path);
  return nlohmann::json::parse(in);
}

std::string number_text(double x) {
  char text[32];
  std::snprintf(text, sizeof text, "%.10g", x);
  return text;
}

std::vector<int> study_orders(const StudyOptions& study, const Case& c) {
  if (study.orders.empty()) return {c.mesh_order};
  std::vector<int> orders = study.orders;
  std::sort(orders.begin(), orders.end());
  if (std::adjacent_find(orders.begin(), orders.end()) != orders.end())
    throw InputError("--order: name each element order once, e.g. --order 1,2");
  return orders;
}

// mesh.size of each level, coarse to fine, in the case's length unit (remeshing).
std::vector<double> level_sizes(const StudyOptions& study, const Case& c) {
  std::vector<double> sizes = study.sizes;
  if (sizes.empty())
    for (int k = 0; k < study.levels; ++k)
      sizes.push_back(c.mesh_size / c.units.metres_per_length() / std::pow(study.ratio, k));
  for (double s : sizes)
    if (!(s > 0)) throw InputError("--sizes: every mesh size must be above 0, got " + number_text(s));
  std::sort(sizes.begin(), sizes.end(), std::greater<double>());
  if (std::adjacent_find(sizes.begin(), sizes.end()) != sizes.end())
    throw InputError("--sizes: each size once; the levels must differ");
  return sizes;
}

// The base mesh of a split study, dir/base_mesh.bin: 4-node tetrahedra at the case's
// sizes, not yet cut at interfaces. Made once and kept while the inputs that made it
// (case file, geometry file, --set) stay the same (dir/base_mesh.json holds their digest).
fs::path prepare_base_mesh(const Case& c, const CommonOptions& options, const fs::path& dir,
                           const Progress& progress) {
  const fs::path mesh_path = dir / "base_mesh.bin", record_path = dir / "base_mesh.json";
  const std::string digest = input_digest(c, options);
  if (fs::exists(mesh_path) && fs::exists(record_path) &&
      read_json(record_path).value("input_digest", "") == digest) {
    progress.say("base mesh: kept from an earlier study with the same inputs");
    return mesh_path;
  }
  const Progress quiet(true);
  MeshRequest request = mesh_request(c, options.threads, quiet, options.trust_geometry);
  request.order = 1;  // split as 4-node tetrahedra; order 2 is added per level
  request.refinements = 0;
  const Mesh mesh = build_mesh_isolated(request, true, /*sandbox=*/!options.trust_geometry);
  if (mesh.order != 1)
    throw InputError(c.geometry_place.str() + ": the geometry is a mesh of 10-node tetrahedra, and --ratio 2 splits "
                     "4-node ones; give a mesh of 4-node tetrahedra, or another --ratio to remesh instead");
  write_atomically(mesh_path, [&](const fs::path& temporary) { write_mesh_file(temporary, mesh); });
  write_summary(record_path, {{"input_digest", digest},
                              {"nodes", mesh.n_nodes()},
                              {"elements", mesh.n_tets()},
                              {"mesh_size", c.mesh_size / c.units.metres_per_length()},
                              {"length_unit", c.units.length}});
  progress.say("base mesh: " + std::to_string(mesh.n_nodes()) + " nodes, " + std::to_string(mesh.n_tets()) +
               " tets, split for every level");
  return mesh_path;
}

std::vector<Level> plan_levels(const StudyOptions& study, const Case& c, const std::vector<int>& orders,
                               LevelsBy by, const fs::path& dir, const fs::path& base_mesh, int threads) {
  const double unit = c.units.metres_per_length();
  const std::vector<double> sizes = by == LevelsBy::remeshing ? level_sizes(study, c) : std::vector<double>();
  const int count = by == LevelsBy::remeshing ? static_cast<int>(sizes.size()) : study.levels;
  std::vector<Level> levels;
  for (int order : orders) {
    const fs::path order_dir = orders.size() > 1 ? dir / order_folder(order) : dir;
    for (int k = 0; k < count; ++k) {
      Level level;
      level.element_order = order;
      level.index = k;
      level.label = (orders.size() > 1 ? "order " + std::to_string(order) + ", level " : "level ") + std::to_string(k);
      CommonOptions& o = level.options;
      o = study.common;
      o.quiet = true;
      o.summary_only = false;
      o.warnings_to_terminal = false;  // they stay in each level's summary.json
      o.threads = threads;
      o.out = (order_dir / ("level_" + std::to_string(k))).string();
      if (by == LevelsBy::remeshing) {
        // Every size of the case scales with the level: the global one and the local ones.
        level.size = sizes[k];
        const double scale = sizes[k] / (c.mesh_size / unit);
        o.sets.push_back("mesh.size=" + number_text(sizes[k]));
        for (const auto& [name, local] : c.local_sizes)
          o.sets.push_back("mesh.local_sizes." + name + "=" + number_text(local / unit * scale));
        level.description = "mesh.size " + number_text(sizes[k]);
      } else {
        level.splits = c.mesh_refinements + k;
        o.sets.push_back("mesh.refinements=" + std::to_string(level.splits));
        o.base_mesh = base_mesh.string();
        level.description = level.splits == 0   ? std::string("base mesh")
                            : level.splits == 1 ? std::string("base mesh split once")
                                                : "base mesh split " + std::to_string(level.splits) + " times";
      }
      if (order != c.mesh_order) o.sets.push_back("mesh.order=" + std::to_string(order));
      levels.push_back(std::move(level));
    }
  }
  return levels;
}

// True when the level's folder holds a whole result of the same inputs.
bool already_solved(const Level& level) {
  const fs::path out = level.options.out;
  if (!fs::exists(out / "run.json") || !fs::exists(out / "summary.json")) return false;
  const Case level_case = load_case(level.options, Progress(true));
  return read_json(out / "run.json").value("input_digest", "") == input_digest(level_case, level.options);
}

// The `hearth run` command line of a level, after the program name.
std::vector<std::string> run_arguments(const Level& level) {
  const CommonOptions& o = level.options;
  std::vector<std::string> args = {"run", o.case_path, "--out", o.out, "--quiet", "--no-report"};
  if (o.threads > 0) args.insert(args.end(), {"--threads", std::to_string(o.threads)});
  if (o.trust_geometry) args.push_back("--trust-geometry");
  for (const auto& s : o.sets) args.insert(args.end(), {"--set", s});
  if (!o.base_mesh.empty()) args.insert(args.end(), {"--base-mesh", o.base_mesh});
  return args;
}

// Bytes for the solve (about 1.8 KB per node with 4-node, 2.6 KB with 10-node elements,
// measured) and the mesher (about 400 B a tetrahedron, some 6 tetrahedra a node).
double memory_for_nodes(double nodes, int order) { return nodes * (order == 2 ? 2600.0 : 1800.0) + 400.0 * nodes * 6; }

// Nodes a level will have: splitting multiplies the vertices by about 8 (a tetrahedral
// mesh has some 7 edges per vertex, each gaining a midpoint), and 10-node elements have
// about 8 nodes per vertex; remeshing scales the finest known level of the same order
// by the cube of the size ratio. NaN when no level of the order is known yet.
double estimated_nodes(const std::vector<Level>& levels, std::size_t i, double base_nodes) {
  const Level& level = levels[i];
  if (base_nodes > 0)
    return base_nodes * std::pow(8.0, level.splits) * (level.element_order == 2 ? 8.0 : 1.0);
  for (std::size_t j = i; j-- > 0;)
    if (levels[j].element_order == level.element_order && levels[j].nodes > 0)
      return levels[j].nodes * std::pow(levels[j].size / level.size, 3);
  return std::nan("");
}

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

// Every quantity of the levels of one order, read back from their summary.json.
std::vector<StudyQuantity> collect_quantities(const std::vector<Level>& levels, int order,
                                              const std::vector<std::string>& extra, double unit) {
  std::vector<StudyQuantity> quantities;
  for (const Level& level : levels) {
    if (level.element_order != order) continue;
    const auto summary = read_json(fs::path(level.options.out) / "summary.json");
    double volume = 0.0;
    for (auto& [name, r] : summary["regions"].items()) volume += r["volume"].get<double>();
    const double elements = summary["mesh"]["elements"].get<double>();
    const double h = std::cbrt(volume / elements) / unit;  // representative size, case length unit
    if (quantities.empty()) {
      for (const auto& [name, qunit] : default_quantities(summary)) quantities.push_back({name, qunit, {}});
      for (const auto& name : extra) quantities.push_back({name, "", {}});
    }
    for (auto& q : quantities) {
      const nlohmann::json* value = find_path(summary, q.name);
      if (!value)
        throw InputError("--quantity " + q.name + ": no such number in summary.json; quantities are dotted paths "
                         "such as boundaries.cold_face.heat_rate or probes.tip.temperature");
      q.levels.push_back({h, summary["solve"]["dofs"].get<double>(), value->get<double>()});
    }
  }
  return quantities;
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
  const std::vector<int> orders = study_orders(study, c);
  const LevelsBy by = study.sizes.empty() && study.ratio == 2.0 ? LevelsBy::splitting : LevelsBy::remeshing;
  if (study.sizes.empty()) {
    if (study.levels < 2) throw InputError("--levels: a study needs at least 2 levels (3 or more for an order)");
    if (!(study.ratio > 1.0)) throw InputError("--ratio: the refinement ratio must be above 1 (1.5 by default)");
  }
  // With --jobs K each level gets its share of the cores unless --threads says otherwise.
  const int threads = options.threads > 0 ? options.threads
                      : study.jobs > 1    ? std::max(1, omp_get_max_threads() / study.jobs)
                                          : 0;
  fs::create_directories(dir);
  const fs::path base_mesh = by == LevelsBy::splitting ? prepare_base_mesh(c, options, dir, progress) : fs::path();
  const double base_nodes =
      by == LevelsBy::splitting ? read_json(dir / "base_mesh.json")["nodes"].get<double>() : 0.0;

  std::vector<Level> levels = plan_levels(study, c, orders, by, dir, base_mesh, threads);
  std::vector<std::size_t> to_solve;
  for (std::size_t i = 0; i < levels.size(); ++i) {
    levels[i].solved = already_solved(levels[i]);
    if (levels[i].solved) {
      levels[i].nodes = read_json(fs::path(levels[i].options.out) / "summary.json")["mesh"]["nodes"].get<double>();
      progress.say(levels[i].label + ": " + levels[i].description + " already solved with these inputs");
    } else {
      to_solve.push_back(i);
    }
  }

  std::vector<LevelRun> runs;
  for (std::size_t i : to_solve) runs.push_back({levels[i].label, run_arguments(levels[i])});
  LevelScheduling scheduling;
  scheduling.jobs = study.jobs;
  scheduling.memory_needed = [&](std::size_t r) {
    const Level& level = levels[to_solve[r]];
    const double nodes = estimated_nodes(levels, to_solve[r], base_nodes);
    return MemoryNeed{std::isnan(nodes) ? nodes : memory_for_nodes(nodes, level.element_order),
                      "some " + number_text(std::round(nodes)) + " nodes (" + level.description + ")"};
  };
  scheduling.finished = [&](std::size_t r, double seconds) {
    Level& level = levels[to_solve[r]];
    level.nodes = read_json(fs::path(level.options.out) / "summary.json")["mesh"]["nodes"].get<double>();
    char text[32];
    std::snprintf(text, sizeof text, "%.2f", seconds);
    progress.say(level.label + ": " + level.description + " solved in " + text + " s");
  };
  run_levels(runs, scheduling);

  std::vector<OrderStudy> studies;
  std::vector<nlohmann::json> written;
  for (int order : orders) {
    OrderStudy s;
    s.element_order = order;
    s.dir = orders.size() > 1 ? dir / order_folder(order) : dir;
    s.levels_by = by == LevelsBy::splitting ? "splitting" : "remeshing";
    s.quantities = collect_quantities(levels, order, study.quantities, c.units.metres_per_length());
    written.push_back(write_order_study(c, s, options.command_line, orders.size() > 1));
    studies.push_back(std::move(s));
  }
  if (orders.size() > 1) write_order_comparison(c, dir, studies, written, options.command_line);
  char seconds[32];
  std::snprintf(seconds, sizeof seconds, "%.1f", progress.elapsed());
  progress.say(std::string("study done in ") + seconds + " s");
  if (c.output_report) {
    const ReportOutcome report = make_report(dir, c.report_mesh_edges, progress);
    progress.say("report: " + report.html.string());
  }
  return exit_done;
}

}  // namespace hearth
