// Reporting a simulator's run of the deck: each line end's error, its parts, and what to change.
#pragma once
#include <string>
#include <string_view>
#include <vector>

#include "3_model/circuit.h"
#include "5_plan/plan.h"
#include "5_plan/simulation_check.h"

namespace rungs::report {

/// For people: "simulated by COMMAND_NAME in S s: method M, maximum step H s", then a row a
/// line end with the simulated error, the ladder's own, what the simulation added (all in % of
/// the swing) and the budget.
std::string simulation_table(const model::Circuit& circuit, const plan::Plan& plan,
                             const std::vector<plan::SimulatedEnd>& ends,
                             std::string_view simulator, double seconds);

/// One line a line end whose simulated error is over its budget: "node N: the simulated deck
/// errs X % of the swing, over its B % budget; ..." naming the part that is over (the
/// simulation, beyond its share kSimulationShare of the budget, or the ladder, which leaves
/// the simulation less) and what to write in the description: a smaller `set step` (and, for
/// gear, `set method trap`), or a smaller tolerance= on the lines there (more sections), or,
/// when an estimated (--analytic) ladder alone is over, planning without --analytic.
std::vector<std::string> simulation_failures(const model::Circuit& circuit, const plan::Plan& plan,
                                             const std::vector<plan::SimulatedEnd>& ends);

/// A time as the description language writes it, two or three figures and a prefix: "5.1ps".
std::string time_setting(double seconds);

}  // namespace rungs::report
