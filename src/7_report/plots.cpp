// Building the waveform and error-against-N charts of a plan.
#include "7_report/plots.h"

#include <algorithm>
#include <set>

#include <fmt/format.h>

#include "6_emit/names.h"
#include "5_plan/verify.h"
#include "7_report/svg_plot.h"
#include "4_sim/error_measure.h"

namespace rungs::report {

namespace {

constexpr const char* kExactColour = "#1f5fa8";
constexpr const char* kLadderColour = "#d0641a";

PlotSeries series_of(const sim::Waveforms& w, const std::string& node, std::string label,
                     const char* colour, bool dashed) {
  PlotSeries s;
  s.label = std::move(label);
  s.colour = colour;
  s.dashed = dashed;
  if (const sim::NodeWaveform* v = sim::find_node(w, node)) {
    for (std::size_t i = 0; i < w.t.size(); ++i) {
      s.x.push_back(w.t[i] * 1e9);
      s.y.push_back(v->v[i]);
    }
  }
  return s;
}

}  // namespace

std::vector<PlotFile> plan_plots(const model::Circuit& circuit, const plan::Plan& plan) {
  std::vector<PlotFile> files;
  const sim::ReferenceOptions options = plan::reference_options(plan);
  sim::ResponseWorkspace workspace;
  const sim::Response exact = sim::exact_reference(circuit, options, &workspace);
  const std::vector<sim::LadderSpec> ladders = plan::ladder_specs(plan);
  const sim::LadderError measured =
      sim::measure_ladder_error(circuit, exact, ladders, options, &workspace);
  const sim::Waveforms exact_total = exact.total();
  const sim::Waveforms ladder_total = measured.ladder.total();

  std::set<std::string> drawn;
  for (const model::Load& load : circuit.loads) {
    if (!drawn.insert(load.node).second) continue;
    PlotSpec spec;
    spec.title = fmt::format("node {}: exact line and ladder", load.node);
    spec.x_label = "time (ns)";
    spec.y_label = "voltage (V)";
    spec.series = {series_of(exact_total, load.node, "exact line", kExactColour, false),
                   series_of(ladder_total, load.node, "ladder", kLadderColour, true)};
    files.push_back({fmt::format("waveform_{}.svg", emit::sanitize_name(load.node)),
                     svg_line_chart(spec)});
  }

  for (std::size_t k = 0; k < circuit.lines.size(); ++k) {
    const plan::LinePlan& lp = plan.lines[k];
    std::set<int> counts;
    for (double f : {0.25, 0.5, 0.75, 1.0, 1.25, 1.5, 2.0})
      counts.insert(std::max(1, static_cast<int>(lp.sections * f + 0.5)));
    PlotSeries curve;
    curve.label = "measured error";
    curve.colour = kExactColour;
    curve.markers = true;
    for (int n : counts) {
      std::vector<sim::LadderSpec> trial = ladders;
      trial[k].sections = n;
      const sim::LadderError e = sim::measure_ladder_error(circuit, exact, trial, options, &workspace);
      curve.x.push_back(n);
      curve.y.push_back(100.0 * e.line_errors[k]);
    }
    PlotSpec spec;
    spec.title = fmt::format("line {}: error against sections", circuit.lines[k].name);
    spec.x_label = fmt::format("sections ({} shape)", model::shape_name(lp.shape));
    spec.y_label = "error (% of the swing)";
    spec.log_y = true;
    spec.series = {curve};
    spec.guides = {PlotGuide{false, 100.0 * lp.tolerance,
                             fmt::format("budget {:g} %", 100.0 * lp.tolerance), "#c0392b"},
                   PlotGuide{true, static_cast<double>(lp.sections),
                             fmt::format("chosen N = {}", lp.sections), "#27ae60"}};
    files.push_back({fmt::format("error_{}.svg", emit::sanitize_name(circuit.lines[k].name)),
                     svg_line_chart(spec)});
  }
  return files;
}

}  // namespace rungs::report
