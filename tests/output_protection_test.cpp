// Every file a command writes is protected as the deck is: never over the input, never two
// outputs onto one file, never over a file rungs did not write without --force, and nothing
// written when any one of them is refused. Runs the real binary.
#include <catch2/catch.hpp>

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <set>
#include <sstream>
#include <string>
#include <utility>

#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include "run_command.h"

namespace fs = std::filesystem;
using rungs::testing::run_rungs;

namespace {

const fs::path kExample = fs::path(RUNGS_SOURCE_DIR) / "examples" / "clock_fanout.rungs";

struct Folder {
  fs::path path;
  Folder() {
    std::string pattern = (fs::temp_directory_path() / "rungs_protect_XXXXXX").string();
    REQUIRE(::mkdtemp(pattern.data()) != nullptr);
    path = pattern;
    fs::copy_file(kExample, path / "d.rungs");
  }
  ~Folder() {
    std::error_code ec;
    fs::remove_all(path, ec);
  }
  std::string operator/(const std::string& name) const { return (path / name).string(); }
  std::set<std::string> entries() const {
    std::set<std::string> names;
    for (const auto& entry : fs::directory_iterator(path)) names.insert(entry.path().filename());
    return names;
  }
};

std::string read_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

/// 'PATH', as messages quote a file.
std::string quoted(const std::string& path) {
  std::string text = "'";
  text += path;
  text += "'";
  return text;
}

void write_file(const std::string& path, const std::string& text) {
  std::ofstream(path, std::ios::binary) << text;
}

}  // namespace

TEST_CASE("no output of emit may name the description or another output", "[cli]") {
  Folder dir;
  const std::string source = dir / "d.rungs";
  const std::string original = read_file(source);
  const auto onto_input = run_rungs("emit --analytic " + source + " -o " + source);
  CHECK(onto_input.exit_code == 2);
  CHECK(onto_input.err.find("-o names " + quoted(source) + ", which is the description") !=
        std::string::npos);
  const auto report_onto_input =
      run_rungs("emit --analytic " + source + " -o " + (dir / "a.cir") + " --report " + source);
  CHECK(report_onto_input.exit_code == 2);
  CHECK(report_onto_input.err.find("--report names") != std::string::npos);
  // Through a link to the description.
  fs::create_symlink(source, dir / "link.txt");
  const auto through_link = run_rungs("emit --analytic " + source + " -o " + (dir / "a.cir") +
                                      " --report-json " + (dir / "link.txt"));
  CHECK(through_link.exit_code == 2);
  CHECK(through_link.err.find("which is the description") != std::string::npos);
  CHECK(read_file(source) == original);

  const auto same_file = run_rungs("emit --analytic " + source + " -o " + (dir / "a.cir") +
                                   " --report " + (dir / "a.cir"));
  CHECK(same_file.exit_code == 2);
  CHECK(same_file.err == "rungs: -o and --report both name " + quoted(dir / "a.cir") +
                             "; give each output its own file\n");
  const auto both_stdout = run_rungs("emit --analytic " + source + " -o - --report -");
  CHECK(both_stdout.exit_code == 2);
  CHECK(both_stdout.out.empty());
  CHECK(both_stdout.err.find("both name standard output") != std::string::npos);
  CHECK(dir.entries() == std::set<std::string>{"d.rungs", "link.txt"});
}

