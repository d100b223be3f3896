// The edges of a circuit: each drive's rise and ramp, and the edge each line is planned for.
#pragma once
#include <optional>

#include "3_model/circuit.h"

namespace rungs::model {

/// The 0-100 % time (s) of a linear ramp whose 10-90 % time is `rise` (s): rise/0.8, since
/// the 10-90 % part is 0.8 of the whole.
constexpr double ramp_time(double rise) {
  return rise / 0.8;
}

/// The edge of `rise` (s, 10-90 %) with its ramp.
constexpr Edge edge_of(double rise) {
  return Edge{rise, ramp_time(rise)};
}

/// The edge a drive makes: its own rise, else the design's `set rise`; empty when neither is
/// given (the resolver reports that). The one rule for a drive's edge: derive_edges stores it,
/// and the simulations, which also take circuits built by hand, apply it themselves.
std::optional<Edge> drive_edge(const Drive& drive, const Settings& settings);

/// Stores every drive's edge (drive_edge) and every line's: its own rise=, else the fastest
/// drive (smallest positive rise) in its connected part (ConnectedParts), else `set rise`;
/// empty when none applies. resolve() calls it; a circuit built or changed by hand calls it
/// again after its last change of lines, drives or settings.
void derive_edges(Circuit& circuit);

}  // namespace rungs::model
