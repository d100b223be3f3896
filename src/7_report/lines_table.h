// `rungs lines`: every line's electrical figures, as a table for people or JSON for tools.
#pragma once
#include <string>

#include "3_model/circuit.h"

namespace rungs::report {

/// A plain-text table: model, Z0 (ohm), delay (ns), velocity factor, L' (nH/m), C' (pF/m),
/// R' (ohm/m), G' (mS/m), eps_eff and length (m); "-" where a figure is unknown (per-length
/// values of a line given by its delay alone).
std::string lines_table(const model::Circuit& circuit);

/// `{"version": 1, "lines": [{"name", "model", "z0", "delay", "velocity", "l", "c", "r", "g",
/// "eps_eff", "length"}]}` in SI units (ohm, s, m/s, H/m, F/m, ohm/m, S/m, m); unknown
/// figures are null.
std::string lines_json(const model::Circuit& circuit);

}  // namespace rungs::report
