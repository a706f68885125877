// Replays the inputs the case-file fuzzer found (tests/fuzz/regressions/case_file/)
// and the example cases through the reader's contract (tests/fuzz/case_reader_contract),
// so that what the fuzzer once found stays fixed in every build, sanitised or not.
#include <gtest/gtest.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "tests/fuzz/case_reader_contract.hpp"

namespace fs = std::filesystem;
using hearth::fuzz::CaseFolder;
using hearth::fuzz::CaseVerdict;
using hearth::fuzz::read_case_under_contract;
using hearth::fuzz::split_case_input;

namespace {

std::string bytes_of(const fs::path& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

// The files of `folder`, sorted, without its README.
std::vector<fs::path> inputs_in(const fs::path& folder) {
  std::vector<fs::path> files;
  for (const auto& entry : fs::directory_iterator(folder))
    if (entry.is_regular_file() && entry.path().filename() != "README.md") files.push_back(entry.path());
  std::sort(files.begin(), files.end());
  return files;
}

const fs::path source_dir = HEARTH_SOURCE_DIR;

}  // namespace

// Each kept input once crashed the reader or broke its contract (the folder's README
// says what each one found); now each must be read or refused with an InputError.
TEST(FuzzRegressions, KeptCaseFileInputsAreReadOrRefusedCleanly) {
  const CaseFolder folder;
  const std::vector<fs::path> inputs = inputs_in(source_dir / "tests/fuzz/regressions/case_file");
  ASSERT_FALSE(inputs.empty()) << "tests/fuzz/regressions/case_file/ holds no inputs";
  for (const fs::path& input : inputs) {
    SCOPED_TRACE(input.filename().string());
    EXPECT_NO_THROW(read_case_under_contract(bytes_of(input), folder));
  }
}

// The example cases are the fuzzer's seeds; each is a valid case and must be accepted
// with every value in range.
TEST(FuzzRegressions, ExampleCasesAreAcceptedUnderTheContract) {
  const CaseFolder folder;
  int cases = 0;
  for (const auto& entry : fs::directory_iterator(source_dir / "cases")) {
    const fs::path file = entry.path() / "case.yaml";
    if (!fs::is_regular_file(file)) continue;
    SCOPED_TRACE(file.string());
    ++cases;
    CaseVerdict verdict = CaseVerdict::refused;
    EXPECT_NO_THROW(verdict = read_case_under_contract(bytes_of(file), folder));
    EXPECT_EQ(verdict, CaseVerdict::accepted);
  }
  EXPECT_GE(cases, 3);  // furnace_wall, duct_bracket, laminate_standoff at least
}

// Leading "#--set KEY=VALUE" lines of a fuzz input are --set overrides; the rest of the
// text, comments included, is the case.
TEST(FuzzRegressions, LeadingSetLinesAreOverrides) {
  const auto input = split_case_input("#--set mesh.size=0.01\n#--set mesh.order=2\n# a comment\nmesh: {}\n");
  ASSERT_EQ(input.overrides.size(), 2u);
  EXPECT_EQ(input.overrides[0], "mesh.size=0.01");
  EXPECT_EQ(input.overrides[1], "mesh.order=2");
  EXPECT_EQ(input.text.substr(0, 7), "#--set ");
  EXPECT_TRUE(split_case_input("mesh: {}\n#--set mesh.size=1\n").overrides.empty());
  EXPECT_EQ(split_case_input("#--set mesh.size=0.5").overrides.at(0), "mesh.size=0.5");
}

// A refused input is not a contract violation; the message names the case file.
TEST(FuzzRegressions, RefusalsAreNotViolations) {
  const CaseFolder folder;
  EXPECT_EQ(read_case_under_contract("geometry: [unclosed\n", folder), CaseVerdict::refused);
  EXPECT_EQ(read_case_under_contract("", folder), CaseVerdict::refused);
  EXPECT_EQ(read_case_under_contract("#--set mesh=1\nmesh: {size: 1}\n", folder), CaseVerdict::refused);
}
