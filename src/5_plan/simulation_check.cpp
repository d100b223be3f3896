// Measuring a simulator's run of the deck against the exact line and the planned ladder.
#include "5_plan/simulation_check.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <stdexcept>

#include <fmt/format.h>

#include "4_sim/error_measure.h"

namespace rungs::plan {

namespace {

/// The simulator's time and the voltage of `node`; throws std::invalid_argument when absent.
std::pair<const std::vector<double>*, const std::vector<double>*> simulated_node(
    const sim::RawPlot& plot, const std::string& node) {
  const std::vector<double>* time = plot.find("time");
  if (!time || time->empty())
    throw std::invalid_argument(
        fmt::format("the simulator's plot '{}' has no time points", plot.name));
  const std::vector<double>* v = plot.find(node);
  if (!v)
    throw std::invalid_argument(
        fmt::format("the simulator's results hold no v({}), which the deck saves", node));
  return {time, v};
}

double budget_at(const model::Circuit& circuit, const Plan& plan, const std::string& node) {
  double budget = std::numeric_limits<double>::infinity();
  for (std::size_t k = 0; k < circuit.lines.size() && k < plan.lines.size(); ++k)
    if (circuit.lines[k].near == node || circuit.lines[k].far == node)
      budget = std::min(budget, plan.lines[k].tolerance);
  return std::isfinite(budget) ? budget : circuit.settings.tolerance;
}

}  // namespace

SimulationVerdict verdict_of(const SimulatedEnd& end) {
  if (end.simulated_error <= end.budget) return SimulationVerdict::within;
  return end.simulation_error > kSimulationShare * end.budget ? SimulationVerdict::simulation_over
                                                              : SimulationVerdict::ladder_over;
}

std::vector<SimulatedEnd> compare_simulation(const model::Circuit& circuit, const Plan& plan,
                                             const std::vector<EndTraces>& traces,
                                             const sim::RawPlot& plot) {
  std::vector<SimulatedEnd> out;
  for (const EndTraces& end : traces) {
    if (!(end.swing > 0.0)) continue;
    const auto [time, v] = simulated_node(plot, end.node);
    const std::vector<double> simulated = sim::interpolate_linear(*time, *v, end.t);
    SimulatedEnd s;
    s.node = end.node;
    s.simulated_error = sim::compare_waveforms(end.t, end.exact, simulated, end.swing).error;
    s.ladder_error = sim::compare_waveforms(end.t, end.exact, end.ladder, end.swing).error;
    const sim::WaveformError added =
        sim::compare_waveforms(end.t, end.ladder, simulated, end.swing);
    s.simulation_error = added.error;
    s.simulation_at = added.at;
    s.budget = budget_at(circuit, plan, end.node);
    out.push_back(std::move(s));
  }
  return out;
}

void add_simulated(PlanCurves& curves, const sim::RawPlot& plot) {
  for (NodeTraces& traces : curves.loads) {
    const auto [time, v] = simulated_node(plot, traces.node);
    traces.simulated = sim::interpolate_linear(*time, *v, traces.t);
  }
}

double suggested_step(const SimulatedEnd& end, double step) {
  if (!(end.simulation_error > 0.0)) return step;
  const double wanted = 0.8 * step * kSimulationShare * end.budget / end.simulation_error;
  const double scale = std::pow(10.0, std::floor(std::log10(wanted)) - 1.0);
  return std::floor(wanted / scale) * scale;
}

}  // namespace rungs::plan
