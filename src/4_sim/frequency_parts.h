// A circuit cut into its connected parts, each of which responds independently of the others.
#pragma once
#include <cstddef>
#include <vector>

#include "3_model/circuit.h"

namespace rungs::sim {

/// A connected part of a circuit: lines joined at their end nodes (ground joins nothing), with
/// the drives and loads on those nodes. `lines`, `drives` and `loads` index the whole circuit.
struct CircuitPart {
  model::Circuit circuit;  // the part alone, with the whole circuit's name and settings
  std::vector<std::size_t> lines;
  std::vector<std::size_t> drives;
  std::vector<std::size_t> loads;
};

/// The connected parts of `circuit`, in the order of their first line (then of nodes that only
/// drives and loads touch). Parts do not interact, and a response holds every source at every
/// node of its circuit, so its size grows as the square of the circuit: solve and measure each
/// part alone.
std::vector<CircuitPart> connected_parts(const model::Circuit& circuit);

}  // namespace rungs::sim
