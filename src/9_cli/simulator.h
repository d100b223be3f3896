// Running the simulator on a deck: a child process in a private folder, under a time limit.
#pragma once
#include <string>
#include <string_view>

#include "4_sim/raw_file.h"

namespace rungs::cli {

/// How to run the simulator (--simulator, --simulator-limit).
struct SimulatorOptions {
  std::string program = "ngspice";  // looked up on PATH unless it holds a '/'
  double time_limit = 600.0;        // s: a hang limit, far above a deck's run time
};

/// One finished run of the simulator.
struct SimulatorRun {
  std::string command;     // what was run, as a shell would write it
  sim::RawPlot transient;  // the transient analysis of its raw file
  double seconds = 0.0;    // wall time of the run, for the report only
};

/// Writes `deck` into a private temporary folder (made by mkdtemp under $TMPDIR, else /tmp),
/// runs `PROGRAM -b -r FOLDER/deck.raw FOLDER/deck.cir` with standard input from /dev/null and
/// standard output and error into a file there, in rungs' own environment (so
/// SPICE_ASCIIRAWFILE=1 asks ngspice for an ASCII raw file, which is read as well), waits at most
/// the time limit, reads the raw file's transient plot and removes the folder, whatever
/// happens. An interrupt (SIGINT, SIGTERM, SIGHUP) while it runs stops the simulator, removes
/// the folder, then ends rungs as the signal would have. Throws SimulatorFailed when the
/// program cannot be started, exits with a status other than 0 or by a signal, passes the time
/// limit (it is then killed, and the message says the limit was hit), leaves no raw file, or one
/// that cannot be read, holds no transient analysis or stops before `window` (s); the message
/// names the command and ends with the last lines it printed. Throws FileError when the folder
/// or the deck cannot be written.
SimulatorRun run_simulator(const SimulatorOptions& options, std::string_view deck, double window);

/// `word` as one word of a POSIX shell command line: as it is when it holds nothing a shell
/// reads specially, else in single quotes.
std::string shell_word(const std::string& word);

}  // namespace rungs::cli
