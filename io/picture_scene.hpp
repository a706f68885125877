// One off-screen picture: the body in a parallel-projection view with its colour bar,
// title, axis triad and (for views straight onto a plane) a scale bar. Internal to io/:
// this header names VTK types.
#pragma once

#include <vtkSmartPointer.h>

#include <string>
#include <vector>

#include "io/view_choice.hpp"

class vtkActor;
class vtkLookupTable;
class vtkPolyData;
class vtkRenderer;
class vtkRenderWindow;

namespace hearth {

struct ColourScale {
  double low = 0.0, high = 1.0;  // temperatures at the two ends of the map
  std::string label;             // e.g. "Temperature (°C)"
};

// The lookup table of the inferno map over [low, high] (a span of at least 1e-6 of
// the value, so that a uniform field still maps).
vtkSmartPointer<vtkLookupTable> temperature_lookup_table(const ColourScale& scale);

class PictureScene {
 public:
  PictureScene(int width, int height, const ColourScale& scale);
  ~PictureScene();
  PictureScene(const PictureScene&) = delete;
  PictureScene& operator=(const PictureScene&) = delete;

  // A surface coloured by its point field "temperature" through the colour map.
  // `straight_on`: the picture looks straight onto a plane; it is lit from the camera, so
  // that the plane shows the map's colours unchanged. Otherwise the light comes from the
  // upper left of the camera, so that faces turned different ways differ in brightness.
  void add_coloured_surface(vtkPolyData* surface, bool straight_on);
  // Lines (poly data of lines) in `rgb` with `width` pixels, drawn `lift` world units
  // towards the camera so that they stay in front of the surface they lie on.
  void add_lines(vtkPolyData* lines, const Vector3& rgb, double width, double lift);
  // Any other actor, in the scene's 3D space.
  void add_actor(vtkActor* actor);

  // Points the camera along `view` and fits `shown` (world bounds) into the picture.
  void frame(const ViewDirection& view, const Bounds& shown);
  // After frame(): a bar of a round length at the bottom, labelled in `length_unit`.
  void add_scale_bar(const std::string& length_unit);
  void set_title(const std::string& title, const std::string& subtitle);

  const ViewDirection& view() const { return view_; }
  // World units per pixel of the scene after frame().
  double world_per_pixel() const;

  // Renders and returns the PNG file's bytes. Throws std::runtime_error on failure.
  std::vector<unsigned char> render_png();

 private:
  int width_, height_;
  ColourScale scale_;
  ViewDirection view_;
  vtkSmartPointer<vtkRenderWindow> window_;
  vtkSmartPointer<vtkRenderer> overlay_, scene_, triad_;
  vtkSmartPointer<vtkLookupTable> lut_;
};

}  // namespace hearth
