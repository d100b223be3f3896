// Running the simulator as a child process: private folder, captured output, time limit.
#include "9_cli/simulator.h"

#include <fcntl.h>
#include <signal.h>
#include <spawn.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cerrno>
#include <chrono>
#include <csignal>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <thread>
#include <vector>

#include <fmt/format.h>

#include "1_syntax/text.h"
#include "9_cli/errors.h"

extern char** environ;

namespace rungs::cli {

namespace fs = std::filesystem;

namespace {

/// The signal that asked rungs to stop while the simulator ran, or 0.
volatile std::sig_atomic_t stop_signal = 0;

extern "C" void note_stop_signal(int signal) {
  stop_signal = signal;
}

constexpr int kStopSignals[] = {SIGINT, SIGTERM, SIGHUP};

/// While alive, the stop signals are noted (stop_signal) instead of ending rungs, so that the
/// run can stop its child and remove its folder first. A signal that was ignored stays ignored.
class StopSignals {
 public:
  StopSignals() {
    stop_signal = 0;
    for (std::size_t i = 0; i < std::size(kStopSignals); ++i) {
      struct sigaction noted {};
      noted.sa_handler = note_stop_signal;
      sigemptyset(&noted.sa_mask);
      ::sigaction(kStopSignals[i], nullptr, &old_[i]);
      if (old_[i].sa_handler != SIG_IGN) ::sigaction(kStopSignals[i], &noted, nullptr);
    }
  }
  ~StopSignals() { restore(); }
  StopSignals(const StopSignals&) = delete;
  StopSignals& operator=(const StopSignals&) = delete;

  void restore() {
    for (std::size_t i = 0; i < std::size(kStopSignals); ++i)
      ::sigaction(kStopSignals[i], &old_[i], nullptr);
  }

 private:
  struct sigaction old_[std::size(kStopSignals)]{};
};

/// A folder only this process uses, removed with everything in it when this goes.
class PrivateFolder {
 public:
  PrivateFolder() {
    const char* base = std::getenv("TMPDIR");
    std::string pattern = std::string(base && *base ? base : "/tmp") + "/rungs-simulate-XXXXXX";
    std::vector<char> name(pattern.begin(), pattern.end());
    name.push_back('\0');
    if (!::mkdtemp(name.data()))
      throw FileError(
          fmt::format("cannot make a temporary folder like '{}' for the simulation: "
                      "{}",
                      pattern, std::strerror(errno)));
    path_ = name.data();
  }
  ~PrivateFolder() { remove(); }
  PrivateFolder(const PrivateFolder&) = delete;
  PrivateFolder& operator=(const PrivateFolder&) = delete;

  const std::string& path() const { return path_; }
  std::string file(std::string_view name) const { return path_ + "/" + std::string(name); }
  void remove() {
    std::error_code ec;
    if (!path_.empty()) fs::remove_all(path_, ec);
  }

 private:
  std::string path_;
};

std::string read_bytes(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream bytes;
  bytes << in.rdbuf();
  return bytes.str();
}

/// The last `count` lines of `text` that are not blank, each indented, after a line break;
/// or a note that it printed nothing.
std::string last_lines(const std::string& text, std::size_t count) {
  std::vector<std::string> lines;
  std::istringstream in(text);
  std::string line;
  while (std::getline(in, line)) {
    if (!line.empty() && line.back() == '\r') line.pop_back();
    if (line.find_first_not_of(" \t") != std::string::npos) lines.push_back(line);
  }
  if (lines.empty()) return "; it printed nothing";
  std::string out = "; its last lines:";
  for (std::size_t i = lines.size() > count ? lines.size() - count : 0; i < lines.size(); ++i) {
    out += "\n  ";
    out += lines[i];
  }
  return out;
}

/// Starts the child in a process group of its own, so that a time limit stops all it started.
pid_t start(const std::vector<std::string>& argv, const std::string& log_path,
            const std::string& command) {
  posix_spawn_file_actions_t actions;
  posix_spawnattr_t attributes;
  posix_spawn_file_actions_init(&actions);
  posix_spawnattr_init(&attributes);
  posix_spawn_file_actions_addopen(&actions, 0, "/dev/null", O_RDONLY, 0);
  posix_spawn_file_actions_addopen(&actions, 1, log_path.c_str(), O_WRONLY | O_CREAT | O_TRUNC,
                                   0600);
  posix_spawn_file_actions_adddup2(&actions, 1, 2);
  sigset_t none, defaults;
  sigemptyset(&none);
  sigemptyset(&defaults);
  for (const int s : kStopSignals) sigaddset(&defaults, s);
  posix_spawnattr_setsigmask(&attributes, &none);
  posix_spawnattr_setsigdefault(&attributes, &defaults);
  posix_spawnattr_setpgroup(&attributes, 0);
  posix_spawnattr_setflags(&attributes,
                           POSIX_SPAWN_SETPGROUP | POSIX_SPAWN_SETSIGMASK | POSIX_SPAWN_SETSIGDEF);
  std::vector<char*> args;
  for (const std::string& a : argv) args.push_back(const_cast<char*>(a.c_str()));
  args.push_back(nullptr);
  pid_t pid = -1;
  const int error =
      ::posix_spawnp(&pid, argv.front().c_str(), &actions, &attributes, args.data(), environ);
  posix_spawn_file_actions_destroy(&actions);
  posix_spawnattr_destroy(&attributes);
  if (error == ENOENT)
    throw SimulatorFailed(fmt::format(
        "cannot run the simulator: '{}' is not {}; install ngspice (Debian: apt-get install "
        "ngspice) or name it with --simulator PATH",
        argv.front(), argv.front().find('/') == std::string::npos ? "found on PATH" : "there"));
  if (error != 0)
    throw SimulatorFailed(
        fmt::format("cannot run the simulator: {}: {}", command, std::strerror(error)));
  return pid;
}

/// How the child ended, waited for at most `limit` seconds; stops it (its whole group) at the
/// limit or when rungs is asked to stop. Returns the wait status, or -1 when stopped at the limit.
int wait_for(pid_t pid, double limit, PrivateFolder& folder, StopSignals& signals) {
  const auto begin = std::chrono::steady_clock::now();
  for (;;) {
    int status = 0;
    const pid_t r = ::waitpid(pid, &status, WNOHANG);
    if (r == pid) return status;
    if (r < 0 && errno != EINTR)
      throw SimulatorFailed(
          fmt::format("cannot wait for the simulator (process {}): {}", pid, std::strerror(errno)));
    if (stop_signal != 0) {
      const int which = stop_signal;
      ::kill(-pid, SIGKILL);
      ::waitpid(pid, &status, 0);
      folder.remove();
      signals.restore();
      std::raise(which);
      std::_Exit(128 + which);  // reached only when the signal's old action let rungs live
    }
    const double elapsed =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - begin).count();
    if (elapsed > limit) {
      ::kill(-pid, SIGKILL);
      ::waitpid(pid, &status, 0);
      return -1;
    }
    std::this_thread::sleep_for(std::chrono::milliseconds(10));
  }
}

/// The transient plot of the raw file's bytes; throws SimulatorFailed when there is none.
sim::RawPlot transient_plot(const std::string& bytes, const std::string& command,
                            const std::string& output) {
  std::vector<sim::RawPlot> plots;
  try {
    plots = sim::read_raw_file(bytes);
  } catch (const sim::RawFileError& e) {
    throw SimulatorFailed(fmt::format("the simulator's results cannot be read: {}; it ran {}{}",
                                      e.what(), command, last_lines(output, 12)));
  }
  for (sim::RawPlot& plot : plots)
    if (syntax::fold_case(plot.name).find("transient") != std::string::npos) return std::move(plot);
  throw SimulatorFailed(fmt::format("the simulator's results hold no transient analysis: {}{}",
                                    command, last_lines(output, 12)));
}

}  // namespace

