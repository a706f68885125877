// report.html: one self-contained page (pictures as data: URIs, plots as inline SVG, no
// scripts, no network) that prints to PDF from a browser.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "io/field_pictures.hpp"
#include "io/result_folder.hpp"

namespace hearth {

struct ReportPlot {
  std::string heading;
  std::string caption;
  std::string svg;        // a whole SVG document
  std::string file_name;  // where it is also written
};

struct ReportPage {
  const ResultFolder* result = nullptr;   // the pictured run (for a study: its finest level)
  const StudyFolder* study = nullptr;     // set for a study report
  std::vector<Picture> pictures;
  std::vector<ReportPlot> plots;          // lines and probe histories
  std::vector<ReportPlot> study_plots;    // convergence plots
  std::string hearth_version;             // of the program making the report
  std::string made_at;                    // when, e.g. "2025-06-01 14:03 UTC"
  std::string notes;                      // one line on how the pictures were made
};

// The whole page. Tables come from summary.json, inputs.json and run.json of the
// result (and study.json); temperatures in the case's unit, everything else SI, each
// column headed with its unit.
std::string report_html(const ReportPage& page);

// Standard base64 (RFC 4648) of bytes, for data: URIs.
std::string base64(const std::vector<unsigned char>& bytes);

}  // namespace hearth
