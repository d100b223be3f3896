// Peak line-end voltages from the method-of-characteristics reference.
#include "4_sim/peak.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <stdexcept>

#include "3_model/edges.h"
#include "4_sim/characteristics.h"

namespace rungs::sim {

namespace {

/// Sets peak.ratio (the largest excursion from a node's start over `swing`) and peak.node (the
/// node of the largest |v|) from the waveforms; returns that largest |v|, V.
double read_excursions(const Waveforms& w, double swing, PeakEstimate& peak) {
  double largest = 0.0;
  for (const NodeWaveform& node : w.nodes) {
    const double start = node.v.front();
    for (double v : node.v) {
      peak.ratio = std::max(peak.ratio, std::abs(v - start) / swing);
      if (std::abs(v) > largest) {
        largest = std::abs(v);
        peak.node = node.node;
      }
    }
  }
  return largest;
}

}  // namespace

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
  for (const model::Drive& d : circuit.drives) {
    const std::optional<model::Edge> edge = model::drive_edge(d, circuit.settings);
    fastest_ramp = std::min(fastest_ramp, edge ? edge->ramp : 0.0);
  }
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
  const double largest_excursion = read_excursions(w, swing, peak);
  // The DC starting voltage of any node lies between the drives' low levels, so adding the
  // largest of them bounds the absolute peak from above.
  peak.voltage = largest_excursion + largest_low;
  peak.computed = true;
  return peak;
}

}  // namespace rungs::sim
