// Running the emitted deck in the simulator and measuring what a user of it sees.
#include "9_cli/simulation.h"

#include <fmt/format.h>

#include "5_plan/verify.h"
#include "7_report/simulation_report.h"
#include "9_cli/errors.h"
#include "9_cli/progress.h"

namespace rungs::cli {

Simulated simulate_netlist(const NetlistJob& job, const PreparedNetlist& netlist,
                           const SimulatorOptions& options) {
  if (job.library)
    throw BadInput("--simulate needs a deck; a library (--library) has no analysis to run");
  std::vector<plan::EndTraces> measured;
  const std::vector<plan::EndTraces>* traces = nullptr;
  if (netlist.verification && !netlist.verification->end_traces.empty()) {
    traces = &netlist.verification->end_traces;
  } else {
    try {
      const ProgressNote note(fmt::format("measuring the ladders of {}", netlist.circuit.name));
      plan::ThreadPool pool(plan::ThreadPool::core_count());
      measured = plan::verify_plan(netlist.circuit, netlist.plan, pool, {.keep_end_traces = true})
                     .end_traces;
    } catch (const std::exception& e) {
      throw ReferenceFailed(fmt::format(
          "{}: the exact reference cannot take this design, so the simulation cannot be "
          "measured: {}",
          netlist.file.name, e.what()));
    }
    traces = &measured;
  }
  Simulated out;
  {
    const ProgressNote note(
        fmt::format("simulating the deck of {} in {}", netlist.circuit.name, options.program));
    out.run = run_simulator(options, netlist_text(job, netlist), netlist.plan.window);
  }
  try {
    out.ends = plan::compare_simulation(netlist.circuit, netlist.plan, *traces, out.run.transient);
  } catch (const std::invalid_argument& e) {
    throw SimulatorFailed(fmt::format("{}: {}", out.run.command, e.what()));
  }
  out.failures = report::simulation_failures(netlist.circuit, netlist.plan, out.ends);
  return out;
}

}  // namespace rungs::cli
