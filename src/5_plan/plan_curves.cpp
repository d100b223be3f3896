// Measuring the waveforms and error-against-N curves that a plan's charts draw.
#include "5_plan/plan_curves.h"

#include <algorithm>
#include <set>

#include "4_sim/error_measure.h"
#include "5_plan/verify.h"

namespace rungs::plan {

namespace {

NodeTraces traces_at(const std::string& node, const sim::Waveforms& exact,
                     const sim::Waveforms& ladder) {
  NodeTraces traces{.node = node, .t = exact.t, .exact = {}, .ladder = {}, .simulated = {}};
  if (const sim::NodeWaveform* v = sim::find_node(exact, node)) traces.exact = v->v;
  if (const sim::NodeWaveform* v = sim::find_node(ladder, node)) traces.ladder = v->v;
  return traces;
}

}  // namespace

PlanCurves measure_plan_curves(const model::Circuit& circuit, const Plan& plan) {
  PlanCurves curves;
  const sim::ReferenceOptions options = reference_options(plan);
  sim::ResponseWorkspace workspace;
  const sim::Response exact = sim::exact_reference(circuit, options, &workspace);
  const std::vector<sim::LadderSpec> ladders = ladder_specs(plan);
  const sim::LadderMeasurement measured =
      sim::measure_ladder_error(circuit, exact, ladders, options, &workspace);
  const sim::Waveforms exact_total = exact.total();
  const sim::Waveforms ladder_total = measured.ladder.total();

  std::set<std::string> seen;
  for (const model::Load& load : circuit.loads)
    if (seen.insert(load.node).second)
      curves.loads.push_back(traces_at(load.node, exact_total, ladder_total));

  for (std::size_t k = 0; k < circuit.lines.size(); ++k) {
    std::set<int> counts;
    for (double f : {0.25, 0.5, 0.75, 1.0, 1.25, 1.5, 2.0})
      counts.insert(std::max(1, static_cast<int>(plan.lines[k].sections * f + 0.5)));
    ErrorCurve curve;
    for (int n : counts) {
      std::vector<sim::LadderSpec> trial = ladders;
      trial[k].sections = n;
      const sim::LadderMeasurement e =
          sim::measure_ladder_error(circuit, exact, trial, options, &workspace);
      curve.sections.push_back(n);
      curve.error.push_back(e.line_errors[k]);
    }
    curves.lines.push_back(std::move(curve));
  }
  return curves;
}

}  // namespace rungs::plan
