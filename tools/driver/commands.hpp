// The hearth commands. Each returns an exit status or throws (InputError, MeshError,
// SolveFailed, Interrupted), which main maps to the documented statuses.
#pragma once

#include "tools/driver/pipeline.hpp"

namespace hearth {

struct StudyOptions {
  CommonOptions common;
  int levels = 3;                       // --levels
  double ratio = 1.5;                   // --ratio: size divided by this from level to level; 2: split
  std::vector<double> sizes;            // --sizes (case length unit); replaces levels and ratio
  std::vector<std::string> quantities;  // --quantity: extra dotted paths into summary.json
  std::vector<int> orders;              // --order: element orders to compare (empty: the case's)
  int jobs = 1;                         // --jobs: levels solved at the same time
};

struct ReportOptions {
  std::string results_dir;  // RESULTS_DIR
  bool mesh_edges = false;  // --mesh-edges
  bool quiet = false;
};

int run_command(const CommonOptions& options);
int report_command(const ReportOptions& options);
int study_command(const StudyOptions& options);
int check_command(const CommonOptions& options);
int mesh_command(const CommonOptions& options);
int materials_command();  // lists the shipped material library on stdout

}  // namespace hearth
