// Tests of the case-file reader: conversion to SI and kelvin, defaults, overrides and
// the input-error messages (where, what, how to fix).
#include <gtest/gtest.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <random>
#include <string>
#include <vector>

#include "io/case_file.hpp"
#include "io/case_schema.hpp"
#include "io/input_error.hpp"
#include "io/text_distance.hpp"

namespace fs = std::filesystem;
using hearth::Case;
using hearth::InputError;
using hearth::read_case_file;
using hearth::TimeVaryingValue;

namespace {

// A minimal valid case in metres and degC; tests edit it by text.
const std::string minimal_case =
    "geometry:\n"                       // 1
    "  file: door.geo\n"                // 2
    "mesh:\n"                           // 3
    "  size: 0.02\n"                    // 4
    "materials:\n"                      // 5
    "  steel:\n"                        // 6
    "    conductivity: 45\n"            // 7
    "regions:\n"                        // 8
    "  shell: steel\n"                  // 9
    "boundaries:\n"                     // 10
    "  hot_face: {temperature: 400}\n"  // 11
    "  cold_face:\n"                    // 12
    "    convection:\n"                 // 13
    "      coefficient: 10\n"           // 14
    "      ambient: 20\n";              // 15

std::string replaced(std::string text, const std::string& from, const std::string& to) {
  const std::size_t at = text.find(from);
  EXPECT_NE(at, std::string::npos) << "test set-up: '" << from << "' not in the case text";
  if (at != std::string::npos) text.replace(at, from.size(), to);
  return text;
}

class CaseFileTest : public ::testing::Test {
 protected:
  void SetUp() override {
    std::random_device random;
    const auto* info = ::testing::UnitTest::GetInstance()->current_test_info();
    dir_ = fs::temp_directory_path() /
           ("hearth_case_" + std::string(info->name()) + "_" + std::to_string(random()));
    fs::create_directories(dir_);
    std::ofstream(dir_ / "door.geo") << "// empty geometry placeholder\n";
  }
  void TearDown() override {
    std::error_code ignored;
    fs::remove_all(dir_, ignored);
  }

  fs::path write(const std::string& text, const std::string& name = "case.yaml") const {
    const fs::path path = dir_ / name;
    std::ofstream(path) << text;
    return path;
  }

  // The InputError message reading `text` gives; fails the test if none is thrown.
  std::string error_of(const std::string& text, const std::vector<std::string>& overrides = {}) const {
    try {
      read_case_file(write(text), overrides);
    } catch (const InputError& e) {
      return e.what();
    }
    ADD_FAILURE() << "no InputError for:\n" << text;
    return "";
  }

  std::string case_path() const { return (dir_ / "case.yaml").string(); }

  fs::path dir_;
};

::testing::AssertionResult has(const std::string& message, const std::string& part) {
  if (message.find(part) != std::string::npos) return ::testing::AssertionSuccess();
  return ::testing::AssertionFailure() << "message\n  " << message << "\ndoes not contain\n  " << part;
}

}  // namespace

TEST_F(CaseFileTest, FullCaseConvertsToMetresAndKelvin) {
  const std::string text =
      "version: 1\n"
      "title: Kiln door\n"
      "units: {length: mm, temperature: degC}\n"
      "geometry:\n"
      "  file: door.geo\n"
      "mesh:\n"
      "  size: 20\n"
      "  order: 2\n"
      "  local_sizes: {anchor: 4}\n"
      "  refinements: 1\n"
      "materials:\n"
      "  firebrick:\n"
      "    conductivity: 1.3\n"
      "    density: 2200\n"
      "    specific_heat: 1000\n"
      "    max_service_temperature: 1400\n"
      "  board:\n"
      "    conductivity: 0.06\n"
      "regions:\n"
      "  lining: firebrick\n"
      "  backup: board\n"
      "heat_sources:\n"
      "  lining: 5.0e4\n"
      "boundaries:\n"
      "  hot_face: {temperature: 1250}\n"
      "  cold_face:\n"
      "    convection: {coefficient: 12, ambient: 30}\n"
      "    heat_flux: -5\n"
      "  flange: {heat_flux: 800}\n"
      "analysis:\n"
      "  type: steady\n"
      "  time_stepping: {method: backward_euler, adaptive: false, tolerance: 0.5}\n"
      "  output_times: [600, 1800]\n"
      "solver:\n"
      "  linear: direct\n"
      "  tolerance: 1.0e-9\n"
      "  nonlinear: {tolerance: 1.0e-7, max_iterations: 20}\n"
      "probes:\n"
      "  bolt_tip: [100, 250, 50]\n"
      "lines:\n"
      "  through_wall: {from: [500, 500, 0], to: [500, 500, 350], points: 11}\n"
      "output:\n"
      "  directory: out/run1\n";
  const Case c = read_case_file(write(text));

  // 1 mm = 1e-3 m and T[K] = t[degC] + 273.15, both exact by definition
  // (SI Brochure, 9th edition, 2019, sections 2.3.1 and 3.1).
  const double tol = 1e-12;
  EXPECT_EQ(c.version, 1);
  EXPECT_EQ(c.title, "Kiln door");
  EXPECT_EQ(c.units.length, "mm");
  EXPECT_EQ(c.units.temperature, "degC");
  EXPECT_EQ(c.geometry_file, (c.directory / "door.geo").lexically_normal());
  EXPECT_TRUE(c.geometry_file.is_absolute());
  EXPECT_EQ(c.geometry_place.line, 5);
  EXPECT_EQ(c.geometry_place.key, "geometry.file");
  EXPECT_NEAR(c.mesh_size, 0.020, tol);
  EXPECT_EQ(c.mesh_order, 2);
  EXPECT_EQ(c.mesh_refinements, 1);
  EXPECT_NEAR(c.local_sizes.at("anchor"), 0.004, tol);
  EXPECT_EQ(c.local_size_places.at("anchor").line, 9);

  ASSERT_EQ(c.materials.size(), 2u);
  const hearth::MaterialSpec& brick = c.materials.at("firebrick");
  EXPECT_TRUE(brick.conductivity.is_isotropic());
  EXPECT_FALSE(brick.conductivity.depends_on_temperature());
  EXPECT_DOUBLE_EQ(brick.conductivity.typical(300.0), 1.3);
  EXPECT_TRUE(brick.library.empty());
  EXPECT_DOUBLE_EQ(brick.density->value(300.0), 2200.0);
  EXPECT_DOUBLE_EQ(brick.specific_heat->value(300.0), 1000.0);
  EXPECT_NEAR(*brick.max_service_temperature, 1673.15, tol);
  EXPECT_EQ(brick.place.line, 12);
  EXPECT_FALSE(c.materials.at("board").density);

  EXPECT_EQ(c.regions.at("lining"), "firebrick");
  EXPECT_EQ(c.regions.at("backup"), "board");
  EXPECT_EQ(c.region_places.at("backup").line, 21);
  EXPECT_EQ(c.region_places.at("backup").key, "regions.backup");
  EXPECT_DOUBLE_EQ(c.heat_sources.at("lining"), 5.0e4);
  EXPECT_EQ(c.heat_source_places.at("lining").line, 23);

  ASSERT_EQ(c.boundaries.size(), 3u);
  EXPECT_NEAR(*c.boundaries.at("hot_face").temperature, 1523.15, tol);
  const hearth::BoundarySpec& cold = c.boundaries.at("cold_face");
  ASSERT_TRUE(cold.convection);
  EXPECT_TRUE(cold.convection->coefficient.is_constant());
  EXPECT_DOUBLE_EQ(cold.convection->coefficient.value(300.0), 12.0);
  EXPECT_FALSE(cold.radiation);
  EXPECT_NEAR(cold.convection->ambient, 303.15, tol);
  EXPECT_DOUBLE_EQ(*cold.heat_flux, -5.0);
  EXPECT_FALSE(cold.temperature);
  EXPECT_EQ(cold.place.line, 26);
  EXPECT_DOUBLE_EQ(*c.boundaries.at("flange").heat_flux, 800.0);

  EXPECT_EQ(c.analysis_type, "steady");
  EXPECT_EQ(c.transient.method, "backward_euler");
  EXPECT_FALSE(c.transient.adaptive);
  EXPECT_DOUBLE_EQ(c.transient.step_tolerance, 0.5);
  EXPECT_EQ(c.transient.output_times, (std::vector<double>{600, 1800}));
  EXPECT_EQ(c.solver.linear, "direct");
  EXPECT_DOUBLE_EQ(c.solver.tolerance, 1e-9);
  EXPECT_DOUBLE_EQ(c.solver.nonlinear_tolerance, 1e-7);
  EXPECT_EQ(c.solver.nonlinear_max_iterations, 20);

  ASSERT_EQ(c.probes.size(), 1u);
  EXPECT_EQ(c.probes[0].name, "bolt_tip");
  EXPECT_NEAR(c.probes[0].point[0], 0.100, tol);
  EXPECT_NEAR(c.probes[0].point[1], 0.250, tol);
  EXPECT_NEAR(c.probes[0].point[2], 0.050, tol);
  ASSERT_EQ(c.lines.size(), 1u);
  EXPECT_NEAR(c.lines[0].from[0], 0.5, tol);
  EXPECT_NEAR(c.lines[0].to[2], 0.35, tol);
  EXPECT_EQ(c.lines[0].points, 11);
  EXPECT_EQ(c.output_directory, (c.directory / "out/run1").lexically_normal());
}

