// The plan: for every line, its section count, shape and element values, and the deck's
// simulation settings.
#pragma once
#include <vector>

#include "physics/circuit.h"
#include "syntax/diagnostics.h"

namespace rungs::plan {

/// How one line becomes a ladder.
struct LinePlan {
  int sections = 1;
  physics::Shape shape = physics::Shape::pi;
  bool fixed = false;         // sections= was given
  double rise = 0.0;          // s, the edge the line was planned for
  double tolerance = 0.0;     // fraction of the swing
  double section_l = 0.0;     // H, one section's series inductance
  double section_c = 0.0;     // F, one section's shunt capacitance
  double section_r = 0.0;     // ohm, one section's series resistance
  double section_g = 0.0;     // S, one section's shunt conductance
  double cutoff = 0.0;        // Hz, a section's cutoff 1/(pi sqrt(L C))
  double bandwidth = 0.0;     // Hz, the edge's knee frequency
  double predicted_error = 0.0;       // fraction of the swing
  int rule_sections = 1;              // the common rule's count
  double rule_predicted_error = 0.0;  // the estimate at the rule's count
  long long elements = 0;             // elements in the ladder
};

/// The plan of a whole circuit; `lines` runs parallel to circuit.lines.
struct Plan {
  std::vector<LinePlan> lines;
  long long elements = 0;  // ladder elements of all lines
  double window = 0.0;     // s, simulated time
  double time_step = 0.0;  // s, the simulator's maximum step
};

/// Elements of an N-section ladder: L and C per section, plus a series R and a shunt G
/// (as a resistor) per section where the line has them; T and pi sections have one more
/// series or shunt element at the ends (the halves are not merged there).
long long ladder_elements(int sections, physics::Shape shape, bool has_r, bool has_g);

/// Sets a line's section count and every figure that follows from it: the section values,
/// cutoff, predicted error and element count (rise, shape and tolerance must be set).
void set_sections(const physics::Line& line, LinePlan& plan, int sections);

/// Plans every line: the rise time that reaches it (its own rise=, else the fastest drive
/// in its connected part of the circuit, else `set rise`; a line with none is an error),
/// its tolerance and shape (own option, else the design's), and the section count from
/// analytic_sections unless sections= fixes it. Also the observation window (`set window`,
/// else enough round trips for the reflections to settle) and the time step.
Plan plan_circuit(const physics::Circuit& circuit, syntax::Diagnostics& diagnostics);

}  // namespace rungs::plan
