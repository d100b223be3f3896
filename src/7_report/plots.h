// The charts of a plan: exact and ladder waveforms at each load, and error against N.
#pragma once
#include <string>
#include <vector>

#include "3_model/circuit.h"
#include "5_plan/plan.h"
#include "5_plan/plan_curves.h"
#include "5_plan/verify.h"

namespace rungs::report {

/// One chart, named for its file.
struct PlotFile {
  std::string name;  // e.g. "waveform_rx1.svg", "error_trunk.svg"
  std::string svg;
};

/// Draws `curves` (plan::measure_plan_curves): for each load node, the exact and the ladder
/// waveforms over the window, and the simulator's where the curves have it; for each line, its
/// measured whole-circuit error against its section count with the budget and the chosen N
/// marked, and with a verification the line's share of the budget. Draws only; measures nothing.
std::vector<PlotFile> plan_plots(const model::Circuit& circuit, const plan::Plan& plan,
                                 const plan::PlanCurves& curves,
                                 const plan::Verification* verification = nullptr);

}  // namespace rungs::report