TEST_F(CaseFileTest, DefaultsFillAbsentKeys) {
  const Case c = read_case_file(write(minimal_case));
  const Case defaults;
  EXPECT_EQ(c.units.length, "m");
  EXPECT_EQ(c.units.temperature, "degC");
  EXPECT_DOUBLE_EQ(c.mesh_size, 0.02);
  EXPECT_EQ(c.mesh_order, 1);
  EXPECT_EQ(c.mesh_refinements, 0);
  EXPECT_EQ(c.analysis_type, "steady");
  // The schema's defaults agree with the value type's.
  EXPECT_EQ(c.solver.linear, defaults.solver.linear);
  EXPECT_DOUBLE_EQ(c.solver.tolerance, defaults.solver.tolerance);
  EXPECT_DOUBLE_EQ(c.solver.nonlinear_tolerance, defaults.solver.nonlinear_tolerance);
  EXPECT_EQ(c.solver.nonlinear_max_iterations, defaults.solver.nonlinear_max_iterations);
  EXPECT_EQ(c.transient.method, defaults.transient.method);
  EXPECT_EQ(c.transient.adaptive, defaults.transient.adaptive);
  EXPECT_DOUBLE_EQ(c.transient.step_tolerance, defaults.transient.step_tolerance);
  EXPECT_EQ(c.output_directory, c.directory / "results");
  EXPECT_EQ(c.file, fs::path(case_path()));
  EXPECT_TRUE(c.directory.is_absolute());
  EXPECT_TRUE(c.heat_sources.empty());
  EXPECT_TRUE(c.probes.empty());
}

TEST_F(CaseFileTest, KelvinTemperaturesAreKeptAsGiven) {
  const Case c = read_case_file(write("units: {temperature: K}\n" + minimal_case));
  EXPECT_DOUBLE_EQ(*c.boundaries.at("hot_face").temperature, 400.0);
  EXPECT_DOUBLE_EQ(c.boundaries.at("cold_face").convection->ambient, 20.0);
}

TEST_F(CaseFileTest, UnknownKeySuggestsNearestAndNamesTheLine) {
  const std::string message = error_of(replaced(minimal_case, "coefficient: 10", "coefficent: 10"));
  EXPECT_EQ(message, case_path() +
                         ":14: boundaries.cold_face.convection: 'coefficent' is not a key; did you mean 'coefficient'?");
}

TEST_F(CaseFileTest, UnknownKeyFarFromAnyListsTheAllowedKeys) {
  const std::string message = error_of(replaced(minimal_case, "  size: 0.02\n", "  size: 0.02\n  colour: red\n"));
  EXPECT_TRUE(has(message, ":5: mesh: 'colour' is not a key; allowed keys here: size, order, local_sizes, refinements"));
}

TEST_F(CaseFileTest, MissingRequiredKeyIsNamed) {
  const std::string no_size = error_of(replaced(minimal_case, "  size: 0.02\n", "  order: 1\n"));
  EXPECT_TRUE(has(no_size, ":3: mesh.size: required key is missing; give target element size, a number > 0 (m)"));

  const std::string no_geometry = error_of(replaced(minimal_case, "geometry:\n  file: door.geo\n", ""));
  EXPECT_TRUE(has(no_geometry, case_path() + ": geometry: required section is missing"));

  const std::string no_conductivity = error_of(replaced(minimal_case, "conductivity: 45", "density: 7800"));
  EXPECT_TRUE(has(no_conductivity, ":6: materials.steel.conductivity: required key is missing"));

  const std::string no_regions = error_of(replaced(minimal_case, "  shell: steel\n", ""));
  EXPECT_TRUE(has(no_regions, ":8: regions: is empty; give at least one entry"));
}

TEST_F(CaseFileTest, BadChoiceListsAllowedValues) {
  const std::string message = error_of("units: {length: inch}\n" + minimal_case);
  EXPECT_EQ(message, case_path() + ":1: units.length: 'inch' is not allowed; allowed: m, mm");

  const std::string order = error_of(replaced(minimal_case, "  size: 0.02\n", "  size: 0.02\n  order: 3\n"));
  EXPECT_TRUE(has(order, ":5: mesh.order: '3' is not allowed; allowed: 1, 2"));

  const std::string near = error_of("units: {temperature: degc}\n" + minimal_case);
  EXPECT_TRUE(has(near, "allowed: degC, K; did you mean 'degC'?"));
}

TEST_F(CaseFileTest, TemperatureExcludesConvection) {
  const std::string message =
      error_of(replaced(minimal_case, "  cold_face:\n", "  cold_face:\n    temperature: 20\n"));
  EXPECT_TRUE(has(message, ":12: boundaries.cold_face: temperature excludes the other conditions"));
}

