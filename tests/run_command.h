// Test helper: runs the real rungs binary through the shell and captures what it printed.
#pragma once
#include <cstdio>
#include <fstream>
#include <sstream>
#include <string>
#include <sys/wait.h>
#include <unistd.h>

namespace rungs::testing {

struct CommandResult {
  int exit_code = -1;
  std::string out;  // standard output
  std::string err;  // standard error
};

/// Runs `rungs ARGS` (ARGS as shell words) with optional standard input text.
inline CommandResult run_rungs(const std::string& args, const std::string& input = "") {
  static int serial = 0;
  const std::string base = "/tmp/rungs_test_" + std::to_string(::getpid()) + "_" +
                           std::to_string(serial++);
  const std::string in_path = base + ".in", err_path = base + ".err";
  std::ofstream(in_path) << input;
  const std::string command =
      std::string(RUNGS_BINARY) + " " + args + " <" + in_path + " 2>" + err_path;
  CommandResult result;
  FILE* pipe = ::popen(command.c_str(), "r");
  char buffer[4096];
  std::size_t n;
  while ((n = std::fread(buffer, 1, sizeof buffer, pipe)) > 0) result.out.append(buffer, n);
  const int status = ::pclose(pipe);
  result.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  std::ifstream err(err_path);
  std::ostringstream text;
  text << err.rdbuf();
  result.err = text.str();
  std::remove(in_path.c_str());
  std::remove(err_path.c_str());
  return result;
}

}  // namespace rungs::testing
