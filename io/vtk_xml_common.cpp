// Writer settings and unit field data for the VTK XML result files.
#include "io/vtk_xml_common.hpp"

#include <vtkErrorCode.h>
#include <vtkFieldData.h>
#include <vtkSmartPointer.h>
#include <vtkStringArray.h>
#include <vtkXMLWriter.h>

#include <cerrno>

#include "io/atomic_file.hpp"
#include "io/write_error.hpp"

namespace hearth {

VtkEncoding vtk_encoding(const std::string& compression, bool ascii) {
  if (ascii) return VtkEncoding::ascii;
  if (compression == "zlib") return VtkEncoding::zlib;
  if (compression == "none") return VtkEncoding::uncompressed;
  return VtkEncoding::lz4;
}

void configure_xml_writer(vtkXMLWriter& writer, VtkEncoding encoding) {
  writer.SetHeaderTypeToUInt64();
  if (encoding == VtkEncoding::ascii) {
    writer.SetDataModeToAscii();
    writer.SetCompressorTypeToNone();
    return;
  }
  writer.SetDataModeToAppended();
  writer.EncodeAppendedDataOff();
  if (encoding == VtkEncoding::lz4) writer.SetCompressorTypeToLZ4();
  else if (encoding == VtkEncoding::zlib) writer.SetCompressorTypeToZLib();
  else writer.SetCompressorTypeToNone();
}

void run_xml_writer(vtkXMLWriter& writer, const std::filesystem::path& path) {
  if (writer.Write() != 1 || writer.GetErrorCode() != vtkErrorCode::NoError)
    throw WriteError(write_failure(path, writer.GetErrorCode() == vtkErrorCode::OutOfDiskSpaceError ? ENOSPC
                                         : errno != 0                                               ? errno
                                                                                                    : EIO));
}

void add_units_field_data(vtkFieldData& field_data, const Units& units) {
  auto names = vtkSmartPointer<vtkStringArray>::New();
  names->SetName("units");
  names->InsertNextValue("length=" + units.length);
  names->InsertNextValue("temperature=" + units.temperature);
  names->InsertNextValue("heat_flux=W/m2");
  field_data.AddArray(names);
}

void add_text_field_data(vtkFieldData& field_data, const std::string& name, const std::string& text) {
  auto array = vtkSmartPointer<vtkStringArray>::New();
  array->SetName(name.c_str());
  array->InsertNextValue(text);
  field_data.AddArray(array);
}

}  // namespace hearth