TEST_F(CaseFileTest, BoundaryWithoutConditionIsAnError) {
  const std::string message = error_of(minimal_case + "  flange: {}\n");
  EXPECT_TRUE(has(message, ":16: boundaries.flange: no condition given; give temperature, heat_flux, convection or radiation"));
}

TEST_F(CaseFileTest, NonPositivePropertiesAreRejected) {
  const std::string conductivity = error_of(replaced(minimal_case, "conductivity: 45", "conductivity: -45"));
  EXPECT_EQ(conductivity, case_path() + ":7: materials.steel.conductivity: -45 is not allowed; must be > 0 (W/(m K))");

  const std::string density =
      error_of(replaced(minimal_case, "conductivity: 45\n", "conductivity: 45\n    density: 0\n"));
  EXPECT_TRUE(has(density, ":8: materials.steel.density: 0 is not allowed; must be > 0 (kg/m3)"));

  const std::string film = error_of(replaced(minimal_case, "coefficient: 10", "coefficient: 0"));
  EXPECT_TRUE(has(film, ":14: boundaries.cold_face.convection.coefficient: 0 is not allowed; must be > 0"));

  const std::string text = error_of(replaced(minimal_case, "conductivity: 45", "conductivity: high"));
  EXPECT_TRUE(has(text, ":7: materials.steel.conductivity: 'high' is not a number"));
}

TEST_F(CaseFileTest, RegionWithUndefinedMaterialListsTheDefinedOnes) {
  const std::string message = error_of(replaced(minimal_case, "shell: steel", "shell: steal"));
  EXPECT_EQ(message, case_path() +
                         ":9: regions.shell: material 'steal' is not defined under materials; defined: steel; "
                         "did you mean 'steel'?");
}

TEST_F(CaseFileTest, TemperatureBelowAbsoluteZeroIsAnError) {
  const std::string message = error_of(replaced(minimal_case, "temperature: 400", "temperature: -300"));
  EXPECT_TRUE(has(message, ":11: boundaries.hot_face.temperature: -300 degC is below absolute zero"));
}

TEST_F(CaseFileTest, SetOverridesValuesAndCreatesKnownKeys) {
  const Case c = read_case_file(write(minimal_case),
                                {"mesh.size=0.01", "boundaries.cold_face.convection.coefficient=15",
                                 "solver.linear=direct", "mesh.order=2", "probes.tip=[0.1, 0, 0]"});
  EXPECT_DOUBLE_EQ(c.mesh_size, 0.01);
  EXPECT_DOUBLE_EQ(c.boundaries.at("cold_face").convection->coefficient.value(300.0), 15.0);
  EXPECT_EQ(c.solver.linear, "direct");
  EXPECT_EQ(c.mesh_order, 2);
  ASSERT_EQ(c.probes.size(), 1u);
  EXPECT_DOUBLE_EQ(c.probes[0].point[0], 0.1);
  EXPECT_EQ(c.probes[0].place.str(), "--set probes.tip");
}

TEST_F(CaseFileTest, SetErrorsNameTheOverride) {
  EXPECT_EQ(error_of(minimal_case, {"mesh.sise=0.01"}),
            "--set mesh.sise: 'sise' is not a key; did you mean 'size'?");
  EXPECT_TRUE(has(error_of(minimal_case, {"mesh.size"}), "--set mesh.size: expected KEY=VALUE"));
  EXPECT_TRUE(has(error_of(minimal_case, {"mesh.size.x=1"}), "--set mesh.size.x: mesh.size holds a value, not keys"));
  EXPECT_TRUE(has(error_of(minimal_case, {"mesh=1"}), "--set mesh: is a group of keys, not a value"));
  EXPECT_EQ(error_of(minimal_case, {"mesh.size=-1"}), "--set mesh.size: -1 is not allowed; must be > 0 (m)");
}

// A transient case: the minimal case with heat capacity and an analysis section.
const std::string transient_case =
    replaced(minimal_case, "    conductivity: 45\n", "    conductivity: 45\n    density: 7800\n    specific_heat: 460\n") +
    "analysis:\n"                           // 18
    "  type: transient\n"                   // 19
    "  duration: 600\n"                     // 20
    "  time_step: 5\n"                      // 21
    "  initial_temperature: 20\n";          // 22

TEST_F(CaseFileTest, TimeTablesAndTransientSettings) {
  const std::string text =
      replaced(replaced(transient_case, "temperature: 400", "temperature: {vs_time: [[0, 20], [60, 400], [60, 500]]}"),
               "coefficient: 10", "coefficient: {vs_time: [[0, 5], [600, 8]]}");
  const Case c = read_case_file(write(text + "  output_times: [60, 300]\n"));
  EXPECT_EQ(c.analysis_type, "transient");
  EXPECT_DOUBLE_EQ(c.transient.duration, 600.0);
  EXPECT_DOUBLE_EQ(*c.transient.initial_temperature, 293.15);
  // The end time is always an output time.
  EXPECT_EQ(c.transient.output_times, (std::vector<double>{60, 300, 600}));
  ASSERT_EQ(c.time_varying.size(), 2u);
  const TimeVaryingValue& hot = c.time_varying[0];
  EXPECT_EQ(hot.target, TimeVaryingValue::Target::temperature);
  EXPECT_EQ(hot.name, "hot_face");
  EXPECT_NEAR(hot.table.value(30.0), 210.0 + 273.15, 1e-9);  // degC converted to K, linear in time
  EXPECT_EQ(hot.table.step_times(), (std::vector<double>{60.0}));
  EXPECT_NEAR(*c.boundaries.at("hot_face").temperature, 293.15, 1e-9);  // the value at t = 0
  EXPECT_EQ(c.time_varying[1].target, TimeVaryingValue::Target::convection_coefficient);
  EXPECT_DOUBLE_EQ(c.boundaries.at("cold_face").convection->coefficient.value(0.0), 5.0);
  // Default output times: ten even intervals.
  const Case d = read_case_file(write(transient_case));
  EXPECT_EQ(d.transient.output_times.size(), 10u);
  EXPECT_DOUBLE_EQ(d.transient.output_times.back(), 600.0);
}

TEST_F(CaseFileTest, CapacityTablesAndInitialTemperatureForms) {
  const std::string tables = replaced(transient_case, "    specific_heat: 460\n",
                                      "    specific_heat: {vs_temperature: [[20, 450], [600, 700]]}\n");
  const Case c = read_case_file(write(tables));
  EXPECT_NEAR(c.materials.at("steel").specific_heat->value(293.15), 450.0, 1e-9);
  EXPECT_NEAR(c.materials.at("steel").specific_heat->value(873.15), 700.0, 1e-9);

  const Case by_region = read_case_file(write(replaced(transient_case, "initial_temperature: 20",
                                                         "initial_temperature: {regions: {shell: 150}}")));
  EXPECT_NEAR(by_region.transient.initial_by_region.at("shell"), 423.15, 1e-9);
  const Case from_result = read_case_file(write(replaced(transient_case, "initial_temperature: 20",
                                                           "initial_temperature: {result: steady_results}")));
  EXPECT_EQ(from_result.transient.initial_result->filename(), "steady_results");
  EXPECT_TRUE(from_result.transient.initial_result->is_absolute());
}

