// Subcommands of `rungs`: reading the description, running the stages, printing results.
#include "9_cli/commands.h"

#include <iostream>

#include <fmt/format.h>
#include <CLI/CLI.hpp>

#include "1_syntax/invariant.h"
#include "1_syntax/parser.h"
#include "3_model/resolve.h"
#include "4_sim/peak.h"
#include "7_report/lines_table.h"
#include "7_report/plan_report.h"
#include "9_cli/errors.h"
#include "9_cli/netlist_job.h"
#include "9_cli/output_file.h"
#include "9_cli/progress.h"
#include "9_cli/subcommands.h"

namespace rungs::cli {

namespace {

/// Parses and resolves; prints every diagnostic to stderr. Throws FileHasErrors when there
/// were errors.
model::Circuit load_circuit(const syntax::InputFile& file) {
  syntax::Diagnostics diagnostics(file);
  const auto description = syntax::parse_description(diagnostics);
  model::Circuit circuit = model::resolve(description, diagnostics);
  std::cerr << diagnostics.render();
  if (diagnostics.has_errors()) throw FileHasErrors(file.name, diagnostics.error_count());
  return circuit;
}

/// `rungs plan FILE` and its options.
struct PlanOptions {
  bool json = false;
  bool analytic = false;
  std::string plots;  // a folder for the charts, or empty
};

int plan_command(const std::string& path, const PlanOptions& options) {
  NetlistJob job;
  job.source = path;
  job.analytic = options.analytic;
  plan::ThreadPool pool(plan::ThreadPool::core_count());
  const PreparedNetlist planned = prepare_for_command(job, pool);
  const sim::PeakEstimate peak = sim::estimate_peak(planned.circuit, planned.plan.window);
  const plan::Verification* verification = verification_of(planned);
  if (!options.plots.empty()) {
    const ProgressNote note("drawing the charts");
    write_plots(options.plots, planned);
  }
  std::cout << (options.json ? report::plan_json(planned.circuit, planned.plan, peak, verification)
                             : report::plan_text(planned.circuit, planned.plan, peak,
                                                 planned.file.name, verification));
  finish_standard_output();
  return kExitOk;
}

int lines_command(const std::string& path, bool json) {
  const model::Circuit circuit = load_circuit(read_source(path));
  std::cout << (json ? report::lines_json(circuit) : report::lines_table(circuit));
  finish_standard_output();
  return kExitOk;
}

/// Everything the command line can say, gathered by CLI11.
struct Arguments {
  std::string path;
  bool json = false;
  bool analytic = false;
  std::string plots;
  std::string check_netlist;
  SimulateOptions check_simulate;
  EmitOptions emit;
  BuildOptions build;
};

constexpr const char* kFileHelp = "Description file (.rungs), or - for standard input";
constexpr const char* kAnalyticHelp =
    "Plan by the analytic estimate alone: faster, but no ladder is measured against the exact "
    "line";
constexpr const char* kPlotHelp =
    "Write SVG charts here: waveforms at each load, error against sections";

/// --simulate, --simulator and --simulator-limit on `command`.
void add_simulate_options(CLI::App* command, SimulateOptions& o) {
  CLI::Option* simulate = command->add_flag(
      "--simulate", o.simulate,
      "Also run the deck in the simulator and measure, at every line end, what it shows against "
      "the exact line; exit 1 when that is over the budget");
  command
      ->add_option("--simulator", o.simulator.program,
                   "The simulator to run for --simulate: a name on PATH or a path")
      ->capture_default_str()
      ->needs(simulate);
  command
      ->add_option("--simulator-limit", o.simulator.time_limit,
                   "Seconds after which the simulator is stopped as hung")
      ->capture_default_str()
      ->check(CLI::PositiveNumber)
      ->needs(simulate);
}

CLI::App* add_lines(CLI::App& app, Arguments& a) {
  CLI::App* lines = app.add_subcommand("lines", "Print every line's Z0, delay, L', C', R', G'");
  lines->add_option("FILE", a.path, kFileHelp)->required();
  lines->add_flag("--json", a.json, "Print JSON (SI units) instead of a table");
  return lines;
}

CLI::App* add_plan(CLI::App& app, Arguments& a) {
  CLI::App* plan =
      app.add_subcommand("plan", "Print how each line becomes a ladder; write nothing");
  plan->add_option("FILE", a.path, kFileHelp)->required();
  plan->add_flag("--json", a.json, "Print JSON (SI units) instead of a report");
  plan->add_flag("--analytic", a.analytic, kAnalyticHelp);
  plan->add_option("--plot", a.plots, kPlotHelp);
  return plan;
}

CLI::App* add_check(CLI::App& app, Arguments& a) {
  CLI::App* check = app.add_subcommand(
      "check", "Exit 1 unless every ladder meets its budget (and --netlist is current)");
  check->add_option("FILE", a.path, kFileHelp)->required();
  check->add_option("--netlist", a.check_netlist,
                    "Also require this netlist to be exactly what rungs emit writes now");
  check->add_flag("--json", a.json, "Print JSON instead of one line a failure");
  check->add_flag("--analytic", a.analytic,
                  "Check the analytic planner's counts (those emit --analytic writes)");
  check->add_option("--plot", a.plots, kPlotHelp);
  add_simulate_options(check, a.check_simulate);
  return check;
}

CLI::App* add_emit(CLI::App& app, Arguments& a) {
  EmitOptions& o = a.emit;
  CLI::App* emit = app.add_subcommand("emit", "Write the SPICE netlist of a description");
  emit->add_option("FILE", a.path, kFileHelp)->required();
  emit->add_option("-o,--output", o.output, "Netlist to write, - for standard output")
      ->capture_default_str();
  emit->add_flag("--library", o.library, "Subcircuits only: no drives, loads or analysis");
  emit->add_flag("--with-ideal", o.with_ideal,
                 "Also the simulator's ideal line beside each ladder, for comparison");
  emit->add_option("--report", o.report, "Write the plan report (text) here");
  emit->add_option("--report-json", o.report_json, "Write the plan report (JSON) here");
  emit->add_option("--templates", o.templates,
                   "Folder of NAME.tmpl files that replace the built-in deck templates");
  emit->add_flag("--force", o.force, "Overwrite a netlist that rungs did not write");
  emit->add_flag("-q,--quiet", o.quiet, "No summary on standard error");
  emit->add_flag("--analytic", o.analytic, kAnalyticHelp);
  emit->add_option("--depfile", o.depfile,
                   "Also write a make-syntax depfile: the outputs, made from the description "
                   "and templates");
  add_simulate_options(emit, o.simulate);
  return emit;
}

CLI::App* add_build(CLI::App& app, Arguments& a) {
  BuildOptions& o = a.build;
  CLI::App* build = app.add_subcommand(
      "build", "Write every netlist that rungs.toml lists, rewriting only what changed");
  build->add_option("--manifest", o.manifest,
                    "The manifest (default: rungs.toml here or in a folder above)");
  build->add_option("-j,--jobs", o.jobs, "Outputs written at once (default: one a processor core)")
      ->check(CLI::Range(1u, 1024u, "a whole number from 1 to 1024"));
  build->add_flag("--check", o.check,
                  "Write nothing; exit 1 listing every output that is stale or missing");
  build->add_option("--depfile", o.depfile,
                    "Also write a make-syntax depfile: the outputs, made from the manifest, "
                    "descriptions and templates");
  build->add_flag("--force", o.force, "Overwrite netlists that rungs did not write");
  build->add_flag("-q,--quiet", o.quiet, "Print only errors and stale outputs");
  build->add_flag("--analytic", o.analytic, kAnalyticHelp);
  return build;
}

/// The subcommands, each with what runs it once argv is parsed.
struct Subcommands {
  CLI::App* lines;
  CLI::App* plan;
  CLI::App* check;
  CLI::App* emit;
  CLI::App* build;
};

/// Runs the subcommand that was parsed; returns its exit code. Throws what it throws.
int dispatch(const Subcommands& s, const Arguments& a) {
  if (s.lines->parsed()) return lines_command(a.path, a.json);
  if (s.plan->parsed()) return plan_command(a.path, {a.json, a.analytic, a.plots});
  if (s.check->parsed())
    return check_command(a.path, a.check_netlist, a.json, a.analytic, a.plots, a.check_simulate);
  if (s.emit->parsed()) return emit_command(a.path, a.emit);
  if (s.build->parsed()) return build_command(a.build);
  RUNGS_UNREACHABLE("no subcommand parsed, though CLI11 requires one");
}

}  // namespace

int run(int argc, char** argv) {
  CLI::App app{"rungs: turns transmission-line descriptions into lumped-ladder SPICE netlists",
               "rungs"};
  app.set_version_flag("--version", std::string("rungs ") + RUNGS_VERSION);
  app.require_subcommand(1);
  Arguments arguments;
  const Subcommands subcommands{add_lines(app, arguments), add_plan(app, arguments),
                                add_check(app, arguments), add_emit(app, arguments),
                                add_build(app, arguments)};
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    // CLI11 prints its own usage message; --help and --version end here too, with 0.
    return app.exit(e) == 0 ? kExitOk : kExitBadInput;
  }
  try {
    return dispatch(subcommands, arguments);
  } catch (const Error& e) {
    return report(e);
  } catch (const std::exception& e) {
    return report(InternalError(e));
  }
}

}  // namespace rungs::cli
