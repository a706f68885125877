// Replays the inputs the geometry-guard fuzzer found (tests/fuzz/regressions/geometry_guard/)
// and the shipped geometry scripts through the guard's contract
// (tests/fuzz/geometry_guard_contract), in every build, sanitised or not.
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

#include "tests/fuzz/geometry_guard_contract.hpp"

namespace fs = std::filesystem;
using hearth::fuzz::scan_under_contract;

namespace {

const fs::path source_dir = HEARTH_SOURCE_DIR;

std::string bytes_of(const fs::path& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

}  // namespace

// Each kept input once crashed the guard or broke its contract (the folder's README says
// what); the folder holds none while the fuzzer has found nothing.
TEST(GuardFuzzRegressions, KeptInputsMeetTheContract) {
  const fs::path folder = source_dir / "tests/fuzz/regressions/geometry_guard";
  if (!fs::is_directory(folder)) return;
  for (const auto& entry : fs::directory_iterator(folder)) {
    if (!entry.is_regular_file() || entry.path().filename() == "README.md") continue;
    SCOPED_TRACE(entry.path().filename().string());
    EXPECT_NO_THROW(scan_under_contract(bytes_of(entry.path())));
  }
}

// The shipped scripts are the fuzzer's seeds: they meet the contract (each with a shell
// command put before it is refused) and hold nothing unsafe, but for make_bracket.geo,
// which writes the bracket's STEP file with Save (GEOMETRY.txt: run by Gmsh itself).
TEST(GuardFuzzRegressions, ShippedScriptsMeetTheContract) {
  int scripts = 0;
  for (const auto& entry : fs::directory_iterator(source_dir / "cases")) {
    if (!entry.is_directory()) continue;
    for (const auto& file : fs::directory_iterator(entry.path())) {
      if (file.path().extension() != ".geo") continue;
      SCOPED_TRACE(file.path().string());
      ++scripts;
      std::size_t unsafe = 1;
      EXPECT_NO_THROW(unsafe = scan_under_contract(bytes_of(file.path())));
      EXPECT_EQ(unsafe, file.path().filename() == "make_bracket.geo" ? 1u : 0u);
    }
  }
  EXPECT_GE(scripts, 4);  // furnace wall, laminate standoff, kiln door, the bracket's source
}
