// The transient run: stages around solve_transient() and the files it leaves.
#include "tools/driver/transient_run.hpp"

#include <cmath>
#include <cstdio>
#include <iostream>
#include <optional>

#include "io/input_error.hpp"
#include "io/inputs_json.hpp"
#include "io/stored_result.hpp"
#include "io/summary_json.hpp"
#include "io/surface_writer.hpp"
#include "io/time_series_writer.hpp"
#include "io/vtu_writer.hpp"
#include "mesh/body_surface.hpp"
#include "mesh/mesh_quality.hpp"
#include "solver/assembler.hpp"
#include "solver/post_processing.hpp"
#include "solver/transient_solver.hpp"
#include "tools/driver/errors.hpp"
#include "tools/driver/case_mesh_checks.hpp"
#include "tools/driver/memory_check.hpp"
#include "tools/driver/output_directory.hpp"
#include "tools/driver/split_mesh.hpp"
#include "tools/driver/report.hpp"

namespace hearth {

namespace {

int index_of(const std::vector<NamedEntity>& entities, const std::string& name) { return entity_index(entities, name); }
std::string fmt(const char* format, double value) { return format_number(format, value); }

// The mesh: the stored one of the result the run starts from, else a new one.
Mesh transient_mesh(const Case& c, const CommonOptions& options, const Progress& progress,
                    std::optional<StoredResult>& stored) {
  if (!c.transient.initial_result)  // a study's split level splits the study's base mesh
    return options.base_mesh.empty() ? mesh_case(c, options.threads, progress, options.trust_geometry)
                                     : split_base_mesh(c, options.base_mesh, progress);
  const std::filesystem::path& folder = *c.transient.initial_result;
  const std::string where = c.transient.initial_place.str() + ".result";
  try {
    stored = read_stored_result(folder);
  } catch (const std::runtime_error& e) {
    throw InputError(where + ": " + e.what());
  }
  if (!stored->geometry_digest.empty() && stored->geometry_digest != geometry_digest(c))
    throw InputError(where + ": " + folder.string() + " was computed on a different version of " +
                     c.geometry_file.filename().string() +
                     "; a restart reuses that result's mesh, so the geometry must be the one it was made from. Run "
                     "the case that makes " + folder.filename().string() + " again, or start from a temperature");
  Mesh mesh = std::move(stored->mesh);
  mesh.tet_quality = tet_qualities(mesh);
  progress.say("starting from " + stored->field_file.string() + fmt(" (t = %.6g s): ", stored->time) +
               std::to_string(mesh.n_nodes()) + " nodes, " + std::to_string(mesh.n_tets()) +
               " elements, the mesh it was computed on");
  return mesh;
}

std::vector<double> initial_field(const Case& c, const Mesh& mesh, const std::optional<StoredResult>& stored,
                                  std::string& from) {
  const TransientSpec& t = c.transient;
  if (stored) {
    from = t.initial_result->string();
    return stored->temperature;
  }
  if (t.initial_temperature) {
    from = "uniform";
    return std::vector<double>(mesh.n_nodes(), *t.initial_temperature);
  }
  // Per region; a node shared by regions takes the mean of their values.
  from = "regions";
  std::vector<double> sum(mesh.n_nodes(), 0.0), count(mesh.n_nodes(), 0.0);
  std::vector<double> value(mesh.regions.size(), 0.0);
  for (std::size_t r = 0; r < mesh.regions.size(); ++r) value[r] = t.initial_by_region.at(mesh.regions[r].name);
  std::vector<std::vector<char>> seen(mesh.regions.size(), std::vector<char>(mesh.n_nodes(), 0));
  for (std::size_t e = 0; e < mesh.n_tets(); ++e) {
    const int r = mesh.tet_region[e];
    for (int a = 0; a < mesh.nodes_per_tet(); ++a) {
      const std::int32_t i = mesh.tet(e)[a];
      if (seen[r][i]) continue;
      seen[r][i] = 1;
      sum[i] += value[r];
      count[i] += 1.0;
    }
  }
  for (std::size_t i = 0; i < sum.size(); ++i) sum[i] = count[i] > 0 ? sum[i] / count[i] : value[0];
  return sum;
}

TransientProblem transient_problem(const Case& c, const Mesh& mesh) {
  TransientProblem problem;
  problem.base = make_problem(c, mesh);
  for (std::size_t r = 0; r < mesh.regions.size(); ++r) {
    const MaterialSpec& m = c.materials.at(c.regions.at(mesh.regions[r].name));
    problem.base.regions[r].capacity = HeatCapacity{*m.density, *m.specific_heat};
  }
  using Target = TimeVaryingValue::Target;
  struct Setter {
    Target target;
    int index;
    TimeTable table;
  };
  std::vector<Setter> setters;
  for (const TimeVaryingValue& v : c.time_varying) {
    const int index =
        v.target == Target::heat_source ? index_of(mesh.regions, v.name) : index_of(mesh.boundaries, v.name);
    if (index < 0) continue;  // a name the geometry lacks is reported by check_names_against_mesh
    setters.push_back({v.target, index, v.table});
    for (double t : v.table.break_times()) problem.break_times.push_back(t);
    for (double t : v.table.step_times()) problem.step_times.push_back(t);
  }
  problem.at_time = [setters](double t, ThermalProblem& p) {
    for (const Setter& s : setters) {
      const double value = s.table.value(t);
      switch (s.target) {
        case Target::temperature: p.boundaries[s.index].temperature = value; break;
        case Target::heat_flux: p.boundaries[s.index].heat_flux = value; break;
        case Target::convection_coefficient: p.boundaries[s.index].convection->coefficient = PiecewiseLinear(value); break;
        case Target::convection_ambient: p.boundaries[s.index].convection->ambient = value; break;
        case Target::radiation_surroundings: p.boundaries[s.index].radiation->surroundings = value; break;
        case Target::heat_source: p.regions[s.index].heat_source = value; break;
      }
    }
  };
  return problem;
}

// Area weight of each node on each boundary (for surface means), and node lists.
struct SurfaceWeights {
  std::vector<std::vector<std::pair<std::int32_t, double>>> nodes;  // per boundary: node, weight (sum 1)
};

SurfaceWeights surface_weights(const Mesh& mesh) {
  SurfaceWeights out;
  out.nodes.resize(mesh.boundaries.size());
  std::vector<std::map<std::int32_t, double>> w(mesh.boundaries.size());
  std::vector<double> area(mesh.boundaries.size(), 0.0);
  double integrals[max_face_nodes];
  for (std::size_t f = 0; f < mesh.n_faces(); ++f) {
    face_shape_integrals(face_geometry(mesh, f), integrals);
    for (int a = 0; a < mesh.nodes_per_face(); ++a) {
      w[mesh.face_boundary[f]][mesh.face(f)[a]] += integrals[a];
      area[mesh.face_boundary[f]] += integrals[a];
    }
  }
  for (std::size_t b = 0; b < w.size(); ++b)
    for (const auto& [node, weight] : w[b]) out.nodes[b].push_back({node, area[b] > 0 ? weight / area[b] : 0.0});
  return out;
}

// Watches thresholds, touch surfaces and service limits at every accepted step.
class Watchers {
 public:
  Watchers(const Case& c, const Mesh& mesh, const std::vector<double>& initial, std::vector<ThresholdRecord>& thresholds,
           std::vector<TouchRecord>& touch, std::vector<ServiceRecord>& service, const PointLocator* locator)
      : c_(c), mesh_(mesh), weights_(surface_weights(mesh)), thresholds_(thresholds), touch_(touch), service_(service),
        locator_(locator) {
    region_nodes_.resize(mesh.regions.size());
    std::vector<std::vector<char>> seen(mesh.regions.size(), std::vector<char>(mesh.n_nodes(), 0));
    for (std::size_t e = 0; e < mesh.n_tets(); ++e)
      for (int a = 0; a < mesh.nodes_per_tet(); ++a) {
        const std::int32_t i = mesh.tet(e)[a];
        if (!seen[mesh.tet_region[e]][i]) region_nodes_[mesh.tet_region[e]].push_back(i);
        seen[mesh.tet_region[e]][i] = 1;
      }
    for (const ThresholdSpec& spec : c.thresholds) {
      ThresholdRecord r;
      r.name = spec.name;
      r.kind = spec.kind == ThresholdSpec::Kind::probe        ? "probe"
               : spec.kind == ThresholdSpec::Kind::region_max ? "region_max"
                                                               : "surface_mean";
      r.target = spec.target;
      r.temperature = spec.temperature;
      r.start_value = watched(spec, initial);
      thresholds_.push_back(r);
    }
    previous_values_.resize(c.thresholds.size());
    for (std::size_t k = 0; k < c.thresholds.size(); ++k) previous_values_[k] = thresholds_[k].start_value;
    for (const std::string& name : c.touch_surfaces) {
      const int b = index_of(mesh.boundaries, name);
      touch_.push_back({name, -1.0, {}, c.touch_limit, std::nullopt, std::nullopt});
      touch_boundary_.push_back(b);
      const auto hot = hottest(weights_.nodes[b], initial);
      touch_previous_.push_back(hot.first);
      update_touch(touch_.size() - 1, 0.0, initial);
    }
    for (const auto& [name, material] : c.materials) {
      if (!material.max_service_temperature) continue;
      std::vector<std::int32_t> nodes;
      for (std::size_t r = 0; r < mesh.regions.size(); ++r)
        if (c.regions.at(mesh.regions[r].name) == name)
          nodes.insert(nodes.end(), region_nodes_[r].begin(), region_nodes_[r].end());
      if (nodes.empty()) continue;
      service_.push_back({name, -1.0, {}, *material.max_service_temperature});
      service_nodes_.push_back(nodes);
    }
    previous_time_ = 0.0;
    observe_service(initial);
  }