TEST_F(CaseFileTest, TransientInputErrorsNameTheKey) {
  // A table in time needs a transient analysis.
  const std::string steady = error_of(replaced(minimal_case, "temperature: 400", "temperature: {vs_time: [[0, 20], [60, 400]]}"));
  EXPECT_TRUE(has(steady, ":11: boundaries.hot_face.temperature.vs_time: a table in time needs analysis.type: transient"))
      << steady;
  // Density is required for a transient run, at the material.
  const std::string density = error_of(replaced(transient_case, "    density: 7800\n", ""));
  EXPECT_TRUE(has(density, ":6: materials.steel.density: a transient analysis needs the density")) << density;
  const std::string initial = error_of(replaced(transient_case, "  initial_temperature: 20\n", ""));
  EXPECT_TRUE(has(initial, "analysis.initial_temperature: required for a transient analysis")) << initial;
  const std::string late = error_of(transient_case + "  output_times: [60, 900]\n");
  EXPECT_TRUE(has(late, ":23: analysis.output_times: 900 s is outside the run (0, 600] s")) << late;
  const std::string order = error_of(transient_case + "  output_times: [300, 60]\n");
  EXPECT_TRUE(has(order, "output times must increase")) << order;
  // Table rows: times must not decrease, a time at most twice, values allowed.
  const std::string back = error_of(replaced(transient_case, "temperature: 400", "temperature: {vs_time: [[0, 20], [60, 400], [30, 500]]}"));
  EXPECT_TRUE(has(back, "row 3 [30, 500]: times must not decrease down the table")) << back;
  const std::string thrice = error_of(replaced(transient_case, "temperature: 400", "temperature: {vs_time: [[0, 20], [60, 400], [60, 500], [60, 600]]}"));
  EXPECT_TRUE(has(thrice, "is given three times")) << thrice;
  const std::string cold = error_of(replaced(transient_case, "temperature: 400", "temperature: {vs_time: [[0, 20], [60, -300]]}"));
  EXPECT_TRUE(has(cold, "below absolute zero")) << cold;
  const std::string film = error_of(replaced(transient_case, "coefficient: 10", "coefficient: {vs_time: [[0, 5], [60, 0]]}"));
  EXPECT_TRUE(has(film, "coefficient = 0 is not allowed; must be > 0 (W/(m2 K))")) << film;
  const std::string region = error_of(replaced(transient_case, "initial_temperature: 20", "initial_temperature: {regions: {shel: 20}}"));
  EXPECT_TRUE(has(region, "analysis.initial_temperature.regions.shel: 'shel' is not a region")) << region;
  const std::string threshold = error_of(transient_case + "thresholds:\n  hot: {probe: nowhere, temperature: 300}\n");
  EXPECT_TRUE(has(threshold, ":24: thresholds.hot: 'nowhere' is not a probe")) << threshold;
  const std::string both = error_of(transient_case + "thresholds:\n  hot: {region_max: shell, surface_mean: cold_face, temperature: 300}\n");
  EXPECT_TRUE(has(both, "give exactly one of probe, region_max and surface_mean")) << both;

  // Interfaces are read; a non-positive conductance is refused at its line.
  const std::string interfaces = error_of(minimal_case + "interfaces:\n  shell_contact: {conductance: -5}\n");
  EXPECT_TRUE(has(interfaces, ":17: interfaces.shell_contact.conductance")) << interfaces;
}

TEST_F(CaseFileTest, YamlSyntaxErrorGivesLineAndColumn) {
  const std::string message = error_of(replaced(minimal_case, "  shell: steel\n", "  shell: [steel\n"));
  EXPECT_TRUE(has(message, case_path() + ":"));
  EXPECT_TRUE(has(message, "YAML syntax error"));
  // The unclosed bracket opens on line 9; yaml-cpp reports where it notices.
  EXPECT_TRUE(message.rfind(case_path() + ":9:", 0) == 0 || message.rfind(case_path() + ":10:", 0) == 0)
      << message;
}

TEST_F(CaseFileTest, MissingFileIsAClearError) {
  try {
    read_case_file(dir_ / "nothing.yaml");
    FAIL() << "no error for a missing file";
  } catch (const InputError& e) {
    EXPECT_TRUE(has(e.what(), "nothing.yaml: the case file does not exist"));
  }
}

TEST_F(CaseFileTest, MissingGeometryFileIsNamedAtItsLine) {
  const std::string message = error_of(replaced(minimal_case, "door.geo", "window.geo"));
  EXPECT_TRUE(has(message, ":2: geometry.file: 'window.geo' does not exist"));
}

TEST_F(CaseFileTest, DuplicateKeyIsAnError) {
  const std::string message = error_of(replaced(minimal_case, "  size: 0.02\n", "  size: 0.02\n  size: 0.03\n"));
  EXPECT_TRUE(has(message, ":5: mesh.size: 'size' is given twice (first at line 4)"));
}

TEST_F(CaseFileTest, ProbesAndLinesAreChecked) {
  EXPECT_TRUE(has(error_of(minimal_case + "probes: {tip: [0, 0]}\n"),
                  ":16: probes.tip: expected a point [x, y, z] (m), found 2 values"));
  EXPECT_TRUE(has(error_of(minimal_case + "lines: {cut: {from: [0, 0, 0], to: [1, 0, 0], points: 1}}\n"),
                  "lines.cut.points: 1 is not allowed; must be >= 2"));
  EXPECT_TRUE(has(error_of(minimal_case + "lines: {cut: {from: [0, 0, 0]}}\n"),
                  "lines.cut.to: required key is missing"));
}

TEST_F(CaseFileTest, HeatSourceMustNameARegion) {
  EXPECT_TRUE(has(error_of(minimal_case + "heat_sources: {shel: 1000}\n"),
                  ":16: heat_sources.shel: 'shel' is not a region"));
}

TEST_F(CaseFileTest, SolverToleranceMustLieBetweenZeroAndOne) {
  EXPECT_TRUE(has(error_of(minimal_case + "solver: {tolerance: 1}\n"),
                  ":16: solver.tolerance: 1 is not allowed; must be in (0, 1)"));
}

// A value quoted in a message is cut after 200 characters: lists that alias each other
// ten times over would otherwise be written out as 10^8 names (found while writing the
// fuzzing contract).
TEST_F(CaseFileTest, AliasesOfAliasesAreCutShortInMessages) {
  std::string lists = "&l0 [z, z, z, z, z, z, z, z, z, z]";
  for (int level = 1; level < 8; ++level) {
    const std::string alias = "*l" + std::to_string(level - 1);
    lists += ", &l" + std::to_string(level) + " [" + alias;
    for (int i = 1; i < 10; ++i) lists += ", " + alias;
    lists += "]";
  }
  const std::string message = error_of(minimal_case + "safety:\n  touch_surfaces: [[" + lists + "]]\n");
  EXPECT_TRUE(has(message, ":17: safety.touch_surfaces: expected a name in the list, found [[z, z, z"));
  EXPECT_TRUE(has(message, " ..."));
  EXPECT_LT(message.size(), 600u);
}

