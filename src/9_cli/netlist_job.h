// The emit path that `rungs emit` and `rungs build` share: one description, its outputs.
#pragma once
#include <functional>
#include <optional>
#include <ostream>
#include <string>
#include <vector>

#include "1_syntax/input_file.h"
#include "3_model/circuit.h"
#include "4_sim/peak.h"
#include "4_sim/raw_file.h"
#include "5_plan/plan.h"
#include "5_plan/thread_pool.h"
#include "5_plan/verify.h"
#include "6_emit/netlist.h"
#include "8_project/manifest.h"
#include "9_cli/errors.h"
#include "9_cli/output_file.h"

namespace rungs::cli {

/// One description and what to make of it. Paths are as the process opens them.
struct NetlistJob {
  std::string source;       // the description; "-" for standard input
  std::string header_name;  // how the deck's header names the source; empty: `source`
  std::string output;       // the netlist; "-" for standard output
  std::string report;       // optional: the plan report (text)
  std::string report_json;  // optional: the plan report (JSON)
  std::string templates;    // optional: a folder of NAME.tmpl overrides
  bool library = false;
  bool with_ideal = false;
  /// Plan by the analytic estimate only; otherwise (the default) by the verified planner,
  /// every ladder measured against the exact reference.
  bool analytic = false;
  /// Keep the verification's waveforms at the line ends (plan::VerifyOptions), for --simulate.
  bool keep_end_traces = false;
  std::vector<project::DefaultSetting> defaults;  // design-wide settings from a manifest
  // What named each output, for the messages of refuse_clashing_outputs.
  std::string output_named_by = "-o";
  std::string report_named_by = "--report";
  std::string report_json_named_by = "--report-json";
};

/// A description read, resolved and planned, with everything its outputs need.
struct PreparedNetlist {
  syntax::InputFile file;
  model::Circuit circuit;
  plan::Plan plan;
  emit::TemplateSet templates;
  std::vector<std::string> template_files;         // the override files read
  std::optional<sim::PeakEstimate> peak;           // computed when a report is asked for
  std::optional<plan::Verification> verification;  // when the job verifies
};

/// The outcome of prepare_netlist: a netlist, or the error that stopped it.
struct Preparation {
  std::optional<PreparedNetlist> netlist;
  std::string messages;        // diagnostics and warnings, for standard error, in order
  std::optional<Error> error;  // set when there is no netlist; printed after `messages`
};

/// Reads the job's description and templates, applies its defaults, resolves, plans (with
/// the verified planner on `pool` unless job.analytic; if the exact reference cannot take the
/// circuit, the analytic plan stands and a warning says so), fills the switches' closing
/// voltages, and checks the templates. Writes nothing and prints nothing, not even progress:
/// every message is in the result. Safe to call from several threads at once.
Preparation prepare_netlist(const NetlistJob& job, plan::ThreadPool& pool);
/// As above, with the description's text already read (`file`).
Preparation prepare_netlist(const NetlistJob& job, syntax::InputFile file, plan::ThreadPool& pool);

/// prepare_netlist for a command's top level, on its main thread: reads the description, then
/// shows a progress line on the terminal while the ladders are verified (not while standard
/// input is read), prints the messages on standard error, and returns the netlist or throws
/// its error.
PreparedNetlist prepare_for_command(const NetlistJob& job, plan::ThreadPool& pool);

/// The verification of a prepared netlist, or null when it was planned analytically.
const plan::Verification* verification_of(const PreparedNetlist& netlist);

/// Writes the plan's charts (7_report/plots.h) as SVG files into `folder`, creating it; with
/// `simulated`, a simulator's run of the deck, its waveforms are drawn beside the exact and the
/// ladder ones. Throws FileError, or ReferenceFailed when a chart's waveforms cannot be computed.
void write_plots(const std::string& folder, const PreparedNetlist& netlist,
                 const sim::RawPlot* simulated = nullptr);

/// The netlist text the job writes (its first output), in memory.
std::string netlist_text(const NetlistJob& job, const PreparedNetlist& netlist);

/// One file a netlist job produces.
/// The largest description read_source takes, in bytes.
inline constexpr std::size_t kMaxDescriptionBytes = std::size_t{256} << 20;

struct JobOutput {
  std::string path;
  OutputKind kind = OutputKind::netlist;
  std::string named_by;  // the option or manifest key that named it, for messages
  std::function<void(std::ostream&)> write;
};

/// The files of a prepared job, netlist first, then the reports asked for. The writers refer
/// to `netlist`, which must outlive them.
std::vector<JobOutput> job_outputs(const NetlistJob& job, const PreparedNetlist& netlist);

/// What the outputs were made from, as absolute paths, for a depfile: the description and
/// the template overrides read. Not their folder: a folder's time changes whenever a file in
/// it is written, and outputs beside the templates would then never be up to date.
std::vector<std::string> job_prerequisites(const NetlistJob& job, const PreparedNetlist& netlist);

/// Reads a description from a path, or from standard input for "-"; throws FileError when it
/// cannot be read.
syntax::InputFile read_source(const std::string& path);

}  // namespace rungs::cli