  void observe(double t, const std::vector<double>& T) {
    for (std::size_t k = 0; k < c_.thresholds.size(); ++k) {
      const double v = watched(c_.thresholds[k], T);
      ThresholdRecord& r = thresholds_[k];
      const double v0 = previous_values_[k];
      const bool rising = r.start_value < r.temperature;
      if (!r.first_crossed && (rising ? v >= r.temperature : v <= r.temperature))
        r.first_crossed = crossing(previous_time_, v0, t, v, r.temperature);
      previous_values_[k] = v;
    }
    for (std::size_t k = 0; k < touch_.size(); ++k) update_touch(k, t, T);
    observe_service(T);
    previous_time_ = t;
  }

 private:
  static double crossing(double t0, double v0, double t1, double v1, double level) {
    if (v1 == v0) return t1;
    return t0 + (level - v0) / (v1 - v0) * (t1 - t0);
  }
  std::pair<double, std::int32_t> hottest(const std::vector<std::pair<std::int32_t, double>>& nodes,
                                          const std::vector<double>& T) const {
    double best = -1.0;
    std::int32_t where = nodes.empty() ? 0 : nodes.front().first;
    for (const auto& [node, w] : nodes)
      if (T[node] > best) best = T[node], where = node;
    return {best, where};
  }
  double watched(const ThresholdSpec& spec, const std::vector<double>& T) const {
    switch (spec.kind) {
      case ThresholdSpec::Kind::probe: {
        for (const auto& p : c_.probes)
          if (p.name == spec.target) return locator_->interpolate(*locator_->locate(p.point), T);
        return 0.0;
      }
      case ThresholdSpec::Kind::region_max: {
        double best = -1.0;
        for (const std::int32_t i : region_nodes_[index_of(mesh_.regions, spec.target)]) best = std::max(best, T[i]);
        return best;
      }
      case ThresholdSpec::Kind::surface_mean: {
        double mean = 0.0;
        for (const auto& [node, w] : weights_.nodes[index_of(mesh_.boundaries, spec.target)]) mean += w * T[node];
        return mean;
      }
    }
    return 0.0;
  }
  void update_touch(std::size_t k, double t, const std::vector<double>& T) {
    TouchRecord& r = touch_[k];
    const auto [hot, node] = hottest(weights_.nodes[touch_boundary_[k]], T);
    if (hot > r.max) {
      r.max = hot;
      r.location = mesh_.node(node);
      r.time_of_max = t;
    }
    if (!r.first_exceeded_time && hot > r.limit)
      r.first_exceeded_time = t > 0 ? crossing(previous_time_, touch_previous_[k], t, hot, r.limit) : 0.0;
    touch_previous_[k] = hot;
  }
  void observe_service(const std::vector<double>& T) {
    for (std::size_t k = 0; k < service_.size(); ++k)
      for (const std::int32_t i : service_nodes_[k])
        if (T[i] > service_[k].max) {
          service_[k].max = T[i];
          service_[k].location = mesh_.node(i);
        }
  }