// A size that is above zero as written but 0 m (or subnormal) in metres is refused
// (found by the case-file fuzzer).
TEST_F(CaseFileTest, ElementSizeThatVanishesInMetresIsAnInputError) {
  EXPECT_TRUE(has(error_of("units: {length: mm}\n" + replaced(minimal_case, "size: 0.02", "size: 4e-324")),
                  ":5: mesh.size: 4e-324 mm is too small for an element size (0 m"));
  EXPECT_TRUE(has(error_of(replaced(minimal_case, "size: 0.02", "size: 0.02\n  local_sizes: {hot_face: 1e-310}")),
                  ":5: mesh.local_sizes.hot_face: 1e-310 m is too small for an element size"));
}

// Whole numbers are kept as int; one beyond it is an input error at its key, not a
// failed conversion later (found by the case-file fuzzer, tests/fuzz/regressions).
TEST_F(CaseFileTest, WholeNumberBeyondIntIsAnInputError) {
  EXPECT_TRUE(has(error_of(minimal_case + "lines:\n  l: {from: [0, 0, 0], to: [1, 0, 0], points: 4294967296}\n"),
                  ":17: lines.l.points: 4294967296 is too large; must be >= 2 and at most 2147483647"));
  EXPECT_TRUE(has(error_of(replaced(minimal_case, "size: 0.02", "size: 0.02\n  refinements: 1e10")),
                  ":5: mesh.refinements: 1e10 is too large; must be >= 0 and at most 2147483647"));
  EXPECT_TRUE(has(error_of(minimal_case, {"solver.nonlinear.max_iterations=99999999999999999999"}),
                  "--set solver.nonlinear.max_iterations: 99999999999999999999 is too large"));
  EXPECT_TRUE(has(error_of(minimal_case + "version: 4294967297\n"), ":16: version: 4294967297 is not allowed; must be 1"));
  EXPECT_TRUE(has(error_of(minimal_case + "lines:\n  l: {from: [0, 0, 0], to: [1, 0, 0], points: 1e3}\n"),
                  "'1e3' is not a whole number"));
}

// --- conductivity forms, film-coefficient tables, radiation, safety, library ---------

namespace {

// K(T) of a conductivity as a plain matrix.
hearth::Matrix3 tensor_at(const hearth::Conductivity& k, double t) {
  hearth::Matrix3 K;
  k.at(t, K);
  return K;
}

}  // namespace

TEST_F(CaseFileTest, ConductivityTableConvertsTemperaturesToKelvin) {
  const Case c = read_case_file(write(
      replaced(minimal_case, "conductivity: 45", "conductivity: {vs_temperature: [[20, 0.06], [400, 0.09], [800, 0.14]]}")));
  const hearth::Conductivity& k = c.materials.at("steel").conductivity;
  ASSERT_TRUE(k.is_isotropic());
  EXPECT_TRUE(k.depends_on_temperature());
  // T[K] = t[degC] + 273.15, exact (SI Brochure, 9th edition, 2019, section 2.3.1).
  ASSERT_EQ(k.principal[0].x.size(), 3u);
  EXPECT_NEAR(k.principal[0].x[0], 293.15, 1e-12);
  EXPECT_NEAR(k.principal[0].x[1], 673.15, 1e-12);
  EXPECT_NEAR(k.principal[0].x[2], 1073.15, 1e-12);
  EXPECT_EQ(k.principal[0].y, (std::vector<double>{0.06, 0.09, 0.14}));

  // Kelvin tables are kept as given; a table written row by row reads the same.
  const Case kelvin = read_case_file(write("units: {temperature: K}\n" +
                                           replaced(minimal_case, "conductivity: 45",
                                                    "conductivity:\n      vs_temperature:\n        - [300, 60.5]\n"
                                                    "        - [400, 56.7]\n")));
  const hearth::PiecewiseLinear& table = kelvin.materials.at("steel").conductivity.principal[0];
  EXPECT_EQ(table.x, (std::vector<double>{300.0, 400.0}));
  EXPECT_EQ(table.y, (std::vector<double>{60.5, 56.7}));
}

TEST_F(CaseFileTest, BadConductivityTablesNameLineKeyAndRow) {
  const std::string increasing = error_of(
      replaced(minimal_case, "conductivity: 45", "conductivity: {vs_temperature: [[20, 0.06], [400, 0.09], [400, 0.14]]}"));
  EXPECT_EQ(increasing, case_path() +
                            ":7: materials.steel.conductivity.vs_temperature: row 3 [400, 0.14]: temperatures must "
                            "increase strictly down the table; 400 degC follows 400 degC");

  const std::string one_row =
      error_of(replaced(minimal_case, "conductivity: 45", "conductivity: {vs_temperature: [[20, 0.06]]}"));
  EXPECT_TRUE(has(one_row, ":7: materials.steel.conductivity.vs_temperature: has 1 row; a table needs at least 2 rows "
                           "[T, k] (T in degC, k in W/(m K))"));

  const std::string negative =
      error_of(replaced(minimal_case, "conductivity: 45", "conductivity: {vs_temperature: [[20, 0.06], [400, -0.09]]}"));
  EXPECT_TRUE(has(negative, ":7: materials.steel.conductivity.vs_temperature: row 2 [400, -0.09]: k = -0.09 is not "
                            "allowed; must be > 0 (W/(m K))"));

  const std::string three = error_of(
      replaced(minimal_case, "conductivity: 45", "conductivity: {vs_temperature: [[20, 0.06], [400, 0.09, 1]]}"));
  EXPECT_TRUE(has(three, ":7: materials.steel.conductivity.vs_temperature: row 2: expected [T, k], two numbers"));
  EXPECT_TRUE(has(three, "found 3 values [400, 0.09, 1]"));

  const std::string cold = error_of(
      replaced(minimal_case, "conductivity: 45", "conductivity: {vs_temperature: [[-300, 0.06], [400, 0.09]]}"));
  EXPECT_TRUE(has(cold, "row 1 [-300, 0.06]: -300 degC is below absolute zero"));

  const std::string text = error_of(
      replaced(minimal_case, "conductivity: 45", "conductivity: {vs_temperature: [[20, low], [400, 0.09]]}"));
  EXPECT_TRUE(has(text, "row 1 [20, low]: k = low is not a finite number"));

  // In a table written row by row, the line is the row's own.
  const std::string row_line = error_of(replaced(
      minimal_case, "conductivity: 45", "conductivity:\n      vs_temperature:\n        - [300, 60.5]\n        - [200, 56.7]"));
  EXPECT_TRUE(has(row_line, ":10: materials.steel.conductivity.vs_temperature: row 2 [200, 56.7]"));

  const std::string bare_list = error_of(replaced(minimal_case, "conductivity: 45", "conductivity: [[20, 1], [400, 2]]"));
  EXPECT_TRUE(has(bare_list, ":7: materials.steel.conductivity: a list is not allowed here"));
  EXPECT_TRUE(has(bare_list, "write a table in temperature as {vs_temperature: [[T, value], ...]}"));

  const std::string misspelt =
      error_of(replaced(minimal_case, "conductivity: 45", "conductivity: {vs_temprature: [[20, 1], [400, 2]]}"));
  EXPECT_TRUE(has(misspelt, ":7: materials.steel.conductivity: 'vs_temprature' is not a form of conductivity; "
                            "did you mean 'vs_temperature'?"));

  const std::string companion = error_of(replaced(
      minimal_case, "conductivity: 45", "conductivity: {vs_temperature: [[20, 1], [400, 2]], axis_1: [1, 0, 0]}"));
  EXPECT_TRUE(has(companion, ":7: materials.steel.conductivity: 'axis_1' does not belong in {vs_temperature:"));

  const std::string two_forms = error_of(replaced(
      minimal_case, "conductivity: 45", "conductivity: {vs_temperature: [[20, 1], [400, 2]], tensor: [[1, 0, 0], [0, 1, 0], [0, 0, 1]]}"));
  EXPECT_TRUE(has(two_forms, ":7: materials.steel.conductivity: give one form of conductivity, not both "
                             "'vs_temperature' and 'tensor'"));
}

