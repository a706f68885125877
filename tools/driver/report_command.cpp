// hearth report: pictures, plots and report.html for a finished results folder.
#include <cstdio>
#include <fstream>
#include <set>

#include "io/atomic_file.hpp"
#include "io/field_grid.hpp"
#include "io/field_pictures.hpp"
#include "io/input_error.hpp"
#include "io/write_error.hpp"
#include "io/line_profile.hpp"
#include "io/nice_numbers.hpp"
#include "io/report_html.hpp"
#include "io/result_folder.hpp"
#include "io/result_plots.hpp"
#include "tools/driver/commands.hpp"
#include "tools/driver/errors.hpp"
#include "tools/driver/output_lock.hpp"
#include "tools/driver/pipeline.hpp"
#include "tools/driver/report.hpp"
#include "tools/driver/virtual_display.hpp"

#ifndef HEARTH_VERSION
#define HEARTH_VERSION "unknown"
#endif

namespace hearth {

namespace fs = std::filesystem;

namespace {

std::string seconds_text(double s) {
  char text[32];
  std::snprintf(text, sizeof text, "%.1f s", s);
  return text;
}

// The folder the report pictures: the run's own, or a study's finest level.
fs::path pictured_folder(const fs::path& directory, const std::optional<StudyFolder>& study) {
  if (!study) return directory;
  for (auto level = study->levels.rbegin(); level != study->levels.rend(); ++level)
    if (fs::is_regular_file(*level / "summary.json")) return *level;
  throw InputError(directory.string() + ": no level of the study has finished (no summary.json in any level_N); "
                                        "run the study again");
}

}  // namespace

ReportOutcome make_report(const fs::path& directory, bool mesh_edges, const Progress& progress) {
  const double t0 = progress.elapsed();
  ReportOutcome outcome;
  const std::optional<StudyFolder> study = read_study_folder(directory);
  const ResultFolder folder = read_result_folder(pictured_folder(directory, study));
  const fs::path out = study ? study->directory : folder.directory;
  const std::string temperature_unit = folder.summary.value("temperature_unit", "degC");
  const std::string length_unit = folder.summary.value("length_unit", "m");
  std::set<std::string> written;
  auto write = [&](const std::string& name, const std::string& bytes) {
    write_text_file(out / name, bytes);
    written.insert(name);
    outcome.files.push_back({name, bytes.size()});
  };

  ReportPage page;
  page.result = &folder;
  page.study = study ? &*study : nullptr;
  page.hearth_version = HEARTH_VERSION;
  page.made_at = utc_now_text();
  {
    const VirtualDisplay display("the report's pictures");
    progress.say("report: rendering on X display " + display.name() + (display.started_xvfb() ? " (Xvfb)" : ""));
    const double r0 = progress.elapsed();
    const FieldGrid field(folder.field_file);
    PictureRequest request;
    request.surface_file = folder.surface_file;
    request.title = folder.summary.value("title", "");
    if (request.title.empty()) request.title = folder.directory.filename().string();
    if (folder.field_time) request.time_label = "t = " + short_number(*folder.field_time, 6) + " s";
    request.temperature_unit = temperature_unit;
    request.length_unit = length_unit;
    request.mesh_edges = mesh_edges;
    page.pictures = render_field_pictures(field, request);
    outcome.render_seconds = progress.elapsed() - r0;
    for (const Picture& p : page.pictures) write(p.file_name, std::string(p.png.begin(), p.png.end()));
    page.notes = "Rendered off screen with VTK " + vtk_version() + " (" + seconds_text(outcome.render_seconds) +
                 ") from " + folder.field_file.filename().string() + " and surface.vtp, " +
                 std::to_string(page.pictures.front().width) + " x " + std::to_string(page.pictures.front().height) +
                 " pixels; parallel projection.";
    progress.say("report: " + std::to_string(page.pictures.size()) + " pictures in " +
                 seconds_text(outcome.render_seconds));
    check_interrupt("while making the report; the results are unchanged");

    for (const LineTable& line : folder.lines) {
      const LineProfile profile = profile_line(line, field);
      ReportPlot plot{"Line " + line.name,
                      "Temperature and heat-flux magnitude along the line, with the borders between regions it "
                      "crosses.",
                      line_plot_svg(profile, temperature_unit, length_unit), "plot_line_" + file_safe(line.name) + ".svg"};
      write(plot.file_name, plot.svg);
      page.plots.push_back(std::move(plot));
    }
  }
  if (folder.probes && folder.probes->times.size() >= 2) {
    ReportPlot plot{"Probe histories", "Temperature at each probe against time, as written to probes.csv.",
                    probe_history_svg(*folder.probes, temperature_unit), "plot_probes.svg"};
    write(plot.file_name, plot.svg);
    page.plots.push_back(std::move(plot));
  }
  if (study)
    for (const fs::path& file : study->plots) {
      std::ifstream in(file);
      const std::string svg((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
      page.study_plots.push_back({file.stem().string(), "Made by hearth study.", svg, file.filename().string()});
    }

  const std::string html = report_html(page);
  write("report.html", html);
  outcome.html = out / "report.html";

  // Files of an earlier report that this one did not write (a line since removed).
  for (const auto& entry : fs::directory_iterator(out)) {
    const std::string name = entry.path().filename().string();
    const bool ours = (name.rfind("picture_", 0) == 0 && entry.path().extension() == ".png") ||
                      (name.rfind("plot_", 0) == 0 && entry.path().extension() == ".svg");
    if (ours && !written.count(name)) fs::remove(entry.path());
  }
  outcome.seconds = progress.elapsed() - t0;
  return outcome;
}

// The report of the folder just written (output.report: true). The results stay in place
// whatever happens here; a failure is reported with how to make the report later.
int report_after_run(const fs::path& out, const Case& c, const Progress& progress) {
  try {
    const ReportOutcome report = make_report(out, c.report_mesh_edges, progress);
    progress.say("report: " + report.html.string() + " (" + std::to_string(fs::file_size(report.html)) +
                 " bytes)");
    return exit_done;
  } catch (const Interrupted&) {
    throw;
  } catch (const std::exception& e) {
    std::fprintf(stderr, "error: the report was not made: %s; the results are in %s, and 'hearth report %s' makes "
                         "the report later\n", e.what(), out.c_str(), out.c_str());
    const bool setup = dynamic_cast<const ReportUnavailable*>(&e) || dynamic_cast<const InputError*>(&e) ||
                       dynamic_cast<const WriteError*>(&e);
    return setup ? exit_bad_input : exit_internal;
  }
}

int report_command(const ReportOptions& options) {
  install_interrupt_handlers();
  const Progress progress(options.quiet);
  const fs::path dir = fs::absolute(options.results_dir).lexically_normal();
  read_result_folder_exists(dir);
  const OutputLock lock(dir, "hearth report " + options.results_dir);  // not while a run rewrites it
  const ReportOutcome outcome = make_report(dir, options.mesh_edges, progress);
  std::uintmax_t total = 0;
  for (const auto& [name, bytes] : outcome.files) total += bytes;
  if (!options.quiet)
    std::fprintf(stderr, "report: %s (%ju bytes; %zu files, %ju bytes in all) in %.1f s\n", outcome.html.c_str(),
                 static_cast<std::uintmax_t>(fs::file_size(outcome.html)), outcome.files.size(), total,
                 outcome.seconds);
  return exit_done;
}

}  // namespace hearth
