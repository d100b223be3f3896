// The command-line front end: the only code that sees argv, files, the terminal and exit codes.
#pragma once

#include "9_cli/errors.h"

namespace rungs::cli {

/// Runs the `rungs` command line and returns its exit code (ExitCode, errors.h).
int run(int argc, char** argv);

}  // namespace rungs::cli
