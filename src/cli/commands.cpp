// Subcommands of `rungs`: reading the description, running the stages, printing results.
#include "cli/commands.h"

#include <cerrno>
#include <cstring>
#include <fstream>
#include <iostream>
#include <optional>
#include <sstream>

#include <CLI/CLI.hpp>
#include <fmt/format.h>

#include <filesystem>

#include "cli/output_file.h"
#include "emit/deck.h"
#include "emit/sha256.h"
#include "physics/resolve.h"
#include "plan/plan.h"
#include "report/lines_table.h"
#include "report/plan_report.h"
#include "sim/peak.h"
#include "syntax/parser.h"
#include "syntax/suggest.h"

namespace rungs::cli {

namespace {

/// Reads a description from a path, or from standard input for "-".
std::optional<syntax::SourceFile> read_source(const std::string& path) {
  std::ostringstream text;
  if (path == "-") {
    text << std::cin.rdbuf();
    return syntax::SourceFile{"<stdin>", text.str()};
  }
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    fmt::print(stderr, "rungs: cannot read '{}': {}\n", path, std::strerror(errno));
    return std::nullopt;
  }
  text << in.rdbuf();
  return syntax::SourceFile{path, text.str()};
}

/// Parses and resolves; prints every diagnostic to stderr. Empty when there were errors.
std::optional<physics::Circuit> load_circuit(const syntax::SourceFile& file) {
  syntax::Diagnostics diagnostics(file);
  const auto description = syntax::parse_description(diagnostics);
  physics::Circuit circuit = physics::resolve(description, diagnostics);
  std::cerr << diagnostics.render();
  if (diagnostics.has_errors()) {
    fmt::print(stderr, "{}: {} error{}; nothing written\n", file.name, diagnostics.error_count(),
               diagnostics.error_count() == 1 ? "" : "s");
    return std::nullopt;
  }
  return circuit;
}

/// Everything a planned design needs downstream.
struct Planned {
  syntax::SourceFile file;
  physics::Circuit circuit;
  plan::Plan plan;
};

/// Reads, resolves and plans; prints diagnostics. Empty (with `exit_code` set) on failure.
std::optional<Planned> load_plan(const std::string& path, int& exit_code) {
  auto file = read_source(path);
  if (!file) {
    exit_code = kExitInternal;
    return std::nullopt;
  }
  syntax::Diagnostics diagnostics(*file);
  const auto description = syntax::parse_description(diagnostics);
  physics::Circuit circuit = physics::resolve(description, diagnostics);
  plan::Plan plan;
  if (!diagnostics.has_errors()) plan = plan::plan_circuit(circuit, diagnostics);
  std::cerr << diagnostics.render();
  if (diagnostics.has_errors()) {
    fmt::print(stderr, "{}: {} error{}; nothing written\n", file->name, diagnostics.error_count(),
               diagnostics.error_count() == 1 ? "" : "s");
    exit_code = kExitBadInput;
    return std::nullopt;
  }
  return Planned{std::move(*file), std::move(circuit), std::move(plan)};
}

/// The built-in templates with any found in `folder` (NAME.tmpl) put in their place.
std::optional<emit::TemplateSet> load_templates(const std::string& folder) {
  emit::TemplateSet templates = emit::builtin_templates();
  if (folder.empty()) return templates;
  namespace fs = std::filesystem;
  std::error_code ec;
  if (!fs::is_directory(folder, ec)) {
    fmt::print(stderr, "rungs: --templates '{}' is not a folder\n", folder);
    return std::nullopt;
  }
  std::vector<std::string_view> known;
  for (const auto& [name, text] : emit::builtin_templates()) known.push_back(name);
  std::vector<fs::path> files;
  for (const auto& entry : fs::directory_iterator(folder, ec))
    if (entry.path().extension() == ".tmpl") files.push_back(entry.path());
  std::sort(files.begin(), files.end());
  for (const fs::path& file : files) {
    const std::string name = file.stem().string();
    if (!templates.count(name)) {
      fmt::print(stderr, "rungs: {}: no deck part is called '{}'{}\n", file.string(), name,
                 syntax::did_you_mean(name, known));
      return std::nullopt;
    }
    std::ifstream in(file, std::ios::binary);
    std::ostringstream text;
    text << in.rdbuf();
    templates[name] = text.str();
  }
  return templates;
}

struct EmitOptions {
  std::string output = "-";
  std::string report;
  std::string report_json;
  std::string templates;
  bool library = false;
  bool with_ideal = false;
  bool force = false;
  bool quiet = false;
};

int emit_command(const std::string& path, const EmitOptions& options) {
  int exit_code = kExitOk;
  const auto planned = load_plan(path, exit_code);
  if (!planned) return exit_code;
  const auto templates = load_templates(options.templates);
  if (!templates) return kExitBadInput;
  const emit::DeckSource source{planned->file.name, emit::sha256_hex(planned->file.text)};
  const emit::DeckOptions deck_options{options.library, options.with_ideal};

  // A bad template is found before anything is written.
  if (std::string error = emit::check_templates(*templates); !error.empty()) {
    fmt::print(stderr, "rungs: {}\n", error);
    return kExitBadInput;
  }
  std::string error = write_atomically(
      options.output,
      [&](std::ostream& out) {
        emit::write_deck(out, planned->circuit, planned->plan, source, *templates, deck_options);
      },
      /*protect_foreign=*/true, options.force);
  if (!error.empty()) {
    fmt::print(stderr, "rungs: {}\n", error);
    return error.find("not overwriting") != std::string::npos ? kExitBadInput : kExitInternal;
  }
  if (!options.report.empty() || !options.report_json.empty()) {
    const sim::PeakEstimate peak = sim::estimate_peak(planned->circuit, planned->plan);
    for (const auto& [target, text] :
         {std::pair{options.report,
                    options.report.empty() ? std::string()
                                           : report::plan_text(planned->circuit, planned->plan,
                                                               peak, planned->file.name)},
          std::pair{options.report_json,
                    options.report_json.empty()
                        ? std::string()
                        : report::plan_json(planned->circuit, planned->plan, peak)}}) {
      if (target.empty()) continue;
      error = write_atomically(target, [&](std::ostream& out) { out << text; }, false, true);
      if (!error.empty()) {
        fmt::print(stderr, "rungs: {}\n", error);
        return kExitInternal;
      }
    }
  }
  if (!options.quiet)
    fmt::print(stderr, "rungs: {}\n", report::plan_summary(planned->circuit, planned->plan));
  return kExitOk;
}

int plan_command(const std::string& path, bool json) {
  int exit_code = kExitOk;
  const auto planned = load_plan(path, exit_code);
  if (!planned) return exit_code;
  const sim::PeakEstimate peak = sim::estimate_peak(planned->circuit, planned->plan);
  std::cout << (json ? report::plan_json(planned->circuit, planned->plan, peak)
                     : report::plan_text(planned->circuit, planned->plan, peak, planned->file.name));
  std::cout.flush();
  return std::cout ? kExitOk : kExitInternal;
}

int lines_command(const std::string& path, bool json) {
  const auto file = read_source(path);
  if (!file) return kExitInternal;
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
  lines->add_option("FILE", path, "Description file (.rungs), or - for standard input")
      ->required();
  lines->add_flag("--json", json, "Print JSON (SI units) instead of a table");

  CLI::App* plan = app.add_subcommand("plan", "Print how each line becomes a ladder; write nothing");
  plan->add_option("FILE", path, "Description file (.rungs), or - for standard input")
      ->required();
  plan->add_flag("--json", json, "Print JSON (SI units) instead of a report");

  EmitOptions emit_options;
  CLI::App* emit = app.add_subcommand("emit", "Write the SPICE netlist of a description");
  emit->add_option("FILE", path, "Description file (.rungs), or - for standard input")
      ->required();
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

  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    const int code = app.exit(e);
    return code == 0 ? kExitOk : kExitBadInput;
  }
  try {
    if (lines->parsed()) return lines_command(path, json);
    if (plan->parsed()) return plan_command(path, json);
    if (emit->parsed()) return emit_command(path, emit_options);
  } catch (const std::exception& e) {
    fmt::print(stderr, "rungs: internal error: {}\n", e.what());
    return kExitInternal;
  }
  return kExitBadInput;
}

}  // namespace rungs::cli
