// `rungs check`: a CI gate on section counts and on a committed netlist being current.
#include <iostream>

#include <fmt/format.h>

#include "8_project/staleness.h"
#include "9_cli/commands.h"
#include "9_cli/netlist_job.h"
#include "9_cli/output_file.h"
#include "9_cli/progress.h"
#include "9_cli/subcommands.h"
#include "7_report/json_writer.h"
#include "7_report/plan_report.h"

namespace rungs::cli {

int check_command(const std::string& path, const std::string& netlist_path, bool json,
                  bool analytic, const std::string& plots) {
  // The counts checked are the ones emit writes with the same planner option, so that a
  // passing check vouches for the committed netlist itself.
  NetlistJob job;
  job.source = path;
  job.output = netlist_path.empty() ? "-" : netlist_path;
  job.analytic = analytic;
  Preparation prepared = prepare_netlist(job);
  std::cerr << prepared.messages;
  if (!prepared.netlist) return prepared.exit_code;
  PreparedNetlist& netlist = *prepared.netlist;
  if (!netlist.verification) {
    try {
      const ProgressNote note(fmt::format("checking the ladders of {}", netlist.circuit.name));
      netlist.verification = plan::verify_plan(netlist.circuit, netlist.plan);
    } catch (const std::exception& e) {
      fmt::print(stderr, "rungs: {}: the exact reference cannot check this design: {}\n", path,
                 e.what());
      return kExitInternal;
    }
  }
  std::vector<std::string> reasons =
      report::inadequate_lines(netlist.circuit, netlist.plan, *netlist.verification);
  if (!plots.empty()) {
    if (std::string error = write_plots(plots, netlist); !error.empty()) {
      fmt::print(stderr, "rungs: {}\n", error);
      return kExitInternal;
    }
  }
  if (!netlist_path.empty()) {
    const Comparison compared =
        compare_with_file(netlist_path, job_outputs(job, netlist).front().write, build::kHeadBytes);
    if (!compared.exists)
      reasons.push_back(fmt::format("netlist {}: missing; run rungs emit", netlist_path));
    else if (!compared.same)
      reasons.push_back(fmt::format("netlist {}: stale, {}; run rungs emit", netlist_path,
                                    build::netlist_stale_reason(compared.existing_head,
                                                                compared.expected_head)));
  }
  if (json) {
    report::JsonWriter out;
    out.begin_object().key("version").value(1).key("design").value(netlist.circuit.name);
    out.key("ok").value(reasons.empty()).key("reasons").begin_array();
    for (const std::string& r : reasons) out.value(r);
    out.end_array().key("lines").begin_array();
    for (std::size_t i = 0; i < netlist.circuit.lines.size(); ++i) {
      const plan::LineVerdict& v = netlist.verification->lines[i];
      out.begin_object()
          .key("name").value(netlist.circuit.lines[i].name)
          .key("sections").value(netlist.plan.lines[i].sections)
          .key("error").value(v.error)
          .key("tolerance").value(netlist.plan.lines[i].tolerance)
          .key("adequate").value(v.adequate)
          .end_object();
    }
    out.end_array().end_object();
    std::cout << out.str();
  } else {
    for (const std::string& r : reasons) std::cout << r << '\n';
    if (reasons.empty())
      std::cout << fmt::format("{}: every line adequate{}\n", netlist.circuit.name,
                               netlist_path.empty() ? "" : ", netlist current");
  }
  std::cout.flush();
  return reasons.empty() ? kExitOk : kExitCheckFailed;
}

}  // namespace rungs::cli
