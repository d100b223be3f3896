// A load network's admittance at a complex frequency, and what follows from it: its form (open,
// short or elements) and its resistance at DC.
#pragma once
#include "2_physics/complex.h"
#include "3_model/circuit.h"

namespace rungs::model {

using physics::Complex;

/// The transform of a load network's admittance at s: the parts' impedances add in series and
/// their admittances in parallel; R is R, C is 1/(sC), L is sL. An open or a zero capacitor is no
/// admittance; a short, a zero resistor or a zero inductor is an infinite one. At s = 0 (DC) a
/// capacitor is open and an inductor a short.
struct LoadAdmittance {
  enum class Kind { open, short_circuit, finite };
  Kind kind = Kind::open;
  Complex y;
};

/// The admittance of `network` at s (Re s > 0, or s = 0 for DC). Throws std::invalid_argument
/// ("a load element must be zero or positive, and finite") for a negative, NaN or infinite
/// element.
LoadAdmittance load_admittance(const LoadNetwork& network, Complex s);

/// What the network is at every s with Re s > 0: open, a short, or finite (it has elements).
/// A passive impedance has a positive real part there, so the form does not depend on s. Throws
/// as load_admittance does.
LoadAdmittance::Kind load_form(const LoadNetwork& network);

/// The network's resistance at DC, ohm (load_admittance at s = 0): infinite for an open (or
/// capacitors in the way), 0 for a short.
double dc_resistance(const LoadNetwork& network);

}  // namespace rungs::model
