// Printing the command line's errors and notes on standard error.
#include "9_cli/errors.h"

#include <cstdio>

#include <fmt/format.h>

namespace rungs::cli {

FileHasErrors::FileHasErrors(const std::string& file, int errors)
    : Error(kExitBadInput,
            fmt::format("{}: {} error{}; nothing written", file, errors, errors == 1 ? "" : "s")) {}

RefusedOverwrite::RefusedOverwrite(const std::string& path)
    : Error(kExitBadInput, fmt::format("rungs: '{}' exists and was not written by rungs; not "
                                       "overwriting it (use --force to replace it)",
                                       path)) {}

namespace {

/// Writes a message to standard error. When that is closed or full there is no one left to
/// tell, so the failure is ignored (the exit code still says what happened) rather than
/// ending the program with an uncaught exception.
void to_standard_error(const std::string& text) {
  std::fwrite(text.data(), 1, text.size(), stderr);
  std::fflush(stderr);
  std::clearerr(stderr);
}

}  // namespace

int report(const Error& error) {
  to_standard_error(fmt::format("{}\n", error.what()));
  return error.exit_code();
}

void print_note(const std::string& message) {
  to_standard_error(fmt::format("rungs: {}\n", message));
}

}  // namespace rungs::cli
