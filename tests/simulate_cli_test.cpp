// `--simulate` as a user meets it: the simulator run as a child process, its failures, its
// limits, its temporary files; and, with ngspice, every example's deck measured as simulated.
#include <catch2/catch.hpp>

#include <signal.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include <chrono>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <regex>
#include <set>
#include <sstream>
#include <string>
#include <thread>
#include <vector>

#include "ngspice.h"
#include "run_command.h"

namespace fs = std::filesystem;
namespace ng = rungs::testing::ngspice;
using rungs::testing::run_rungs;

namespace {

/// A scratch folder for this test process, removed when it ends.
const std::string& scratch() {
  struct Folder {
    std::string path = "/tmp/rungs_simulate_cli_" + std::to_string(::getpid()) + "/";
    Folder() { fs::create_directories(path); }
    ~Folder() { fs::remove_all(path); }
  };
  static Folder folder;
  return folder.path;
}

void write_file(const std::string& path, const std::string& text) {
  std::ofstream(path, std::ios::binary) << text;
}

/// A stand-in simulator: a shell script that does `body` with the arguments rungs gives it
/// ($1 -b, $2 -r, $3 the raw file, $4 the deck).
std::string fake_simulator(const std::string& name, const std::string& body) {
  const std::string path = scratch() + name;
  write_file(path, "#!/bin/sh\n" + body + "\n");
  ::chmod(path.c_str(), 0755);
  return path;
}

/// While alive, TMPDIR names a fresh folder of this test's, so that the simulation's private
/// folder can be looked for there.
struct TemporaryFolder {
  std::string path;
  explicit TemporaryFolder(const std::string& name) : path(scratch() + name) {
    fs::create_directories(path);
    ::setenv("TMPDIR", path.c_str(), 1);
  }
  ~TemporaryFolder() { ::unsetenv("TMPDIR"); }
  /// What is left in the folder.
  std::vector<std::string> left() const {
    std::vector<std::string> names;
    for (const auto& entry : fs::directory_iterator(path)) names.push_back(entry.path().string());
    return names;
  }
};

// A matched 50 ohm line, 1 ns, with a 200 ps edge: planned in an instant.
const char* kMatched =
    "design matched\n"
    "drive a step 0V to 1V rise=200ps at=100ps source=50ohm\n"
    "line t a -> b ideal z0=50ohm delay=1ns\n"
    "load b 50ohm\n";

std::string matched_file() {
  const std::string path = scratch() + "matched.rungs";
  write_file(path, kMatched);
  return path;
}

/// The number after `"key": ` in each object of the JSON array `array`, in order.
std::vector<double> json_numbers(const std::string& json, const std::string& array,
                                 const std::string& key) {
  const std::size_t start = json.find("\"" + array + "\": [");
  REQUIRE(start != std::string::npos);
  const std::size_t end = json.find(']', start);
  const std::string part = json.substr(start, end - start);
  std::vector<double> out;
  const std::regex number("\"" + key + "\": ([-0-9.e+]+)");
  for (auto it = std::sregex_iterator(part.begin(), part.end(), number);
       it != std::sregex_iterator(); ++it)
    out.push_back(std::stod((*it)[1]));
  return out;
}

}  // namespace

TEST_CASE("check --simulate: a simulator that is not there is exit 3, saying what to do") {
  const TemporaryFolder tmp("missing");
  const auto not_on_path = run_rungs(
      "check --analytic --simulate --simulator rungs-no-such-simulator " + matched_file());
  CHECK(not_on_path.exit_code == 3);
  CHECK(not_on_path.err ==
        "rungs: cannot run the simulator: 'rungs-no-such-simulator' is not found on PATH; install "
        "ngspice (Debian: apt-get install ngspice) or name it with --simulator PATH\n");
  const auto not_there =
      run_rungs("check --analytic --simulate --simulator /nonexistent/ngspice " + matched_file());
  CHECK(not_there.exit_code == 3);
  CHECK(not_there.err.find("'/nonexistent/ngspice' is not there;") != std::string::npos);
  CHECK(tmp.left().empty());
}

TEST_CASE("check --simulate: a failing simulator is exit 3 with what was run and its last lines") {
  const TemporaryFolder tmp("failing");
  const std::string sim =
      fake_simulator("failing.sh",
                     "i=1; while [ $i -le 20 ]; do echo \"line $i\"; i=$((i+1)); done\n"
                     "echo 'Error: no such model' >&2; exit 2");
  const auto r = run_rungs("check --analytic --simulate --simulator " + sim + " " + matched_file());
  CHECK(r.exit_code == 3);
  CHECK(r.out.empty());
  CHECK(r.err.rfind("rungs: the simulator failed, exit status 2: " + sim + " -b -r ", 0) == 0);
  CHECK(r.err.find("/deck.raw ") != std::string::npos);
  CHECK(r.err.find("/deck.cir; its last lines:\n") != std::string::npos);
  // The last twelve lines, standard error's among them; not the first ones.
  CHECK(r.err.find("\n  line 20\n  Error: no such model\n") != std::string::npos);
  CHECK(r.err.find("\n  line 10\n") != std::string::npos);
  CHECK(r.err.find("\n  line 9\n") == std::string::npos);
  CHECK(tmp.left().empty());
}

