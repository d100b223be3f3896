// Peak line-end voltages from the method-of-characteristics reference.
#include "sim/peak.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "sim/characteristics.h"

namespace rungs::sim {

PeakEstimate estimate_peak(const physics::Circuit& circuit, const plan::Plan& plan) {
  PeakEstimate peak;
  double swing = 0.0;
  for (const physics::Drive& d : circuit.drives) {
    swing = std::max(swing, std::abs(d.high - d.low));
    peak.source_level = std::max({peak.source_level, std::abs(d.high), std::abs(d.low)});
  }
  physics::Circuit lossless = circuit;
  double shortest_delay = std::numeric_limits<double>::infinity();
  for (physics::Line& line : lossless.lines) {
    line.per_length.r = line.per_length.g = 0.0;
    shortest_delay = std::min(shortest_delay, line.delay);
    if (line.charged) {
      swing = std::max(swing, std::abs(*line.charged));
      peak.source_level = std::max(peak.source_level, std::abs(*line.charged));
    }
  }
  if (lossless.lines.empty() || !(swing > 0.0)) return peak;
  // Steps fine enough for the fastest ramp and whole-ish sample counts on the shortest line.
  double fastest_ramp = std::numeric_limits<double>::infinity();
  for (const physics::Drive& d : circuit.drives)
    fastest_ramp = std::min(fastest_ramp, d.rise.value_or(circuit.settings.rise.value_or(0.0)) / 0.8);
  const double dt = std::min(shortest_delay / 4.0, fastest_ramp / 20.0);
  const double samples = plan.window / dt * 2.0 * static_cast<double>(lossless.lines.size());
  if (!(dt > 0.0) || samples > 2e8) return peak;

  const Waveforms w = simulate_characteristics(lossless, plan.window, dt);
  for (const NodeWaveform& node : w.nodes) {
    const double start = node.v.front();
    for (double v : node.v) {
      peak.ratio = std::max(peak.ratio, std::abs(v - start) / swing);
      if (std::abs(v) > peak.voltage) {
        peak.voltage = std::abs(v);
        peak.node = node.node;
      }
    }
  }
  peak.computed = true;
  return peak;
}

}  // namespace rungs::sim