TEST_F(CaseFileTest, OrthotropicConductivityInARotatedFrame) {
  // Principal values along a1 = (1, 1, 0)/sqrt 2, a2 = (-1, 1, 0)/sqrt 2, a3 = z; the
  // third one a table. K = sum k_i a_i a_i^T (rotation of a diagonal tensor; any
  // linear-algebra text), so Kxx = Kyy = (k1 + k2)/2, Kxy = (k1 - k2)/2, Kzz = k3.
  const Case c = read_case_file(write(replaced(
      minimal_case, "conductivity: 45",
      "conductivity:\n"
      "      principal: [12.0, 4.0, {vs_temperature: [[20, 0.8], [220, 1.0]]}]\n"
      "      axis_1: [2, 2, 0]\n"
      "      axis_2: [-1, 1, 0]")));
  EXPECT_TRUE(c.warnings.empty());
  const hearth::Conductivity& k = c.materials.at("steel").conductivity;
  ASSERT_EQ(k.kind, hearth::Conductivity::Kind::orthotropic);
  const double r = std::sqrt(0.5);
  EXPECT_NEAR(k.axes[0][0], r, 1e-15);
  EXPECT_NEAR(k.axes[0][1], r, 1e-15);
  EXPECT_NEAR(k.axes[1][0], -r, 1e-15);
  EXPECT_NEAR(k.axes[1][1], r, 1e-15);
  EXPECT_NEAR(k.axes[2][2], 1.0, 1e-15);  // axis_3 = axis_1 x axis_2
  EXPECT_EQ(k.principal[2].x, (std::vector<double>{293.15, 493.15}));
  const hearth::Matrix3 K = tensor_at(k, 393.15);  // halfway up the k3 table: 0.9
  EXPECT_NEAR(K[0][0], 8.0, 1e-12);
  EXPECT_NEAR(K[1][1], 8.0, 1e-12);
  EXPECT_NEAR(K[0][1], 4.0, 1e-12);
  EXPECT_NEAR(K[1][0], 4.0, 1e-12);
  EXPECT_NEAR(K[2][2], 0.9, 1e-12);
  EXPECT_NEAR(K[0][2], 0.0, 1e-12);
}

TEST_F(CaseFileTest, NonOrthogonalAxis2IsCorrectedWithAWarning) {
  const Case c = read_case_file(write(replaced(minimal_case, "conductivity: 45",
                                               "conductivity: {principal: [3, 2, 1], axis_1: [1, 0, 0], axis_2: [1, 1, 0]}")));
  ASSERT_EQ(c.warnings.size(), 1u);
  EXPECT_EQ(c.warnings[0], case_path() +
                               ":7: materials.steel.conductivity.axis_2: [1, 1, 0] is not at right angles to axis_1 "
                               "[1, 0, 0] (45 degrees apart); made orthogonal to it (Gram-Schmidt): axis_2 = [0, 1, 0]");
  const hearth::Conductivity& k = c.materials.at("steel").conductivity;
  EXPECT_NEAR(k.axes[1][0], 0.0, 1e-15);
  EXPECT_NEAR(k.axes[1][1], 1.0, 1e-15);
  EXPECT_NEAR(k.axes[2][2], 1.0, 1e-15);
}

TEST_F(CaseFileTest, BadOrthotropicInputIsNamed) {
  const std::string parallel = error_of(replaced(
      minimal_case, "conductivity: 45", "conductivity: {principal: [3, 2, 1], axis_1: [1, 0, 0], axis_2: [-2, 0, 0]}"));
  EXPECT_EQ(parallel, case_path() + ":7: materials.steel.conductivity.axis_2: [-2, 0, 0] is parallel to axis_1 [1, 0, 0]; "
                                    "axis_2 must be a second principal direction at right angles to axis_1");

  const std::string zero = error_of(replaced(
      minimal_case, "conductivity: 45", "conductivity: {principal: [3, 2, 1], axis_1: [0, 0, 0], axis_2: [0, 1, 0]}"));
  EXPECT_TRUE(has(zero, ":7: materials.steel.conductivity.axis_1: [0, 0, 0] is not a direction (zero length)"));

  const std::string missing =
      error_of(replaced(minimal_case, "conductivity: 45", "conductivity: {principal: [3, 2, 1], axis_1: [1, 0, 0]}"));
  EXPECT_TRUE(has(missing, ":7: materials.steel.conductivity.axis_2: required key is missing"));

  const std::string two = error_of(replaced(
      minimal_case, "conductivity: 45", "conductivity: {principal: [3, 2], axis_1: [1, 0, 0], axis_2: [0, 1, 0]}"));
  EXPECT_TRUE(has(two, ":7: materials.steel.conductivity.principal: expected three principal values [k1, k2, k3]"));

  const std::string negative = error_of(replaced(
      minimal_case, "conductivity: 45", "conductivity: {principal: [3, -2, 1], axis_1: [1, 0, 0], axis_2: [0, 1, 0]}"));
  EXPECT_TRUE(has(negative, ":7: materials.steel.conductivity.principal: principal value 2 of 3 = -2 is not allowed; "
                            "must be > 0 (W/(m K))"));

  const std::string misspelt = error_of(replaced(
      minimal_case, "conductivity: 45", "conductivity: {principal: [3, 2, 1], axis_1: [1, 0, 0], axis2: [0, 1, 0]}"));
  EXPECT_TRUE(has(misspelt, ":7: materials.steel.conductivity: 'axis2' does not belong in {principal: ..., axis_1: ..., "
                            "axis_2: ...}; did you mean 'axis_2'?"));

  const std::string short_axis = error_of(replaced(
      minimal_case, "conductivity: 45", "conductivity: {principal: [3, 2, 1], axis_1: [1, 0], axis_2: [0, 1, 0]}"));
  EXPECT_TRUE(has(short_axis, ":7: materials.steel.conductivity.axis_1: expected a direction [x, y, z]"));
}

