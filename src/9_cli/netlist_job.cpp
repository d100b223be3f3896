// One description through the pipeline: read, defaults, resolve, plan, templates, outputs.
#include "9_cli/netlist_job.h"
#include "9_cli/output_file.h"
#include "9_cli/progress.h"

#include <algorithm>
#include <cerrno>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <sstream>

#include <fmt/format.h>

#include "9_cli/commands.h"
#include "6_emit/sha256.h"
#include "3_model/resolve.h"
#include "7_report/plan_report.h"
#include "7_report/plots.h"
#include "1_syntax/parser.h"
#include "1_syntax/suggest.h"

namespace rungs::cli {

namespace fs = std::filesystem;

namespace {

/// The built-in templates with any found in `folder` (NAME.tmpl) put in their place; the
/// files read are added to `files`. Empty, with `error` set, on a bad folder or name.
std::optional<emit::TemplateSet> load_templates(const std::string& folder,
                                                std::vector<std::string>& files,
                                                std::string& error) {
  emit::TemplateSet templates = emit::builtin_templates();
  if (folder.empty()) return templates;
  std::error_code ec;
  if (!fs::is_directory(folder, ec)) {
    error = fmt::format("rungs: --templates '{}' is not a folder\n", folder);
    return std::nullopt;
  }
  std::vector<std::string_view> known;
  for (const auto& [name, text] : emit::builtin_templates()) known.push_back(name);
  std::vector<fs::path> paths;
  for (const auto& entry : fs::directory_iterator(folder, ec))
    if (entry.path().extension() == ".tmpl") paths.push_back(entry.path());
  std::sort(paths.begin(), paths.end());
  for (const fs::path& path : paths) {
    const std::string name = path.stem().string();
    if (!templates.count(name)) {
      error = fmt::format("rungs: {}: no deck part is called '{}'{}\n", path.string(), name,
                          syntax::did_you_mean(name, known));
      return std::nullopt;
    }
    std::ifstream in(path, std::ios::binary);
    std::ostringstream text;
    text << in.rdbuf();
    if (!in) {
      error = fmt::format("rungs: cannot read '{}': {}\n", path.string(), std::strerror(errno));
      return std::nullopt;
    }
    templates[name] = text.str();
    files.push_back(path.string());
  }
  return templates;
}

std::string absolute_path(const std::string& path) {
  std::error_code ec;
  const fs::path absolute = fs::absolute(path, ec);
  return (ec ? fs::path(path) : absolute).lexically_normal().string();
}

}  // namespace

std::optional<syntax::SourceFile> read_source(const std::string& path, std::string& error) {
  std::ostringstream text;
  if (path == "-") {
    text << std::cin.rdbuf();
    return syntax::SourceFile{"<stdin>", text.str()};
  }
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    error = fmt::format("rungs: cannot read '{}': {}\n", path, std::strerror(errno));
    return std::nullopt;
  }
  text << in.rdbuf();
  return syntax::SourceFile{path, text.str()};
}

const plan::Verification* verification_of(const PreparedNetlist& netlist) {
  return netlist.verification ? &*netlist.verification : nullptr;
}

