// The command-line front end: the only code that sees argv, files, the terminal and exit codes.
#pragma once

namespace rungs::cli {

/// Exit codes, as the README documents them.
enum ExitCode : int {
  kExitOk = 0,           // done, every check passed
  kExitCheckFailed = 1,  // a check failed (an inadequate ladder, a stale netlist)
  kExitBadInput = 2,     // the description or the command line is wrong
  kExitInternal = 3,     // a file could not be read or written, or an internal error
};

/// Runs the `rungs` command line and returns its exit code.
int run(int argc, char** argv);

}  // namespace rungs::cli