TEST_F(CaseFileTest, FullTensorIsReadAndChecked) {
  const Case c = read_case_file(write(replaced(minimal_case, "conductivity: 45",
                                               "conductivity: {tensor: [[5, 1, 0], [1, 4, 0.5], [0, 0.5, 3]]}")));
  const hearth::Conductivity& k = c.materials.at("steel").conductivity;
  ASSERT_EQ(k.kind, hearth::Conductivity::Kind::tensor);
  EXPECT_DOUBLE_EQ(k.tensor[0][1], 1.0);
  EXPECT_DOUBLE_EQ(k.tensor[2][1], 0.5);
  EXPECT_DOUBLE_EQ(k.tensor[2][2], 3.0);

  const std::string asymmetric = error_of(replaced(minimal_case, "conductivity: 45",
                                                   "conductivity: {tensor: [[5, 1, 0], [1, 4, 0.5], [0, 0.4, 3]]}"));
  EXPECT_EQ(asymmetric, case_path() + ":7: materials.steel.conductivity.tensor: the tensor is not symmetric: entry (2, 3) = "
                                      "0.5 but entry (3, 2) = 0.4 (row, column); a conductivity tensor is symmetric: "
                                      "make them equal");

  // [[1, 2, 0], [2, 1, 0], [0, 0, 1]] has eigenvalues 1 - 2, 1 + 2 and 1 (the 2 x 2
  // block [[a, b], [b, a]] has eigenvalues a - b and a + b).
  const std::string indefinite = error_of(replaced(minimal_case, "conductivity: 45",
                                                   "conductivity: {tensor: [[1, 2, 0], [2, 1, 0], [0, 0, 1]]}"));
  EXPECT_TRUE(has(indefinite, ":7: materials.steel.conductivity.tensor: the tensor is not positive definite: its "
                              "eigenvalues are -1, 1 and 3 W/(m K); all must be > 0"));

  const std::string shape =
      error_of(replaced(minimal_case, "conductivity: 45", "conductivity: {tensor: [[1, 0], [0, 1]]}"));
  EXPECT_TRUE(has(shape, ":7: materials.steel.conductivity.tensor: expected a symmetric 3 x 3 tensor"));
}

TEST_F(CaseFileTest, RadiationCombinesWithConvectionAndHeatFlux) {
  const Case c = read_case_file(write(replaced(
      minimal_case, "      ambient: 20\n",
      "      ambient: 20\n    radiation: {emissivity: 0.85, surroundings: 30}\n    heat_flux: 100\n")));
  const hearth::BoundarySpec& cold = c.boundaries.at("cold_face");
  ASSERT_TRUE(cold.radiation);
  EXPECT_DOUBLE_EQ(cold.radiation->emissivity, 0.85);
  EXPECT_NEAR(cold.radiation->surroundings, 303.15, 1e-12);  // 30 degC + 273.15, exact
  EXPECT_TRUE(cold.convection);
  EXPECT_DOUBLE_EQ(*cold.heat_flux, 100.0);

  // Radiation alone, in kelvin.
  const Case kelvin = read_case_file(
      write("units: {temperature: K}\n" + minimal_case + "  flange: {radiation: {emissivity: 1, surroundings: 300}}\n"));
  EXPECT_DOUBLE_EQ(kelvin.boundaries.at("flange").radiation->surroundings, 300.0);
  EXPECT_DOUBLE_EQ(kelvin.boundaries.at("flange").radiation->emissivity, 1.0);
}

TEST_F(CaseFileTest, BadRadiationIsNamed) {
  const std::string zero = error_of(minimal_case + "  flange: {radiation: {emissivity: 0, surroundings: 20}}\n");
  EXPECT_EQ(zero, case_path() + ":16: boundaries.flange.radiation.emissivity: 0 is not allowed; must be in (0, 1]");
  const std::string above = error_of(minimal_case + "  flange: {radiation: {emissivity: 1.5, surroundings: 20}}\n");
  EXPECT_EQ(above, case_path() + ":16: boundaries.flange.radiation.emissivity: 1.5 is not allowed; must be in (0, 1]");
  const std::string cold = error_of(minimal_case + "  flange: {radiation: {emissivity: 0.5, surroundings: -280}}\n");
  EXPECT_TRUE(has(cold, ":16: boundaries.flange.radiation.surroundings: -280 degC is below absolute zero"));
  const std::string missing = error_of(minimal_case + "  flange: {radiation: {emissivity: 0.5}}\n");
  EXPECT_TRUE(has(missing, ":16: boundaries.flange.radiation.surroundings: required key is missing"));
  const std::string with_temperature =
      error_of(minimal_case + "  flange: {temperature: 20, radiation: {emissivity: 0.5, surroundings: 20}}\n");
  EXPECT_TRUE(has(with_temperature, ":16: boundaries.flange: temperature excludes the other conditions; remove "
                                    "radiation or the temperature"));
}

TEST_F(CaseFileTest, FilmCoefficientTableOfSurfaceTemperature) {
  const Case c = read_case_file(
      write(replaced(minimal_case, "coefficient: 10", "coefficient: {vs_temperature: [[20, 5], [120, 9]]}")));
  const hearth::PiecewiseLinear& h = c.boundaries.at("cold_face").convection->coefficient;
  EXPECT_FALSE(h.is_constant());
  EXPECT_NEAR(h.x[0], 293.15, 1e-12);
  EXPECT_NEAR(h.x[1], 393.15, 1e-12);
  EXPECT_EQ(h.y, (std::vector<double>{5.0, 9.0}));

  const std::string negative = error_of(
      replaced(minimal_case, "coefficient: 10", "coefficient: {vs_temperature: [[20, 5], [120, -9]]}"));
  EXPECT_EQ(negative, case_path() + ":14: boundaries.cold_face.convection.coefficient.vs_temperature: row 2 [120, -9]: "
                                    "h = -9 is not allowed; must be > 0 (W/(m2 K))");
  const std::string constant = error_of(replaced(minimal_case, "coefficient: 10", "coefficient: -10"));
  EXPECT_EQ(constant, case_path() + ":14: boundaries.cold_face.convection.coefficient: -10 is not allowed; must be > 0 "
                                    "(W/(m2 K))");
  const std::string order = error_of(
      replaced(minimal_case, "coefficient: 10", "coefficient: {vs_temperature: [[120, 5], [20, 9]]}"));
  EXPECT_TRUE(has(order, "row 2 [20, 9]: temperatures must increase strictly down the table; 20 degC follows 120 degC"));
}

