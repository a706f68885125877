// The report's pictures of the temperature field, rendered off screen with VTK (needs
// an X display; tools/driver starts Xvfb where there is none).
#pragma once

#include <filesystem>
#include <string>
#include <vector>

#include "io/field_grid.hpp"

namespace hearth {

struct PictureRequest {
  std::filesystem::path surface_file;  // surface.vtp of the same run as the FieldGrid
  std::string title;                   // the case's title
  std::string time_label;              // e.g. "t = 3600 s" for a transient result; "" when steady
  std::string temperature_unit = "degC";
  std::string length_unit = "m";
  bool mesh_edges = false;             // draw element edges on the surface pictures
  int width = 1200, height = 900;      // pixels
};

struct Picture {
  std::string file_name;            // e.g. "picture_isometric.png"
  std::string heading;              // e.g. "Isometric view"
  std::string caption;              // what the picture shows, one paragraph
  std::vector<unsigned char> png;   // the encoded file
  int width = 0, height = 0;
};

// Three pictures: the isometric view, the view onto the largest named exterior boundary
// (left out when the surface has none) and the section through the hottest point. All
// share one colour scale, from the field's lowest to its highest temperature. Colours:
// io/colour_map.hpp. Throws std::runtime_error when VTK cannot render.
std::vector<Picture> render_field_pictures(const FieldGrid& field, const PictureRequest& request);

// The version of the VTK library doing the rendering, e.g. "9.1.0".
std::string vtk_version();

// The case's temperature unit as printed: "°C" for degC, "K".
std::string temperature_symbol(const std::string& unit);

}  // namespace hearth
