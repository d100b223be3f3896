// One description through the pipeline: read, defaults, resolve, plan, templates, outputs.
#include "9_cli/netlist_job.h"

#include <algorithm>
#include <cerrno>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <sstream>
#include <vector>

#include <fcntl.h>
#include <unistd.h>

#include <fmt/format.h>

#include "1_syntax/parser.h"
#include "1_syntax/suggest.h"
#include "3_model/resolve.h"
#include "6_emit/sha256.h"
#include "7_report/plan_report.h"
#include "5_plan/simulation_check.h"
#include "7_report/plots.h"
#include "9_cli/errors.h"
#include "9_cli/output_file.h"
#include "9_cli/progress.h"

namespace rungs::cli {

namespace fs = std::filesystem;

namespace {

/// The built-in templates with any found in `folder` (NAME.tmpl) put in their place; the
/// files read are added to `files`. Throws BadInput for a bad folder or name, FileError for a
/// file that cannot be read.
emit::TemplateSet load_templates(const std::string& folder, std::vector<std::string>& files) {
  emit::TemplateSet templates = emit::builtin_templates();
  if (folder.empty()) return templates;
  std::error_code ec;
  if (!fs::is_directory(folder, ec))
    throw BadInput(fmt::format("--templates '{}' is not a folder", folder));
  std::vector<std::string_view> known;
  for (const auto& [name, text] : emit::builtin_templates()) known.push_back(name);
  std::vector<fs::path> paths;
  for (const auto& entry : fs::directory_iterator(folder, ec))
    if (entry.path().extension() == ".tmpl") paths.push_back(entry.path());
  std::sort(paths.begin(), paths.end());
  for (const fs::path& path : paths) {
    const std::string name = path.stem().string();
    if (!templates.count(name))
      throw BadInput(fmt::format("{}: no deck part is called '{}'{}", path.string(), name,
                                 syntax::did_you_mean(name, known)));
    std::ifstream in(path, std::ios::binary);
    std::ostringstream text;
    text << in.rdbuf();
    if (!in)
      throw FileError(fmt::format("cannot read '{}': {}", path.string(), std::strerror(errno)));
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

/// The job's description with its defaults applied, resolved and planned by the analytic
/// estimate; the diagnostics are added to `messages`. Throws FileHasErrors when the
/// description has errors.
PreparedNetlist resolve_and_plan(const NetlistJob& job, syntax::InputFile file,
                                 std::string& messages) {
  PreparedNetlist netlist;
  netlist.file = std::move(file);
  syntax::Diagnostics diagnostics(netlist.file);
  auto description = syntax::parse_description(diagnostics);
  project::apply_defaults(description, job.defaults);
  netlist.circuit = model::resolve(description, diagnostics);
  // A deck of no line would be a .tran of nothing (window 0): say so instead.
  if (!diagnostics.has_errors() && netlist.circuit.lines.empty())
    diagnostics.error(syntax::Span{},
                      "the description has no line, so there is no deck to write: add one, "
                      "for example 'line trunk drv -> rx ideal z0=50ohm delay=1ns'");
  if (!diagnostics.has_errors()) netlist.plan = plan::plan_circuit(netlist.circuit, diagnostics);
  messages += diagnostics.render();
  if (diagnostics.has_errors()) throw FileHasErrors(netlist.file.name, diagnostics.error_count());
  return netlist;
}

/// The verified plan in place of the analytic one; when the exact reference cannot take the
/// circuit, the analytic plan stands and a warning in `messages` says so.
void verify_counts(PreparedNetlist& netlist, plan::ThreadPool& pool, bool keep_end_traces,
                   std::string& messages) {
  try {
    auto [verified, verification] =
        plan::plan_verified(netlist.circuit, netlist.plan, pool, {keep_end_traces});
    netlist.plan = std::move(verified);
    netlist.verification = std::move(verification);
  } catch (const std::exception& e) {
    messages += fmt::format(
        "{}: warning: the exact reference cannot check this design ({}); "
        "the analytic plan is used\n",
        netlist.file.name, e.what());
  }
}

/// The switches' open voltages when they start to close, unless the verified planner found
/// them; when they cannot be found, the switches close at once and a warning says so.
void fill_closing_voltages(PreparedNetlist& netlist, std::string& messages) {
  if (!netlist.plan.closing_voltage.empty()) return;
  try {
    plan::set_closing_voltages(netlist.circuit, netlist.plan);
  } catch (const std::exception& e) {
    messages += fmt::format(
        "{}: warning: the switches' open voltages cannot be found ({}); "
        "they close at once\n",
        netlist.file.name, e.what());
    std::fill(netlist.plan.closing.begin(), netlist.plan.closing.end(), 0.0);
    netlist.plan.closing_voltage.assign(netlist.circuit.loads.size(), 0.0);
  }
}

/// prepare_netlist, throwing the error that stops it.
PreparedNetlist prepare(const NetlistJob& job, syntax::InputFile file, plan::ThreadPool& pool,
                        std::string& messages) {
  PreparedNetlist netlist = resolve_and_plan(job, std::move(file), messages);
  // A bad template is found before anything is written.
  netlist.templates = load_templates(job.templates, netlist.template_files);
  if (std::string problem = emit::check_templates(netlist.templates); !problem.empty())
    throw BadInput(problem);
  if (!job.analytic) verify_counts(netlist, pool, job.keep_end_traces, messages);
  fill_closing_voltages(netlist, messages);
  if (!job.report.empty() || !job.report_json.empty())
    netlist.peak = sim::estimate_peak(netlist.circuit, netlist.plan.window);
  return netlist;
}

}  // namespace

namespace {

/// All of `in`, refused (FileError) past kMaxDescriptionBytes: a description of that size is
/// not one a person wrote, and a stream without end must not fill the memory.
std::string read_at_most(std::istream& in, const std::string& what) {
  std::string text;
  std::vector<char> chunk(1 << 16);
  while (in) {
    in.read(chunk.data(), static_cast<std::streamsize>(chunk.size()));
    text.append(chunk.data(), static_cast<std::size_t>(in.gcount()));
    if (text.size() > kMaxDescriptionBytes)
      throw FileError(fmt::format("{} is larger than {} MiB, more than a description holds; "
                                  "split the design into several descriptions",
                                  what, kMaxDescriptionBytes >> 20));
  }
  if (in.bad()) throw FileError(fmt::format("cannot read {}", what));
  return text;
}

}  // namespace

syntax::InputFile read_source(const std::string& path) {
  if (path == "-") {
    if (::fcntl(STDIN_FILENO, F_GETFD) == -1)
      throw FileError("standard input is closed; give a description file, or pipe one into -");
    return syntax::InputFile{"<stdin>", read_at_most(std::cin, "standard input")};
  }
  std::error_code ec;
  const auto status = std::filesystem::status(path, ec);
  if (std::filesystem::is_directory(status))
    throw FileError(fmt::format("'{}' is a folder; name a description file in it", path));
  if (std::filesystem::exists(status) && !std::filesystem::is_regular_file(status))
    throw FileError(fmt::format("'{}' is not a plain file; to read a stream, pipe it into -",
                                path));
  std::ifstream in(path, std::ios::binary);
  if (!in) throw FileError(fmt::format("cannot read '{}': {}", path, std::strerror(errno)));
  return syntax::InputFile{path, read_at_most(in, "'" + path + "'")};
}

const plan::Verification* verification_of(const PreparedNetlist& netlist) {
  return netlist.verification ? &*netlist.verification : nullptr;
}

Preparation prepare_netlist(const NetlistJob& job, syntax::InputFile file,
                            plan::ThreadPool& pool) {
  Preparation result;
  try {
    result.netlist = prepare(job, std::move(file), pool, result.messages);
  } catch (const Error& e) {
    result.error = e;
  }
  return result;
}

Preparation prepare_netlist(const NetlistJob& job, plan::ThreadPool& pool) {
  try {
    return prepare_netlist(job, read_source(job.source), pool);
  } catch (const Error& e) {
    Preparation result;
    result.error = e;
    return result;
  }
}

PreparedNetlist prepare_for_command(const NetlistJob& job, plan::ThreadPool& pool) {
  syntax::InputFile file = read_source(job.source);
  Preparation prepared = [&] {
    const ProgressNote note(job.analytic ? ""
                                         : fmt::format("verifying the ladders of {}", file.name));
    return prepare_netlist(job, std::move(file), pool);
  }();
  std::cerr << prepared.messages;
  if (prepared.error) throw *prepared.error;
  return std::move(*prepared.netlist);
}

void write_plots(const std::string& folder, const PreparedNetlist& netlist,
                 const sim::RawPlot* simulated) {
  std::error_code ec;
  std::filesystem::create_directories(folder, ec);
  if (ec) throw FileError(fmt::format("cannot make the folder '{}': {}", folder, ec.message()));
  std::vector<report::PlotFile> plots;
  try {
    plan::PlanCurves curves = plan::measure_plan_curves(netlist.circuit, netlist.plan);
    if (simulated) plan::add_simulated(curves, *simulated);
    plots = report::plan_plots(netlist.circuit, netlist.plan, curves, verification_of(netlist));
  } catch (const std::exception& e) {
    throw ReferenceFailed(fmt::format("cannot draw the charts: {}", e.what()));
  }
  // A chart would replace a file someone else wrote: refuse before any chart is written.
  for (const report::PlotFile& plot : plots) {
    const std::string path = (std::filesystem::path(folder) / plot.name).string();
    if (is_foreign_file(path, OutputKind::chart))
      throw FileError(fmt::format("'{}' exists and is not a chart rungs drew; not overwriting it "
                                  "(move it, or give --plot another folder)",
                                  path));
  }
  for (const report::PlotFile& plot : plots) {
    const std::string path = (std::filesystem::path(folder) / plot.name).string();
    write_atomically(
        path, [&](std::ostream& out) { out << plot.svg; }, OutputKind::chart, false);
  }
}

std::string netlist_text(const NetlistJob& job, const PreparedNetlist& netlist) {
  std::ostringstream text;
  job_outputs(job, netlist).front().write(text);
  return text.str();
}

std::vector<JobOutput> job_outputs(const NetlistJob& job, const PreparedNetlist& netlist) {
  std::vector<JobOutput> outputs;
  // The header and the report name the source as the job says, so that a build's outputs
  // do not depend on the folder it was started from.
  const std::string& name = job.header_name.empty() ? netlist.file.name : job.header_name;
  outputs.push_back({job.output, OutputKind::netlist, job.output_named_by, [&job, &netlist, name](std::ostream& out) {
                       const emit::NetlistOrigin source{name, emit::sha256_hex(netlist.file.text)};
                       const emit::NetlistOptions options{job.library, job.with_ideal};
                       emit::write_netlist(out, netlist.circuit, netlist.plan, source,
                                        netlist.templates, options);
                     }});
  if (!job.report.empty()) {
    outputs.push_back({job.report, OutputKind::report, job.report_named_by, [&netlist, name](std::ostream& out) {
                         out << report::plan_text(netlist.circuit, netlist.plan, *netlist.peak,
                                                  name, verification_of(netlist));
                       }});
  }
  if (!job.report_json.empty()) {
    outputs.push_back({job.report_json, OutputKind::report_json, job.report_json_named_by,
                       [&netlist](std::ostream& out) {
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
