// Subcommands of `rungs`: reading the description, running the stages, printing results.
#include "9_cli/commands.h"

#include <iostream>
#include <optional>

#include <fmt/format.h>
#include <CLI/CLI.hpp>

#include "9_cli/netlist_job.h"
#include "9_cli/subcommands.h"
#include "3_model/resolve.h"
#include "7_report/lines_table.h"
#include "7_report/plan_report.h"
#include "4_sim/peak.h"
#include "1_syntax/parser.h"

namespace rungs::cli {

namespace {

/// Parses and resolves; prints every diagnostic to stderr. Empty when there were errors.
std::optional<model::Circuit> load_circuit(const syntax::SourceFile& file) {
  syntax::Diagnostics diagnostics(file);
  const auto description = syntax::parse_description(diagnostics);
  model::Circuit circuit = model::resolve(description, diagnostics);
  std::cerr << diagnostics.render();
  if (diagnostics.has_errors()) {
    fmt::print(stderr, "{}: {} error{}; nothing written\n", file.name, diagnostics.error_count(),
               diagnostics.error_count() == 1 ? "" : "s");
    return std::nullopt;
  }
  return circuit;
}

int plan_command(const std::string& path, bool json, bool analytic, const std::string& plots) {
  NetlistJob job;
  job.source = path;
  job.analytic = analytic;
  const Preparation prepared = prepare_netlist(job);
  std::cerr << prepared.messages;
  if (!prepared.netlist) return prepared.exit_code;
  const PreparedNetlist* planned = &*prepared.netlist;
  const sim::PeakEstimate peak = sim::estimate_peak(planned->circuit, planned->plan.window);
  const plan::Verification* verification = verification_of(*planned);
  if (!plots.empty()) {
    if (std::string error = write_plots(plots, *planned); !error.empty()) {
      fmt::print(stderr, "rungs: {}\n", error);
      return kExitInternal;
    }
  }
  std::cout << (json ? report::plan_json(planned->circuit, planned->plan, peak, verification)
                     : report::plan_text(planned->circuit, planned->plan, peak, planned->file.name,
                                         verification));
  std::cout.flush();
  return std::cout ? kExitOk : kExitInternal;
}

int lines_command(const std::string& path, bool json) {
  std::string error;
  const auto file = read_source(path, error);
  if (!file) {
    std::cerr << error;
    return kExitInternal;
  }
  const auto circuit = load_circuit(*file);
  if (!circuit) return kExitBadInput;
  std::cout << (json ? report::lines_json(*circuit) : report::lines_table(*circuit));
  std::cout.flush();
  return std::cout ? kExitOk : kExitInternal;
}

}  // namespace

int run(int argc, char** argv) {
  CLI::App app{"rungs: turns transmission-line descriptions into lumped-ladder SPICE netlists",
               "rungs"};
  app.set_version_flag("--version", std::string("rungs ") + RUNGS_VERSION);
  app.require_subcommand(1);

  std::string path;
  bool json = false;
  CLI::App* lines = app.add_subcommand("lines", "Print every line's Z0, delay, L', C', R', G'");
  lines->add_option("FILE", path, "Description file (.rungs), or - for standard input")->required();
  lines->add_flag("--json", json, "Print JSON (SI units) instead of a table");

  CLI::App* plan =
      app.add_subcommand("plan", "Print how each line becomes a ladder; write nothing");
  plan->add_option("FILE", path, "Description file (.rungs), or - for standard input")->required();
  plan->add_flag("--json", json, "Print JSON (SI units) instead of a report");
  bool analytic = false;
  constexpr const char* analytic_help =
      "Plan by the analytic estimate alone: faster, but no ladder is measured against the exact "
      "line";
  plan->add_flag("--analytic", analytic, analytic_help);

  std::string check_netlist;
  CLI::App* check = app.add_subcommand(
      "check", "Exit 1 unless every ladder meets its budget (and --netlist is current)");
  check->add_option("FILE", path, "Description file (.rungs), or - for standard input")
      ->required();
  check->add_option("--netlist", check_netlist,
                    "Also require this netlist to be exactly what rungs emit writes now");
  check->add_flag("--json", json, "Print JSON instead of one line a failure");
  check->add_flag("--analytic", analytic,
                  "Check the analytic planner's counts (those emit --analytic writes)");
  std::string plots;
  plan->add_option("--plot", plots,
                   "Write SVG charts here: waveforms at each load, error against sections");
  check->add_option("--plot", plots,
                    "Write SVG charts here: waveforms at each load, error against sections");

  EmitOptions emit_options;
  CLI::App* emit = app.add_subcommand("emit", "Write the SPICE netlist of a description");
  emit->add_option("FILE", path, "Description file (.rungs), or - for standard input")->required();
  emit->add_option("-o,--output", emit_options.output, "Netlist to write, - for standard output")
      ->capture_default_str();
  emit->add_flag("--library", emit_options.library,
                 "Subcircuits only: no drives, loads or analysis");
  emit->add_flag("--with-ideal", emit_options.with_ideal,
                 "Also the simulator's ideal line beside each ladder, for comparison");
  emit->add_option("--report", emit_options.report, "Write the plan report (text) here");
  emit->add_option("--report-json", emit_options.report_json, "Write the plan report (JSON) here");
  emit->add_option("--templates", emit_options.templates,
                   "Folder of NAME.tmpl files that replace the built-in deck templates");
  emit->add_flag("--force", emit_options.force, "Overwrite a netlist that rungs did not write");
  emit->add_flag("-q,--quiet", emit_options.quiet, "No summary on standard error");
  emit->add_flag("--analytic", emit_options.analytic, analytic_help);
  emit->add_option("--depfile", emit_options.depfile,
                   "Also write a make-syntax depfile: the outputs, made from the description "
                   "and templates");

  BuildOptions build_options;
  CLI::App* build = app.add_subcommand(
      "build", "Write every netlist that rungs.toml lists, rewriting only what changed");
  build->add_option("--manifest", build_options.manifest,
                    "The manifest (default: rungs.toml here or in a folder above)");
  build
      ->add_option("-j,--jobs", build_options.jobs,
                   "Outputs written at once (default: one a processor core)")
      ->check(CLI::PositiveNumber);
  build->add_flag("--check", build_options.check,
                  "Write nothing; exit 1 listing every output that is stale or missing");
  build->add_option("--depfile", build_options.depfile,
                    "Also write a make-syntax depfile: the outputs, made from the manifest, "
                    "descriptions and templates");
  build->add_flag("--force", build_options.force, "Overwrite netlists that rungs did not write");
  build->add_flag("-q,--quiet", build_options.quiet, "Print only errors and stale outputs");
  build->add_flag("--analytic", build_options.analytic, analytic_help);

  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    const int code = app.exit(e);
    return code == 0 ? kExitOk : kExitBadInput;
  }
  try {
    if (lines->parsed()) return lines_command(path, json);
    if (plan->parsed()) return plan_command(path, json, analytic, plots);
    if (check->parsed()) return check_command(path, check_netlist, json, analytic, plots);
    if (emit->parsed()) return emit_command(path, emit_options);
    if (build->parsed()) return build_command(build_options);
  } catch (const std::exception& e) {
    fmt::print(stderr, "rungs: internal error: {}\n", e.what());
    return kExitInternal;
  }
  return kExitBadInput;
}

}  // namespace rungs::cli
