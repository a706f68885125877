// What the VTK XML result files (temperature.vtu, mesh.vtu, surface.vtp) share: the
// encoding and the field data that state the units.
#pragma once

#include <filesystem>
#include <string>

#include "io/case.hpp"

class vtkFieldData;
class vtkXMLWriter;

namespace hearth {

// Binary (appended raw, 64-bit headers) compressed with LZ4 or zlib or not at all, or,
// for reading by eye, ASCII. LZ4 is the default: a million-node result (420 MB of
// arrays) took 0.8 s to write with it and 13 s with zlib, for a file a third larger
// (260 MB against 190 MB).
enum class VtkEncoding { lz4, zlib, uncompressed, ascii };

// The encoding for output.compression ("lz4", "zlib" or "none") unless `ascii` (--ascii).
VtkEncoding vtk_encoding(const std::string& compression, bool ascii);

void configure_xml_writer(vtkXMLWriter& writer, VtkEncoding encoding);

// Runs the writer (its file name set to a temporary beside `path`); a failure is a
// WriteError naming `path` and the reason (disk full, permission).
void run_xml_writer(vtkXMLWriter& writer, const std::filesystem::path& path);

// Field data "units": "length=m", "temperature=degC", "heat_flux=W/m2".
void add_units_field_data(vtkFieldData& field_data, const Units& units);

// Field data `name` holding one string.
void add_text_field_data(vtkFieldData& field_data, const std::string& name, const std::string& text);

}  // namespace hearth
