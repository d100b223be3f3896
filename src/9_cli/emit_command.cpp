// `rungs emit`: one description to a netlist, its reports and a depfile.
#include <iostream>

#include <fmt/format.h>

#include "8_project/depfile.h"
#include "9_cli/commands.h"
#include "9_cli/netlist_job.h"
#include "9_cli/output_file.h"
#include "9_cli/subcommands.h"
#include "7_report/plan_report.h"

namespace rungs::cli {

namespace {

/// The depfile of one emit: every file written, made from the description and templates.
std::string emit_depfile(const NetlistJob& job, const PreparedNetlist& netlist,
                         std::string& error) {
  std::vector<std::string> targets;
  for (const JobOutput& output : job_outputs(job, netlist)) targets.push_back(output.path);
  const std::vector<std::string> prerequisites = job_prerequisites(job, netlist);
  error = build::depfile_problem(targets, prerequisites);
  return build::make_depfile(targets, prerequisites);
}

}  // namespace

int emit_command(const std::string& path, const EmitOptions& options) {
  if (!options.depfile.empty() && (options.output == "-" || path == "-")) {
    fmt::print(stderr,
               "rungs: --depfile needs a description file and -o FILE: a build tool "
               "cannot track standard input or output\n");
    return kExitBadInput;
  }
  NetlistJob job;
  job.source = path;
  job.output = options.output;
  job.report = options.report;
  job.report_json = options.report_json;
  job.templates = options.templates;
  job.library = options.library;
  job.with_ideal = options.with_ideal;
  job.analytic = options.analytic;
  const Preparation prepared = prepare_netlist(job);
  std::cerr << prepared.messages;
  if (!prepared.netlist) return prepared.exit_code;
  const PreparedNetlist& netlist = *prepared.netlist;

  for (const JobOutput& output : job_outputs(job, netlist)) {
    const std::string error =
        write_atomically(output.path, output.write, output.is_netlist, options.force);
    if (!error.empty()) {
      fmt::print(stderr, "rungs: {}\n", error);
      return error.find("not overwriting") != std::string::npos ? kExitBadInput : kExitInternal;
    }
  }
  if (!options.depfile.empty()) {
    std::string error;
    const std::string text = emit_depfile(job, netlist, error);
    if (error.empty())
      error = write_atomically(
          options.depfile, [&](std::ostream& out) { out << text; }, false, true);
    if (!error.empty()) {
      fmt::print(stderr, "rungs: {}\n", error);
      return kExitInternal;
    }
  }
  if (!options.quiet)
    fmt::print(stderr, "rungs: {}\n", report::plan_summary(netlist.circuit, netlist.plan, verification_of(netlist)));
  return kExitOk;
}

}  // namespace rungs::cli