TEST_F(CaseFileTest, SafetyTouchSurfacesAndLimit) {
  const Case c = read_case_file(write(minimal_case + "safety:\n  touch_surfaces: [cold_face, hot_face]\n  touch_limit: 50\n"));
  EXPECT_EQ(c.touch_surfaces, (std::vector<std::string>{"cold_face", "hot_face"}));
  EXPECT_NEAR(c.touch_limit, 323.15, 1e-12);  // 50 degC + 273.15, exact
  EXPECT_EQ(c.safety_place.line, 17);
  EXPECT_EQ(c.safety_place.key, "safety.touch_surfaces");

  // Default 60 degC (common practice, no source), whatever the case's unit.
  const Case defaults = read_case_file(write(minimal_case + "safety: {touch_surfaces: [cold_face]}\n"));
  EXPECT_NEAR(defaults.touch_limit, 333.15, 1e-12);
  const Case kelvin = read_case_file(write("units: {temperature: K}\n" + minimal_case + "safety: {touch_surfaces: [cold_face]}\n"));
  EXPECT_NEAR(kelvin.touch_limit, 333.15, 1e-12);
  const Case kelvin_limit = read_case_file(
      write("units: {temperature: K}\n" + minimal_case + "safety: {touch_surfaces: [cold_face], touch_limit: 320}\n"));
  EXPECT_DOUBLE_EQ(kelvin_limit.touch_limit, 320.0);
  const Case none = read_case_file(write(minimal_case));
  EXPECT_TRUE(none.touch_surfaces.empty());

  EXPECT_TRUE(has(error_of(minimal_case + "safety: {touch_surfaces: [cold_face, cold_face]}\n"),
                  ":16: safety.touch_surfaces: 'cold_face' is listed twice"));
  EXPECT_TRUE(has(error_of(minimal_case + "safety: {touch_surfaces: []}\n"), ":16: safety.touch_surfaces: the list is empty"));
  EXPECT_TRUE(has(error_of(minimal_case + "safety: {touch_surfaces: cold_face}\n"),
                  ":16: safety.touch_surfaces: expected a list of names [a, b, ...], found 'cold_face'"));
  EXPECT_TRUE(has(error_of(minimal_case + "safety: {touch_limit: 50}\n"), "safety.touch_surfaces: required key is missing"));
  EXPECT_TRUE(has(error_of(minimal_case + "safety: {touch_surfaces: [cold_face], touch_limit: -400}\n"),
                  ":16: safety.touch_limit: -400 degC is below absolute zero"));
}

TEST_F(CaseFileTest, LibraryEntryWithOverrides) {
  const Case c = read_case_file(write(replaced(minimal_case, "conductivity: 45", "library: carbon_steel\n    conductivity: 45")));
  const hearth::MaterialSpec& steel = c.materials.at("steel");
  EXPECT_EQ(steel.library, "carbon_steel");
  EXPECT_DOUBLE_EQ(steel.conductivity.typical(300.0), 45.0);  // the case's own value
  // Density kept from the library entry: 7854 kg/m3, plain carbon steel, Incropera &
  // DeWitt Table A.1 (from memory).
  ASSERT_TRUE(steel.density);
  EXPECT_DOUBLE_EQ(steel.density->value(300.0), 7854.0);
  EXPECT_DOUBLE_EQ(steel.specific_heat->value(300.0), 434.0);  // same source

  // Without overrides the table comes from the library, already in kelvin: 60.5 W/(m K)
  // at 300 K and 30.0 at 1000 K (Incropera & DeWitt Table A.1, from memory).
  const Case plain = read_case_file(write(replaced(minimal_case, "conductivity: 45", "library: carbon_steel")));
  const hearth::Conductivity& k = plain.materials.at("steel").conductivity;
  EXPECT_TRUE(k.depends_on_temperature());
  EXPECT_DOUBLE_EQ(k.typical(300.0), 60.5);
  EXPECT_DOUBLE_EQ(k.typical(1000.0), 30.0);

  const Case density = read_case_file(write(replaced(minimal_case, "conductivity: 45", "library: carbon_steel\n    density: 7800")));
  EXPECT_DOUBLE_EQ(density.materials.at("steel").density->value(300.0), 7800.0);
  EXPECT_DOUBLE_EQ(density.materials.at("steel").conductivity.typical(300.0), 60.5);  // as above

  const Case limit = read_case_file(
      write(replaced(minimal_case, "conductivity: 45", "library: carbon_steel\n    max_service_temperature: 400")));
  EXPECT_NEAR(*limit.materials.at("steel").max_service_temperature, 673.15, 1e-12);

  // --set may override a library property too.
  const Case set = read_case_file(write(replaced(minimal_case, "conductivity: 45", "library: carbon_steel")),
                                  {"materials.steel.conductivity=50"});
  EXPECT_DOUBLE_EQ(set.materials.at("steel").conductivity.typical(300.0), 50.0);
}

TEST_F(CaseFileTest, UnknownLibraryEntrySuggestsTheNearest) {
  const std::string message = error_of(replaced(minimal_case, "conductivity: 45", "library: carbon_stel"));
  EXPECT_TRUE(has(message, case_path() + ":7: materials.steel.library: 'carbon_stel' is not an entry of the material "
                                         "library ("));
  EXPECT_TRUE(has(message, "); did you mean 'carbon_steel'? Nearest entries: carbon_steel, "));
  EXPECT_TRUE(has(message, "; 'hearth materials' lists them all"));

  const std::string missing = error_of(replaced(minimal_case, "conductivity: 45", "density: 7800"));
  EXPECT_TRUE(has(missing, ":6: materials.steel.conductivity: required key is missing; give thermal conductivity, a "
                           "number > 0 (W/(m K))"));
  EXPECT_TRUE(has(missing, "or library: NAME, an entry of the material library"));
}

TEST(CaseSchema, ReferenceListsEveryKey) {
  const std::string reference = hearth::case_file_reference();
  for (const hearth::KeySpec& spec : hearth::case_schema())
    EXPECT_TRUE(has(reference, "`" + spec.key + "`"));
}

TEST(CaseSchema, EveryKeyHasItsParent) {
  for (const hearth::KeySpec& spec : hearth::case_schema()) {
    const std::size_t dot = spec.key.rfind('.');
    if (dot == std::string::npos) continue;
    EXPECT_NE(hearth::find_key_spec(spec.key.substr(0, dot)), nullptr) << spec.key;
  }
}

TEST(TextDistance, EditDistance) {
  // kitten -> sitting = 3: the standard worked example of the Levenshtein distance
  // (V. I. Levenshtein, 1966; e.g. Wikipedia "Levenshtein distance").
  EXPECT_EQ(hearth::edit_distance("kitten", "sitting"), 3u);
  EXPECT_EQ(hearth::edit_distance("", "abc"), 3u);
  EXPECT_EQ(hearth::edit_distance("size", "size"), 0u);
  // Adjacent swap counts one (optimal string alignment); common practice, no source.
  EXPECT_EQ(hearth::edit_distance("szie", "size"), 1u);
  EXPECT_EQ(hearth::edit_distance("DegC", "degc"), 0u);
}

TEST(TextDistance, NearestWord) {
  const std::vector<std::string> keys = {"coefficient", "ambient"};
  EXPECT_EQ(hearth::nearest_word("coefficent", keys), std::optional<std::string>("coefficient"));
  EXPECT_EQ(hearth::nearest_word("boundary", {"boundaries", "analysis"}), std::optional<std::string>("boundaries"));
  EXPECT_FALSE(hearth::nearest_word("colour", keys));
}

TEST(PlaceText, Forms) {
  EXPECT_EQ((hearth::Place{"case.yaml", 12, "boundaries.cold_face", ""}.str()), "case.yaml:12: boundaries.cold_face");
  EXPECT_EQ((hearth::Place{"case.yaml", 0, "mesh.size", ""}.str()), "case.yaml: mesh.size");
  EXPECT_EQ((hearth::Place{"case.yaml", 0, "mesh.size", "mesh.size"}.str()), "--set mesh.size");
}
