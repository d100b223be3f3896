// Sampled node voltages: what every time-domain reference hands to the planner and reports.
#pragma once
#include <string>
#include <string_view>
#include <vector>

namespace rungs::sim {

/// The voltage of one node (to ground), volts, one value per sample of Waveforms::t.
struct NodeWaveform {
  std::string node;
  std::vector<double> v;
};

/// Node voltages on a uniform time grid: t[0] = 0, t[k] = k dt; every node's `v` has the size
/// of `t`.
struct Waveforms {
  std::vector<double> t;
  std::vector<NodeWaveform> nodes;
};

/// The waveform of `node` (spelled as in the circuit), or nullptr when there is none.
inline const NodeWaveform* find_node(const Waveforms& waveforms, std::string_view node) {
  for (const NodeWaveform& w : waveforms.nodes)
    if (w.node == node) return &w;
  return nullptr;
}

}  // namespace rungs::sim
