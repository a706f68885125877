// The VTU writer's ASCII form and its field data (read as text: VTK's XML format is
// plain text with --ascii), and its binary forms read back through VTK's own reader.
#include <gtest/gtest.h>
#include <vtkCellType.h>
#include <vtkDataArray.h>
#include <vtkIdList.h>
#include <vtkNew.h>
#include <vtkPointData.h>
#include <vtkUnstructuredGrid.h>
#include <vtkXMLUnstructuredGridReader.h>

#include <filesystem>
#include <fstream>
#include <random>
#include <regex>
#include <sstream>
#include <vector>

#include "io/vtu_writer.hpp"

namespace hearth {
namespace {

namespace fs = std::filesystem;

Mesh one_tet() {
  Mesh m;
  m.coords = {0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 1};
  m.tet_nodes = {0, 1, 2, 3};
  m.tet_region = {0};
  m.regions = {{"block", 7}};
  return m;
}

// The strings of an ASCII string array: VTK writes each as its character codes, ended by 0.
std::vector<std::string> strings_of(const std::string& text, const std::string& name) {
  std::smatch match;
  if (!std::regex_search(text, match, std::regex("Name=\"" + name + "\"[^>]*>([^<]*)<"))) return {};
  std::vector<std::string> out(1);
  std::istringstream codes(match[1].str());
  for (int c; codes >> c;) {
    if (c == 0) out.emplace_back();
    else out.back() += static_cast<char>(c);
  }
  out.pop_back();
  return out;
}

std::string read(const fs::path& p) {
  std::ifstream in(p);
  std::stringstream s;
  s << in.rdbuf();
  return s.str();
}

TEST(VtuWriter, AsciiFileCarriesNamesUnitsTitleAndTime) {
  std::random_device random;
  const fs::path file = fs::temp_directory_path() / ("hearth_test_vtu_" + std::to_string(random()) + ".vtu");
  const std::vector<double> temperature = {373.15, 373.15, 373.15, 273.15};  // K
  VtuFields fields;
  fields.temperature = &temperature;
  fields.title = "small block";
  fields.time = 3600.0;
  write_vtu(file, one_tet(), Units{}, fields, VtkEncoding::ascii);
  const std::string text = read(file);
  fs::remove(file);
  EXPECT_NE(text.find("format=\"ascii\""), std::string::npos);
  EXPECT_EQ(text.find("AppendedData"), std::string::npos);
  // "TimeValue": the field-data name VTK's readers take as a data set's time (VTK
  // convention; common practice, no source).
  EXPECT_TRUE(std::regex_search(text, std::regex("Name=\"TimeValue\"[^>]*>\\s*3600\\s")));
  EXPECT_EQ(strings_of(text, "title"), (std::vector<std::string>{"small block"}));
  EXPECT_EQ(strings_of(text, "region_names"), (std::vector<std::string>{"block"}));
  EXPECT_EQ(strings_of(text, "units"),
            (std::vector<std::string>{"length=m", "temperature=degC", "heat_flux=W/m2"}));
  // Temperatures in degC (the default unit): 100 at three corners, 0 at the fourth.
  EXPECT_TRUE(std::regex_search(text, std::regex("Name=\"temperature\"[^>]*>\\s*100 100 100 0\\s")));
}

// Each binary encoding (output.compression) names its compressor in the header, as
// VTK's XML format defines (VTK file-format documentation, "compressor" attribute of
// VTKFile), and reads back through VTK's reader to the same numbers.
TEST(VtuWriter, EveryBinaryEncodingReadsBackThroughVtk) {
  struct Case { VtkEncoding encoding; const char* compressor; };
  const Case cases[] = {{VtkEncoding::lz4, "vtkLZ4DataCompressor"},
                        {VtkEncoding::zlib, "vtkZLibDataCompressor"},
                        {VtkEncoding::uncompressed, nullptr}};
  const std::vector<double> temperature = {373.15, 350.0, 300.0, 273.15};  // K
  VtuFields fields;
  fields.temperature = &temperature;
  std::random_device random;
  Mesh mesh = one_tet();
  mesh.tet_nodes = {3, 1, 0, 2};  // not the identity, so that the order read back means something
  for (const Case& c : cases) {
    const fs::path file = fs::temp_directory_path() / ("hearth_test_vtu_" + std::to_string(random()) + ".vtu");
    write_vtu(file, mesh, Units{}, fields, c.encoding);
    const std::string text = read(file);
    const std::string header = text.substr(0, text.find("<AppendedData"));
    if (c.compressor) EXPECT_NE(header.find(std::string("compressor=\"") + c.compressor + "\""), std::string::npos) << c.compressor;
    else EXPECT_EQ(header.find("compressor="), std::string::npos);
    // 32-bit cell arrays (the writer's choice for meshes whose connectivity fits).
    EXPECT_NE(header.find("type=\"Int32\" Name=\"connectivity\""), std::string::npos);
    vtkNew<vtkXMLUnstructuredGridReader> reader;
    reader->SetFileName(file.string().c_str());
    reader->Update();
    fs::remove(file);
    vtkUnstructuredGrid* grid = reader->GetOutput();
    ASSERT_EQ(grid->GetNumberOfPoints(), 4);
    ASSERT_EQ(grid->GetNumberOfCells(), 1);
    EXPECT_EQ(grid->GetCellType(0), VTK_TETRA);
    vtkNew<vtkIdList> ids;
    grid->GetCellPoints(0, ids);
    ASSERT_EQ(ids->GetNumberOfIds(), 4);
    for (int a = 0; a < 4; ++a) EXPECT_EQ(ids->GetId(a), mesh.tet_nodes[a]);
    vtkDataArray* t = grid->GetPointData()->GetArray("temperature");
    ASSERT_NE(t, nullptr);
    // Degrees Celsius, the default unit: K - 273.15.
    for (int i = 0; i < 4; ++i) EXPECT_NEAR(t->GetTuple1(i), temperature[i] - 273.15, 1e-12);
  }
}

// output.compression's values map to the encodings; --ascii wins over any of them.
TEST(VtuWriter, CompressionKeyChoosesTheEncoding) {
  EXPECT_EQ(vtk_encoding("lz4", false), VtkEncoding::lz4);
  EXPECT_EQ(vtk_encoding("zlib", false), VtkEncoding::zlib);
  EXPECT_EQ(vtk_encoding("none", false), VtkEncoding::uncompressed);
  EXPECT_EQ(vtk_encoding("zlib", true), VtkEncoding::ascii);
}

}  // namespace
}  // namespace hearth