  const Case& c_;
  const Mesh& mesh_;
  SurfaceWeights weights_;
  std::vector<ThresholdRecord>& thresholds_;
  std::vector<TouchRecord>& touch_;
  std::vector<ServiceRecord>& service_;
  const PointLocator* locator_;
  std::vector<std::vector<std::int32_t>> region_nodes_;
  std::vector<double> previous_values_;
  std::vector<int> touch_boundary_;
  std::vector<double> touch_previous_;
  std::vector<std::vector<std::int32_t>> service_nodes_;
  double previous_time_ = 0.0;
};

void add_safety_warnings(const Case& c, RunRecord& record) {
  const double s = 1.0 / c.units.metres_per_length();
  for (const auto& t : record.touch) {
    if (!t.first_exceeded_time) continue;
    char text[512];
    std::snprintf(text, sizeof text,
                  "surface '%s' exceeds the touch limit %.1f %s from t = %.1f s (%.2f h); it reaches %.1f %s at "
                  "t = %.1f s at [%g, %g, %g] %s: guard it or insulate it (burn risk)",
                  t.surface.c_str(), c.units.from_kelvin(t.limit), c.units.temperature.c_str(), *t.first_exceeded_time,
                  *t.first_exceeded_time / 3600.0, c.units.from_kelvin(t.max), c.units.temperature.c_str(),
                  t.time_of_max.value_or(0.0), t.location[0] * s, t.location[1] * s, t.location[2] * s,
                  c.units.length.c_str());
    record.warnings.push_back(text);
  }
  for (const auto& m : record.service)
    if (m.max > m.limit)
      record.warnings.push_back("material '" + m.material + "' reaches " + fmt("%.1f", c.units.from_kelvin(m.max)) +
                                " " + c.units.temperature + " during the run, above its max_service_temperature " +
                                fmt("%.1f", c.units.from_kelvin(m.limit)));
}

void print_transient_summary(const Case& c, const RunRecord& record) {
  const TransientRecord& t = *record.transient;
  std::fprintf(stderr, "  time: %.6g of %.6g s in %d steps (%d rejected), %s%s\n", t.end_time, t.duration, t.steps,
               t.rejected_steps, t.method.c_str(), t.adaptive ? ", adaptive" : "");
  for (const auto& th : t.thresholds) {
    if (th.first_crossed)
      std::fprintf(stderr, "  threshold %-14s %s %s reaches %.1f %s at t = %.1f s (%.2f h)\n", th.name.c_str(),
                   th.kind.c_str(), th.target.c_str(), c.units.from_kelvin(th.temperature), c.units.temperature.c_str(),
                   *th.first_crossed, *th.first_crossed / 3600.0);
    else
      std::fprintf(stderr, "  threshold %-14s %s %s does not reach %.1f %s by t = %.1f s\n", th.name.c_str(),
                   th.kind.c_str(), th.target.c_str(), c.units.from_kelvin(th.temperature), c.units.temperature.c_str(),
                   t.end_time);
  }
  const auto& eb = t.energy;
  std::fprintf(stderr, "  energy over the run: in %.6g J, out %.6g J, sources %.6g J, stored %.6g J (imbalance %.2e)\n",
               eb.boundary_in, eb.boundary_out, eb.sources, eb.stored, eb.relative_imbalance);
}

}  // namespace

int run_transient(const CommonOptions& options, const Case& c, const std::filesystem::path& out,
                  const Progress& progress) {
  std::optional<StoredResult> stored;
  const Mesh mesh = transient_mesh(c, options, progress, stored);
  check_names_against_mesh(c, mesh);
  check_interrupt("after meshing; nothing was written");
  const TransientProblem problem = transient_problem(c, mesh);
  std::optional<PointLocator> locator;
  if (!c.probes.empty() || !c.lines.empty()) locator.emplace(mesh, sampled_points(c));
  if (locator) check_probes_and_lines(c, mesh, *locator);  // a probe, or a whole line, outside: error now
  check_solve_memory(c, mesh, problem.base);               // refuse what the machine cannot hold

  RunRecord record = start_record(c, mesh);
  record.warnings = c.warnings;
  record.transient.emplace();
  TransientRecord& tr = *record.transient;
  const std::vector<double> initial = initial_field(c, mesh, stored, tr.initial_from);
  tr.initial_min = *std::min_element(initial.begin(), initial.end());
  tr.initial_max = *std::max_element(initial.begin(), initial.end());
  tr.method = c.transient.method;
  tr.adaptive = c.transient.adaptive;
  tr.tolerance = c.transient.step_tolerance;
  tr.duration = c.transient.duration;
  Watchers watchers(c, mesh, initial, tr.thresholds, record.touch, record.service, locator ? &*locator : nullptr);

  StagedDirectory staged(out);
  const std::filesystem::path dir = staged.path();
  std::vector<TimeSeriesEntry> series;
  std::vector<std::pair<double, std::vector<double>>> probe_rows;
  std::vector<std::string> probe_names;
  for (const auto& p : c.probes) probe_names.push_back(p.name);
  auto sample = [&](double t, const std::vector<double>& T) {
    if (!locator || c.probes.empty()) return;
    std::vector<double> values;
    for (const auto& p : sample_probes(c, *locator, T)) values.push_back(p.temperature);
    probe_rows.push_back({t, values});
  };
  // One field file, complete before the collection lists it.
  auto write_field = [&](double t, const std::vector<double>& T, const Results& results) {
    char name[64];
    std::snprintf(name, sizeof name, "temperature_%04zu.vtu", series.size());
    VtuFields fields;
    fields.temperature = &T;
    fields.nodal_flux = &results.nodal_flux;
    fields.cell_flux = &results.cell_flux;
    fields.time = t;
    fields.title = c.title;
    write_vtu(dir / name, mesh, c.units, fields, vtk_encoding(c.output_compression, options.ascii));
    series.push_back({t, name});
    tr.field_files.push_back(name);
    write_time_series(dir / "temperature.pvd", series);
  };
  write_field(0.0, initial, post_process(mesh, problem.base, initial));
  sample(0.0, initial);

  double last_output_time = 0.0;
  auto output = [&](const StepState& s) {
    Results results = post_process(mesh, *s.problem, *s.temperature);
    write_field(s.time, *s.temperature, results);
    last_output_time = s.time;
    record.results = results;
    results.nodal_flux.clear();
    results.cell_flux.clear();
    tr.history.push_back({s.time, std::move(results)});
    if (!probe_rows.empty()) write_probes_csv(dir / "probes.csv", probe_names, probe_rows, c.units);
  };
  TransientCallbacks callbacks;
  callbacks.progress = [&](const std::string& line) { progress.say(line); };
  callbacks.on_step = [&](const StepState& s) {
    sample(s.time, *s.temperature);
    watchers.observe(s.time, *s.temperature);
    // Stopping on request after this step: keep it as the last field of the series.
    if (!s.output && interrupt_requested()) output(s);
  };
  callbacks.on_output = output;
  callbacks.stop_requested = [] { return interrupt_requested(); };

  TransientSettings settings;
  settings.duration = c.transient.duration;
  settings.initial_step = c.transient.time_step;
  settings.method = c.transient.method == "backward_euler" ? TimeMethod::backward_euler : TimeMethod::bdf2;
  settings.adaptive = c.transient.adaptive;
  settings.tolerance = c.transient.step_tolerance;
  settings.output_times = c.transient.output_times;
  settings.nonlinear = nonlinear_settings(c);
  progress.say("transient: " + fmt("%.6g s", settings.duration) + " by " + c.transient.method +
               (settings.adaptive ? ", adaptive steps" : ", fixed steps") + fmt(" from %.4g s", settings.initial_step));
  const TransientSolution solution = solve_transient(mesh, problem, initial, settings, linear_settings(c), callbacks);

  if (!solution.completed && last_output_time < solution.time) {
    // Failed or stopped between output times: the last accepted state closes the series.
    const ThermalProblem final_problem = [&] {
      ThermalProblem p = problem.base;
      if (problem.at_time) problem.at_time(solution.time, p);
      return p;
    }();
    Results results = post_process(mesh, final_problem, solution.temperature);
    write_field(solution.time, solution.temperature, results);
    record.results = std::move(results);
  }
  record.dofs = solution.dofs;
  record.linear_solver = solution.linear_solver;
  record.linear_iterations = solution.linear_iterations;
  record.nonlinear_iterations = solution.newton_iterations;
  record.seconds = solution.seconds;
  record.converged = solution.failure.empty();
  record.failure = solution.failure;
  record.boundary_conditions = describe_conditions(mesh, problem.base);
  if (locator) record.probes = sample_probes(c, *locator, solution.temperature);
  tr.end_time = solution.time;
  tr.steps = solution.steps;
  tr.rejected_steps = solution.rejected_steps;
  tr.failed_steps = solution.failed_steps;
  tr.newton_iterations = solution.newton_iterations;
  tr.preconditioner_setups = solution.preconditioner_setups;
  tr.matrix_reuses = solution.matrix_reuses;
  tr.first_step_seconds = solution.first_step_seconds;
  tr.interrupted = solution.interrupted;
  // The run's energy balance, J.
  EnergyBalance& eb = tr.energy;
  const std::vector<bool> internal = [&] {
    std::vector<bool> v;
    for (const auto& b : record.results.boundaries) v.push_back(b.internal);
    return v;
  }();
  for (std::size_t b = 0; b < solution.energy.boundary.size(); ++b) {
    const double e = solution.energy.boundary[b];
    if (b < internal.size() && internal[b] && !problem.base.boundaries[b].is_fixed()) continue;
    if (e > 0) eb.boundary_in += e;
    else eb.boundary_out -= e;
  }
  eb.sources = solution.energy.sources;
  eb.stored = solution.energy.stored_change;
  const double scale = std::max({eb.boundary_in + std::abs(eb.sources), eb.boundary_out, std::abs(eb.stored), 1e-300});
  eb.relative_imbalance = (eb.boundary_in + eb.sources - eb.boundary_out - eb.stored) / scale;
  add_safety_warnings(c, record);
  if (solution.interrupted)
    record.warnings.push_back("the run was interrupted at t = " + fmt("%.6g s", solution.time) + " of " +
                              fmt("%.6g s", settings.duration) + "; the results end there");

  if (!probe_rows.empty()) write_probes_csv(dir / "probes.csv", probe_names, probe_rows, c.units);
  if (locator && !c.lines.empty()) {  // the final field along each line, sampled once
    const auto lines = sample_lines(c, *locator, solution.temperature, record.warnings);
    for (std::size_t l = 0; l < c.lines.size(); ++l)
      write_line_csv(dir / ("line_" + c.lines[l].name + ".csv"), lines[l], c.units);
  }
  // The outside with the last state's field, and the case as solved.
  write_surface_vtp(dir / "surface.vtp", mesh, body_surface(mesh), c.units,
                    {&solution.temperature, record.results.nodal_flux.empty() ? nullptr : &record.results.nodal_flux,
                     c.title},
                    vtk_encoding(c.output_compression, options.ascii));
  write_summary(dir / "inputs.json", inputs_json(c));
  write_summary(dir / "run.json", run_provenance(c, options, solution.seconds, progress.elapsed()));
  const auto summary = summary_json(record, c.units);
  write_summary(dir / "summary.json", summary);  // last: its presence marks a whole result
  staged.commit();
  if (options.summary_only) std::cout << summary.dump(2) << std::endl;
  if (!options.quiet) {
    print_human_summary(c, record, insulated_boundaries(c, mesh), out);
    print_transient_summary(c, record);
  } else if (options.warnings_to_terminal) {
    for (const auto& w : record.warnings) progress.always("warning: " + w);
  }
  // output.report: the report of what was written (not after an interruption: the user
  // asked to stop).
  const bool report = c.output_report && options.report_allowed && !solution.interrupted;
  const int report_status = report ? report_after_run(out, c, progress) : exit_done;
  if (solution.interrupted)
    check_interrupt("at t = " + fmt("%.6g s", solution.time) + "; the time series up to then is in " + out.string());
  if (!record.converged)
    throw SolveFailed("the time integration stopped at t = " + fmt("%.6g s", solution.time) + ": " + solution.failure +
                      "; the results up to then are in " + out.string());
  return report_status;
}

}  // namespace hearth
