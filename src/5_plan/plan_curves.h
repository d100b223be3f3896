// What the charts of a plan show, measured: the waveforms at each load, error against N.
#pragma once
#include <string>
#include <vector>

#include "3_model/circuit.h"
#include "4_sim/waveform.h"
#include "5_plan/plan.h"

namespace rungs::plan {

/// The exact and the ladder waveform at one load node, on the same time grid (s, V).
struct NodeTraces {
  std::string node;
  std::vector<double> t;
  std::vector<double> exact;
  std::vector<double> ladder;
  std::vector<double> simulated;  // a simulator's run of the deck, when one was made; else empty
};

/// One line's measured whole-circuit error (fraction of the swing) at a few section counts
/// around its planned one, the other lines as planned. Counts ascend.
struct ErrorCurve {
  std::vector<int> sections;
  std::vector<double> error;
};

struct PlanCurves {
  std::vector<NodeTraces> loads;   // one a load node, in the order loads are written
  std::vector<ErrorCurve> lines;   // one a line, in circuit order
};

/// Measures what the charts of `plan` draw: the exact reference and its ladder twin at every
/// load node, and each line's error at 0.25, 0.5, 0.75, 1, 1.25, 1.5 and 2 times its planned
/// count (at least 1 section). Throws what the exact reference throws.
PlanCurves measure_plan_curves(const model::Circuit& circuit, const Plan& plan);

}  // namespace rungs::plan
