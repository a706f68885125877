// --set KEY=VALUE for every value key of the schema: each one, nested materials and
// boundaries included, replaces what the file says or creates what it lacks, and the
// Case holds the value given (converted to SI and kelvin where the key has a unit).
// The table below covers every scalar and list key; a key added to the schema without
// a line here fails OverridesCoverEverySchemaKey.
#include <gtest/gtest.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <functional>
#include <map>
#include <random>
#include <string>
#include <vector>

#include "io/case_file.hpp"
#include "io/case_schema.hpp"
#include "io/input_error.hpp"

namespace fs = std::filesystem;
using hearth::Case;
using hearth::read_case_file;

namespace {

constexpr double celsius = 273.15;  // K at 0 degC, by the definition of the Celsius scale (SI)

// Every section the overrides below reach, so that each --set replaces a value (the
// file's) and, in OverridesCreateWhatTheFileLacks, creates one.
const std::string full_case =
    "version: 1\n"
    "title: Kiln door\n"
    "units: {length: m, temperature: degC}\n"
    "geometry: {file: door.geo}\n"
    "mesh:\n"
    "  size: 0.02\n"
    "  order: 1\n"
    "  local_sizes: {hot_face: 0.01}\n"
    "  refinements: 0\n"
    "materials:\n"
    "  steel: {conductivity: 45, density: 7800, specific_heat: 460, max_service_temperature: 500}\n"
    "  board: {conductivity: {vs_temperature: [[20, 0.06], [800, 0.14]]}}\n"
    "  brick: {library: fireclay_brick}\n"
    "regions: {shell: steel, lining: board}\n"
    "heat_sources: {lining: 100}\n"
    "boundaries:\n"
    "  hot_face: {temperature: 400}\n"
    "  cold_face:\n"
    "    convection: {coefficient: 10, ambient: 20}\n"
    "    radiation: {emissivity: 0.9, surroundings: 20}\n"
    "  flange: {heat_flux: 100}\n"
    "interfaces: {gap: {conductance: 1000}}\n"
    "safety: {touch_surfaces: [cold_face], touch_limit: 60}\n"
    "analysis:\n"
    "  type: steady\n"
    "  duration: 600\n"
    "  time_step: 10\n"
    "  time_stepping: {method: bdf2, adaptive: true, tolerance: 0.1}\n"
    "  initial_temperature: 20\n"
    "  output_times: [60, 600]\n"
    "solver:\n"
    "  linear: auto\n"
    "  tolerance: 1.0e-10\n"
    "  nonlinear: {tolerance: 1.0e-8, max_iterations: 30}\n"
    "probes: {tip: [0, 0, 0]}\n"
    "lines: {cut: {from: [0, 0, 0], to: [0.1, 0, 0], points: 5}}\n"
    "output: {directory: results}\n";

// The least the reader accepts, for overrides that create their keys.
const std::string minimal_case =
    "geometry: {file: door.geo}\n"
    "mesh: {size: 0.02}\n"
    "materials: {steel: {conductivity: 45}}\n"
    "regions: {shell: steel}\n"
    "boundaries: {hot_face: {temperature: 400}}\n";

struct Override {
  std::string key;                            // schema pattern it exercises
  std::vector<std::string> sets;              // KEY=VALUE, applied in order
  std::function<void(const Case&)> check;     // the Case holds the values given
};

// The overrides that make either case a valid transient one, then `more`.
std::vector<std::string> with_transient(std::vector<std::string> more) {
  std::vector<std::string> sets = {"analysis.type=transient", "analysis.duration=600", "analysis.time_step=10",
                                   "analysis.initial_temperature=20", "materials.steel.density=7800",
                                   "materials.steel.specific_heat=460", "materials.board.conductivity=0.1",
                                   "materials.board.density=250", "materials.board.specific_heat=1000"};
  sets.insert(sets.end(), more.begin(), more.end());
  return sets;
}

bool near(double a, double b) { return std::abs(a - b) <= 1e-12 * std::max(1.0, std::abs(b)); }

const std::vector<Override>& overrides() {
  static const std::vector<Override> table = {
      {"version", {"version=1"}, [](const Case& c) { EXPECT_EQ(c.version, 1); }},
      {"title", {"title=Door at 3 mm gap"}, [](const Case& c) { EXPECT_EQ(c.title, "Door at 3 mm gap"); }},
      {"units.length", {"units.length=mm"}, [](const Case& c) {
         EXPECT_EQ(c.units.length, "mm");
         EXPECT_TRUE(near(c.mesh_size, 2e-5));  // the file's 0.02, now in mm
       }},
      {"units.temperature", {"units.temperature=K"}, [](const Case& c) {
         EXPECT_EQ(c.units.temperature, "K");
         EXPECT_TRUE(near(*c.boundaries.at("hot_face").temperature, 400.0));  // the file's 400, now in K
       }},
      {"geometry.file", {"geometry.file=other.geo"},
       [](const Case& c) { EXPECT_EQ(c.geometry_file.filename(), "other.geo"); }},
      {"mesh.size", {"mesh.size=0.005"}, [](const Case& c) { EXPECT_TRUE(near(c.mesh_size, 0.005)); }},
      {"mesh.order", {"mesh.order=2"}, [](const Case& c) { EXPECT_EQ(c.mesh_order, 2); }},
      {"mesh.local_sizes.*", {"mesh.local_sizes.hot_face=0.004"},
       [](const Case& c) { EXPECT_TRUE(near(c.local_sizes.at("hot_face"), 0.004)); }},
      {"mesh.refinements", {"mesh.refinements=2"}, [](const Case& c) { EXPECT_EQ(c.mesh_refinements, 2); }},
      {"materials.*.library", {"materials.steel.library=carbon_steel"},
       [](const Case& c) { EXPECT_EQ(c.materials.at("steel").library, "carbon_steel"); }},
      {"materials.*.conductivity", {"materials.board.conductivity=0.08"}, [](const Case& c) {
         const auto& k = c.materials.at("board").conductivity;
         EXPECT_FALSE(k.depends_on_temperature());  // the file's table replaced by a number
         EXPECT_TRUE(near(k.typical(300.0), 0.08));
       }},
      {"materials.*.conductivity", {"materials.steel.conductivity={vs_temperature: [[20, 50], [520, 40]]}"},
       [](const Case& c) {
         const auto& k = c.materials.at("steel").conductivity;
         EXPECT_TRUE(k.depends_on_temperature());  // a table given on the command line
         EXPECT_TRUE(near(k.typical(270.0 + celsius), 45.0));  // half way: linear between the rows
       }},
      {"materials.*.density", {"materials.steel.density=7850"},
       [](const Case& c) { EXPECT_TRUE(near(c.materials.at("steel").density->value(300.0), 7850.0)); }},
      {"materials.*.specific_heat", {"materials.steel.specific_heat=490"},
       [](const Case& c) { EXPECT_TRUE(near(c.materials.at("steel").specific_heat->value(300.0), 490.0)); }},
      {"materials.*.max_service_temperature", {"materials.steel.max_service_temperature=450"},
       [](const Case& c) { EXPECT_TRUE(near(*c.materials.at("steel").max_service_temperature, 450.0 + celsius)); }},
      {"regions.*", {"regions.shell=board"}, [](const Case& c) { EXPECT_EQ(c.regions.at("shell"), "board"); }},
      {"heat_sources.*", {"heat_sources.shell=2.5e4"},
       [](const Case& c) { EXPECT_TRUE(near(c.heat_sources.at("shell"), 2.5e4)); }},
      {"boundaries.*.temperature", {"boundaries.hot_face.temperature=950"},
       [](const Case& c) { EXPECT_TRUE(near(*c.boundaries.at("hot_face").temperature, 950.0 + celsius)); }},
      {"boundaries.*.heat_flux", {"boundaries.flange.heat_flux=-250"},
       [](const Case& c) { EXPECT_TRUE(near(*c.boundaries.at("flange").heat_flux, -250.0)); }},
      {"boundaries.*.convection.coefficient", {"boundaries.cold_face.convection.coefficient=8"},
       [](const Case& c) { EXPECT_TRUE(near(c.boundaries.at("cold_face").convection->coefficient.value(300.0), 8.0)); }},
      {"boundaries.*.convection.ambient", {"boundaries.cold_face.convection.ambient=35"},
       [](const Case& c) { EXPECT_TRUE(near(c.boundaries.at("cold_face").convection->ambient, 35.0 + celsius)); }},
      {"boundaries.*.radiation.emissivity", {"boundaries.cold_face.radiation.emissivity=0.3"},
       [](const Case& c) { EXPECT_TRUE(near(c.boundaries.at("cold_face").radiation->emissivity, 0.3)); }},
      {"boundaries.*.radiation.surroundings", {"boundaries.cold_face.radiation.surroundings=45"},
       [](const Case& c) { EXPECT_TRUE(near(c.boundaries.at("cold_face").radiation->surroundings, 45.0 + celsius)); }},
      {"interfaces.*.conductance", {"interfaces.gap.conductance=250"},
       [](const Case& c) { EXPECT_TRUE(near(c.interfaces.at("gap").conductance, 250.0)); }},
      {"safety.touch_surfaces", {"safety.touch_surfaces=[cold_face, flange]"}, [](const Case& c) {
         EXPECT_EQ(c.touch_surfaces, (std::vector<std::string>{"cold_face", "flange"}));
       }},
      {"safety.touch_limit", {"safety.touch_surfaces=[cold_face]", "safety.touch_limit=48"},
       [](const Case& c) { EXPECT_TRUE(near(c.touch_limit, 48.0 + celsius)); }},
      {"analysis.type", {"analysis.type=steady"}, [](const Case& c) { EXPECT_EQ(c.analysis_type, "steady"); }},
      {"analysis.duration", {"analysis.duration=7200"},
       [](const Case& c) { EXPECT_TRUE(near(c.transient.duration, 7200.0)); }},
      {"analysis.time_step", {"analysis.time_step=30"},
       [](const Case& c) { EXPECT_TRUE(near(c.transient.time_step, 30.0)); }},
      {"analysis.time_stepping.method", {"analysis.time_stepping.method=backward_euler"},
       [](const Case& c) { EXPECT_EQ(c.transient.method, "backward_euler"); }},
      {"analysis.time_stepping.adaptive", {"analysis.time_stepping.adaptive=false"},
       [](const Case& c) { EXPECT_FALSE(c.transient.adaptive); }},
      {"analysis.time_stepping.tolerance", {"analysis.time_stepping.tolerance=0.5"},
       [](const Case& c) { EXPECT_TRUE(near(c.transient.step_tolerance, 0.5)); }},
      {"analysis.initial_temperature", {"analysis.initial_temperature=15"},
       [](const Case& c) { EXPECT_TRUE(near(*c.transient.initial_temperature, 15.0 + celsius)); }},
      {"analysis.output_times", {"analysis.output_times=[600, 1800, 3600]"}, [](const Case& c) {
         EXPECT_EQ(c.transient.output_times, (std::vector<double>{600, 1800, 3600}));
       }},
      {"thresholds.*.probe", with_transient({"probes.tip=[0, 0, 0]", "thresholds.warm.temperature=90", "thresholds.warm.probe=tip"}),
       [](const Case& c) {
         ASSERT_EQ(c.thresholds.size(), 1u);
         EXPECT_EQ(c.thresholds[0].kind, hearth::ThresholdSpec::Kind::probe);
         EXPECT_EQ(c.thresholds[0].target, "tip");
       }},
      {"thresholds.*.region_max", with_transient({"thresholds.warm.temperature=90", "thresholds.warm.region_max=shell"}), [](const Case& c) {
         ASSERT_EQ(c.thresholds.size(), 1u);
         EXPECT_EQ(c.thresholds[0].kind, hearth::ThresholdSpec::Kind::region_max);
         EXPECT_EQ(c.thresholds[0].target, "shell");
       }},
      {"thresholds.*.surface_mean", with_transient({"thresholds.warm.temperature=90", "thresholds.warm.surface_mean=hot_face"}), [](const Case& c) {
         ASSERT_EQ(c.thresholds.size(), 1u);
         EXPECT_EQ(c.thresholds[0].kind, hearth::ThresholdSpec::Kind::surface_mean);
         EXPECT_EQ(c.thresholds[0].target, "hot_face");
       }},
      {"thresholds.*.temperature", with_transient({"thresholds.warm.region_max=shell", "thresholds.warm.temperature=90"}),
       [](const Case& c) {
         ASSERT_EQ(c.thresholds.size(), 1u);
         EXPECT_TRUE(near(c.thresholds[0].temperature, 90.0 + celsius));
       }},
      {"boundaries.*.temperature",
       with_transient({"boundaries.hot_face.temperature={vs_time: [[0, 20], [300, 700], [600, 900]]}"}),
       [](const Case& c) {
         ASSERT_EQ(c.time_varying.size(), 1u);  // a table in time given on the command line
         EXPECT_EQ(c.time_varying[0].name, "hot_face");
         EXPECT_EQ(c.time_varying[0].target, hearth::TimeVaryingValue::Target::temperature);
       }},
      {"solver.linear", {"solver.linear=direct"}, [](const Case& c) { EXPECT_EQ(c.solver.linear, "direct"); }},
      {"solver.tolerance", {"solver.tolerance=1e-12"}, [](const Case& c) { EXPECT_TRUE(near(c.solver.tolerance, 1e-12)); }},
      {"solver.nonlinear.tolerance", {"solver.nonlinear.tolerance=1e-10"},
       [](const Case& c) { EXPECT_TRUE(near(c.solver.nonlinear_tolerance, 1e-10)); }},
      {"solver.nonlinear.max_iterations", {"solver.nonlinear.max_iterations=60"},
       [](const Case& c) { EXPECT_EQ(c.solver.nonlinear_max_iterations, 60); }},
      {"probes.*", {"probes.tip=[0.1, 0.2, 0.3]"}, [](const Case& c) {
         ASSERT_EQ(c.probes.size(), 1u);
         EXPECT_TRUE(near(c.probes[0].point[2], 0.3));
       }},
      {"lines.*.from", {"lines.cut.from=[0, 0.05, 0]"}, [](const Case& c) {
         ASSERT_EQ(c.lines.size(), 1u);
         EXPECT_TRUE(near(c.lines[0].from[1], 0.05));
       }},
      {"lines.*.to", {"lines.cut.from=[0, 0, 0]", "lines.cut.to=[0, 0, 0.2]"}, [](const Case& c) {
         ASSERT_EQ(c.lines.size(), 1u);
         EXPECT_TRUE(near(c.lines[0].to[2], 0.2));
       }},
      {"lines.*.points", {"lines.cut.from=[0, 0, 0]", "lines.cut.to=[0.1, 0, 0]", "lines.cut.points=21"},
       [](const Case& c) {
         ASSERT_EQ(c.lines.size(), 1u);
         EXPECT_EQ(c.lines[0].points, 21);
       }},
      {"output.directory", {"output.directory=sweep/h_8"},
       [](const Case& c) { EXPECT_EQ(c.output_directory.filename(), "h_8"); }},
      {"output.report", {"output.report=true"}, [](const Case& c) { EXPECT_TRUE(c.output_report); }},
      {"output.report_mesh_edges", {"output.report_mesh_edges=true"},
       [](const Case& c) { EXPECT_TRUE(c.report_mesh_edges); }},
      {"output.compression", {"output.compression=zlib"},
       [](const Case& c) { EXPECT_EQ(c.output_compression, "zlib"); }},
  };
  return table;
}

class Overrides : public ::testing::Test {
 protected:
  void SetUp() override {
    std::random_device random;
    dir_ = fs::temp_directory_path() / ("hearth_overrides_" + std::to_string(random()));
    fs::create_directories(dir_);
    for (const char* geo : {"door.geo", "other.geo"}) std::ofstream(dir_ / geo) << "// placeholder\n";
  }
  void TearDown() override {
    std::error_code ignored;
    fs::remove_all(dir_, ignored);
  }
  fs::path write(const std::string& text) const {
    const fs::path path = dir_ / "case.yaml";
    std::ofstream(path) << text;
    return path;
  }
  fs::path dir_;
};

TEST_F(Overrides, EveryKeyReplacesTheFilesValue) {
  const fs::path file = write(full_case);
  for (const Override& o : overrides()) {
    SCOPED_TRACE("--set " + o.sets.back());
    try {
      o.check(read_case_file(file, o.sets));
    } catch (const hearth::InputError& e) {
      ADD_FAILURE() << e.what();
    }
  }
}

// From a minimal file, every override creates its key and the sections above it
// (a material, a boundary, an interface, a probe that the file does not name).
TEST_F(Overrides, OverridesCreateWhatTheFileLacks) {
  const fs::path file = write(minimal_case);
  // Sections that need a partner key or a name defined elsewhere get it beside them.
  const std::map<std::string, std::vector<std::string>> partners = {
      {"regions.*", {"materials.board.conductivity=0.1"}},
      {"boundaries.*.convection.coefficient", {"boundaries.cold_face.convection.ambient=20"}},
      {"boundaries.*.convection.ambient", {"boundaries.cold_face.convection.coefficient=10"}},
      {"boundaries.*.radiation.emissivity", {"boundaries.cold_face.radiation.surroundings=20"}},
      {"boundaries.*.radiation.surroundings", {"boundaries.cold_face.radiation.emissivity=0.9"}},
      {"lines.*.from", {"lines.cut.to=[0.1, 0, 0]"}},
  };
  for (const Override& o : overrides()) {
    std::vector<std::string> sets;
    const auto extra = partners.find(o.key);
    if (extra != partners.end()) sets = extra->second;
    sets.insert(sets.end(), o.sets.begin(), o.sets.end());
    SCOPED_TRACE("--set " + o.sets.back());
    try {
      o.check(read_case_file(file, sets));
    } catch (const hearth::InputError& e) {
      ADD_FAILURE() << e.what();
    }
  }
}

TEST_F(Overrides, OverridesCoverEverySchemaKey) {
  std::map<std::string, int> covered;
  for (const Override& o : overrides()) ++covered[o.key];
  for (const hearth::KeySpec& spec : hearth::case_schema()) {
    if (spec.kind == hearth::KeyKind::section || spec.kind == hearth::KeyKind::names) continue;
    EXPECT_TRUE(covered.count(spec.key)) << spec.key << " has no --set check in tests/io/test_overrides.cpp";
  }
}

// A section made by --set names the key it still needs, and how to give it.
TEST_F(Overrides, NewSectionSaysWhichKeyItStillNeeds) {
  try {
    read_case_file(write(minimal_case), {"boundaries.side.convection.coefficient=5"});
    ADD_FAILURE() << "no InputError";
  } catch (const hearth::InputError& e) {
    EXPECT_NE(std::string(e.what()).find("boundaries.side.convection.ambient is needed too"), std::string::npos)
        << e.what();
    EXPECT_NE(std::string(e.what()).find("add --set boundaries.side.convection.ambient=VALUE"), std::string::npos)
        << e.what();
  }
}

}  // namespace
