// `rungs build` and `rungs emit --depfile` as a hardware repository's build meets them: the
// real binary on a folder of descriptions and a manifest, its outputs, timestamps, exit
// codes and messages, a parallel build against a serial one, and a build killed mid-write.
#include <catch2/catch.hpp>

#include <chrono>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <map>
#include <regex>
#include <set>
#include <sstream>
#include <string>
#include <thread>
#include <vector>

#include <fcntl.h>
#include <signal.h>
#include <spawn.h>
#include <sys/wait.h>
#include <unistd.h>

#include "run_command.h"

namespace fs = std::filesystem;

namespace {

/// A fresh folder under the system's temporary folder, removed at the end of the test.
struct Folder {
  fs::path path;
  Folder() {
    static int serial = 0;
    path = fs::temp_directory_path() /
           ("rungs_build_test_" + std::to_string(::getpid()) + "_" + std::to_string(serial++));
    fs::remove_all(path);
    fs::create_directories(path);
  }
  ~Folder() { fs::remove_all(path); }
  fs::path operator/(const std::string& name) const { return path / name; }
  void write(const std::string& name, const std::string& text) const {
    fs::create_directories((path / name).parent_path());
    std::ofstream(path / name, std::ios::binary) << text;
  }
};

std::string read(const fs::path& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

/// Runs `rungs ARGS` with `folder` as the current folder. The tests here plan with
/// --analytic: the build's files, timestamps and messages are under test, not the planner.
rungs::testing::CommandResult run_in(const fs::path& folder, const std::string& args) {
  const std::string out = (folder / ".out").string(), err = (folder / ".err").string();
  const std::string command = "cd '" + folder.string() + "' && " + RUNGS_BINARY + " " + args +
                              " >'" + out + "' 2>'" + err + "' </dev/null";
  const int status = std::system(command.c_str());
  rungs::testing::CommandResult result;
  result.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  result.out = read(out);
  result.err = read(err);
  fs::remove(out);
  fs::remove(err);
  return result;
}

/// A small matched line; `note` goes in a comment, so changing it changes only the hash.
std::string description(const std::string& note, int sections = 0) {
  return "# " + note + "\nline t a -> b ideal z0=50ohm delay=1ns" +
         (sections > 0 ? " sections=" + std::to_string(sections) : std::string()) +
         "\ndrive a step 0V to 1V rise=100ps source=50ohm\nload b 50ohm\n";
}

const char* kTwoNetlists =
    "[[netlist]]\n"
    "source = \"lines/a.rungs\"\n"
    "output = \"sim/a.cir\"\n"
    "report = \"sim/a.txt\"\n"
    "\n"
    "[[netlist]]\n"
    "source = \"lines/b.rungs\"\n"
    "output = \"sim/b.cir\"\n"
    "report_json = \"sim/b.json\"\n";

/// A folder with two descriptions and kTwoNetlists; no sim/ yet (build makes it).
void two_netlists(const Folder& folder) {
  folder.write("lines/a.rungs", description("a, first"));
  folder.write("lines/b.rungs", description("b, first"));
  folder.write("rungs.toml", kTwoNetlists);
}

/// A time well in the past, to tell a file that was rewritten from one that was not.
const fs::file_time_type kLongAgo = fs::file_time_type::clock::now() - std::chrono::hours(24 * 400);

}  // namespace

TEST_CASE("rungs build writes what rungs emit writes, and a second build rewrites nothing") {
  Folder folder;
  two_netlists(folder);
  auto first = run_in(folder.path, "build --analytic");
  REQUIRE(first.exit_code == 0);
  CHECK(first.out.empty());
  CHECK(first.err.find("rungs: wrote sim/a.cir: a: 1 line") == 0);
  CHECK(first.err.find("rungs: 4 outputs: 4 written, 0 unchanged\n") != std::string::npos);
  // The same bytes as emit from the manifest's folder, whose header names the same path.
  REQUIRE(run_in(folder.path, "emit --analytic lines/a.rungs -o a_emit.cir --report a_emit.txt -q")
              .exit_code == 0);
  CHECK(read(folder / "sim/a.cir") == read(folder / "a_emit.cir"));
  CHECK(read(folder / "sim/a.txt") == read(folder / "a_emit.txt"));
  CHECK(read(folder / "sim/a.cir").find("from lines/a.rungs;") != std::string::npos);
  CHECK(read(folder / "sim/b.json").find("\"version\": 1") != std::string::npos);

  for (const char* name : {"sim/a.cir", "sim/a.txt", "sim/b.cir", "sim/b.json"})
    fs::last_write_time(folder / name, kLongAgo);
  auto second = run_in(folder.path, "build --analytic");
  CHECK(second.exit_code == 0);
  CHECK(second.err == "rungs: 4 outputs: 0 written, 4 unchanged\n");
  for (const char* name : {"sim/a.cir", "sim/a.txt", "sim/b.cir", "sim/b.json"}) {
    INFO(name);
    CHECK(fs::last_write_time(folder / name) == kLongAgo);
  }

  // A changed description rewrites its netlist only; its report says the same as before.
  folder.write("lines/a.rungs", description("a, second"));
  auto third = run_in(folder.path, "build --analytic -q");
  CHECK(third.exit_code == 0);
  CHECK(third.err.empty());
  CHECK(fs::last_write_time(folder / "sim/a.cir") != kLongAgo);
  for (const char* name : {"sim/a.txt", "sim/b.cir", "sim/b.json"}) {
    INFO(name);
    CHECK(fs::last_write_time(folder / name) == kLongAgo);
  }
}

TEST_CASE("a netlist changed at its end, its middle or cut short is rewritten whole") {
  Folder folder;
  two_netlists(folder);
  REQUIRE(run_in(folder.path, "build --analytic -q").exit_code == 0);
  const std::string good = read(folder / "sim/b.cir");
  REQUIRE(good.size() > 200);
  std::string middle = good;
  middle[good.size() / 2] = middle[good.size() / 2] == '1' ? '2' : '1';
  for (const std::string& damaged :
       {good + "* added\n", good.substr(0, good.size() / 2), middle, std::string()}) {
    folder.write("sim/b.cir", damaged);
    REQUIRE(run_in(folder.path, "build --analytic -q").exit_code == 0);
    CHECK(read(folder / "sim/b.cir") == good);
  }
}

TEST_CASE("a netlist of megabytes is kept when the same and rewritten whole when not") {
  // Over 3 MB: the deck reaches the comparison in megabyte writes, each compared as it comes,
  // so damage in the first, a later or the last of them, or a file cut short, must show.
  Folder folder;
  folder.write("lines/a.rungs", description("a, large", 50000));
  folder.write("rungs.toml", "[[netlist]]\nsource = \"lines/a.rungs\"\noutput = \"sim/a.cir\"\n");
  REQUIRE(run_in(folder.path, "build --analytic -q").exit_code == 0);
  const std::string good = read(folder / "sim/a.cir");
  REQUIRE(good.size() > 3u << 20);
  fs::last_write_time(folder / "sim/a.cir", kLongAgo);
  REQUIRE(run_in(folder.path, "build --analytic -q").exit_code == 0);
  CHECK(fs::last_write_time(folder / "sim/a.cir") == kLongAgo);
  std::vector<std::string> damaged;
  for (std::size_t at : {std::size_t{100}, (std::size_t{1} << 20) + 7, good.size() / 2,
                         good.size() - 2}) {
    std::string changed = good;
    changed[at] = changed[at] == '1' ? '2' : '1';
    damaged.push_back(changed);
  }
  damaged.push_back(good.substr(0, good.size() - (1 << 20)));
  damaged.push_back(good + "* added\n");
  for (const std::string& file : damaged) {
    folder.write("sim/a.cir", file);
    REQUIRE(run_in(folder.path, "build --analytic -q").exit_code == 0);
    CHECK(read(folder / "sim/a.cir") == good);
  }
}

TEST_CASE("rungs build --check lists each stale or missing output with its reason") {
  Folder folder;
  two_netlists(folder);
  REQUIRE(run_in(folder.path, "build --analytic -q").exit_code == 0);
  auto fresh = run_in(folder.path, "build --analytic --check");
  CHECK(fresh.exit_code == 0);
  CHECK(fresh.out.empty());
  CHECK(fresh.err == "rungs: all 4 outputs are up to date\n");

  folder.write("lines/b.rungs", description("b, second"));
  fs::remove(folder / "sim/a.txt");
  const std::string hand_edited = read(folder / "sim/a.cir") + "* a note\n";
  folder.write("sim/a.cir", hand_edited);
  fs::last_write_time(folder / "sim/b.cir", kLongAgo);
  auto stale = run_in(folder.path, "build --analytic --check");
  CHECK(stale.exit_code == 1);
  CHECK(stale.out ==
        "sim/a.cir: differs from what rungs writes now (edited by hand, or the manifest's "
        "defaults or the templates changed)\n"
        "sim/a.txt: missing\n"
        "sim/b.cir: its description changed since it was written\n");
  CHECK(stale.err == "rungs: 3 of 4 outputs are stale or missing; run rungs build\n");
  // It wrote nothing.
  CHECK(!fs::exists(folder / "sim/a.txt"));
  CHECK(read(folder / "sim/a.cir") == hand_edited);
  CHECK(fs::last_write_time(folder / "sim/b.cir") == kLongAgo);

  // From a folder below the manifest, paths are shown from there.
  auto below = run_in(folder / "lines", "build --analytic --check -q");
  CHECK(below.exit_code == 1);
  CHECK(below.out.find("../sim/a.txt: missing\n") != std::string::npos);
  CHECK(below.err.empty());

  // A netlist from somewhere else, and one from another version of rungs.
  folder.write("sim/a.cir", "* my own deck\n.end\n");
  std::string other_version = read(folder / "sim/b.cir");
  other_version.replace(other_version.find(RUNGS_VERSION), std::string(RUNGS_VERSION).size(),
                        "0.0.1");
  folder.write("sim/b.cir", other_version);
  auto foreign = run_in(folder.path, "build --analytic --check");
  CHECK(foreign.exit_code == 1);
  CHECK(foreign.out.find("sim/a.cir: not written by rungs\n") == 0);
  CHECK(foreign.out.find(std::string("sim/b.cir: written by rungs 0.0.1; this is rungs ") +
                         RUNGS_VERSION + "\n") != std::string::npos);
}

TEST_CASE("manifest defaults apply where a description does not set them") {
  Folder folder;
  folder.write("lines/own.rungs", "set tolerance 3%\n" + description("sets its own"));
  folder.write("lines/plain.rungs", description("sets nothing"));
  folder.write("templates/header.tmpl", "* {{design}} for the bench, {{tolerance}}\n");
  folder.write("rungs.toml",
               "[defaults]\ntolerance = \"1%\"\nshape = \"t\"\ntemplates = \"templates\"\n"
               "[[netlist]]\nsource = \"lines/own.rungs\"\noutput = \"own.cir\"\n"
               "[[netlist]]\nsource = \"lines/plain.rungs\"\noutput = \"plain.cir\"\n");
  REQUIRE(run_in(folder.path, "build --analytic -q").exit_code == 0);
  const std::string own = read(folder / "own.cir"), plain = read(folder / "plain.cir");
  CHECK(own.find("* own for the bench, 3 %\n") != std::string::npos);
  CHECK(plain.find("* plain for the bench, 1 %\n") != std::string::npos);
  // The shape from the defaults (line_begin.tmpl prints "N SHAPE sections").
  CHECK(plain.find(" t sections\n") != std::string::npos);
  CHECK(own.find(" t sections\n") != std::string::npos);
}

TEST_CASE("rungs build --depfile names every output and what they were made from") {
  Folder folder;
  two_netlists(folder);
  folder.write("templates/header.tmpl", "* {{design}}\n");
  folder.write("rungs.toml", std::string("[defaults]\ntemplates = \"templates\"\n") + kTwoNetlists);
  REQUIRE(run_in(folder.path, "build --analytic -q --depfile sim/build.d").exit_code == 0);
  const std::string root = folder.path.string();
  CHECK(read(folder / "sim/build.d") ==
        "sim/a.cir sim/a.txt sim/b.cir sim/b.json: \\\n"
        "  " +
            root +
            "/rungs.toml \\\n"
            "  " +
            root +
            "/lines/a.rungs \\\n"
            "  " +
            root +
            "/templates/header.tmpl \\\n"
            "  " +
            root +
            "/lines/b.rungs\n"
            "\n" +
            root +
            "/rungs.toml:\n"
            "\n" +
            root +
            "/lines/a.rungs:\n"
            "\n" +
            root +
            "/templates/header.tmpl:\n"
            "\n" +
            root + "/lines/b.rungs:\n");
  auto usage = run_in(folder.path, "build --analytic --check --depfile x.d");
  CHECK(usage.exit_code == 2);
  CHECK(usage.err == "rungs: --check writes nothing; leave out --depfile\n");
}

TEST_CASE("rungs emit --depfile names the netlist and reports, made from the description") {
  Folder folder;
  folder.write("my lines/a.rungs", description("a"));
  REQUIRE(run_in(folder.path,
                 "emit --analytic 'my lines/a.rungs' -o a.cir --report a.txt --depfile a.d -q")
              .exit_code == 0);
  CHECK(read(folder / "a.d") == "a.cir a.txt: \\\n  " +
                                    (folder.path / "my\\ lines/a.rungs").string() + "\n\n" +
                                    (folder.path / "my\\ lines/a.rungs").string() + ":\n");
  auto to_stdout = run_in(folder.path, "emit --analytic 'my lines/a.rungs' --depfile a.d");
  CHECK(to_stdout.exit_code == 2);
  CHECK(to_stdout.err ==
        "rungs: --depfile needs a description file and -o FILE: a build tool "
        "cannot track standard input or output\n");
}

TEST_CASE("a parallel build writes the same bytes as a serial one") {
  Folder serial, parallel;
  std::string manifest;
  const fs::path examples = fs::path(RUNGS_SOURCE_DIR) / "examples";
  int count = 0;
  for (const auto& entry : fs::directory_iterator(examples)) {
    if (entry.path().extension() != ".rungs") continue;
    const std::string stem = entry.path().stem().string();
    for (const Folder* folder : {&serial, &parallel})
      folder->write("lines/" + stem + ".rungs", read(entry.path()));
    manifest += "[[netlist]]\nsource = \"lines/" + stem + ".rungs\"\noutput = \"sim/" + stem +
                ".cir\"\nreport = \"sim/" + stem + ".txt\"\nreport_json = \"sim/" + stem +
                ".json\"\n";
    ++count;
  }
  REQUIRE(count >= 5);
  for (const Folder* folder : {&serial, &parallel}) {
    folder->write("rungs.toml", manifest);
    fs::create_directories(*folder / "sim");
  }
  const auto one = run_in(serial.path, "build --analytic -j 1");
  const auto many = run_in(parallel.path, "build --analytic -j 8");
  REQUIRE(one.exit_code == 0);
  REQUIRE(many.exit_code == 0);
  CHECK(one.err == many.err);  // messages come in manifest order, whatever finished first
  std::set<std::string> names;
  for (const auto& entry : fs::directory_iterator(serial / "sim"))
    names.insert(entry.path().filename().string());
  CHECK(names.size() == static_cast<std::size_t>(3 * count));
  for (const std::string& name : names) {
    INFO(name);
    CHECK(read(serial / ("sim/" + name)) == read(parallel / ("sim/" + name)));
  }
}

TEST_CASE("rungs build -j 2 writes the same bytes as -j 1, the planner's threads inside") {
  // Several netlists of two parts each, one part a cascade: the planner's loops over parts
  // and over lines run inside the build's loop over descriptions, on the same threads.
  Folder serial, parallel;
  std::string manifest;
  for (int k = 0; k < 4; ++k) {
    const std::string name = "net" + std::to_string(k);
    const std::string text =
        "line f a -> m ideal z0=50ohm delay=" + std::to_string(k + 1) +
        "ns\nline s m -> b ideal z0=75ohm delay=1ns\n"
        "drive a step 0V to 1V rise=1ns source=50ohm\nload b 75ohm\n"
        "line u c -> d ideal z0=60ohm delay=2ns\n"
        "drive c step 0V to 1V rise=1ns source=60ohm\nload d open\n";
    for (const Folder* folder : {&serial, &parallel}) folder->write(name + ".rungs", text);
    manifest += "[[netlist]]\nsource = \"" + name + ".rungs\"\noutput = \"sim/" + name +
                ".cir\"\nreport_json = \"sim/" + name + ".json\"\n";
  }
  for (const Folder* folder : {&serial, &parallel}) folder->write("rungs.toml", manifest);
  const auto one = run_in(serial.path, "build -j 1");
  const auto two = run_in(parallel.path, "build -j 2");
  REQUIRE(one.exit_code == 0);
  REQUIRE(two.exit_code == 0);
  CHECK(one.err == two.err);
  CHECK(one.err.find("rungs: 8 outputs: 8 written, 0 unchanged\n") != std::string::npos);
  for (int k = 0; k < 4; ++k)
    for (const char* extension : {".cir", ".json"}) {
      const std::string name = "sim/net" + std::to_string(k) + extension;
      INFO(name);
      CHECK(read(serial / name).size() > 100);
      CHECK(read(serial / name) == read(parallel / name));
    }
}

TEST_CASE("rungs build exit codes and messages") {
  Folder folder;
  SECTION("no manifest here or above") {
    auto r = run_in(folder.path, "build --analytic");
    // The temporary folder may sit below a folder with a rungs.toml only on odd machines.
    CHECK(r.exit_code == 2);
    CHECK(r.err ==
          "rungs: no rungs.toml in this folder or any folder above it; give one with "
          "--manifest FILE\n");
  }
  SECTION("an unreadable manifest") {
    auto r = run_in(folder.path, "build --analytic --manifest missing.toml");
    CHECK(r.exit_code == 3);
    CHECK(r.err == "rungs: cannot read 'missing.toml': No such file or directory\n");
  }
  SECTION("a wrong manifest writes nothing") {
    folder.write("rungs.toml", "[[netlist]]\nsource = \"a.rungs\"\nouptut = \"a.cir\"\n");
    auto r = run_in(folder.path, "build --analytic --manifest rungs.toml");
    CHECK(r.exit_code == 2);
    CHECK(r.err ==
          "rungs.toml:1:1: error: this netlist has no output; add output = \"sim/NAME.cir\"\n"
          "[[netlist]]\n"
          "^~~~~~~~~~~\n"
          "rungs.toml:3:1: error: unknown key 'ouptut' in [[netlist]]; did you mean 'output'?\n"
          "ouptut = \"a.cir\"\n"
          "^~~~~~\n"
          "rungs.toml: 2 errors; nothing written\n");
  }
  SECTION("a source that is not there is pointed at in the manifest") {
    folder.write("rungs.toml", "[[netlist]]\nsource = \"lines/gone.rungs\"\noutput = \"a.cir\"\n");
    auto r = run_in(folder.path, "build --analytic");
    CHECK(r.exit_code == 2);
    CHECK(r.err ==
          "rungs.toml:2:10: error: no description at 'lines/gone.rungs' (paths are "
          "relative to the manifest's folder)\n"
          "source = \"lines/gone.rungs\"\n"
          "         ^~~~~~~~~~~~~~~~~~\n"
          "rungs.toml: 1 error; nothing written\n");
  }
  SECTION("one wrong description writes nothing at all") {
    two_netlists(folder);
    folder.write("lines/b.rungs", "line t a -> b ideal z0=50ohm delay=1ns widht=3mm\n");
    auto r = run_in(folder.path, "build --analytic");
    CHECK(r.exit_code == 2);
    CHECK(r.err.find("lines/b.rungs:1:") == 0);
    CHECK(r.err.find("rungs: nothing written\n") != std::string::npos);
    CHECK(!fs::exists(folder / "sim"));
  }
  SECTION("a netlist that rungs did not write is left alone without --force") {
    two_netlists(folder);
    folder.write("sim/b.cir", "* the bench's own deck\n");
    auto r = run_in(folder.path, "build --analytic");
    CHECK(r.exit_code == 2);
    CHECK(r.err ==
          "rungs: 'sim/b.cir' exists and was not written by rungs; not overwriting it "
          "(use --force to replace it)\nrungs: nothing written\n");
    CHECK(!fs::exists(folder / "sim/a.cir"));
    CHECK(run_in(folder.path, "build --analytic --force -q").exit_code == 0);
    CHECK(read(folder / "sim/b.cir").find("* generated by rungs") == 0);
  }
  SECTION("-j takes a positive number") {
    two_netlists(folder);
    CHECK(run_in(folder.path, "build --analytic -j 0").exit_code == 2);
  }
}

namespace {

/// Starts `rungs ARGS...` in `folder` with its output thrown away; returns its process id.
pid_t spawn_rungs(const fs::path& folder, const std::vector<std::string>& args) {
  std::vector<std::string> words = {RUNGS_BINARY};
  words.insert(words.end(), args.begin(), args.end());
  std::vector<char*> argv;
  for (std::string& word : words) argv.push_back(word.data());
  argv.push_back(nullptr);
  posix_spawn_file_actions_t actions;
  posix_spawn_file_actions_init(&actions);
  posix_spawn_file_actions_addopen(&actions, 1, "/dev/null", O_WRONLY, 0);
  posix_spawn_file_actions_addopen(&actions, 2, "/dev/null", O_WRONLY, 0);
  const fs::path here = fs::current_path();
  fs::current_path(folder);
  pid_t pid = -1;
  const int failed = posix_spawn(&pid, argv[0], &actions, nullptr, argv.data(), environ);
  fs::current_path(here);
  posix_spawn_file_actions_destroy(&actions);
  return failed ? -1 : pid;
}

}  // namespace

// Atomicity: each output is replaced by renaming a finished temporary file over it
// (rename(2) replaces the name in one step, POSIX.1-2017), so a build killed at any moment
// leaves every output whole, old or new. The kill lands while the large netlist is half
// written (its temporary file is seen growing), with the other outputs done or under way.
TEST_CASE("a build killed in the middle of a large write leaves each output old or new") {
  Folder folder;
  const std::vector<std::string> outputs = {"sim/a.cir", "sim/b.cir", "sim/c.cir", "sim/big.cir"};
  std::string manifest;
  for (const char* name : {"a", "b", "c", "big"})
    manifest += std::string("[[netlist]]\nsource = \"lines/") + name + ".rungs\"\noutput = \"sim/" +
                name + ".cir\"\n";
  folder.write("rungs.toml", manifest);
  for (const char* name : {"a", "b", "c"})
    folder.write(std::string("lines/") + name + ".rungs", description("old"));
  folder.write("lines/big.rungs", description("old", 10));
  fs::create_directories(folder / "sim");
  REQUIRE(run_in(folder.path, "build --analytic -q").exit_code == 0);
  std::map<std::string, std::string> old_content;
  for (const std::string& output : outputs) old_content[output] = read(folder / output);

  // New descriptions: every output changes; the big one becomes about 30 MB.
  for (const char* name : {"a", "b", "c"})
    folder.write(std::string("lines/") + name + ".rungs", description("new"));
  folder.write("lines/big.rungs", description("new", 400000));
  const pid_t pid = spawn_rungs(folder.path, {"build", "--analytic", "-j", "4", "-q"});
  REQUIRE(pid > 0);
  const fs::path temporary = folder / ("sim/.big.cir.rungs-" + std::to_string(pid) + ".tmp");
  // Watched until the large temporary file passes 1 MiB or the build ends, however long
  // that takes (a build that never ends meets CTest's hang limit).
  bool caught = false, ended = false;
  int status = 0;
  while (!ended) {
    std::error_code ec;
    if (fs::file_size(temporary, ec) > (1u << 20) && !ec) {
      caught = ::kill(pid, SIGKILL) == 0;
      break;
    }
    ended = ::waitpid(pid, &status, WNOHANG) == pid;
    std::this_thread::sleep_for(std::chrono::microseconds(200));
  }
  if (!ended) ::waitpid(pid, &status, 0);
  if (!caught) FAIL("the build ended before its large temporary file passed 1 MiB");
  REQUIRE(WIFSIGNALED(status));
  REQUIRE(fs::exists(temporary));  // the kill left a half-written temporary file

  std::map<std::string, std::string> after_kill;
  for (const std::string& output : outputs) after_kill[output] = read(folder / output);
  CHECK(after_kill["sim/big.cir"] == old_content["sim/big.cir"]);
  // What is in sim/ besides the outputs is temporary files, hidden and named .tmp.
  const std::regex temporary_name(R"(\.(a|b|c|big)\.cir\.rungs-[0-9]+\.tmp)");
  for (const auto& entry : fs::directory_iterator(folder / "sim")) {
    const std::string name = "sim/" + entry.path().filename().string();
    if (old_content.count(name)) continue;
    INFO(name);
    CHECK(std::regex_match(entry.path().filename().string(), temporary_name));
  }
  // The check looks only at the outputs, never at a temporary file.
  const auto check = run_in(folder.path, "build --analytic --check -q");
  CHECK(check.exit_code == 1);
  CHECK(check.out.find(".tmp") == std::string::npos);
  CHECK(check.out.find("sim/big.cir: its description changed since it was written\n") !=
        std::string::npos);

  // A build to the end: every output new, and the killed build's temporary files gone.
  REQUIRE(run_in(folder.path, "build --analytic -q").exit_code == 0);
  for (const std::string& output : outputs) {
    INFO(output);
    const std::string now = read(folder / output);
    CHECK(now != old_content[output]);
    CHECK((after_kill[output] == old_content[output] || after_kill[output] == now));
  }
  CHECK(read(folder / "sim/big.cir").size() > (20u << 20));
  std::size_t entries = 0;
  for (const auto& entry : fs::directory_iterator(folder / "sim")) {
    (void)entry;
    ++entries;
  }
  CHECK(entries == outputs.size());
  CHECK(run_in(folder.path, "build --analytic --check -q").exit_code == 0);
}
