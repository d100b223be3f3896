// The charts of a plan: exact and ladder waveforms at each load, and error against N.
#pragma once
#include <string>
#include <vector>

#include "3_model/circuit.h"
#include "5_plan/plan.h"

namespace rungs::report {

/// One chart, named for its file.
struct PlotFile {
  std::string name;  // e.g. "waveform_rx1.svg", "error_trunk.svg"
  std::string svg;
};

/// For each load node, the exact and the ladder waveforms over the window; for each line, the
/// measured whole-circuit error of that line against its section count (the others as
/// planned) with the budget and the chosen N marked. Waveforms come from the exact
/// reference (sim/frequency_reference.h) and its ladder twin. Throws what the reference throws.
std::vector<PlotFile> plan_plots(const model::Circuit& circuit, const plan::Plan& plan);

}  // namespace rungs::report
