// --simulate, for check and emit: the deck run in the simulator and measured against the exact
// line.
#pragma once
#include <string>
#include <vector>

#include "5_plan/simulation_check.h"
#include "9_cli/netlist_job.h"
#include "9_cli/simulator.h"

namespace rungs::cli {

/// A simulated deck, measured.
struct Simulated {
  SimulatorRun run;
  std::vector<plan::SimulatedEnd> ends;
  std::vector<std::string> failures;  // one line an end over its budget (report stage's)
};

/// Runs the deck that `job` writes for `netlist` in the simulator and compares every saved line
/// end with the check's exact and ladder waveforms (Verification::end_traces, which
/// job.keep_end_traces keeps; measured here when the netlist has none, as for --analytic).
/// Throws BadInput for a library (it has no analysis), SimulatorFailed, or ReferenceFailed when
/// the exact reference cannot take the design.
Simulated simulate_netlist(const NetlistJob& job, const PreparedNetlist& netlist,
                           const SimulatorOptions& options);

}  // namespace rungs::cli
