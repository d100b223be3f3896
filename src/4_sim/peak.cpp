// Peak line-end voltages from the method-of-characteristics reference.
#include "4_sim/peak.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <stdexcept>

#include "4_sim/characteristics.h"

namespace rungs::sim {

PeakEstimate estimate_peak(const model::Circuit& circuit, double window) {
  PeakEstimate peak;
  double swing = 0.0;
  for (const model::Drive& d : circuit.drives) {
    swing = std::max(swing, std::abs(d.high - d.low));
    peak.source_level = std::max({peak.source_level, std::abs(d.high), std::abs(d.low)});
  }
  // The deck starts from the DC operating point with every drive at its low level (or from
  // rest under uic when a line is charged). The excursion from there is the response to
  // the drives' changes alone, so the reference runs with each low shifted to 0 V.
  model::Circuit lossless = circuit;
  double largest_low = 0.0;
  for (model::Drive& d : lossless.drives) {
    largest_low = std::max(largest_low, std::abs(d.low));
    d.high -= d.low;
    d.low = 0.0;
  }
  double shortest_delay = std::numeric_limits<double>::infinity();
  for (model::Line& line : lossless.lines) {
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
  for (const model::Drive& d : circuit.drives)
    fastest_ramp = std::min(fastest_ramp, d.rise.value_or(circuit.settings.rise.value_or(0.0)) / 0.8);
  const double dt = std::min(shortest_delay / 4.0, fastest_ramp / 20.0);
  // The reference solves a dense system each step: keep steps x nodes^2 to about a second.
  const double steps = window / dt;
  const double nodes = 2.0 * static_cast<double>(lossless.lines.size());
  if (!(dt > 0.0) || steps > 4e7 || steps * nodes * nodes > 1e9) return peak;

  Waveforms w;
  try {
    w = simulate_characteristics(lossless, window, dt);
  } catch (const std::invalid_argument&) {
    return peak;  // a circuit the reference does not cover: no peak is claimed
  }
  double largest_excursion = 0.0;
  for (const NodeWaveform& node : w.nodes) {
    const double start = node.v.front();
    for (double v : node.v) {
      const double excursion = std::abs(v - start);
      peak.ratio = std::max(peak.ratio, excursion / swing);
      if (std::abs(v) > largest_excursion) {
        largest_excursion = std::abs(v);
        peak.node = node.node;
      }
    }
  }
  // The DC starting voltage of any node lies between the drives' low levels, so adding the
  // largest of them bounds the absolute peak from above.
  peak.voltage = largest_excursion + largest_low;
  peak.computed = true;
  return peak;
}

}  // namespace rungs::sim
