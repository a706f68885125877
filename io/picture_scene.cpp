// Three renderer layers in one off-screen window: 0 the white page with the 2D
// annotations (title, colour bar, scale bar), 1 the body (transparent background), 2 the
// axis triad in the lower left corner.
#include "io/picture_scene.hpp"

#include <vtkActor.h>
#include <vtkActor2D.h>
#include <vtkAxesActor.h>
#include <vtkCamera.h>
#include <vtkCaptionActor2D.h>
#include <vtkCellArray.h>
#include <vtkCoordinate.h>
#include <vtkDoubleArray.h>
#include <vtkLight.h>
#include <vtkLookupTable.h>
#include <vtkPNGWriter.h>
#include <vtkPoints.h>
#include <vtkPolyData.h>
#include <vtkPolyDataMapper.h>
#include <vtkPolyDataMapper2D.h>
#include <vtkProperty.h>
#include <vtkProperty2D.h>
#include <vtkRenderWindow.h>
#include <vtkRenderer.h>
#include <vtkScalarBarActor.h>
#include <vtkTextActor.h>
#include <vtkTextProperty.h>
#include <vtkTransform.h>
#include <vtkUnsignedCharArray.h>
#include <vtkWindowToImageFilter.h>

#include <cmath>
#include <stdexcept>

#include "io/colour_map.hpp"
#include "io/nice_numbers.hpp"

namespace hearth {

namespace {

template <class T>
using Ptr = vtkSmartPointer<T>;

// Where the body goes, as a fraction of the window: left of the colour bar, between
// the title and the scale bar.
constexpr double kSceneViewport[4] = {0.0, 0.08, 0.83, 0.87};
constexpr double kTextGrey = 0.12;

void style_text(vtkTextProperty& p, int size, bool bold) {
  p.SetFontFamilyToArial();
  p.SetFontSize(size);
  p.SetBold(bold);
  p.SetItalic(false);
  p.SetShadow(false);
  p.SetColor(kTextGrey, kTextGrey, kTextGrey);
}

double dot(const Vector3& a, const Vector3& b) { return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]; }
Vector3 cross(const Vector3& a, const Vector3& b) {
  return {a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]};
}

}  // namespace

vtkSmartPointer<vtkLookupTable> temperature_lookup_table(const ColourScale& scale) {
  auto lut = Ptr<vtkLookupTable>::New();
  const auto& table = inferno_table();
  lut->SetNumberOfTableValues(static_cast<vtkIdType>(table.size()));
  for (std::size_t i = 0; i < table.size(); ++i)
    lut->SetTableValue(static_cast<vtkIdType>(i), table[i][0], table[i][1], table[i][2], 1.0);
  double low = scale.low, high = scale.high;
  const double least = 1e-6 * std::max(1.0, std::abs(high));
  if (high - low < least) low -= least, high += least;
  lut->SetTableRange(low, high);
  lut->SetUseBelowRangeColor(false);
  lut->SetUseAboveRangeColor(false);
  return lut;
}