Preparation prepare_netlist(const NetlistJob& job) {
  Preparation result;
  auto file = read_source(job.source, result.messages);
  if (!file) {
    result.exit_code = kExitInternal;
    return result;
  }
  PreparedNetlist netlist;
  netlist.file = std::move(*file);
  syntax::Diagnostics diagnostics(netlist.file);
  auto description = syntax::parse_description(diagnostics);
  build::apply_defaults(description, job.defaults);
  netlist.circuit = model::resolve(description, diagnostics);
  if (!diagnostics.has_errors()) netlist.plan = plan::plan_circuit(netlist.circuit, diagnostics);
  result.messages += diagnostics.render();
  if (diagnostics.has_errors()) {
    result.messages +=
        fmt::format("{}: {} error{}; nothing written\n", netlist.file.name,
                    diagnostics.error_count(), diagnostics.error_count() == 1 ? "" : "s");
    result.exit_code = kExitBadInput;
    return result;
  }
  std::string error;
  auto templates = load_templates(job.templates, netlist.template_files, error);
  // A bad template is found before anything is written.
  if (templates) {
    if (std::string problem = emit::check_templates(*templates); !problem.empty())
      error = fmt::format("rungs: {}\n", problem);
  }
  if (!error.empty()) {
    result.messages += error;
    result.exit_code = kExitBadInput;
    return result;
  }
  netlist.templates = std::move(*templates);
  if (!job.analytic) {
    try {
      const ProgressNote note(fmt::format("verifying the ladders of {}", netlist.circuit.name));
      auto [verified, verification] = plan::plan_verified(netlist.circuit, netlist.plan);
      netlist.plan = std::move(verified);
      netlist.verification = std::move(verification);
    } catch (const std::exception& e) {
      result.messages += fmt::format("{}: warning: the exact reference cannot check this design "
                                     "({}); the analytic plan is used\n",
                                     netlist.file.name, e.what());
    }
  }
  if (netlist.plan.closing_voltage.empty()) {
    try {
      plan::set_closing_voltages(netlist.circuit, netlist.plan);
    } catch (const std::exception& e) {
      result.messages += fmt::format("{}: warning: the switches' open voltages cannot be found "
                                     "({}); they close at once\n",
                                     netlist.file.name, e.what());
      std::fill(netlist.plan.closing.begin(), netlist.plan.closing.end(), 0.0);
      netlist.plan.closing_voltage.assign(netlist.circuit.loads.size(), 0.0);
    }
  }
  if (!job.report.empty() || !job.report_json.empty())
    netlist.peak = sim::estimate_peak(netlist.circuit, netlist.plan.window);
  result.netlist = std::move(netlist);
  return result;
}

std::string write_plots(const std::string& folder, const PreparedNetlist& netlist) {
  std::error_code ec;
  std::filesystem::create_directories(folder, ec);
  if (ec) return fmt::format("cannot make the folder '{}': {}", folder, ec.message());
  std::vector<report::PlotFile> plots;
  try {
    const ProgressNote note("drawing the charts");
    plots = report::plan_plots(netlist.circuit, netlist.plan,
                               plan::measure_plan_curves(netlist.circuit, netlist.plan));
  } catch (const std::exception& e) {
    return fmt::format("cannot draw the charts: {}", e.what());
  }
  for (const report::PlotFile& plot : plots) {
    const std::string path = (std::filesystem::path(folder) / plot.name).string();
    std::string error = write_atomically(
        path, [&](std::ostream& out) { out << plot.svg; }, /*protect_foreign=*/false, true);
    if (!error.empty()) return error;
  }
  return "";
}

std::vector<JobOutput> job_outputs(const NetlistJob& job, const PreparedNetlist& netlist) {
  std::vector<JobOutput> outputs;
  // The header and the report name the source as the job says, so that a build's outputs
  // do not depend on the folder it was started from.
  const std::string& name = job.header_name.empty() ? netlist.file.name : job.header_name;
  outputs.push_back({job.output, true, [&job, &netlist, name](std::ostream& out) {
                       const emit::DeckSource source{name, emit::sha256_hex(netlist.file.text)};
                       const emit::DeckOptions options{job.library, job.with_ideal};
                       emit::write_deck(out, netlist.circuit, netlist.plan, source,
                                        netlist.templates, options);
                     }});
  if (!job.report.empty()) {
    outputs.push_back({job.report, false, [&netlist, name](std::ostream& out) {
                         out << report::plan_text(netlist.circuit, netlist.plan, *netlist.peak,
                                                  name, verification_of(netlist));
                       }});
  }
  if (!job.report_json.empty()) {
    outputs.push_back({job.report_json, false, [&netlist](std::ostream& out) {
                         out << report::plan_json(netlist.circuit, netlist.plan, *netlist.peak,
                                                  verification_of(netlist));
                       }});
  }
  return outputs;
}

std::vector<std::string> job_prerequisites(const NetlistJob& job, const PreparedNetlist& netlist) {
  std::vector<std::string> paths;
  if (job.source != "-") paths.push_back(absolute_path(job.source));
  for (const std::string& file : netlist.template_files) paths.push_back(absolute_path(file));
  return paths;
}

}  // namespace rungs::cli
