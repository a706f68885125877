// A small SVG writer for the report's plots: frames with round ticks, polylines, text.
// Each plot panel carries its data ranges and pixel box as data-* attributes, so that a
// reader can turn the drawn points back into values.
#pragma once

#include <sstream>
#include <string>
#include <utility>
#include <vector>

namespace hearth {

// Colours of Okabe & Ito's colour-blind-safe palette (Color Universal Design, 2008),
// for plotted series, in order.
const std::vector<std::string>& series_colours();

std::string xml_escape(const std::string& text);

// A panel: data ranges mapped onto a pixel box.
struct PlotPanel {
  double x_min = 0, x_max = 1, y_min = 0, y_max = 1;  // data
  double left = 0, top = 0, width = 100, height = 100;  // pixels
  double px(double x) const { return left + (x - x_min) / (x_max - x_min) * width; }
  double py(double y) const { return top + height - (y - y_min) / (y_max - y_min) * height; }
};

// Data range [low, high] widened by a margin and made non-empty.
std::pair<double, double> padded_range(double low, double high, double margin = 0.05);

class SvgCanvas {
 public:
  SvgCanvas(double width, double height, const std::string& title);

  // Frame, round ticks and grid of a panel, with axis labels; opens a <g class="panel">
  // carrying the panel's data-* attributes, closed by end_panel().
  void begin_panel(const PlotPanel& panel, const std::string& x_label, const std::string& y_label,
                   const std::string& name);
  void end_panel();
  // A series of points as one polyline (class "series <cls>", data-points = count).
  void polyline(const PlotPanel& panel, const std::vector<std::pair<double, double>>& points,
                const std::string& colour, const std::string& cls);
  // A vertical line across the panel at data x, dashed, with class and data-x.
  void vertical_marker(const PlotPanel& panel, double x, const std::string& cls);
  void text(double x, double y, const std::string& text, const std::string& anchor = "start", int size = 13,
            const std::string& colour = "#222");
  void legend(double x, double y, const std::vector<std::pair<std::string, std::string>>& entries);

  std::string str() const;  // the whole SVG document

 private:
  double width_, height_;
  std::ostringstream body_;
};

}  // namespace hearth
