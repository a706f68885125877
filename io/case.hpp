// Case: what the case file said, validated, in SI units and kelvin.
#pragma once

#include <array>
#include <filesystem>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "solver/material.hpp"
#include "solver/time_table.hpp"

namespace hearth {

constexpr double kelvin_offset = 273.15;  // 0 degC in K, exact

// The case's units: what the user writes and what results are reported in.
struct Units {
  std::string length = "m";          // "m" | "mm"
  std::string temperature = "degC";  // "degC" | "K"

  double metres_per_length() const { return length == "mm" ? 1e-3 : 1.0; }
  double to_kelvin(double t) const { return temperature == "degC" ? t + kelvin_offset : t; }
  double from_kelvin(double t) const { return temperature == "degC" ? t - kelvin_offset : t; }
};

// Where a key sits in the case file, for messages that point at it.
struct Place {
  std::string file;  // as the user gave it
  int line = 0;      // 1-based; 0 when not from the file (defaults, --set)
  std::string key;   // dotted path, e.g. "boundaries.cold_face.convection"
  std::string set_by;  // the KEY of the --set KEY=VALUE that gave this value; empty if from the file
  // "case.yaml:12: boundaries.cold_face"; "--set mesh.size" for a value from --set;
  // "case.yaml: mesh.size" when there is no line (a default).
  std::string str() const;
};

struct MaterialSpec {
  std::string name;
  // W/(m K): a number, a table in temperature, orthotropic or a full tensor (K-based
  // tables: the reader converts table temperatures to kelvin).
  Conductivity conductivity;
  std::string library;                           // library entry it came from, if any
  std::optional<PiecewiseLinear> density;        // kg/m3: a number or a table in temperature (K)
  std::optional<PiecewiseLinear> specific_heat;  // J/(kg K): likewise
  std::optional<double> max_service_temperature; // K
  Place place;
};

struct ConvectionSpec {
  PiecewiseLinear coefficient;  // W/(m2 K), > 0; a number or a table of the surface temperature (K)
  double ambient = 0.0;      // K
};

// One named surface's condition. `temperature` excludes the others; convection and
// heat_flux may be combined. No entry at all means insulated.
struct BoundarySpec {
  std::string name;
  std::optional<double> temperature;  // K
  std::optional<double> heat_flux;    // W/m2 into the body
  std::optional<ConvectionSpec> convection;
  std::optional<Radiation> radiation;  // emissivity (0, 1], surroundings in K
  Place place;
};

// Thermal contact across a named internal surface between two volumes.
struct InterfaceSpec {
  std::string name;
  double conductance = 0.0;  // W/(m2 K), > 0 (1 / contact resistance)
  Place place;
};

struct ProbeSpec {
  std::string name;
  std::array<double, 3> point{};  // metres
  Place place;
};

struct LineSpec {
  std::string name;
  std::array<double, 3> from{}, to{};  // metres
  int points = 101;                    // >= 2
  Place place;
};

struct SolverSpec {
  std::string linear = "auto";        // "auto" | "direct" | "iterative"
  double tolerance = 1e-10;           // relative residual of the linear solve
  double nonlinear_tolerance = 1e-8;
  int nonlinear_max_iterations = 30;
};

// A boundary value or heat source that follows a table in time ({vs_time: ...}). The
// BoundarySpec or heat_sources entry holds its value at t = 0.
struct TimeVaryingValue {
  enum class Target { temperature, heat_flux, convection_coefficient, convection_ambient, radiation_surroundings,
                      heat_source };
  Target target = Target::temperature;
  std::string name;  // the boundary or region
  TimeTable table;   // s -> SI value (temperatures in K)
  Place place;
};

// When a temperature first crosses a level: at a probe, a region's maximum or a
// surface's mean (transient).
struct ThresholdSpec {
  enum class Kind { probe, region_max, surface_mean };
  std::string name;
  Kind kind = Kind::probe;
  std::string target;        // the probe, region or surface
  double temperature = 0.0;  // K
  Place place;
};

// Transient settings.
struct TransientSpec {
  double duration = 0.0;                      // s, > 0
  double time_step = 0.0;                     // s, initial (or fixed) step, > 0
  std::string method = "bdf2";                // "bdf2" | "backward_euler"
  bool adaptive = true;
  double step_tolerance = 0.1;                // K per step (a difference: no offset)
  // Starting field: a number, a number per region, or an earlier result's field.
  std::optional<double> initial_temperature;                // K
  std::map<std::string, double> initial_by_region;           // region -> K
  std::optional<std::filesystem::path> initial_result;       // result folder (absolute)
  Place initial_place;
  std::vector<double> output_times;           // s, increasing, in (0, duration]; the duration is always one
  bool output_times_given = false;
};

struct Case {
  std::filesystem::path file;          // the case file, as given
  std::filesystem::path directory;     // its folder (absolute); relative paths resolve here
  int version = 1;
  std::string title;
  Units units;

  std::filesystem::path geometry_file;  // absolute
  Place geometry_place;

  double mesh_size = 0.0;                      // metres
  Place mesh_size_place;                       // the mesh.size key
  int mesh_order = 1;                          // 1 | 2
  std::map<std::string, double> local_sizes;   // name -> metres
  std::map<std::string, Place> local_size_places;
  int mesh_refinements = 0;                    // uniform splits (studies)

  std::map<std::string, MaterialSpec> materials;
  std::map<std::string, std::string> regions;   // physical volume -> material name
  std::map<std::string, Place> region_places;
  std::map<std::string, double> heat_sources;   // physical volume -> W/m3
  std::map<std::string, Place> heat_source_places;
  std::map<std::string, BoundarySpec> boundaries;
  std::map<std::string, InterfaceSpec> interfaces;
  Place regions_place;     // the 'regions' key itself
  Place boundaries_place;  // the 'boundaries' key (line 0 when the file has none)

  std::string analysis_type = "steady";      // "steady" | "transient"
  Place analysis_place;
  TransientSpec transient;
  std::vector<TimeVaryingValue> time_varying;  // transient only
  std::vector<ThresholdSpec> thresholds;       // transient only
  SolverSpec solver;
  // safety: {touch_surfaces: [...], touch_limit: 60}; the limit in K (default 60 degC).
  std::vector<std::string> touch_surfaces;
  double touch_limit = 60.0 + kelvin_offset;
  Place safety_place;
  std::vector<ProbeSpec> probes;
  std::vector<LineSpec> lines;
  std::filesystem::path output_directory;  // absolute
  Place output_place;                      // the output.directory key (line 0 for the default)
  bool output_report = false;              // output.report: make the report after the run
  bool report_mesh_edges = false;          // output.report_mesh_edges
  std::string output_compression = "lz4";  // output.compression: lz4 | zlib | none
  // Warnings found while reading ("case.yaml:9: materials.board.conductivity.axis_2: ...");
  // the driver prints them and puts them in summary.json.
  std::vector<std::string> warnings;
};

}  // namespace hearth
