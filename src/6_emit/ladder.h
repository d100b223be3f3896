// One line as a SPICE subcircuit: a ladder of series L (and R) and shunt C (and G) sections.
#pragma once
#include <optional>
#include <ostream>
#include <string>

#include "6_emit/deck_buffer.h"
#include "5_plan/plan.h"

namespace rungs::emit {

/// Writes the element lines (no .subckt/.ends) of a ladder between the subcircuit ports
/// `near`, `far` and `ref`, streaming to `out` so memory does not grow with the section
/// count. Shapes: pi = C/2 | L | C | L ... | C/2; T = L/2 | C | L ... | C | L/2; L = (L, C)
/// per section with the C at the far side. A series R sits beside each L through an inner
/// node m<k>; a shunt G is a resistor of 1/G beside each C. With `charged`, every capacitor
/// starts at that voltage (IC=, for a `uic` transient). Inner nodes are n<k> and m<k>.
/// Returns the number of elements written.
long long write_ladder(DeckBuffer& out, const plan::LinePlan& line, std::optional<double> charged);
/// The same, into a stream (through a DeckBuffer of its own, flushed before it returns).
long long write_ladder(std::ostream& out, const plan::LinePlan& line,
                       std::optional<double> charged);

}  // namespace rungs::emit