std::string shell_word(const std::string& word) {
  const bool plain = !word.empty() && word.find_first_not_of(
                                          "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz"
                                          "0123456789_./+,:=@%-") == std::string::npos;
  if (plain) return word;
  std::string quoted = "'";
  for (char c : word) quoted += c == '\'' ? std::string("'\\''") : std::string(1, c);
  return quoted + "'";
}

SimulatorRun run_simulator(const SimulatorOptions& options, std::string_view deck, double window) {
  StopSignals signals;
  PrivateFolder folder;
  const std::string deck_path = folder.file("deck.cir");
  const std::string raw_path = folder.file("deck.raw");
  const std::string log_path = folder.file("output.txt");
  {
    std::ofstream out(deck_path, std::ios::binary);
    out << deck;
    out.close();
    if (!out)
      throw FileError(fmt::format("cannot write the deck to simulate into '{}': {}", deck_path,
                                  std::strerror(errno)));
  }
  const std::vector<std::string> argv = {options.program, "-b", "-r", raw_path, deck_path};
  std::string command;
  for (const std::string& a : argv) {
    if (!command.empty()) command += ' ';
    command += shell_word(a);
  }
  SimulatorRun run;
  run.command = command;
  const auto begin = std::chrono::steady_clock::now();
  const pid_t pid = start(argv, log_path, command);
  const int status = wait_for(pid, options.time_limit, folder, signals);
  run.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - begin).count();
  const std::string output = read_bytes(log_path);
  if (status == -1)
    throw SimulatorFailed(fmt::format(
        "the simulator was stopped at its time limit of {:g} s (--simulator-limit), taken as "
        "hung: {}{}",
        options.time_limit, command, last_lines(output, 12)));
  if (WIFSIGNALED(status))
    throw SimulatorFailed(fmt::format("the simulator was ended by signal {} ({}): {}{}",
                                      WTERMSIG(status), strsignal(WTERMSIG(status)), command,
                                      last_lines(output, 12)));
  if (!WIFEXITED(status) || WEXITSTATUS(status) != 0)
    throw SimulatorFailed(fmt::format("the simulator failed, exit status {}: {}{}",
                                      WIFEXITED(status) ? WEXITSTATUS(status) : -1, command,
                                      last_lines(output, 12)));
  std::error_code ec;
  if (!fs::exists(raw_path, ec))
    throw SimulatorFailed(fmt::format("the simulator wrote no results (no raw file): {}{}", command,
                                      last_lines(output, 12)));
  run.transient = transient_plot(read_bytes(raw_path), command, output);
  const std::vector<double>* time = run.transient.find("time");
  const double reached = time && !time->empty() ? time->back() : 0.0;
  if (!(reached >= window * (1.0 - 1e-9)))
    throw SimulatorFailed(
        fmt::format("the simulator stopped at {:g} s, before the end of the "
                    "{:g} s window: {}{}",
                    reached, window, command, last_lines(output, 12)));
  return run;
}

}  // namespace rungs::cli
