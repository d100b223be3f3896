// Depfiles: the exact text rungs writes, and GNU make reading it back to the same file names.
#include <catch2/catch.hpp>

#include <chrono>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <string>
#include <thread>
#include <vector>

#include <unistd.h>

#include "8_project/depfile.h"

namespace fs = std::filesystem;
using rungs::project::depfile_can_name;
using rungs::project::depfile_problem;
using rungs::project::escape_make_path;
using rungs::project::make_depfile;

// The escapes are those GCC's dependency writer uses (libcpp/mkdeps.cc, munge(); recalled
// from memory of GCC 12's source): space and tab get a backslash, with the backslashes
// just before them doubled; '#' gets a backslash; '$' is doubled. The make test below checks
// them against GNU make itself.
TEST_CASE("paths are escaped as GCC escapes them for make", "[depfile]") {
  CHECK(escape_make_path("lines/clock.rungs") == "lines/clock.rungs");
  CHECK(escape_make_path("my lines/a b.rungs") == "my\\ lines/a\\ b.rungs");
  CHECK(escape_make_path("tab\there") == "tab\\\there");
  CHECK(escape_make_path("cost$1.rungs") == "cost$$1.rungs");
  CHECK(escape_make_path("rev#2.rungs") == "rev\\#2.rungs");
  CHECK(escape_make_path("g\\ h") == "g\\\\\\ h");    // backslash, space: 3 backslashes, space
  CHECK(escape_make_path("C:\\x\\y") == "C:\\x\\y");  // other backslashes stay as they are
}

TEST_CASE("a depfile is one rule, then an empty rule a prerequisite", "[depfile]") {
  const std::vector<std::string> targets = {"sim/clock.cir", "sim/clock.txt"};
  const std::vector<std::string> prerequisites = {
      "/repo/lines/clock.rungs", "/repo/sim/templates/header.tmpl", "/repo/lines/clock.rungs"};
  CHECK(make_depfile(targets, prerequisites) ==
        "sim/clock.cir sim/clock.txt: \\\n"
        "  /repo/lines/clock.rungs \\\n"
        "  /repo/sim/templates/header.tmpl\n"
        "\n"
        "/repo/lines/clock.rungs:\n"
        "\n"
        "/repo/sim/templates/header.tmpl:\n");
  CHECK(make_depfile(std::vector<std::string>{"a.cir"}, {}) == "a.cir:\n");
}

TEST_CASE("a path with a line break cannot go in a depfile", "[depfile]") {
  CHECK(depfile_can_name("a b"));
  CHECK_FALSE(depfile_can_name("a\nb"));
  CHECK_FALSE(depfile_can_name(""));
  const std::vector<std::string> good = {"a"}, bad = {"x\r\ny"};
  CHECK(depfile_problem(good, good).empty());
  CHECK(depfile_problem(good, bad) == "a depfile cannot name a path with a line break in it");
}

namespace {

/// Runs `make -q TARGET` in `folder`: 0 when up to date, 1 when it would remake it.
int make_question(const fs::path& folder, const std::string& target) {
  const std::string command =
      "cd '" + folder.string() + "' && make -q '" + target + "' >/dev/null 2>&1";
  const int status = std::system(command.c_str());
  return WIFEXITED(status) ? WEXITSTATUS(status) : -1;
}

void touch(const fs::path& path) {
  std::ofstream(path, std::ios::app) << "";
}

}  // namespace

// The outside check: GNU make (4.3 here, Debian 12) reads the depfile. When it misreads a
// name, it sees a prerequisite that does not exist, which the empty rule makes "remade", so
// `make -q` reports out of date even though the target is newer than every real file.
TEST_CASE("GNU make reads each escaped name back to the file", "[depfile][make]") {
  if (std::system("make --version >/dev/null 2>&1") != 0) {
    WARN("make is not installed; the depfile was not checked against it");
    return;
  }
  const fs::path folder =
      fs::temp_directory_path() / ("rungs_depfile_test_" + std::to_string(::getpid()));
  fs::remove_all(folder);
  fs::create_directories(folder);
  const std::vector<std::string> names = {"a b.rungs", "c$d.tmpl", "e#f.rungs", "g\\ h.rungs",
                                          "tab\tname.rungs"};
  for (const std::string& name : names) {
    INFO(name);
    const std::vector<std::string> targets = {"out.cir"};
    const std::vector<std::string> prerequisites = {name};
    std::ofstream(folder / "dep.d") << make_depfile(targets, prerequisites);
    std::ofstream(folder / "Makefile") << "include dep.d\nout.cir: ; @echo remade\n";
    touch(folder / name);
    std::this_thread::sleep_for(std::chrono::milliseconds(20));
    touch(folder / "out.cir");
    fs::last_write_time(folder / "out.cir",
                        fs::last_write_time(folder / name) + std::chrono::seconds(1));
    CHECK(make_question(folder, "out.cir") == 0);  // newer than the file: up to date
    fs::last_write_time(folder / name,
                        fs::last_write_time(folder / "out.cir") + std::chrono::seconds(1));
    CHECK(make_question(folder, "out.cir") == 1);  // the file changed: remake it
  }
  // Make reads an escaped space in a target too.
  const std::vector<std::string> targets = {"out put.cir"};
  const std::vector<std::string> prerequisites = {"a b.rungs"};
  std::ofstream(folder / "dep.d") << make_depfile(targets, prerequisites);
  std::ofstream(folder / "Makefile") << "include dep.d\nout\\ put.cir: ; @echo remade\n";
  touch(folder / "out put.cir");
  fs::last_write_time(folder / "out put.cir",
                      fs::last_write_time(folder / "a b.rungs") + std::chrono::seconds(1));
  CHECK(make_question(folder, "out put.cir") == 0);
  fs::remove_all(folder);
}
