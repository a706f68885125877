// SVG text building; coordinates written with two decimals (a hundredth of a pixel).
#include "io/svg_canvas.hpp"

#include <cmath>
#include <cstdio>

#include "io/nice_numbers.hpp"

namespace hearth {

namespace {

std::string px(double v) {
  char text[32];
  std::snprintf(text, sizeof text, "%.2f", v);
  return text;
}

std::string full(double v) {
  char text[40];
  std::snprintf(text, sizeof text, "%.17g", v);
  return text;
}

}  // namespace

const std::vector<std::string>& series_colours() {
  static const std::vector<std::string> colours = {"#D55E00", "#0072B2", "#009E73", "#CC79A7",
                                                   "#E69F00", "#56B4E9", "#000000", "#F0E442"};
  return colours;
}

std::string xml_escape(const std::string& text) {
  std::string out;
  for (char c : text) {
    switch (c) {
      case '<': out += "&lt;"; break;
      case '>': out += "&gt;"; break;
      case '&': out += "&amp;"; break;
      case '"': out += "&quot;"; break;
      default: out += c;
    }
  }
  return out;
}

std::pair<double, double> padded_range(double low, double high, double margin) {
  if (!(high > low)) {
    const double half = std::max(1e-9, 0.05 * std::abs(low));
    return {low - half, high + half};
  }
  const double pad = margin * (high - low);
  return {low - pad, high + pad};
}

SvgCanvas::SvgCanvas(double width, double height, const std::string& title) : width_(width), height_(height) {
  body_ << "<rect width=\"100%\" height=\"100%\" fill=\"white\"/>\n";
  text(width / 2, 24, title, "middle", 15, "#111");
}

void SvgCanvas::begin_panel(const PlotPanel& p, const std::string& x_label, const std::string& y_label,
                            const std::string& name) {
  body_ << "<g class=\"panel\" data-name=\"" << xml_escape(name) << "\" data-x-min=\"" << full(p.x_min)
        << "\" data-x-max=\"" << full(p.x_max) << "\" data-y-min=\"" << full(p.y_min) << "\" data-y-max=\""
        << full(p.y_max) << "\" data-left=\"" << full(p.left) << "\" data-top=\"" << full(p.top)
        << "\" data-width=\"" << full(p.width) << "\" data-height=\"" << full(p.height) << "\">\n";
  for (double x : nice_ticks(p.x_min, p.x_max, 6)) {
    body_ << "<line x1=\"" << px(p.px(x)) << "\" y1=\"" << px(p.top) << "\" x2=\"" << px(p.px(x)) << "\" y2=\""
          << px(p.top + p.height) << "\" stroke=\"#e3e3e3\"/>\n";
    text(p.px(x), p.top + p.height + 16, short_number(x, 6), "middle", 12);
  }
  for (double y : nice_ticks(p.y_min, p.y_max, 5)) {
    body_ << "<line x1=\"" << px(p.left) << "\" y1=\"" << px(p.py(y)) << "\" x2=\"" << px(p.left + p.width)
          << "\" y2=\"" << px(p.py(y)) << "\" stroke=\"#e3e3e3\"/>\n";
    text(p.left - 6, p.py(y) + 4, short_number(y, 6), "end", 12);
  }
  body_ << "<rect x=\"" << px(p.left) << "\" y=\"" << px(p.top) << "\" width=\"" << px(p.width) << "\" height=\""
        << px(p.height) << "\" fill=\"none\" stroke=\"#333\"/>\n";
  if (!x_label.empty()) text(p.left + p.width / 2, p.top + p.height + 34, x_label, "middle", 13);
  body_ << "<text transform=\"translate(" << px(p.left - 58) << "," << px(p.top + p.height / 2)
        << ") rotate(-90)\" text-anchor=\"middle\" font-size=\"13\" fill=\"#222\">" << xml_escape(y_label)
        << "</text>\n";
}

void SvgCanvas::end_panel() { body_ << "</g>\n"; }

void SvgCanvas::polyline(const PlotPanel& p, const std::vector<std::pair<double, double>>& points,
                         const std::string& colour, const std::string& cls) {
  if (points.empty()) return;
  body_ << "<polyline class=\"series " << cls << "\" data-points=\"" << points.size() << "\" fill=\"none\" stroke=\""
        << colour << "\" stroke-width=\"2\" stroke-linejoin=\"round\" points=\"";
  for (std::size_t k = 0; k < points.size(); ++k)
    body_ << (k ? " " : "") << px(p.px(points[k].first)) << "," << px(p.py(points[k].second));
  body_ << "\"/>\n";
  if (points.size() == 1)  // a lone point would not show as a line
    body_ << "<circle class=\"lone " << cls << "\" cx=\"" << px(p.px(points[0].first)) << "\" cy=\""
          << px(p.py(points[0].second)) << "\" r=\"3\" fill=\"" << colour << "\"/>\n";
}

void SvgCanvas::vertical_marker(const PlotPanel& p, double x, const std::string& cls) {
  body_ << "<line class=\"" << cls << "\" data-x=\"" << full(x) << "\" x1=\"" << px(p.px(x)) << "\" y1=\""
        << px(p.top) << "\" x2=\"" << px(p.px(x)) << "\" y2=\"" << px(p.top + p.height)
        << "\" stroke=\"#555\" stroke-dasharray=\"5 4\"/>\n";
}

void SvgCanvas::text(double x, double y, const std::string& t, const std::string& anchor, int size,
                     const std::string& colour) {
  body_ << "<text x=\"" << px(x) << "\" y=\"" << px(y) << "\" text-anchor=\"" << anchor << "\" font-size=\"" << size
        << "\" fill=\"" << colour << "\">" << xml_escape(t) << "</text>\n";
}

void SvgCanvas::legend(double x, double y, const std::vector<std::pair<std::string, std::string>>& entries) {
  double at = x;
  for (const auto& [label, colour] : entries) {
    body_ << "<line x1=\"" << px(at) << "\" y1=\"" << px(y - 4) << "\" x2=\"" << px(at + 22) << "\" y2=\""
          << px(y - 4) << "\" stroke=\"" << colour << "\" stroke-width=\"3\"/>\n";
    text(at + 28, y, label, "start", 12);
    at += 40 + 7.0 * static_cast<double>(label.size());
  }
}

std::string SvgCanvas::str() const {
  std::ostringstream out;
  out << "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"" << px(width_) << "\" height=\"" << px(height_)
      << "\" viewBox=\"0 0 " << px(width_) << " " << px(height_)
      << "\" font-family=\"DejaVu Sans, Arial, sans-serif\">\n"
      << body_.str() << "</svg>\n";
  return out.str();
}

}  // namespace hearth