TEST_CASE("check --simulate: a simulator stopped at its time limit says so, and leaves nothing") {
  // A hang limit, not a measure of speed: the stand-in never ends on its own.
  const TemporaryFolder tmp("hung");
  const std::string sim = fake_simulator("hung.sh", "echo 'starting'; exec sleep 1000");
  const auto r = run_rungs("check --analytic --simulate --simulator-limit 1 --simulator " + sim +
                           " " + matched_file());
  CHECK(r.exit_code == 3);
  CHECK(r.err.rfind("rungs: the simulator was stopped at its time limit of 1 s "
                    "(--simulator-limit), taken as hung: " +
                        sim,
                    0) == 0);
  CHECK(r.err.find("its last lines:\n  starting\n") != std::string::npos);
  CHECK(tmp.left().empty());
}

TEST_CASE("check --simulate: results that are missing, unreadable or short are exit 3") {
  const TemporaryFolder tmp("results");
  const std::string file = matched_file();
  const auto none = run_rungs("check --analytic --simulate --simulator " +
                              fake_simulator("none.sh", "echo done") + " " + file);
  CHECK(none.exit_code == 3);
  CHECK(none.err.rfind("rungs: the simulator wrote no results (no raw file): ", 0) == 0);

  const auto garbage =
      run_rungs("check --analytic --simulate --simulator " +
                fake_simulator("garbage.sh", "echo nonsense > \"$3\"") + " " + file);
  CHECK(garbage.exit_code == 3);
  CHECK(garbage.err.rfind("rungs: the simulator's results cannot be read: raw file line 1: "
                          "expected 'Key: value' in a header, found 'nonsense'; it ran ",
                          0) == 0);

  // A well-formed ASCII raw file of two points that stops at 1 ps, far short of the window.
  const auto short_run = run_rungs(
      "check --analytic --simulate --simulator " +
      fake_simulator("short.sh",
                     "printf 'Title: x\\nPlotname: Transient Analysis\\nFlags: real\\n"
                     "No. Variables: 3\\nNo. Points: 2\\nVariables:\\n\\t0\\ttime\\ttime\\n"
                     "\\t1\\tv(a)\\tvoltage\\n\\t2\\tv(b)\\tvoltage\\nValues:\\n"
                     "0\\t0\\n\\t0\\n\\t0\\n1\\t1e-12\\n\\t0\\n\\t0\\n' > \"$3\"") +
      " " + file);
  CHECK(short_run.exit_code == 3);
  CHECK(short_run.err.rfind("rungs: the simulator stopped at 1e-12 s, before the end of the ", 0) ==
        0);

  // A raw file with a transient plot that lacks a saved line end.
  const auto lacking = run_rungs(
      "check --analytic --simulate --simulator " +
      fake_simulator("lacking.sh",
                     "printf 'Title: x\\nPlotname: Transient Analysis\\nFlags: real\\n"
                     "No. Variables: 2\\nNo. Points: 2\\nVariables:\\n\\t0\\ttime\\ttime\\n"
                     "\\t1\\tv(a)\\tvoltage\\nValues:\\n"
                     "0\\t0\\n\\t0\\n1\\t1\\n\\t0\\n' > \"$3\"") +
      " " + file);
  CHECK(lacking.exit_code == 3);
  CHECK(lacking.err.find(": the simulator's results hold no v(b), which the deck saves\n") !=
        std::string::npos);
  CHECK(tmp.left().empty());
}