PictureScene::PictureScene(int width, int height, const ColourScale& scale)
    : width_(width), height_(height), scale_(scale) {
  lut_ = temperature_lookup_table(scale);
  window_ = Ptr<vtkRenderWindow>::New();
  window_->SetOffScreenRendering(1);
  window_->SetSize(width, height);
  window_->SetMultiSamples(8);
  window_->SetNumberOfLayers(3);
  window_->SetAlphaBitPlanes(0);

  overlay_ = Ptr<vtkRenderer>::New();
  overlay_->SetLayer(0);
  overlay_->SetBackground(1, 1, 1);
  overlay_->InteractiveOff();
  scene_ = Ptr<vtkRenderer>::New();
  scene_->SetLayer(1);
  scene_->SetViewport(kSceneViewport[0], kSceneViewport[1], kSceneViewport[2], kSceneViewport[3]);
  scene_->GetActiveCamera()->ParallelProjectionOn();
  triad_ = Ptr<vtkRenderer>::New();
  triad_->SetLayer(2);
  triad_->SetViewport(0.0, 0.0, 0.13, 0.18);
  triad_->InteractiveOff();
  window_->AddRenderer(overlay_);
  window_->AddRenderer(scene_);
  window_->AddRenderer(triad_);

  // Colour bar: the whole map, labelled at round temperatures.
  auto bar = Ptr<vtkScalarBarActor>::New();
  bar->SetLookupTable(lut_);
  bar->SetTitle(scale.label.c_str());
  bar->SetMaximumNumberOfColors(256);
  bar->SetNumberOfLabels(0);
  auto labels = Ptr<vtkDoubleArray>::New();
  double range[2];
  lut_->GetTableRange(range);
  for (double t : nice_ticks(range[0], range[1], 6)) labels->InsertNextValue(t);
  bar->SetUseCustomLabels(true);
  bar->SetCustomLabels(labels);
  bar->SetLabelFormat("%g");
  bar->SetPosition(0.85, 0.12);
  bar->SetWidth(0.12);
  bar->SetHeight(0.70);
  bar->SetBarRatio(0.3);
  bar->SetUnconstrainedFontSize(true);
  bar->SetTextPositionToSucceedScalarBar();
  bar->DrawTickLabelsOn();
  style_text(*bar->GetTitleTextProperty(), 17, true);
  style_text(*bar->GetLabelTextProperty(), 15, false);
  bar->GetTitleTextProperty()->SetJustificationToLeft();
  overlay_->AddActor2D(bar);

  // Axis triad: x red, y green, z blue, turned with the scene's camera in render_png().
  auto axes = Ptr<vtkAxesActor>::New();
  axes->SetShaftTypeToCylinder();
  axes->SetCylinderRadius(0.04);
  axes->SetConeRadius(0.3);
  axes->SetTotalLength(1, 1, 1);
  for (vtkCaptionActor2D* caption : {axes->GetXAxisCaptionActor2D(), axes->GetYAxisCaptionActor2D(),
                                     axes->GetZAxisCaptionActor2D()}) {
    style_text(*caption->GetCaptionTextProperty(), 14, true);
    caption->GetTextActor()->SetTextScaleModeToNone();
  }
  triad_->AddActor(axes);
}

PictureScene::~PictureScene() = default;

void PictureScene::add_coloured_surface(vtkPolyData* surface, bool straight_on) {
  auto mapper = Ptr<vtkPolyDataMapper>::New();
  mapper->SetInputData(surface);
  mapper->SetLookupTable(lut_);
  mapper->SetScalarModeToUsePointFieldData();
  mapper->SelectColorArray("temperature");
  mapper->SetColorModeToMapScalars();
  mapper->UseLookupTableScalarRangeOn();
  mapper->ScalarVisibilityOn();
  // Map each pixel's interpolated temperature, not corner colours blended: the
  // picture's colours are then exactly the map's.
  mapper->InterpolateScalarsBeforeMappingOn();
  auto actor = Ptr<vtkActor>::New();
  actor->SetMapper(mapper);
  // Ambient + diffuse = 1: a face lit head-on shows the map's colour unchanged; faces
  // turned away from the light are darker, down to the ambient share.
  actor->GetProperty()->SetAmbient(straight_on ? 0.35 : 0.8);
  actor->GetProperty()->SetDiffuse(straight_on ? 0.65 : 0.2);
  actor->GetProperty()->SetSpecular(0.0);
  scene_->AddActor(actor);
  auto light = Ptr<vtkLight>::New();
  light->SetLightTypeToCameraLight();  // camera coordinates: the camera at (0, 0, 1), up +y
  light->SetFocalPoint(0, 0, 0);
  if (straight_on) light->SetPosition(0, 0, 1);
  else light->SetPosition(-0.3, 0.6, 1.0);
  light->SetIntensity(1.0);
  scene_->RemoveAllLights();
  scene_->AutomaticLightCreationOff();
  scene_->AddLight(light);
}

