// Line charts as standalone SVG text, for waveform and error plots a browser shows as is.
#pragma once
#include <string>
#include <vector>

namespace rungs::report {

/// One curve: points (x, y) in the chart's units, drawn in `colour`.
struct PlotSeries {
  std::string label;
  std::string colour;  // any SVG colour, e.g. "#1f5fa8"
  std::vector<double> x;
  std::vector<double> y;
  bool markers = false;  // a dot at each point, for sparse data such as error against N
  bool dashed = false;
};

/// A horizontal or vertical reference line with its label (a budget, a chosen N).
struct PlotGuide {
  bool vertical = false;
  double at = 0.0;
  std::string label;
  std::string colour;
};

struct PlotSpec {
  std::string title;
  std::string x_label;  // with its unit, e.g. "time (ns)"
  std::string y_label;  // e.g. "voltage (V)"
  std::vector<PlotSeries> series;
  std::vector<PlotGuide> guides;
  bool log_y = false;   // logarithmic y axis (values must be positive)
  int width = 800;
  int height = 480;
};

/// The chart as a complete SVG document: axes with "nice" ticks (1, 2, 5 times a power of
/// ten), labels, a legend, the series and guides. Numbers are written locale-free, so the
/// same spec gives the same bytes.
std::string svg_line_chart(const PlotSpec& spec);

}  // namespace rungs::report
