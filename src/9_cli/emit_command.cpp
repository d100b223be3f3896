// `rungs emit`: one description to a netlist, its reports and a depfile.
#include <iostream>

#include <fmt/format.h>

#include "7_report/plan_report.h"
#include "8_project/depfile.h"
#include "9_cli/errors.h"
#include "9_cli/netlist_job.h"
#include "9_cli/output_file.h"
#include "9_cli/subcommands.h"

namespace rungs::cli {

namespace {

/// The job of `rungs emit FILE` with `options`.
NetlistJob emit_job(const std::string& path, const EmitOptions& options) {
  NetlistJob job;
  job.source = path;
  job.output = options.output;
  job.report = options.report;
  job.report_json = options.report_json;
  job.templates = options.templates;
  job.library = options.library;
  job.with_ideal = options.with_ideal;
  job.analytic = options.analytic;
  return job;
}

/// Writes the depfile of one emit: every file written, made from the description and
/// templates. Throws FileError when a path cannot be written in make syntax.
void write_emit_depfile(const std::string& depfile, const NetlistJob& job,
                        const PreparedNetlist& netlist) {
  std::vector<std::string> targets;
  for (const JobOutput& output : job_outputs(job, netlist)) targets.push_back(output.path);
  const std::vector<std::string> prerequisites = job_prerequisites(job, netlist);
  if (std::string problem = project::depfile_problem(targets, prerequisites); !problem.empty())
    throw FileError(problem);
  const std::string text = project::make_depfile(targets, prerequisites);
  write_atomically(
      depfile, [&](std::ostream& out) { out << text; }, false, true);
}

}  // namespace

int emit_command(const std::string& path, const EmitOptions& options) {
  if (!options.depfile.empty() && (options.output == "-" || path == "-"))
    throw BadInput(
        "--depfile needs a description file and -o FILE: a build tool cannot track standard "
        "input or output");
  const NetlistJob job = emit_job(path, options);
  plan::ThreadPool pool(plan::ThreadPool::core_count());
  const PreparedNetlist netlist = prepare_for_command(job, pool);
  for (const JobOutput& output : job_outputs(job, netlist))
    write_atomically(output.path, output.write, output.is_netlist, options.force);
  if (!options.depfile.empty()) write_emit_depfile(options.depfile, job, netlist);
  if (!options.quiet)
    print_note(report::plan_summary(netlist.circuit, netlist.plan, verification_of(netlist)));
  return kExitOk;
}

}  // namespace rungs::cli
