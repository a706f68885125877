// A small fixed-layout SVG: frame, decade ticks, points, fitted line, labels.
#include "io/svg_plot.hpp"

#include <algorithm>
#include <cmath>
#include <sstream>

#include "io/atomic_file.hpp"

namespace hearth {

namespace {
std::string number(double v) {
  std::ostringstream s;
  s.precision(4);
  s << v;
  return s.str();
}
std::string escape(const std::string& text) {
  std::string out;
  for (char c : text) {
    if (c == '<') out += "&lt;";
    else if (c == '>') out += "&gt;";
    else if (c == '&') out += "&amp;";
    else out += c;
  }
  return out;
}
}  // namespace

void write_convergence_svg(const std::filesystem::path& path, const ConvergencePlot& plot) {
  const double W = 640, H = 440, left = 90, right = 30, top = 50, bottom = 70;
  const bool with_error = std::isfinite(plot.extrapolated);
  std::vector<double> x, y;
  for (std::size_t k = 0; k < plot.h.size(); ++k) {
    const double yv = with_error ? std::abs(plot.values[k] - plot.extrapolated) : plot.values[k];
    if (plot.h[k] <= 0 || (with_error && !(yv > 0))) continue;
    x.push_back(std::log10(plot.h[k]));
    y.push_back(with_error ? std::log10(yv) : yv);
  }
  std::ostringstream svg;
  svg << "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"" << W << "\" height=\"" << H
      << "\" font-family=\"sans-serif\" font-size=\"13\">\n<rect width=\"100%\" height=\"100%\" fill=\"white\"/>\n";
  svg << "<text x=\"" << W / 2 << "\" y=\"28\" text-anchor=\"middle\" font-size=\"16\">" << escape(plot.title)
      << "</text>\n";
  if (!x.empty()) {
    double x0 = *std::min_element(x.begin(), x.end()), x1 = *std::max_element(x.begin(), x.end());
    double y0 = *std::min_element(y.begin(), y.end()), y1 = *std::max_element(y.begin(), y.end());
    if (x1 - x0 < 1e-12) x0 -= 0.5, x1 += 0.5;
    if (y1 - y0 < 1e-12 * std::max(1.0, std::abs(y0))) y0 -= 0.5, y1 += 0.5;
    const double px = (x1 - x0) * 0.1, py = (y1 - y0) * 0.1;
    x0 -= px, x1 += px, y0 -= py, y1 += py;
    auto sx = [&](double v) { return left + (v - x0) / (x1 - x0) * (W - left - right); };
    auto sy = [&](double v) { return H - bottom - (v - y0) / (y1 - y0) * (H - top - bottom); };
    svg << "<rect x=\"" << left << "\" y=\"" << top << "\" width=\"" << W - left - right << "\" height=\""
        << H - top - bottom << "\" fill=\"none\" stroke=\"black\"/>\n";
    for (int k = 0; k <= 4; ++k) {  // ticks: labels in data units
      const double xv = x0 + (x1 - x0) * k / 4, yv = y0 + (y1 - y0) * k / 4;
      svg << "<text x=\"" << sx(xv) << "\" y=\"" << H - bottom + 18 << "\" text-anchor=\"middle\">"
          << number(std::pow(10.0, xv)) << "</text>\n";
      svg << "<text x=\"" << left - 6 << "\" y=\"" << sy(yv) + 4 << "\" text-anchor=\"end\">"
          << number(with_error ? std::pow(10.0, yv) : yv) << "</text>\n";
    }
    svg << "<text x=\"" << (left + W - right) / 2 << "\" y=\"" << H - 20
        << "\" text-anchor=\"middle\">cell size h (" << escape(plot.length_unit) << "), log scale</text>\n";
    svg << "<text transform=\"translate(22," << (top + H - bottom) / 2 << ") rotate(-90)\" text-anchor=\"middle\">"
        << (with_error ? "|value - extrapolated| (" + escape(plot.unit) + "), log scale"
                       : "value (" + escape(plot.unit) + ")")
        << "</text>\n";
    if (with_error && std::isfinite(plot.observed_order) && x.size() >= 2) {
      // Line of the observed slope through the finest point.
      const std::size_t f = std::min_element(x.begin(), x.end()) - x.begin();
      const double xa = x0, xb = x1;
      const double ya = y[f] + plot.observed_order * (xa - x[f]), yb = y[f] + plot.observed_order * (xb - x[f]);
      svg << "<line x1=\"" << sx(xa) << "\" y1=\"" << sy(ya) << "\" x2=\"" << sx(xb) << "\" y2=\"" << sy(yb)
          << "\" stroke=\"#0072b2\" stroke-dasharray=\"6 4\"/>\n";
      svg << "<text x=\"" << W - right - 8 << "\" y=\"" << top + 18 << "\" text-anchor=\"end\" fill=\"#0072b2\">"
          << "observed order " << number(plot.observed_order) << "</text>\n";
    }
    for (std::size_t k = 0; k < x.size(); ++k)
      svg << "<circle cx=\"" << sx(x[k]) << "\" cy=\"" << sy(y[k]) << "\" r=\"5\" fill=\"#d55e00\"/>\n";
  }
  svg << "</svg>\n";
  write_text_file(path, svg.str());
}

}  // namespace hearth
