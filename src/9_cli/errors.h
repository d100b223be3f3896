// The errors a user meets on the command line, each type with its exit code, and their printer.
#pragma once
#include <exception>
#include <stdexcept>
#include <string>

namespace rungs::cli {

/// Exit codes, as the README documents them.
enum ExitCode : int {
  kExitOk = 0,           // done, every check passed
  kExitCheckFailed = 1,  // a check failed (an inadequate ladder, a stale netlist)
  kExitBadInput = 2,     // the description or the command line is wrong
  kExitFile = 3,         // a file could not be read or written
  kExitInternal = 3,     // an internal error
  kExitSimulator = 3,    // the simulator could not be run, failed, or passed its time limit
};

/// An error a user can cause or meet, as it is printed: one line for standard error. Its type
/// says the exit code it ends rungs with; throw one of the kinds below, and let report() print
/// it. (Errors in a description or manifest are syntax::Diagnostics's: their spans and carets
/// come first, and FileHasErrors ends them.)
class Error : public std::runtime_error {
 public:
  int exit_code() const { return exit_code_; }

 protected:
  Error(int exit_code, const std::string& line) : std::runtime_error(line), exit_code_(exit_code) {}

 private:
  int exit_code_;
};

/// The command line asks for something that cannot be done (exit 2). `message` is lower case
/// and says what to write instead; the line printed is "rungs: MESSAGE".
class BadInput : public Error {
 public:
  explicit BadInput(const std::string& message) : Error(kExitBadInput, "rungs: " + message) {}
};

/// The last line after the diagnostics of a file with errors (exit 2): "FILE: N errors;
/// nothing written".
class FileHasErrors : public Error {
 public:
  FileHasErrors(const std::string& file, int errors);
};

/// A netlist is to replace a file that rungs did not write, and --force was not given (exit 2,
/// the README's code for it: the command line must change).
class RefusedOverwrite : public Error {
 public:
  explicit RefusedOverwrite(const std::string& path);
};

/// A file or folder could not be read or written (exit 3); "rungs: MESSAGE".
class FileError : public Error {
 public:
  explicit FileError(const std::string& message) : Error(kExitFile, "rungs: " + message) {}
};

/// The exact reference cannot compute a figure that was asked for (exit 3, as an internal
/// error: the design is one the reference should take); "rungs: MESSAGE".
class ReferenceFailed : public Error {
 public:
  explicit ReferenceFailed(const std::string& message)
      : Error(kExitInternal, "rungs: " + message) {}
};

/// The simulator (--simulate) could not be started, failed, ran past its time limit, or left
/// results that cannot be read (exit 3); "rungs: MESSAGE", which says what was run and ends
/// with the last lines it printed.
class SimulatorFailed : public Error {
 public:
  explicit SimulatorFailed(const std::string& message)
      : Error(kExitSimulator, "rungs: " + message) {}
};

/// A check failed (exit 1); "rungs: MESSAGE".
class CheckFailed : public Error {
 public:
  explicit CheckFailed(const std::string& message) : Error(kExitCheckFailed, "rungs: " + message) {}
};

/// An exception that no input should cause, caught where rungs stops (exit 3): "rungs:
/// internal error: WHAT".
class InternalError : public Error {
 public:
  explicit InternalError(const std::exception& cause)
      : Error(kExitInternal, std::string("rungs: internal error: ") + cause.what()) {}
};

/// Prints `error` on standard error, its line and a line break, and returns its exit code:
/// the one way the command line reports an error.
int report(const Error& error);

/// Prints "rungs: MESSAGE" on standard error: what the command did, or a note beside errors.
void print_note(const std::string& message);

}  // namespace rungs::cli
