// What causes a circuit's response and how it starts: the sources, the initial state and the
// switched loads, shared by the exact reference and the nodal network without their solvers.
#pragma once
#include <cstddef>

namespace rungs::sim {

/// One independent cause of the response: a drive's change from its low level, or a charged
/// line's initial charge. Responses are kept apart by source so that each error can be divided by
/// the swing of the source that causes it.
struct Excitation {
  enum class Kind { drive, charge };
  Kind kind = Kind::drive;
  std::size_t index = 0;  // into circuit.drives, or circuit.lines for a charge
  double swing = 0.0;     // V: high - low (high for dc), or the line's charged voltage
};

/// How the circuit stands at t = 0.
enum class InitialState {
  automatic,  // rest when a line is charged (as the deck's `uic` run), else settled
  rest,       // every node, line, C and L at zero; a drive's low level is applied at t = 0
  settled,    // the DC state with every drive at its low level (the deck's operating point)
};

/// A load switched in at `at` (s): an ideal switch, open before, the load at rest when it
/// closes. It is handled by compensation: the load is always connected, in series with a source
/// e(t) that equals the open switch's voltage until `at` and is zero after, so that no current
/// flows through it before then (superposition holds because the circuit is linear).
struct Switch {
  std::size_t load = 0;  // into circuit.loads
  std::size_t node = 0;  // into FrequencyNetwork::nodes()
  double at = 0.0;
  bool is_short = false;
};

}  // namespace rungs::sim