TEST_CASE("reports and depfiles are not written over someone else's file", "[cli]") {
  Folder dir;
  const std::string source = dir / "d.rungs";
  const std::string notes = "my notes on the clock tree\n";
  write_file(dir / "notes.txt", notes);
  write_file(dir / "rules.d", "all:\n\tmake -C sub\n");
  const std::string base = "emit -q --analytic " + source + " -o " + (dir / "a.cir");

  for (const std::string& option : {std::string(" --report "), std::string(" --report-json ")}) {
    const auto refused = run_rungs(base + option + (dir / "notes.txt"));
    CHECK(refused.exit_code == 2);
    CHECK(refused.err.find(quoted(dir / "notes.txt") + " exists and was not written by rungs") !=
          std::string::npos);
    CHECK(read_file(dir / "notes.txt") == notes);
    // The deck, which could have been written, was not: a refusal leaves everything as it was.
    CHECK_FALSE(fs::exists(dir / "a.cir"));
  }
  const auto depfile = run_rungs(base + " --depfile " + (dir / "rules.d"));
  CHECK(depfile.exit_code == 2);
  CHECK(read_file(dir / "rules.d") == "all:\n\tmake -C sub\n");
  CHECK_FALSE(fs::exists(dir / "a.cir"));

  // --force replaces them.
  const auto forced = run_rungs(base + " --force --report " + (dir / "notes.txt"));
  CHECK(forced.exit_code == 0);
  CHECK(read_file(dir / "notes.txt").rfind("design clock_fanout", 0) == 0);
}

TEST_CASE("every output rungs writes is recognised as its own and rewritten, mode kept",
          "[cli]") {
  Folder dir;
  const std::string source = dir / "d.rungs";
  const std::string args = "emit -q --analytic " + source + " -o " + (dir / "a.cir") +
                           " --report " + (dir / "r.txt") + " --report-json " +
                           (dir / "r.json") + " --depfile " + (dir / "a.d");
  REQUIRE(run_rungs(args).exit_code == 0);
  REQUIRE(::chmod((dir / "r.txt").c_str(), 0640) == 0);
  REQUIRE(::chmod((dir / "a.cir").c_str(), 0600) == 0);
  // A second run over the first one's files is not refused: each kind is recognised.
  const auto again = run_rungs(args);
  CHECK(again.exit_code == 0);
  CHECK(again.err.empty());
  struct stat status {};
  REQUIRE(::stat((dir / "r.txt").c_str(), &status) == 0);
  CHECK((status.st_mode & 0777) == 0640);
  REQUIRE(::stat((dir / "a.cir").c_str(), &status) == 0);
  CHECK((status.st_mode & 0777) == 0600);

  const std::string charts = dir / "charts";
  REQUIRE(run_rungs("plan --analytic " + source + " --plot " + charts).exit_code == 0);
  const auto redraw = run_rungs("plan --analytic " + source + " --plot " + charts);
  CHECK(redraw.exit_code == 0);
  // A file of someone else's among the charts' names stops the drawing before any is drawn.
  write_file(charts + "/error_trunk.svg", "<svg>my own drawing</svg>\n");
  fs::remove(charts + "/error_br1.svg");
  const auto refused = run_rungs("plan --analytic " + source + " --plot " + charts);
  CHECK(refused.exit_code == 3);
  CHECK(refused.err.find("is not a chart rungs drew") != std::string::npos);
  CHECK(read_file(charts + "/error_trunk.svg") == "<svg>my own drawing</svg>\n");
  CHECK_FALSE(fs::exists(charts + "/error_br1.svg"));
}

TEST_CASE("a line break in the description's file name cannot add lines to the deck", "[cli]") {
  Folder dir;
  const std::string name = "board\nR1 a 0 1\n.rungs";
  fs::copy_file(kExample, dir.path / name);
  const std::string source = dir / name;
  // The name, quoted for the shell as one word: it holds no single quote.
  const auto r = run_rungs("emit -q --analytic '" + source + "' -o " + (dir / "a.cir") +
                           " --report " + (dir / "a.txt"));
  REQUIRE(r.exit_code == 0);
  const std::string deck = read_file(dir / "a.cir");
  CHECK(deck.find("\nR1 a 0 1") == std::string::npos);
  CHECK(deck.find("board\\x0aR1 a 0 1\\x0a.rungs; do not edit") != std::string::npos);
  CHECK(read_file(dir / "a.txt").find("\nR1 a 0 1") == std::string::npos);
}

