// Making the report of a results folder: shared by hearth report, hearth run (with
// output.report: true) and hearth study.
#pragma once

#include <cstdint>
#include <filesystem>
#include <string>
#include <vector>

#include "io/case.hpp"
#include "tools/driver/progress.hpp"

namespace hearth {

struct ReportOutcome {
  std::filesystem::path html;                                      // report.html
  std::vector<std::pair<std::string, std::uintmax_t>> files;      // every file written, with its size in bytes
  double render_seconds = 0.0;                                     // the pictures
  double seconds = 0.0;                                            // everything
};

// Writes the pictures (picture_*.png), plots (plot_*.svg) and report.html into
// `directory`, the folder of a run or of a study (whose finest level is pictured), and
// removes report files of an earlier report that this one does not write. Throws
// InputError for a folder that is not a finished result, ReportUnavailable when no
// display can be had.
ReportOutcome make_report(const std::filesystem::path& directory, bool mesh_edges, const Progress& progress);

// The report of a folder a run has just written (output.report: true), as hearth report
// makes it. The results stay in place whatever happens; a failure is printed with how to
// make the report later, and its exit status returned (1 for a missing display, a
// damaged folder or a failed write, 3 otherwise). Interrupted passes through.
int report_after_run(const std::filesystem::path& out, const Case& c, const Progress& progress);

}  // namespace hearth
