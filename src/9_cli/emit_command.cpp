// `rungs emit`: one description to a netlist, its reports and a depfile.
#include <filesystem>
#include <iostream>
#include <string>
#include <vector>

#include <fmt/format.h>
#include <fmt/ranges.h>

#include "7_report/plan_report.h"
#include "7_report/simulation_report.h"
#include "8_project/depfile.h"
#include "9_cli/errors.h"
#include "9_cli/netlist_job.h"
#include "9_cli/output_file.h"
#include "9_cli/simulation.h"
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
  job.keep_end_traces = options.simulate.simulate;
  return job;
}

/// Writes the depfile of one emit: every file written, made from the description and
/// templates. Throws FileError when a path cannot be written in make syntax.
void write_emit_depfile(const std::string& depfile, const NetlistJob& job,
                        const PreparedNetlist& netlist, bool force) {
  std::vector<std::string> targets;
  for (const JobOutput& output : job_outputs(job, netlist)) targets.push_back(output.path);
  const std::vector<std::string> prerequisites = job_prerequisites(job, netlist);
  if (std::string problem = project::depfile_problem(targets, prerequisites); !problem.empty())
    throw FileError(problem);
  const std::string text = project::make_depfile(targets, prerequisites);
  write_atomically(
      depfile, [&](std::ostream& out) { out << text; }, OutputKind::depfile, force);
}

/// What a person needs after an emit: the files written and how to run the deck. Nothing
/// when the netlist went to standard output (the terminal shows it already).
std::vector<std::string> written_notes(const NetlistJob& job, const EmitOptions& options) {
  if (job.output == "-") return {};
  std::vector<std::string> written = {
      fmt::format("{} ({})", job.output, job.library ? "the subcircuits, to .include" : "the deck")};
  if (!job.report.empty() && job.report != "-")
    written.push_back(fmt::format("{} (the report)", job.report));
  if (!job.report_json.empty() && job.report_json != "-")
    written.push_back(fmt::format("{} (the report as JSON)", job.report_json));
  if (!options.depfile.empty()) written.push_back(fmt::format("{} (the depfile)", options.depfile));
  std::vector<std::string> notes = {fmt::format("wrote {}", fmt::join(written, ", "))};
  if (!job.library) {
    const std::string raw = std::filesystem::path(job.output).replace_extension(".raw").string();
    notes.push_back(fmt::format("run it: ngspice -b -r {} {} (every saved voltage into {})",
                                shell_word(raw), shell_word(job.output), raw));
  }
  return notes;
}

}  // namespace

int emit_command(const std::string& path, const EmitOptions& options) {
  if (!options.depfile.empty() && (options.output == "-" || path == "-"))
    throw BadInput(
        "--depfile needs a description file and -o FILE: a build tool cannot track standard "
        "input or output");
  const NetlistJob job = emit_job(path, options);
  std::vector<NamedOutput> outputs = {{job.output, job.output_named_by}};
  if (!job.report.empty()) outputs.push_back({job.report, job.report_named_by});
  if (!job.report_json.empty()) outputs.push_back({job.report_json, job.report_json_named_by});
  if (!options.depfile.empty()) outputs.push_back({options.depfile, "--depfile"});
  refuse_clashing_outputs({{path, "the description"}}, outputs);
  plan::ThreadPool pool(plan::ThreadPool::core_count());
  const PreparedNetlist netlist = prepare_for_command(job, pool);
  const std::vector<JobOutput> files = job_outputs(job, netlist);
  // Every refusal before the first write, so that a refused report leaves the deck as it was.
  for (const JobOutput& output : files)
    refuse_before_writing(output.path, output.kind, options.force);
  if (!options.depfile.empty())
    refuse_before_writing(options.depfile, OutputKind::depfile, options.force);
  for (const JobOutput& output : files)
    write_atomically(output.path, output.write, output.kind, options.force);
  if (!options.depfile.empty()) write_emit_depfile(options.depfile, job, netlist, options.force);
  if (!options.quiet) {
    print_note(report::plan_summary(netlist.circuit, netlist.plan, verification_of(netlist)));
    for (const std::string& note : written_notes(job, options)) print_note(note);
  }
  if (!options.simulate.simulate) return kExitOk;
  // The deck is written whatever the simulation shows: it is the description's; the
  // simulation's verdict is the exit code and the lines below.
  const Simulated simulated = simulate_netlist(job, netlist, options.simulate.simulator);
  if (!options.quiet)
    std::cerr << report::simulation_table(netlist.circuit, netlist.plan, simulated.ends,
                                          options.simulate.simulator.program,
                                          simulated.run.seconds);
  for (const std::string& failure : simulated.failures) print_note(failure);
  return simulated.failures.empty() ? kExitOk : kExitCheckFailed;
}

}  // namespace rungs::cli
