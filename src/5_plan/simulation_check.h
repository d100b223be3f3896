// The simulator in the loop: a simulator's run of the deck against the exact line and the ladder.
#pragma once
#include <string>
#include <vector>

#include "3_model/circuit.h"
#include "4_sim/raw_file.h"
#include "5_plan/end_traces.h"
#include "5_plan/plan.h"
#include "5_plan/plan_curves.h"

namespace rungs::plan {

/// One line end of a simulated deck, as fractions of the swing of its part (EndTraces::swing).
/// The simulator's waveform is compared on the exact reference's uniform grid, onto which it is
/// interpolated linearly from the simulator's own (uneven) time points.
struct SimulatedEnd {
  std::string node;
  double simulated_error = 0.0;   // max |v_simulated - v_exact|: what a user of the deck sees
  double ladder_error = 0.0;      // max |v_ladder - v_exact|: the ladder's own, as check measures
  double simulation_error = 0.0;  // max |v_simulated - v_ladder|: what the simulation added
  double simulation_at = 0.0;     // s, where that largest difference falls
  double budget = 0.0;            // the smallest tolerance of the lines that end here
};

/// Which part of a simulated end's error is over, if any.
enum class SimulationVerdict {
  within,           // simulated_error <= budget
  simulation_over,  // over, and the simulation adds more than its share (kSimulationShare)
  ladder_over,      // over, and the ladder leaves the simulation less than its share
};

SimulationVerdict verdict_of(const SimulatedEnd& end);

/// Compares a simulator's transient plot with the check's traces (Verification::end_traces
/// of the same circuit and plan), end by end; ends whose part has no source are left out.
/// Throws std::invalid_argument when the plot lacks the time or a traced node's voltage.
std::vector<SimulatedEnd> compare_simulation(const model::Circuit& circuit, const Plan& plan,
                                             const std::vector<EndTraces>& traces,
                                             const sim::RawPlot& plot);

/// Puts the simulator's waveform beside each load's traces (NodeTraces::simulated),
/// interpolated linearly onto their grid. Throws std::invalid_argument as compare_simulation.
void add_simulated(PlanCurves& curves, const sim::RawPlot& plot);

/// A maximum step that should bring `end`'s simulation error within its share of the budget,
/// from the deck's `step` (s): the step scaled by share over error (as if the error fell only
/// in proportion to the step, which it does at least: the integration methods are of order
/// one or two), with a margin, cut to two significant figures.
double suggested_step(const SimulatedEnd& end, double step);

}  // namespace rungs::plan
