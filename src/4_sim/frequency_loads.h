// A load network's admittance at a complex frequency, from its series and parallel parts.
#pragma once
#include "3_model/circuit.h"
#include "4_sim/two_port.h"

namespace rungs::sim {

/// The transform of a load network's admittance at s: the parts' impedances add in series and
/// their admittances in parallel; R is R, C is 1/(sC), L is sL. An open or a zero capacitor is no
/// admittance; a short, a zero resistor or a zero inductor is an infinite one.
struct LoadAdmittance {
  enum class Kind { open, short_circuit, finite };
  Kind kind = Kind::open;
  Complex y;
};
LoadAdmittance load_admittance(const model::LoadNetwork& network, Complex s);

}  // namespace rungs::sim
