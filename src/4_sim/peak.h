// The highest voltage the line ends can reach, from the exact lossless reference.
#pragma once
#include <string>

#include "3_model/circuit.h"

namespace rungs::sim {

/// How far the line ends swing, measured on the lossless circuit (R' and G' set to zero,
/// which can only raise the peaks of a passive circuit's first arrivals).
struct PeakEstimate {
  bool computed = false;   // false when the circuit is too large to simulate quickly
  double ratio = 0.0;      // largest |v(t) - v(0)| at a line end over the largest swing
  double voltage = 0.0;    // V, an upper bound of |v(t)| at any line end
  std::string node;        // where `voltage` occurs
  double source_level = 0.0;  // V, largest |level| of any drive or charged line
};

/// Simulates `circuit` by the method of characteristics over `window` (s), with each
/// drive's change applied to a circuit at rest (superposition on the DC starting point).
/// The swing is the largest of the drives' (high - low) and the charged lines' voltages.
/// Skipped (computed = false) when the dense reference would take more than about a second,
/// or for a circuit it does not cover.
PeakEstimate estimate_peak(const model::Circuit& circuit, double window);

}  // namespace rungs::sim