TEST_CASE("check --simulate: an interrupted run stops the simulator and removes its folder") {
  const TemporaryFolder tmp("interrupted");
  const std::string pid_file = scratch() + "interrupted.pid";
  const std::string sim =
      fake_simulator("interrupted.sh", "echo $$ > " + pid_file + "; exec sleep 1000");
  const std::string file = matched_file();
  const pid_t rungs = ::fork();
  if (rungs == 0) {
    ::execl(RUNGS_BINARY, RUNGS_BINARY, "check", "--analytic", "--simulate", "--simulator",
            sim.c_str(), file.c_str(), static_cast<char*>(nullptr));
    ::_exit(127);
  }
  // Wait for the stand-in to start (a hang limit only: it starts in well under a second).
  const auto begin = std::chrono::steady_clock::now();
  while (!fs::exists(pid_file) &&
         std::chrono::steady_clock::now() - begin < std::chrono::seconds(300))
    std::this_thread::sleep_for(std::chrono::milliseconds(20));
  REQUIRE(fs::exists(pid_file));
  std::this_thread::sleep_for(std::chrono::milliseconds(100));  // let the pid be written whole
  pid_t simulator = 0;
  std::ifstream(pid_file) >> simulator;
  REQUIRE(simulator > 0);
  CHECK(tmp.left().size() == 1);  // its private folder, while it runs
  ::kill(rungs, SIGTERM);
  int status = 0;
  ::waitpid(rungs, &status, 0);
  // rungs ends as the signal ends a program, after stopping its child and removing the folder.
  CHECK(WIFSIGNALED(status));
  CHECK(WTERMSIG(status) == SIGTERM);
  CHECK(tmp.left().empty());
  CHECK(::kill(simulator, 0) == -1);
}

TEST_CASE("check --simulate: its options need it, a library cannot be simulated") {
  CHECK(run_rungs("check --analytic --simulator ngspice " + matched_file()).exit_code == 2);
  CHECK(run_rungs("check --analytic --simulate --simulator-limit 0 " + matched_file()).exit_code ==
        2);
  const auto library = run_rungs("emit --analytic --library --simulate -o " + scratch() +
                                 "library.cir " + matched_file());
  CHECK(library.exit_code == 2);
  CHECK(library.err.find("rungs: --simulate needs a deck; a library (--library) has no analysis "
                         "to run\n") != std::string::npos);
}

// ---- with ngspice ---------------------------------------------------------------------------

TEST_CASE("check --simulate: a matched line, the JSON keys, the split and its parts", "[ngspice]") {
  REQUIRE(ng::available());
  const TemporaryFolder tmp("matched");
  const auto r = run_rungs("check --analytic --simulate --json " + matched_file());
  INFO(r.out << r.err);
  CHECK(r.exit_code == 0);
  CHECK(r.out.find("\"ok\": true") != std::string::npos);
  // Each simulated end has exactly these four keys.
  const std::regex entry(
      "\\{\\s*\"node\": \"(a|b)\",\\s*\"simulated_error\": [-0-9.e+]+,\\s*"
      "\"ladder_error\": [-0-9.e+]+,\\s*\"simulation_error\": [-0-9.e+]+\\s*\\}");
  const std::size_t start = r.out.find("\"simulated\": [");
  REQUIRE(start != std::string::npos);
  const std::string array = r.out.substr(start, r.out.find(']', start) - start);
  CHECK(std::distance(std::sregex_iterator(array.begin(), array.end(), entry),
                      std::sregex_iterator()) == 2);
  const auto simulated = json_numbers(r.out, "simulated", "simulated_error");
  const auto ladder = json_numbers(r.out, "simulated", "ladder_error");
  const auto added = json_numbers(r.out, "simulated", "simulation_error");
  REQUIRE(simulated.size() == 2);
  for (std::size_t i = 0; i < 2; ++i) {
    // The largest of a sum is at most the sum of the largest (on one grid).
    CHECK(simulated[i] <= ladder[i] + added[i] + 1e-15);
    CHECK(added[i] <= 0.25 * 0.02);  // the deck's step keeps the simulation in its share
    CHECK(added[i] > 0.0);           // a simulator is never exactly the exact ladder
  }
  // The ladder's share is what check measures: the line's error is its larger end.
  const auto line_error = json_numbers(r.out, "lines", "error");
  REQUIRE(line_error.size() == 1);
  CHECK(std::max(ladder[0], ladder[1]) == Approx(line_error[0]).epsilon(1e-9));
  CHECK(tmp.left().empty());

  // ASCII results (SPICE_ASCIIRAWFILE=1, which the simulator inherits) give the same figures.
  ::setenv("SPICE_ASCIIRAWFILE", "1", 1);
  const auto ascii = run_rungs("check --analytic --simulate --json " + matched_file());
  ::unsetenv("SPICE_ASCIIRAWFILE");
  const auto ascii_simulated = json_numbers(ascii.out, "simulated", "simulated_error");
  REQUIRE(ascii_simulated.size() == 2);
  for (std::size_t i = 0; i < 2; ++i)
    CHECK(ascii_simulated[i] == Approx(simulated[i]).epsilon(1e-9));
}

