// Test helper: runs ngspice in batch mode on a deck and reads the waveforms it wrote.
//
// Contract, for every test that reuses it:
// - simulate() runs `ngspice -b -r RAW DECK` exactly: the deck is not touched, no .control
//   block is added, no option is set (a Job may set environment variables for the run).
//   stdout and stderr are captured together in `output`; stdin is /dev/null.
// - No result depends on how long a run takes. A run still going after kHangLimit seconds
//   is taken to have stalled and is killed (SIGKILL); it comes back with hung = true, and
//   failure() says that it met the hang limit. The limit is far above any deck's run time
//   on a loaded machine, so that it catches a stall only.
// - simulate_all() runs several decks at once (at most `jobs` at a time) and returns the
//   runs in the order of the request.
// - complaints() picks out the lines of `output` that report a problem (warning, error,
//   unknown, can't find), leaving out ngspice's harmless "Note: No compatibility mode
//   selected!".
// - read_raw() reads the first plot of a raw file, binary (ngspice's default) or ASCII
//   (SPICE_ASCIIRAWFILE=1), real data only, with rungs' reader (src/4_sim/raw_file.h); it
//   throws std::runtime_error for anything else.
//   Vectors are looked up by their raw-file name ("v(rx1)", "time"), case-insensitively;
//   a bare node name ("rx1") finds its "v(rx1)".
// - Apart from the raw-file reader, nothing here knows about rungs: it is a plain ngspice
//   driver.
#pragma once
#include <fcntl.h>
#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>
#include <algorithm>
#include <cctype>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <fstream>
#include <sstream>
#include <stdexcept>
#include <string>
#include <string_view>
#include <thread>
#include <vector>

#include "4_sim/raw_file.h"

namespace rungs::testing::ngspice {

/// Wall-clock seconds after which a run is killed as stalled: a guard against a hang, not a
/// measure of speed (the slowest deck of the suite takes well under a minute).
inline constexpr double kHangLimit = 900.0;

/// What one ngspice run did.
struct Run {
  std::string deck_path;
  std::string raw_path;
  int exit_code = -1;    // ngspice's exit status; -1 when it was killed or did not start
  bool hung = false;     // killed at the hang limit
  std::string output;    // stdout and stderr, as printed
  double seconds = 0.0;  // wall-clock time of the run, for messages only
  bool ok() const { return exit_code == 0 && !hung; }
  /// Empty for a clean exit, else what went wrong, in words for a test's message.
  std::string failure() const {
    if (hung)
      return "ngspice was killed at the hang limit (" +
             std::to_string(static_cast<int>(kHangLimit)) + " s): it stalled on " + deck_path +
             "; this is not a result of the deck";
    if (exit_code != 0)
      return "ngspice exited with " + std::to_string(exit_code) + " on " + deck_path;
    return "";
  }
};

/// One deck to run, where its raw file goes, and any variables to set for the run
/// ("SPICE_ASCIIRAWFILE=1" asks ngspice for an ASCII raw file).
struct Job {
  std::string deck_path;
  std::string raw_path;
  std::vector<std::string> environment = {};
};

namespace detail {

inline std::string lower(std::string_view s) {
  std::string out(s);
  for (char& c : out) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return out;
}

inline std::string read_text(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

struct Started {
  pid_t pid = -1;
  std::string log_path;
  std::chrono::steady_clock::time_point begin;
};

/// Starts ngspice with stdout and stderr going to a log file; stdin is /dev/null so that a
/// deck that asks for input cannot wait on the terminal.
inline Started start(const Job& job) {
  static int serial = 0;
  Started s;
  s.log_path =
      "/tmp/rungs_ngspice_" + std::to_string(::getpid()) + "_" + std::to_string(serial++) + ".log";
  s.begin = std::chrono::steady_clock::now();
  std::remove(job.raw_path.c_str());  // a stale raw file must not pass for this run's
  const pid_t pid = ::fork();
  if (pid == 0) {
    const int log = ::open(s.log_path.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
    const int null = ::open("/dev/null", O_RDONLY);
    if (log < 0 || null < 0) ::_exit(126);
    ::dup2(null, 0);
    ::dup2(log, 1);
    ::dup2(log, 2);
    for (const std::string& setting : job.environment) {
      const std::size_t eq = setting.find('=');
      if (eq == std::string::npos) ::_exit(126);
      ::setenv(setting.substr(0, eq).c_str(), setting.substr(eq + 1).c_str(), 1);
    }
    ::execlp("ngspice", "ngspice", "-b", "-r", job.raw_path.c_str(), job.deck_path.c_str(),
             static_cast<char*>(nullptr));
    ::_exit(127);
  }
  s.pid = pid;
  return s;
}

inline Run finish(const Job& job, const Started& s, int status, bool hung) {
  Run run;
  run.deck_path = job.deck_path;
  run.raw_path = job.raw_path;
  run.hung = hung;
  run.exit_code = (!hung && WIFEXITED(status)) ? WEXITSTATUS(status) : -1;
  run.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - s.begin).count();
  run.output = read_text(s.log_path);
  std::remove(s.log_path.c_str());
  return run;
}

}  // namespace detail

/// True when an `ngspice` runs from PATH.
inline bool available() {
  return std::system("ngspice --version >/dev/null 2>&1 </dev/null") == 0;
}

/// Runs several decks, at most `jobs` at a time, each killed only at the hang limit. The
/// runs come back in the order of `batch`.
inline std::vector<Run> simulate_all(const std::vector<Job>& batch, int jobs = 2) {
  std::vector<Run> runs(batch.size());
  std::vector<detail::Started> active(batch.size());
  std::vector<bool> running(batch.size(), false);
  std::size_t next = 0, done = 0;
  int in_flight = 0;
  while (done < batch.size()) {
    while (in_flight < std::max(1, jobs) && next < batch.size()) {
      active[next] = detail::start(batch[next]);
      running[next] = true;
      ++in_flight;
      ++next;
    }
    bool progressed = false;
    for (std::size_t i = 0; i < batch.size(); ++i) {
      if (!running[i]) continue;
      int status = 0;
      const pid_t r = ::waitpid(active[i].pid, &status, WNOHANG);
      const double elapsed =
          std::chrono::duration<double>(std::chrono::steady_clock::now() - active[i].begin).count();
      bool hung = false;
      if (r == 0 && elapsed > kHangLimit) {
        ::kill(active[i].pid, SIGKILL);
        ::waitpid(active[i].pid, &status, 0);
        hung = true;
      } else if (r == 0) {
        continue;
      }
      runs[i] = detail::finish(batch[i], active[i], status, hung);
      running[i] = false;
      --in_flight;
      ++done;
      progressed = true;
    }
    if (!progressed) std::this_thread::sleep_for(std::chrono::milliseconds(5));
  }
  return runs;
}

/// Runs `ngspice -b -r raw_path deck_path`, killed only at the hang limit.
inline Run simulate(const std::string& deck_path, const std::string& raw_path) {
  return simulate_all({Job{deck_path, raw_path}}, 1).front();
}

/// The same for one Job (with its environment).
inline Run simulate(const Job& job) {
  return simulate_all({job}, 1).front();
}

/// The lines of ngspice's output that report a problem with the deck or the run: those that
/// contain "warning", "error", "unknown" or "can't find" (any case). ngspice's note that no
/// compatibility mode is selected is harmless and left out, and so is the echoed title.
inline std::vector<std::string> complaints(const std::string& output) {
  std::vector<std::string> found;
  std::istringstream lines(output);
  std::string line;
  while (std::getline(lines, line)) {
    const std::string l = detail::lower(line);
    if (l.find("no compatibility mode selected") != std::string::npos) continue;
    // The deck's title line, which ngspice echoes, names the description's path: a folder
    // called "errors" is not a complaint.
    if (l.find("generated by rungs") != std::string::npos) continue;
    for (const char* word : {"warning", "error", "unknown", "can't find"}) {
      if (l.find(word) != std::string::npos) {
        found.push_back(line);
        break;
      }
    }
  }
  return found;
}

/// The vectors of one real-valued plot (a transient analysis), as ngspice wrote them.
class Waveforms {
 public:
  Waveforms() = default;
  Waveforms(std::string plot, std::vector<std::string> names,
            std::vector<std::vector<double>> values)
      : plot_(std::move(plot)), names_(std::move(names)), values_(std::move(values)) {}

