// The plan: for every line, its section count, shape and element values, and the deck's
// simulation settings.
#pragma once
#include <vector>

#include "3_model/circuit.h"
#include "4_sim/frequency_parts.h"
#include "1_syntax/diagnostics.h"

namespace rungs::plan {

/// How one line becomes a ladder.
struct LinePlan {
  int sections = 1;
  model::Shape shape = model::Shape::pi;
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
  /// The section counts were measured against the exact reference (plan_verified), not only
  /// estimated (plan_circuit): the time step allows for the difference (deck_time_step).
  bool measured = false;
  /// s, parallel to circuit.loads: a switched load's closing time, over which its switch's
  /// voltage falls linearly from its open value to zero (in the deck and in the exact
  /// reference alike): the 0-100 % ramp (rise/0.8) of the fastest line at its node. 0 for a
  /// load that is not switched, or whose node no line with an edge reaches (an ideal switch).
  std::vector<double> closing;
  /// V, parallel to circuit.loads: the open voltage across each switch that closes over a
  /// ramp, at the moment it starts to close, with the plan's ladders in place (the deck's
  /// switch starts from it, so no current jumps). Filled by plan::set_closing_voltages; empty
  /// until then.
  std::vector<double> closing_voltage;
};

/// Elements of an N-section ladder: L and C per section, plus a series R and a shunt G
/// (as a resistor) per section where the line has them; T and pi sections have one more
/// series or shunt element at the ends (the halves are not merged there).
long long ladder_elements(int sections, model::Shape shape, bool has_r, bool has_g);

/// Sets a line's section count and every figure that follows from it: the section values,
/// cutoff, predicted error and element count (rise, shape and tolerance must be set).
void set_sections(const model::Line& line, LinePlan& plan, int sections);

/// The part of each line's tolerance that the deck's transient settings leave to the
/// simulator: its own error (its waveform against the exact solution of the same ladder) is
/// meant to stay under this share, and the ladder's error under the rest.
inline constexpr double kSimulationShare = 0.25;

/// The simulator's maximum step for a plan's counts: `set step` when the description gives
/// one; else it resolves the fastest ramp (a drive's stored edge or a switch's closing) over 40
/// steps and the shortest section delay over 8 when the counts are measured (plan.measured), 16
/// when they are only estimated. Why the counts matter: the simulator's error on a ladder is
/// its phase error on the ladder's own ringing, so it grows with the ladder's error e, about
/// K (step / section delay)^2 e with K up to 14 (measured with ngspice's trap integration on
/// the examples and the test decks): 8 steps a section keep it under kSimulationShare of the
/// tolerance for a ladder within its budget, 16 for an estimated ladder up to about four times
/// over it (the analytic plan of examples/plane_load_step.rungs errs 5.4 times its budget). A
/// window's thousandth when nothing bounds it. tests/emit_ngspice_test.cpp and `rungs check
/// --simulate` measure what it gives.
double deck_time_step(const model::Circuit& circuit, const Plan& plan);

/// The plan of one part, cut from the whole circuit's plan.
Plan part_plan(const Plan& whole, const sim::CircuitPart& part);

/// Plans every line: the rise time that reaches it (the edge model::derive_edges stored: its
/// own rise=, else the fastest drive in its connected part, else `set rise`; a line with none
/// is an error),
/// its tolerance and shape (own option, else the design's), and the section count from
/// analytic_sections unless sections= fixes it. Also the observation window (`set window`,
/// else enough round trips for the reflections to settle) and the time step.
Plan plan_circuit(const model::Circuit& circuit, syntax::Diagnostics& diagnostics);

}  // namespace rungs::plan
