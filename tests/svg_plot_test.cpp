// SVG charts: well-formed documents with labelled axes, nice ticks and every series drawn.
#include <catch2/catch.hpp>

#include <regex>

#include "7_report/svg_plot.h"

using namespace rungs::report;

namespace {
PlotSpec ramp_chart() {
  PlotSpec spec;
  spec.title = "far end <rx1>";
  spec.x_label = "time (ns)";
  spec.y_label = "voltage (V)";
  PlotSeries exact;
  exact.label = "exact line";
  exact.colour = "#1f5fa8";
  PlotSeries ladder;
  ladder.label = "ladder";
  ladder.colour = "#d0641a";
  for (int i = 0; i <= 100; ++i) {
    exact.x.push_back(i * 0.1);
    exact.y.push_back(i < 50 ? 0.0 : 3.3);
    ladder.x.push_back(i * 0.1);
    ladder.y.push_back(i < 50 ? 0.01 : 3.25);
  }
  spec.series = {exact, ladder};
  spec.guides = {PlotGuide{false, 3.3, "source level", "#888"}};
  return spec;
}
int count(const std::string& text, const std::string& what) {
  int n = 0;
  for (std::size_t at = text.find(what); at != std::string::npos; at = text.find(what, at + 1)) ++n;
  return n;
}
}  // namespace

TEST_CASE("a chart is one SVG document with its labels escaped") {
  const std::string svg = svg_line_chart(ramp_chart());
  CHECK(svg.rfind("<svg xmlns=\"http://www.w3.org/2000/svg\"", 0) == 0);
  CHECK(svg.substr(svg.size() - 7) == "</svg>\n");
  CHECK(svg.find("far end &lt;rx1&gt;") != std::string::npos);
  CHECK(svg.find(">time (ns)</text>") != std::string::npos);
  CHECK(svg.find(">voltage (V)</text>") != std::string::npos);
  CHECK(count(svg, "<polyline") == 2);
  CHECK(svg.find(">exact line</text>") != std::string::npos);
  CHECK(svg.find(">source level</text>") != std::string::npos);
}

TEST_CASE("ticks fall on 1, 2 or 5 times a power of ten") {
  const std::string svg = svg_line_chart(ramp_chart());
  // x runs 0..10 ns: ticks every 2 (10/8 rounds up to 2).
  for (const char* tick : {">0</text>", ">2</text>", ">4</text>", ">6</text>", ">8</text>", ">10</text>"})
    CHECK(svg.find(tick) != std::string::npos);
  CHECK(svg.find(">1.25</text>") == std::string::npos);
}

TEST_CASE("a logarithmic axis labels its decades and skips values it cannot show") {
  PlotSpec spec;
  spec.log_y = true;
  PlotSeries s;
  s.label = "error";
  s.colour = "#000";
  s.x = {1, 2, 3, 4};
  s.y = {0.5, 0.05, 0.0, 0.002};
  s.markers = true;
  spec.series = {s};
  const std::string svg = svg_line_chart(spec);
  CHECK(svg.find(">0.001</text>") != std::string::npos);
  CHECK(svg.find(">1</text>") != std::string::npos);
  CHECK(count(svg, "<circle") == 3);  // the zero has no place on a log axis
}

TEST_CASE("the same chart gives the same bytes") {
  CHECK(svg_line_chart(ramp_chart()) == svg_line_chart(ramp_chart()));
}