TEST_CASE("check --simulate: a deck whose maximum step is too coarse fails, the simulation named",
          "[ngspice]") {
  REQUIRE(ng::available());
  const TemporaryFolder tmp("coarse");
  // The same line with the deck's maximum step forced to 100 ps, half its edge's ramp.
  const std::string path = scratch() + "coarse.rungs";
  write_file(path, std::string(kMatched) + "set step 100ps\n");
  const auto plain = run_rungs("check --analytic " + path);
  CHECK(plain.exit_code == 0);  // the ladder itself is within its budget
  const auto r = run_rungs("check --analytic --simulate " + path);
  INFO(r.out << r.err);
  CHECK(r.exit_code == 1);
  CHECK(r.out.find("simulated by ngspice in ") == 0);
  CHECK(r.out.find("method trap, maximum step 1e-10 s") != std::string::npos);
  const std::regex failure(
      "node (a|b): the simulated deck errs [0-9.]+ % of the swing, over its 2 % budget \\(the "
      "ladder's own error [0-9.e-]+ %, the simulation's [0-9.]+ % at [0-9.]+ ns\\); the "
      "simulation is over its share of 0.5 %: write set step ([0-9.]+)ps in the description "
      "\\(the deck's maximum step is 100ps\\)\n");
  std::smatch m;
  REQUIRE(std::regex_search(r.out, m, failure));
  // The step it suggests does what it says.
  const std::string fixed = scratch() + "fixed.rungs";
  write_file(fixed, std::string(kMatched) + "set step " + m[2].str() + "ps\n");
  const auto again = run_rungs("check --analytic --simulate " + fixed);
  INFO(again.out << again.err);
  CHECK(again.exit_code == 0);
  CHECK(again.out.find("matched: every line adequate, simulated deck within every budget\n") !=
        std::string::npos);
}

TEST_CASE("emit --simulate writes the deck, reports on stderr, and plots beside it", "[ngspice]") {
  REQUIRE(ng::available());
  const TemporaryFolder tmp("emit");
  const std::string deck = scratch() + "emitted.cir";
  const auto r = run_rungs("emit --analytic --simulate -o " + deck + " --force " + matched_file());
  INFO(r.err);
  CHECK(r.exit_code == 0);
  CHECK(fs::exists(deck));
  CHECK(r.err.find("simulated by ngspice in ") != std::string::npos);
  CHECK(r.err.find("  node  simulated  ladder  simulation  budget") != std::string::npos);
  // The charts of check --simulate --plot draw the simulator's waveform beside the others.
  const std::string charts = scratch() + "charts";
  const auto plotted =
      run_rungs("check --analytic --simulate --plot " + charts + " " + matched_file());
  CHECK(plotted.exit_code == 0);
  std::ifstream in(charts + "/waveform_b.svg");
  std::stringstream svg;
  svg << in.rdbuf();
  CHECK(svg.str().find("simulator") != std::string::npos);
  CHECK(svg.str().find("exact line") != std::string::npos);
  CHECK(tmp.left().empty());
}

TEST_CASE("every example through check --simulate: the simulation within its share",
          "[ngspice][slow]") {
  REQUIRE(ng::available());
  const TemporaryFolder tmp("examples");
  std::vector<std::string> sources;
  for (const auto& entry : fs::directory_iterator(RUNGS_SOURCE_DIR "/examples"))
    if (entry.path().extension() == ".rungs") sources.push_back(entry.path().string());
  std::sort(sources.begin(), sources.end());
  REQUIRE(sources.size() >= 5);
  for (const std::string& source : sources) {
    for (const std::string planner : {"--analytic", ""}) {
      INFO(source << " " << planner);
      const auto check = run_rungs("check --json " + planner + " " + source);
      const auto r = run_rungs("check --simulate --json " + planner + " " + source);
      INFO(r.out << r.err);
      // The simulation adds a verdict and never takes one away: it fails what the check fails.
      CHECK((r.exit_code == 0 || r.exit_code == 1));
      if (check.exit_code == 1) CHECK(r.exit_code == 1);
      CHECK((r.out.find("\"ok\": true") != std::string::npos) == (r.exit_code == 0));
      const auto simulated = json_numbers(r.out, "simulated", "simulated_error");
      const auto ladder = json_numbers(r.out, "simulated", "ladder_error");
      const auto added = json_numbers(r.out, "simulated", "simulation_error");
      REQUIRE(!simulated.empty());
      REQUIRE(ladder.size() == simulated.size());
      REQUIRE(added.size() == simulated.size());
      const auto tolerance = json_numbers(r.out, "lines", "tolerance");
      const double smallest = *std::min_element(tolerance.begin(), tolerance.end());
      for (std::size_t i = 0; i < simulated.size(); ++i) {
        CHECK(simulated[i] <= ladder[i] + added[i] + 1e-15);
        // The deck's transient settings keep what the simulation adds under a quarter of the
        // smallest budget of the design (every end's own budget is at least that).
        CHECK(added[i] <= 0.25 * smallest);
      }
    }
  }
  CHECK(tmp.left().empty());
}
