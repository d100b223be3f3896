// The waveforms a check measured at the line ends, kept for comparing a simulator's run with them.
#pragma once
#include <string>
#include <vector>

#include "3_model/circuit.h"
#include "4_sim/frequency_reference.h"

namespace rungs::plan {

/// One line end's waveforms as the check measured them, all sources of its part together (a
/// simulator gives only their sum).
struct EndTraces {
  std::string node;
  std::vector<double> t;       // s, the exact reference's uniform grid
  std::vector<double> exact;   // V, every line exact
  std::vector<double> ladder;  // V, every line its planned ladder, solved exactly
  /// V, the largest |swing| of the sources in the part: a simulator's waveform is the sum of
  /// them all, so its errors are fractions of this swing (0: no source, nothing to compare).
  double swing = 0.0;
};

/// The traces at every line end of `circuit` that is not ground, each node once, in the order
/// of the lines (near end, then far end), from its exact response and its ladders' response
/// on the same grid. Throws std::invalid_argument when the responses are not of this circuit.
std::vector<EndTraces> end_traces(const model::Circuit& circuit, const sim::Response& exact,
                                  const sim::Response& ladder);

}  // namespace rungs::plan