void PictureScene::add_lines(vtkPolyData* lines, const Vector3& rgb, double width, double lift) {
  auto mapper = Ptr<vtkPolyDataMapper>::New();
  mapper->SetInputData(lines);
  mapper->ScalarVisibilityOff();
  auto actor = Ptr<vtkActor>::New();
  actor->SetMapper(mapper);
  actor->GetProperty()->SetColor(rgb[0], rgb[1], rgb[2]);
  actor->GetProperty()->SetLineWidth(static_cast<float>(width));
  actor->GetProperty()->SetLighting(false);
  const Vector3& d = view_.direction;
  actor->SetPosition(-d[0] * lift, -d[1] * lift, -d[2] * lift);
  scene_->AddActor(actor);
}

void PictureScene::add_actor(vtkActor* actor) { scene_->AddActor(actor); }

void PictureScene::frame(const ViewDirection& view, const Bounds& b) {
  view_ = view;
  const Vector3 right = cross(view.direction, view.view_up);
  double r0 = INFINITY, r1 = -INFINITY, u0 = INFINITY, u1 = -INFINITY;
  for (int corner = 0; corner < 8; ++corner) {
    const Vector3 x{b[corner & 1 ? 1 : 0], b[corner & 2 ? 3 : 2], b[corner & 4 ? 5 : 4]};
    r0 = std::min(r0, dot(x, right)), r1 = std::max(r1, dot(x, right));
    u0 = std::min(u0, dot(x, view.view_up)), u1 = std::max(u1, dot(x, view.view_up));
  }
  const Vector3 centre{(b[0] + b[1]) / 2, (b[2] + b[3]) / 2, (b[4] + b[5]) / 2};
  const double shift_r = (r0 + r1) / 2 - dot(centre, right), shift_u = (u0 + u1) / 2 - dot(centre, view.view_up);
  Vector3 focal;
  for (int k = 0; k < 3; ++k) focal[k] = centre[k] + shift_r * right[k] + shift_u * view.view_up[k];
  const double diagonal = std::sqrt(std::pow(b[1] - b[0], 2) + std::pow(b[3] - b[2], 2) + std::pow(b[5] - b[4], 2));
  const double aspect = (kSceneViewport[2] - kSceneViewport[0]) * width_ /
                        ((kSceneViewport[3] - kSceneViewport[1]) * height_);
  vtkCamera* camera = scene_->GetActiveCamera();
  camera->SetFocalPoint(focal.data());
  camera->SetPosition(focal[0] - view.direction[0] * 2 * diagonal, focal[1] - view.direction[1] * 2 * diagonal,
                      focal[2] - view.direction[2] * 2 * diagonal);
  camera->SetViewUp(view.view_up.data());
  const double half_height = std::max((u1 - u0) / 2, (r1 - r0) / 2 / aspect);
  camera->SetParallelScale(std::max(half_height, 1e-12) * 1.06);
  scene_->ResetCameraClippingRange(b[0] - diagonal, b[1] + diagonal, b[2] - diagonal, b[3] + diagonal,
                                   b[4] - diagonal, b[5] + diagonal);
}

double PictureScene::world_per_pixel() const {
  const double scene_pixels = (kSceneViewport[3] - kSceneViewport[1]) * height_;
  return 2.0 * scene_->GetActiveCamera()->GetParallelScale() / scene_pixels;
}

