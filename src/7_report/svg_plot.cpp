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

}  // namespace

std::string svg_line_chart(const PlotSpec& spec) {
  const double left = 80, right = 180, top = 40, bottom = 60;
  const double plot_w = spec.width - left - right, plot_h = spec.height - top - bottom;

  Range xr, yr;
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

  auto px = [&](double x) { return left + (x - xr.low) / (xr.high - xr.low) * plot_w; };
  auto py = [&](double y) {
    const double v = spec.log_y ? std::log10(y) : y;
    return top + (yr.high - v) / (yr.high - yr.low) * plot_h;
  };

  std::string svg = fmt::format(
      "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{}\" height=\"{}\" viewBox=\"0 0 {} {}\" "
      "font-family=\"sans-serif\" font-size=\"12\">\n"
      "<rect width=\"100%\" height=\"100%\" fill=\"white\"/>\n"
      "<text x=\"{}\" y=\"22\" font-size=\"15\" text-anchor=\"middle\">{}</text>\n",
      spec.width, spec.height, spec.width, spec.height, left + plot_w / 2, escape(spec.title));

  // Grid and ticks.
  const double xs = nice_step(xr.high - xr.low, 8);
  for (double x = std::ceil(xr.low / xs) * xs; x <= xr.high + 1e-9 * xs; x += xs) {
    svg += fmt::format("<line x1=\"{0:.2f}\" y1=\"{1}\" x2=\"{0:.2f}\" y2=\"{2}\" stroke=\"#e4e4e4\"/>\n"
                       "<text x=\"{0:.2f}\" y=\"{3}\" text-anchor=\"middle\">{4}</text>\n",
                       px(x), top, top + plot_h, top + plot_h + 16, tick_label(x));
  }
  if (spec.log_y) {
    for (double e = yr.low; e <= yr.high + 1e-9; e += 1.0) {
      const double y = top + (yr.high - e) / (yr.high - yr.low) * plot_h;
      svg += fmt::format("<line x1=\"{0}\" y1=\"{1:.2f}\" x2=\"{2}\" y2=\"{1:.2f}\" stroke=\"#e4e4e4\"/>\n"
                         "<text x=\"{3}\" y=\"{4:.2f}\" text-anchor=\"end\">{5}</text>\n",
                         left, y, left + plot_w, left - 6, y + 4, tick_label(std::pow(10.0, e)));
    }
  } else {
    const double ys = nice_step(yr.high - yr.low, 6);
    for (double y = std::ceil(yr.low / ys) * ys; y <= yr.high + 1e-9 * ys; y += ys) {
      svg += fmt::format("<line x1=\"{0}\" y1=\"{1:.2f}\" x2=\"{2}\" y2=\"{1:.2f}\" stroke=\"#e4e4e4\"/>\n"
                         "<text x=\"{3}\" y=\"{4:.2f}\" text-anchor=\"end\">{5}</text>\n",
                         left, py(y), left + plot_w, left - 6, py(y) + 4, tick_label(y));
    }
  }
  svg += fmt::format("<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"none\" "
                     "stroke=\"#444\"/>\n",
                     left, top, plot_w, plot_h);
  svg += fmt::format("<text x=\"{}\" y=\"{}\" text-anchor=\"middle\">{}</text>\n", left + plot_w / 2,
                     spec.height - 16, escape(spec.x_label));
  svg += fmt::format("<text x=\"18\" y=\"{0}\" text-anchor=\"middle\" transform=\"rotate(-90 18 {0})\">"
                     "{1}</text>\n",
                     top + plot_h / 2, escape(spec.y_label));

  // Guides, series and legend.
  for (const PlotGuide& g : spec.guides) {
    if (g.vertical)
      svg += fmt::format("<line x1=\"{0:.2f}\" y1=\"{1}\" x2=\"{0:.2f}\" y2=\"{2}\" stroke=\"{3}\" "
                         "stroke-dasharray=\"6 4\"/>\n<text x=\"{4:.2f}\" y=\"{5}\" fill=\"{3}\">{6}</text>\n",
                         px(g.at), top, top + plot_h, g.colour, px(g.at) + 4, top + 14, escape(g.label));
    else
      svg += fmt::format("<line x1=\"{0}\" y1=\"{1:.2f}\" x2=\"{2}\" y2=\"{1:.2f}\" stroke=\"{3}\" "
                         "stroke-dasharray=\"6 4\"/>\n<text x=\"{4}\" y=\"{5:.2f}\" fill=\"{3}\">{6}</text>\n",
                         left, py(g.at), left + plot_w, g.colour, left + 4, py(g.at) - 4, escape(g.label));
  }
  double legend_y = top + 10;
  for (const PlotSeries& s : spec.series) {
    std::string points;
    for (std::size_t i = 0; i < s.x.size() && i < s.y.size(); ++i) {
      if (spec.log_y && !(s.y[i] > 0)) continue;
      points += fmt::format("{:.2f},{:.2f} ", px(s.x[i]), py(s.y[i]));
    }
    svg += fmt::format("<polyline fill=\"none\" stroke=\"{}\" stroke-width=\"1.6\"{} points=\"{}\"/>\n",
                       s.colour, s.dashed ? " stroke-dasharray=\"5 3\"" : "", points);
    if (s.markers) {
      for (std::size_t i = 0; i < s.x.size() && i < s.y.size(); ++i) {
        if (spec.log_y && !(s.y[i] > 0)) continue;
        svg += fmt::format("<circle cx=\"{:.2f}\" cy=\"{:.2f}\" r=\"3\" fill=\"{}\"/>\n", px(s.x[i]),
                           py(s.y[i]), s.colour);
      }
    }
    svg += fmt::format("<line x1=\"{0}\" y1=\"{1}\" x2=\"{2}\" y2=\"{1}\" stroke=\"{3}\" stroke-width=\"2\"{4}/>\n"
                       "<text x=\"{5}\" y=\"{6}\">{7}</text>\n",
                       left + plot_w + 12, legend_y, left + plot_w + 36, s.colour,
                       s.dashed ? " stroke-dasharray=\"5 3\"" : "", left + plot_w + 42, legend_y + 4,
                       escape(s.label));
    legend_y += 18;
  }
  svg += "</svg>\n";
  return svg;
}

}  // namespace rungs::report
