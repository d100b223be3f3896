// The checks a circuit must pass before it is simulated, whichever way it is simulated.
#pragma once
#include "3_model/circuit.h"

namespace rungs::model {

/// The drive's ramp (s, 0-100 %) as a simulation takes it: drive_edge's. Throws
/// std::invalid_argument when no rise time is known or it is negative, or a pulse has no width.
double simulated_ramp(const Drive& drive, const Settings& settings);

/// Throws std::invalid_argument, at the first problem found, unless every line has a positive,
/// finite z0 and delay; every drive is off ground, has a source resistance zero or positive and
/// finite, and a ramp (simulated_ramp); no node has two drives without source resistance; every
/// load element is zero or positive and finite (load_admittance); and no load that is a short
/// sits on a node with a drive without source resistance. What a simulation needs beyond that
/// (lossless lines, a time step, a ladder) it checks itself.
void check_simulable(const Circuit& circuit);

}  // namespace rungs::model
