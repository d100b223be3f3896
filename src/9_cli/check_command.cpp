// `rungs check`: a CI gate on section counts and on a committed netlist being current.
#include <iostream>
#include <optional>

#include <fmt/format.h>

#include "7_report/json_writer.h"
#include "7_report/plan_report.h"
#include "7_report/simulation_report.h"
#include "8_project/staleness.h"
#include "9_cli/errors.h"
#include "9_cli/netlist_job.h"
#include "9_cli/output_file.h"
#include "9_cli/progress.h"
#include "9_cli/simulation.h"
#include "9_cli/subcommands.h"

namespace rungs::cli {

namespace {

/// The reason a committed netlist fails the check, or empty when it is what emit writes now.
std::string netlist_reason(const std::string& path, const NetlistJob& job,
                           const PreparedNetlist& netlist) {
  const Comparison compared =
      compare_with_file(path, job_outputs(job, netlist).front().write, project::kHeadBytes);
  if (!compared.exists) return fmt::format("netlist {}: missing; run rungs emit", path);
  if (compared.same) return "";
  return fmt::format("netlist {}: stale, {}; run rungs emit", path,
                     project::netlist_stale_reason(compared.existing_head, compared.expected_head));
}

/// The check's outcome as JSON: the reasons and every line's figures, and with a simulation,
/// every simulated line end's errors.
std::string check_json(const PreparedNetlist& netlist, const std::vector<std::string>& reasons,
                       const Simulated* simulated) {
  report::JsonWriter out;
  out.begin_object().key("version").value(1).key("design").value(netlist.circuit.name);
  out.key("ok").value(reasons.empty()).key("reasons").begin_array();
  for (const std::string& r : reasons) out.value(r);
  out.end_array().key("lines").begin_array();
  for (std::size_t i = 0; i < netlist.circuit.lines.size(); ++i) {
    const plan::LineVerdict& v = netlist.verification->lines[i];
    // clang-format off
    out.begin_object()
        .key("name").value(netlist.circuit.lines[i].name)
        .key("sections").value(netlist.plan.lines[i].sections)
        .key("error").value(v.error)
        .key("tolerance").value(netlist.plan.lines[i].tolerance)
        .key("adequate").value(v.adequate)
        .end_object();
    // clang-format on
  }
  out.end_array();
  if (simulated) {
    out.key("simulated").begin_array();
    for (const plan::SimulatedEnd& end : simulated->ends) {
      // clang-format off
      out.begin_object()
          .key("node").value(end.node)
          .key("simulated_error").value(end.simulated_error)
          .key("ladder_error").value(end.ladder_error)
          .key("simulation_error").value(end.simulation_error)
          .end_object();
      // clang-format on
    }
    out.end_array();
  }
  out.end_object();
  return out.str();
}

/// The description planned as emit plans it, and verified. Throws ReferenceFailed when the
/// exact reference cannot measure the ladders.
PreparedNetlist checked_netlist(const std::string& path, const NetlistJob& job) {
  const plan::VerifyOptions options{.keep_end_traces = job.keep_end_traces};
  plan::ThreadPool pool(plan::ThreadPool::core_count());
  PreparedNetlist netlist = prepare_for_command(job, pool);
  if (netlist.verification) return netlist;
  try {
    const ProgressNote note(fmt::format("checking the ladders of {}", netlist.circuit.name));
    netlist.verification = plan::verify_plan(netlist.circuit, netlist.plan, pool, options);
  } catch (const std::exception& e) {
    throw ReferenceFailed(
        fmt::format("{}: the exact reference cannot check this design: {}", path, e.what()));
  }
  return netlist;
}

}  // namespace

int check_command(const std::string& path, const std::string& netlist_path, bool json,
                  bool analytic, const std::string& plots, const SimulateOptions& simulate) {
  // The counts checked are the ones emit writes with the same planner option, so that a
  // passing check vouches for the committed netlist itself.
  NetlistJob job;
  job.source = path;
  job.output = netlist_path.empty() ? "-" : netlist_path;
  job.analytic = analytic;
  job.keep_end_traces = simulate.simulate;
  const PreparedNetlist netlist = checked_netlist(path, job);
  std::vector<std::string> reasons =
      report::inadequate_lines(netlist.circuit, netlist.plan, *netlist.verification);
  std::optional<Simulated> simulated;
  if (simulate.simulate) {
    simulated = simulate_netlist(job, netlist, simulate.simulator);
    reasons.insert(reasons.end(), simulated->failures.begin(), simulated->failures.end());
  }
  if (!plots.empty()) {
    const ProgressNote note("drawing the charts");
    write_plots(plots, netlist, simulated ? &simulated->run.transient : nullptr);
  }
  if (!netlist_path.empty()) {
    if (std::string reason = netlist_reason(netlist_path, job, netlist); !reason.empty())
      reasons.push_back(std::move(reason));
  }
  if (json) {
    std::cout << check_json(netlist, reasons, simulated ? &*simulated : nullptr);
  } else {
    if (simulated)
      std::cout << report::simulation_table(netlist.circuit, netlist.plan, simulated->ends,
                                            simulate.simulator.program, simulated->run.seconds);
    for (const std::string& r : reasons) std::cout << r << '\n';
    if (reasons.empty())
      std::cout << fmt::format("{}: every line adequate{}{}\n", netlist.circuit.name,
                               netlist_path.empty() ? "" : ", netlist current",
                               simulated ? ", simulated deck within every budget" : "");
  }
  finish_standard_output();
  // The reasons are the check's output, on standard output; nothing more goes to stderr.
  return reasons.empty() ? kExitOk : kExitCheckFailed;
}

}  // namespace rungs::cli
