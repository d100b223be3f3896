// Drawing line charts as SVG: scales, ticks, axes, legend.
#include "7_report/svg_plot.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include <fmt/format.h>

namespace rungs::report {

namespace {

struct Range {
  double low = std::numeric_limits<double>::infinity();
  double high = -std::numeric_limits<double>::infinity();
  void take(double v) {
    if (!std::isfinite(v)) return;
    low = std::min(low, v);
    high = std::max(high, v);
  }
  bool empty() const { return !(low <= high); }
};

/// Tick spacing of 1, 2 or 5 times a power of ten giving about `count` ticks over the span.
double nice_step(double span, int count) {
  const double raw = span / count;
  const double power = std::pow(10.0, std::floor(std::log10(raw)));
  for (double m : {1.0, 2.0, 5.0})
    if (m * power >= raw) return m * power;
  return 10.0 * power;
}

std::string escape(std::string_view text) {
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

std::string tick_label(double v) { return fmt::format("{:.6g}", std::abs(v) < 1e-12 ? 0.0 : v); }

/// Where the plot area sits in the picture and what it spans, with the maps from data to
/// picture coordinates.
struct Frame {
  double left = 80, right = 180, top = 40, bottom = 60;
  double plot_w = 0, plot_h = 0;
  Range xr, yr;  // yr in log10 units on a logarithmic axis
  bool log_y = false;
  double px(double x) const { return left + (x - xr.low) / (xr.high - xr.low) * plot_w; }
  double py(double y) const { return py_scaled(log_y ? std::log10(y) : y); }
  double py_scaled(double v) const { return top + (yr.high - v) / (yr.high - yr.low) * plot_h; }
};

Frame frame_for(const PlotSpec& spec) {
  Frame f;
  f.plot_w = spec.width - f.left - f.right;
  f.plot_h = spec.height - f.top - f.bottom;
  f.log_y = spec.log_y;
  Range& xr = f.xr;
  Range& yr = f.yr;
  for (const PlotSeries& s : spec.series) {
    for (double x : s.x) xr.take(x);
    for (double y : s.y)
      if (!spec.log_y || y > 0) yr.take(spec.log_y ? std::log10(y) : y);
  }
  for (const PlotGuide& g : spec.guides) {
    if (g.vertical) xr.take(g.at);
    else yr.take(spec.log_y ? std::log10(g.at) : g.at);
  }
  if (xr.empty()) xr = {0.0, 1.0};
  if (yr.empty()) yr = {0.0, 1.0};
  if (xr.high == xr.low) xr.high = xr.low + 1.0;
  if (yr.high == yr.low) yr = {yr.low - 0.5, yr.high + 0.5};
  const double y_pad = 0.05 * (yr.high - yr.low);
  if (!spec.log_y) yr = {yr.low - y_pad, yr.high + y_pad};
  else yr = {std::floor(yr.low), std::ceil(yr.high)};
  return f;
}

/// Grid lines with their tick labels: 1-2-5 steps, decades on a logarithmic axis.
std::string grid(const Frame& f) {
  std::string svg;
  const double xs = nice_step(f.xr.high - f.xr.low, 8);
  for (double x = std::ceil(f.xr.low / xs) * xs; x <= f.xr.high + 1e-9 * xs; x += xs) {
    svg += fmt::format("<line x1=\"{0:.2f}\" y1=\"{1}\" x2=\"{0:.2f}\" y2=\"{2}\" stroke=\"#e4e4e4\"/>\n"
                       "<text x=\"{0:.2f}\" y=\"{3}\" text-anchor=\"middle\">{4}</text>\n",
                       f.px(x), f.top, f.top + f.plot_h, f.top + f.plot_h + 16, tick_label(x));
  }
  auto y_tick = [&](double y_pic, double value) {
    svg += fmt::format("<line x1=\"{0}\" y1=\"{1:.2f}\" x2=\"{2}\" y2=\"{1:.2f}\" stroke=\"#e4e4e4\"/>\n"
                       "<text x=\"{3}\" y=\"{4:.2f}\" text-anchor=\"end\">{5}</text>\n",
                       f.left, y_pic, f.left + f.plot_w, f.left - 6, y_pic + 4, tick_label(value));
  };
  if (f.log_y) {
    for (double e = f.yr.low; e <= f.yr.high + 1e-9; e += 1.0) y_tick(f.py_scaled(e), std::pow(10.0, e));
  } else {
    const double ys = nice_step(f.yr.high - f.yr.low, 6);
    for (double y = std::ceil(f.yr.low / ys) * ys; y <= f.yr.high + 1e-9 * ys; y += ys)
      y_tick(f.py(y), y);
  }
  return svg;
}

/// The plot area's border and the two axis labels.
std::string axes(const Frame& f, const PlotSpec& spec) {
  std::string svg = fmt::format("<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"none\" "
                                "stroke=\"#444\"/>\n",
                                f.left, f.top, f.plot_w, f.plot_h);
  svg += fmt::format("<text x=\"{}\" y=\"{}\" text-anchor=\"middle\">{}</text>\n", f.left + f.plot_w / 2,
                     spec.height - 16, escape(spec.x_label));
  svg += fmt::format("<text x=\"18\" y=\"{0}\" text-anchor=\"middle\" transform=\"rotate(-90 18 {0})\">"
                     "{1}</text>\n",
                     f.top + f.plot_h / 2, escape(spec.y_label));
  return svg;
}

std::string guide(const Frame& f, const PlotGuide& g) {
  if (g.vertical)
    return fmt::format("<line x1=\"{0:.2f}\" y1=\"{1}\" x2=\"{0:.2f}\" y2=\"{2}\" stroke=\"{3}\" "
                       "stroke-dasharray=\"6 4\"/>\n<text x=\"{4:.2f}\" y=\"{5}\" fill=\"{3}\">{6}</text>\n",
                       f.px(g.at), f.top, f.top + f.plot_h, g.colour, f.px(g.at) + 4, f.top + 14,
                       escape(g.label));
  return fmt::format("<line x1=\"{0}\" y1=\"{1:.2f}\" x2=\"{2}\" y2=\"{1:.2f}\" stroke=\"{3}\" "
                     "stroke-dasharray=\"6 4\"/>\n<text x=\"{4}\" y=\"{5:.2f}\" fill=\"{3}\">{6}</text>\n",
                     f.left, f.py(g.at), f.left + f.plot_w, g.colour, f.left + 4, f.py(g.at) - 4,
                     escape(g.label));
}

/// One series as a polyline (with dots if asked) and its legend entry at `legend_y`.
std::string series(const Frame& f, const PlotSeries& s, double legend_y) {
  std::string points;
  for (std::size_t i = 0; i < s.x.size() && i < s.y.size(); ++i) {
    if (f.log_y && !(s.y[i] > 0)) continue;
    points += fmt::format("{:.2f},{:.2f} ", f.px(s.x[i]), f.py(s.y[i]));
  }
  std::string svg = fmt::format("<polyline fill=\"none\" stroke=\"{}\" stroke-width=\"1.6\"{} points=\"{}\"/>\n",
                                s.colour, s.dashed ? " stroke-dasharray=\"5 3\"" : "", points);
  if (s.markers) {
    for (std::size_t i = 0; i < s.x.size() && i < s.y.size(); ++i) {
      if (f.log_y && !(s.y[i] > 0)) continue;
      svg += fmt::format("<circle cx=\"{:.2f}\" cy=\"{:.2f}\" r=\"3\" fill=\"{}\"/>\n", f.px(s.x[i]),
                         f.py(s.y[i]), s.colour);
    }
  }
  const double legend_x = f.left + f.plot_w;
  svg += fmt::format("<line x1=\"{0}\" y1=\"{1}\" x2=\"{2}\" y2=\"{1}\" stroke=\"{3}\" stroke-width=\"2\"{4}/>\n"
                     "<text x=\"{5}\" y=\"{6}\">{7}</text>\n",
                     legend_x + 12, legend_y, legend_x + 36, s.colour,
                     s.dashed ? " stroke-dasharray=\"5 3\"" : "", legend_x + 42, legend_y + 4,
                     escape(s.label));
  return svg;
}

}  // namespace

std::string svg_line_chart(const PlotSpec& spec) {
  const Frame f = frame_for(spec);
  std::string svg = fmt::format(
      "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{}\" height=\"{}\" viewBox=\"0 0 {} {}\" "
      "font-family=\"sans-serif\" font-size=\"12\">\n"
      "<rect width=\"100%\" height=\"100%\" fill=\"white\"/>\n"
      "<text x=\"{}\" y=\"22\" font-size=\"15\" text-anchor=\"middle\">{}</text>\n",
      spec.width, spec.height, spec.width, spec.height, f.left + f.plot_w / 2, escape(spec.title));
  svg += grid(f);
  svg += axes(f, spec);
  for (const PlotGuide& g : spec.guides) svg += guide(f, g);
  double legend_y = f.top + 10;
  for (const PlotSeries& s : spec.series) {
    svg += series(f, s, legend_y);
    legend_y += 18;
  }
  svg += "</svg>\n";
  return svg;
}

}  // namespace rungs::report