  const std::string& plot() const { return plot_; }
  const std::vector<std::string>& names() const { return names_; }
  std::size_t points() const { return values_.empty() ? 0 : values_.front().size(); }
  /// The first vector (time, for a transient analysis).
  const std::vector<double>& time() const { return values_.at(0); }

  bool has(std::string_view name) const { return find(name) >= 0; }
  /// A vector by name; "rx1" also finds "v(rx1)". Throws std::out_of_range when absent.
  const std::vector<double>& operator[](std::string_view name) const {
    const int i = find(name);
    if (i < 0) throw std::out_of_range("no vector '" + std::string(name) + "' in the raw file");
    return values_[static_cast<std::size_t>(i)];
  }
  /// The vector `name` at time `t`, interpolated linearly between the simulator's points
  /// (clamped to the first and last point outside them).
  double at(std::string_view name, double t) const { return interpolate(time(), (*this)[name], t); }

  /// Linear interpolation of samples (x ascending; repeated x allowed) at `t`.
  static double interpolate(const std::vector<double>& x, const std::vector<double>& y, double t) {
    if (x.empty()) throw std::out_of_range("interpolating an empty vector");
    if (t <= x.front()) return y.front();
    if (t >= x.back()) return y.back();
    const auto it = std::upper_bound(x.begin(), x.end(), t);
    const std::size_t k = static_cast<std::size_t>(it - x.begin());
    const double x0 = x[k - 1], x1 = x[k];
    if (x1 == x0) return y[k];
    return y[k - 1] + (y[k] - y[k - 1]) * (t - x0) / (x1 - x0);
  }

 private:
  int find(std::string_view name) const {
    const std::string want = detail::lower(name);
    for (std::size_t i = 0; i < names_.size(); ++i)
      if (detail::lower(names_[i]) == want) return static_cast<int>(i);
    for (std::size_t i = 0; i < names_.size(); ++i)
      if (detail::lower(names_[i]) == "v(" + want + ")") return static_cast<int>(i);
    return -1;
  }
  std::string plot_;
  std::vector<std::string> names_;
  std::vector<std::vector<double>> values_;
};

/// Reads the first plot of a SPICE3 raw file, binary or ASCII, with rungs' own reader
/// (sim::read_raw_file, which `rungs check --simulate` uses). Real data only.
inline Waveforms read_raw(const std::string& path) {
  const std::string data = detail::read_text(path);
  if (data.empty()) throw std::runtime_error("raw file '" + path + "' is missing or empty");
  try {
    sim::RawPlot plot = sim::read_raw_file(data).front();
    return Waveforms(plot.name, std::move(plot.variables), std::move(plot.values));
  } catch (const sim::RawFileError& e) {
    throw std::runtime_error("raw file '" + path + "': " + e.what());
  }
}

}  // namespace rungs::testing::ngspice