void PictureScene::add_scale_bar(const std::string& length_unit) {
  const double per_pixel = world_per_pixel();
  const double scene_width = (kSceneViewport[2] - kSceneViewport[0]) * width_;
  const double length = round_length_below(0.25 * scene_width * per_pixel);
  const double pixels = length / per_pixel;
  const double x0 = kSceneViewport[0] * width_ + scene_width / 2 - pixels / 2, x1 = x0 + pixels;
  const double y = 0.045 * height_, tick = 6;
  auto points = Ptr<vtkPoints>::New();
  auto lines = Ptr<vtkCellArray>::New();
  const double xy[6][2] = {{x0, y}, {x1, y}, {x0, y - tick}, {x0, y + tick}, {x1, y - tick}, {x1, y + tick}};
  for (const auto& p : xy) points->InsertNextPoint(p[0], p[1], 0);
  for (vtkIdType k = 0; k < 6; k += 2) {
    const vtkIdType ids[2] = {k, k + 1};
    lines->InsertNextCell(2, ids);
  }
  auto poly = Ptr<vtkPolyData>::New();
  poly->SetPoints(points);
  poly->SetLines(lines);
  auto coordinate = Ptr<vtkCoordinate>::New();
  coordinate->SetCoordinateSystemToDisplay();
  auto mapper = Ptr<vtkPolyDataMapper2D>::New();
  mapper->SetInputData(poly);
  mapper->SetTransformCoordinate(coordinate);
  auto bar = Ptr<vtkActor2D>::New();
  bar->SetMapper(mapper);
  bar->GetProperty()->SetColor(kTextGrey, kTextGrey, kTextGrey);
  bar->GetProperty()->SetLineWidth(3);
  overlay_->AddActor2D(bar);
  auto label = Ptr<vtkTextActor>::New();
  label->SetInput((short_number(length) + " " + length_unit).c_str());
  style_text(*label->GetTextProperty(), 16, false);
  label->GetTextProperty()->SetJustificationToLeft();
  label->GetTextProperty()->SetVerticalJustificationToCentered();
  label->SetDisplayPosition(static_cast<int>(x1 + 12), static_cast<int>(y));
  overlay_->AddActor2D(label);
}

void PictureScene::set_title(const std::string& title, const std::string& subtitle) {
  auto heading = Ptr<vtkTextActor>::New();
  heading->SetInput(title.c_str());
  style_text(*heading->GetTextProperty(), 24, true);
  heading->GetTextProperty()->SetVerticalJustificationToTop();
  heading->SetDisplayPosition(static_cast<int>(0.02 * width_), static_cast<int>(height_ - 0.025 * height_));
  overlay_->AddActor2D(heading);
  auto second = Ptr<vtkTextActor>::New();
  second->SetInput(subtitle.c_str());
  style_text(*second->GetTextProperty(), 17, false);
  second->GetTextProperty()->SetVerticalJustificationToTop();
  second->SetDisplayPosition(static_cast<int>(0.02 * width_), static_cast<int>(height_ - 0.025 * height_ - 34));
  overlay_->AddActor2D(second);
}

std::vector<unsigned char> PictureScene::render_png() {
  // The triad's camera looks the same way as the scene's, from a fixed distance.
  vtkCamera* camera = triad_->GetActiveCamera();
  const Vector3& d = view_.direction;
  camera->SetFocalPoint(0, 0, 0);
  camera->SetPosition(-d[0] * 5, -d[1] * 5, -d[2] * 5);
  camera->SetViewUp(view_.view_up.data());
  camera->ParallelProjectionOn();
  triad_->ResetCamera();
  camera->Zoom(1.05);

  window_->Render();
  auto grab = Ptr<vtkWindowToImageFilter>::New();
  grab->SetInput(window_);
  grab->SetInputBufferTypeToRGB();
  grab->ReadFrontBufferOff();
  grab->Update();
  auto writer = Ptr<vtkPNGWriter>::New();
  writer->SetInputConnection(grab->GetOutputPort());
  writer->WriteToMemoryOn();
  writer->Write();
  vtkUnsignedCharArray* bytes = writer->GetResult();
  if (!bytes || bytes->GetNumberOfTuples() == 0) throw std::runtime_error("VTK rendered no picture");
  const unsigned char* data = bytes->GetPointer(0);
  return std::vector<unsigned char>(data, data + bytes->GetNumberOfTuples() * bytes->GetNumberOfComponents());
}

}  // namespace hearth
