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

int report(const Error& error) {
  fmt::print(stderr, "{}\n", error.what());
  return error.exit_code();
}

void print_note(const std::string& message) {
  fmt::print(stderr, "rungs: {}\n", message);
}

}  // namespace rungs::cli
