// What the VTK XML result files (temperature.vtu, mesh.vtu, surface.vtp) share: the
// encoding and the field data that state the units.
#pragma once

#include <filesystem>
#include <string>

#include "io/case.hpp"

class vtkFieldData;
class vtkXMLWriter;

namespace hearth {

// Binary (appended, zlib-compressed, 64-bit headers) or, for reading by eye, ASCII.
enum class VtkEncoding { binary, ascii };

void configure_xml_writer(vtkXMLWriter& writer, VtkEncoding encoding);

// Runs the writer (its file name set to a temporary beside `path`); a failure is a
// WriteError naming `path` and the reason (disk full, permission).
void run_xml_writer(vtkXMLWriter& writer, const std::filesystem::path& path);

// Field data "units": "length=m", "temperature=degC", "heat_flux=W/m2".
void add_units_field_data(vtkFieldData& field_data, const Units& units);

// Field data `name` holding one string.
void add_text_field_data(vtkFieldData& field_data, const std::string& name, const std::string& text);

}  // namespace hearth
