// Drawing the waveform and error-against-N charts of a plan from its measured curves.
#include "7_report/plots.h"

#include <fmt/format.h>

#include "6_emit/names.h"
#include "7_report/svg_plot.h"

namespace rungs::report {

namespace {

constexpr const char* kExactColour = "#1f5fa8";
constexpr const char* kLadderColour = "#d0641a";
constexpr const char* kSimulatedColour = "#2e8b3a";

PlotSeries series_of(const plan::NodeTraces& traces, const std::vector<double>& v,
                     std::string label, const char* colour, bool dashed) {
  PlotSeries s;
  s.label = std::move(label);
  s.colour = colour;
  s.dashed = dashed;
  for (std::size_t i = 0; i < traces.t.size() && i < v.size(); ++i) {
    s.x.push_back(traces.t[i] * 1e9);
    s.y.push_back(v[i]);
  }
  return s;
}

PlotFile waveform_chart(const plan::NodeTraces& traces) {
  PlotSpec spec;
  spec.title = fmt::format("node {}: exact line and ladder", traces.node);
  spec.x_label = "time (ns)";
  spec.y_label = "voltage (V)";
  spec.series = {series_of(traces, traces.exact, "exact line", kExactColour, false),
                 series_of(traces, traces.ladder, "ladder", kLadderColour, true)};
  if (!traces.simulated.empty()) {
    spec.title = fmt::format("node {}: exact line, ladder and the simulator's run", traces.node);
    spec.series.push_back(series_of(traces, traces.simulated, "simulator", kSimulatedColour, true));
  }
  return {fmt::format("waveform_{}.svg", emit::sanitize_name(traces.node)), svg_line_chart(spec)};
}

PlotFile error_chart(const model::Line& line, const plan::LinePlan& lp,
                     const plan::ErrorCurve& measured, const plan::LineVerdict* verdict) {
  PlotSeries curve;
  curve.label = "measured error";
  curve.colour = kExactColour;
  curve.markers = true;
  for (std::size_t i = 0; i < measured.sections.size(); ++i) {
    curve.x.push_back(measured.sections[i]);
    curve.y.push_back(100.0 * measured.error[i]);
  }
  PlotSpec spec;
  spec.title = fmt::format("line {}: error against sections", line.name);
  spec.x_label = fmt::format("sections ({} shape)", model::shape_name(lp.shape));
  spec.y_label = "error (% of the swing)";
  spec.log_y = true;
  spec.series = {curve};
  spec.guides = {PlotGuide{false, 100.0 * lp.tolerance,
                           fmt::format("budget {:g} %", 100.0 * lp.tolerance), "#c0392b"},
                 PlotGuide{true, static_cast<double>(lp.sections),
                           fmt::format("chosen N = {}", lp.sections), "#27ae60"}};
  if (verdict && verdict->share > 0.0)
    spec.guides.push_back(PlotGuide{false, 100.0 * verdict->share,
                                    fmt::format("share {:.3g} % at {}", 100.0 * verdict->share,
                                                verdict->share_node),
                                    "#8e44ad"});
  return {fmt::format("error_{}.svg", emit::sanitize_name(line.name)), svg_line_chart(spec)};
}

}  // namespace

std::vector<PlotFile> plan_plots(const model::Circuit& circuit, const plan::Plan& plan,
                                 const plan::PlanCurves& curves,
                                 const plan::Verification* verification) {
  std::vector<PlotFile> files;
  for (const plan::NodeTraces& traces : curves.loads) files.push_back(waveform_chart(traces));
  for (std::size_t k = 0; k < circuit.lines.size() && k < curves.lines.size(); ++k)
    files.push_back(error_chart(circuit.lines[k], plan.lines[k], curves.lines[k],
                                verification ? &verification->lines[k] : nullptr));
  return files;
}

}  // namespace rungs::report
