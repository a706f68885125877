// Tests of the case-file reader: conversion to SI and kelvin, defaults, overrides and
// the input-error messages (where, what, how to fix).
#include <gtest/gtest.h>

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
  EXPECT_DOUBLE_EQ(brick.conductivity, 1.3);
  EXPECT_DOUBLE_EQ(*brick.density, 2200.0);
  EXPECT_DOUBLE_EQ(*brick.specific_heat, 1000.0);
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
  EXPECT_DOUBLE_EQ(cold.convection->coefficient, 12.0);
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
  EXPECT_TRUE(has(message, ":16: boundaries.flange: no condition given; give temperature, heat_flux or convection"));
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
  EXPECT_DOUBLE_EQ(c.boundaries.at("cold_face").convection->coefficient, 15.0);
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

TEST_F(CaseFileTest, UnsupportedFeaturesSaySo) {
  const std::string radiation = error_of(
      replaced(minimal_case, "      ambient: 20\n", "      ambient: 20\n    radiation: {emissivity: 0.8, surroundings: 20}\n"));
  EXPECT_TRUE(has(radiation, ":16: boundaries.cold_face.radiation: radiation"));
  EXPECT_TRUE(has(radiation, "is not supported by this version of hearth yet"));

  const std::string k_of_t = error_of(
      replaced(minimal_case, "conductivity: 45", "conductivity: {vs_temperature: [[20, 45], [400, 40]]}"));
  EXPECT_TRUE(has(k_of_t, ":7: materials.steel.conductivity: conductivity as {vs_temperature: ...} "
                          "is not supported by this version of hearth yet"));

  const std::string orthotropic = error_of(
      replaced(minimal_case, "conductivity: 45", "conductivity: {principal: [1, 1, 2], axis_1: [1, 0, 0]}"));
  EXPECT_TRUE(has(orthotropic, "is not supported by this version of hearth yet"));

  const std::string table = error_of(replaced(minimal_case, "coefficient: 10", "coefficient: [[20, 5], [100, 8]]"));
  EXPECT_TRUE(has(table, ":14: boundaries.cold_face.convection.coefficient: coefficient as a table of values "
                         "is not supported by this version of hearth yet"));

  const std::string vs_time = error_of(replaced(minimal_case, "temperature: 400", "temperature: {vs_time: [[0, 20]]}"));
  EXPECT_TRUE(has(vs_time, "temperature as {vs_time: ...} is not supported by this version of hearth yet"));

  const std::string transient = error_of("analysis: {type: transient, duration: 60}\n" + minimal_case);
  EXPECT_TRUE(has(transient, ":1: analysis.type: 'transient' is not supported by this version of hearth yet; "
                             "allowed now: steady"));
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