TEST_CASE("inputs that are not descriptions are refused, not read as an empty design",
          "[cli]") {
  Folder dir;
  const auto folder = run_rungs("lines " + dir.path.string());
  CHECK(folder.exit_code == 3);
  CHECK(folder.err.find("is a folder") != std::string::npos);
  const auto device = run_rungs("lines /dev/zero");
  CHECK(device.exit_code == 3);
  CHECK(device.err == "rungs: '/dev/zero' is not a plain file; to read a stream, pipe it into -\n");
  // run_rungs gives the program a standard input of its own; these need another one.
  auto with_input = [&](const std::string& redirect) {
    const std::string err = dir / "err.txt";
    const int status = std::system(
        (std::string(RUNGS_BINARY) + " lines - " + redirect + " >/dev/null 2>" + err).c_str());
    return std::make_pair(WIFEXITED(status) ? WEXITSTATUS(status) : -1, read_file(err));
  };
  const auto [closed_exit, closed_err] = with_input("<&-");
  CHECK(closed_exit == 3);
  CHECK(closed_err.find("standard input is closed") != std::string::npos);
  // A stream without end is cut at the stated size instead of filling the memory.
  const auto [endless_exit, endless_err] = with_input("</dev/zero");
  CHECK(endless_exit == 3);
  CHECK(endless_err.find("larger than 256 MiB") != std::string::npos);
}

TEST_CASE("a closed or full standard error does not crash the program", "[cli]") {
  Folder dir;
  write_file(dir / "bad.rungs", "line a x -> y coax\n");
  // With standard error closed or full, the exit code still tells what happened (2: bad
  // input); before, an uncaught exception ended the program with SIGABRT (134 from a shell).
  // run_rungs captures standard error itself, so these run through the shell as they are.
  auto exit_of = [](const std::string& args) {
    const int status = std::system((std::string(RUNGS_BINARY) + " " + args).c_str());
    return WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  };
  CHECK(exit_of("lines " + (dir / "bad.rungs") + " 2>&-") == 2);
  CHECK(exit_of("emit --analytic " + (dir / "bad.rungs") + " -o - 2>/dev/full") == 2);
}

TEST_CASE("a FIFO among the outputs is refused before any output is written", "[cli]") {
  Folder dir;
  REQUIRE(::mkfifo((dir / "pipe").c_str(), 0600) == 0);
  const auto r = run_rungs("emit -q --analytic " + (dir / "d.rungs") + " -o " + (dir / "a.cir") +
                           " --report " + (dir / "pipe"));
  CHECK(r.exit_code == 3);
  CHECK(r.err.find("is not a plain file") != std::string::npos);
  CHECK_FALSE(fs::exists(dir / "a.cir"));
}

TEST_CASE("a manifest's outputs stay inside its project", "[cli][build]") {
  Folder dir;
  write_file(dir / "rungs.toml",
             "[[netlist]]\nsource = \"d.rungs\"\noutput = \"../escaped.cir\"\n"
             "report = \"/tmp/rungs_absolute_report.txt\"\n");
  const auto r = run_rungs("build --analytic --manifest " + (dir / "rungs.toml"));
  CHECK(r.exit_code == 2);
  CHECK(r.err.find("rungs.toml:3:10: error: '../escaped.cir' is outside the manifest's folder") !=
        std::string::npos);
  CHECK(r.err.find("rungs.toml:4:10: error: '/tmp/rungs_absolute_report.txt' is outside") !=
        std::string::npos);
  CHECK_FALSE(fs::exists(dir.path.parent_path() / "escaped.cir"));
  CHECK_FALSE(fs::exists("/tmp/rungs_absolute_report.txt"));
  // The manifest may not name itself or a description as an output either.
  write_file(dir / "rungs.toml", "[[netlist]]\nsource = \"d.rungs\"\noutput = \"d.rungs\"\n");
  const auto self = run_rungs("build --analytic --manifest " + (dir / "rungs.toml"));
  CHECK(self.exit_code == 2);
  CHECK(self.err.find("rungs.toml:3:10: error: 'd.rungs' is a netlist's source") !=
        std::string::npos);
}
