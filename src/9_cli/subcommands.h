// The subcommands that write files, for commands.cpp to call once argv is parsed.
#pragma once
#include <string>

#include "9_cli/simulator.h"

namespace rungs::cli {

/// `--simulate` and its options, for check and emit.
struct SimulateOptions {
  bool simulate = false;  // run the deck in the simulator and measure what it shows
  SimulatorOptions simulator;
};

/// `rungs emit FILE` and its options.
struct EmitOptions {
  std::string output = "-";
  std::string report;
  std::string report_json;
  std::string templates;
  std::string depfile;
  bool library = false;
  bool with_ideal = false;
  bool force = false;
  bool quiet = false;
  bool analytic = false;  // plan by the analytic estimate only, unmeasured
  SimulateOptions simulate;
};

/// Writes the netlist of `path` (and the reports and depfile asked for); returns the exit code.
int emit_command(const std::string& path, const EmitOptions& options);

/// `rungs build` and its options.
struct BuildOptions {
  std::string manifest;  // empty: rungs.toml, looked up from the current folder upward
  unsigned jobs = 0;     // 0: one a core
  std::string depfile;
  bool check = false;
  bool force = false;
  bool quiet = false;
  bool analytic = false;  // plan every output by the analytic estimate only, unmeasured
};

/// Builds, or with `check` compares, every output of a manifest; returns the exit code.
int build_command(const BuildOptions& options);

/// `rungs check FILE [--netlist FILE] [--json] [--analytic]`: exit 0 when every ladder that
/// emit writes (with the same --analytic) is adequate, measured against the exact reference, and,
/// with a netlist, when it is exactly what emit would write now; else exit 1 with one line of
/// reason for each failure.
/// With `plots`, also writes the SVG charts into that folder. With `simulate`, also runs the
/// deck in the simulator and fails (exit 1) for every line end whose simulated error is over its
/// budget, with one line naming the part that is over; the charts then draw the simulator's
/// waveforms too.
int check_command(const std::string& path, const std::string& netlist, bool json, bool analytic,
                  const std::string& plots, const SimulateOptions& simulate);

}  // namespace rungs::cli
