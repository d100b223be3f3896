// `rungs emit` as a user meets it: the decks and reports it writes for the examples and for
// the designs in tests/golden/ (golden files), the same bytes on every run and in a locale
// with a decimal comma, and how it writes files: standard output, atomic replacement, files
// it did not write left alone, --library, --with-ideal, --templates, the reports, bad input.
//
// Golden files live in tests/golden/: <stem>.cir is the deck and <stem>.report.txt the text
// report (--report) of examples/<stem>.rungs or tests/golden/<stem>.rungs, emitted from the
// source folder, so that the deck's header names its source as `examples/<stem>.rungs`;
// <stem>.library.cir and <stem>.with_ideal.cir are the decks emitted with --library and
// --with-ideal. When a change to the emitted text is meant, rewrite them instead of
// comparing:
//
//   RUNGS_UPDATE_GOLDEN=1 ./build/tests/emit_cli_test "[golden]"
//
// then read `git diff tests/golden/` as the deck an engineer would run, and commit the new
// golden files with the change that made them.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <functional>
#include <locale>
#include <set>
#include <sstream>
#include <string>
#include <vector>

#include <spawn.h>
#include <sys/wait.h>
#include <unistd.h>

#include "6_emit/netlist.h"
#include "6_emit/sha256.h"
#include "6_emit/spice_number.h"
#include "6_emit/templates.h"
#include "3_model/resolve.h"
#include "5_plan/plan.h"
#include "5_plan/verify.h"
#include "7_report/plan_report.h"
#include "run_command.h"
#include "4_sim/peak.h"
#include "1_syntax/diagnostics.h"
#include "1_syntax/parser.h"

extern char** environ;

namespace fs = std::filesystem;
using rungs::testing::run_rungs;

namespace {

const fs::path kSource = RUNGS_SOURCE_DIR;
const fs::path kGolden = kSource / "tests" / "golden";

std::string read_file(const fs::path& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

void write_file(const fs::path& path, const std::string& text) {
  std::ofstream(path, std::ios::binary) << text;
}

/// A fresh folder under the system's temporary folder, removed with everything in it.
struct TempDir {
  fs::path path;
  TempDir() {
    std::string pattern = (fs::temp_directory_path() / "rungs_emit_cli_XXXXXX").string();
    REQUIRE(::mkdtemp(pattern.data()) != nullptr);
    path = pattern;
  }
  ~TempDir() {
    std::error_code ec;
    fs::remove_all(path, ec);
  }
  std::set<std::string> entries() const {
    std::set<std::string> names;
    for (const auto& entry : fs::directory_iterator(path)) names.insert(entry.path().filename());
    return names;
  }
};

/// Runs the binary from the source folder, so that sources are named as a user there would.
struct InSourceFolder {
  fs::path previous = fs::current_path();
  InSourceFolder() { fs::current_path(kSource); }
  ~InSourceFolder() { fs::current_path(previous); }
};

/// Sets an environment variable for the commands run while it lives.
struct ScopedEnv {
  std::string name;
  ScopedEnv(std::string n, const std::string& value) : name(std::move(n)) {
    ::setenv(name.c_str(), value.c_str(), 1);
  }
  ~ScopedEnv() { ::unsetenv(name.c_str()); }
};

std::string shell_output(const std::string& command) {
  std::string out;
  FILE* pipe = ::popen(command.c_str(), "r");
  REQUIRE(pipe != nullptr);
  char buffer[4096];
  for (std::size_t n; (n = std::fread(buffer, 1, sizeof buffer, pipe)) > 0;) out.append(buffer, n);
  ::pclose(pipe);
  return out;
}

/// Empty when the texts are equal, else where they first differ, line by line.
std::string first_difference(const std::string& expected, const std::string& actual) {
  if (expected == actual) return "";
  std::istringstream a(expected), b(actual);
  std::string x, y;
  for (int line = 1;; ++line) {
    const bool more_a = static_cast<bool>(std::getline(a, x));
    const bool more_b = static_cast<bool>(std::getline(b, y));
    if (!more_a && !more_b) return "the texts differ only in their last line break";
    if (!more_a || !more_b || x != y)
      return "line " + std::to_string(line) + ": golden '" + (more_a ? x : "<end>") +
             "', emitted '" + (more_b ? y : "<end>") + "'";
  }
}

bool updating_golden() {
  const char* flag = std::getenv("RUNGS_UPDATE_GOLDEN");
  return flag != nullptr && std::string(flag) == "1";
}

/// Compares `actual` with the golden file `name`, or rewrites it with RUNGS_UPDATE_GOLDEN=1.
void check_golden(const std::string& name, const std::string& actual) {
  const fs::path path = kGolden / name;
  INFO("golden file tests/golden/" << name);
  if (updating_golden()) {
    write_file(path, actual);
    WARN("rewrote tests/golden/" << name);
    CHECK(read_file(path) == actual);
    return;
  }
  INFO("missing? regenerate with RUNGS_UPDATE_GOLDEN=1 (see the top of emit_cli_test.cpp)");
  REQUIRE(fs::exists(path));
  CHECK(first_difference(read_file(path), actual) == "");
}

/// One deck held by a golden file: which description, with which option.
struct GoldenCase {
  std::string input;   // relative to the source folder
  std::string option;  // "", "library" or "with-ideal"
  std::string stem() const { return fs::path(input).stem().string(); }
  std::string deck_golden() const {
    std::string suffix = option;
    std::replace(suffix.begin(), suffix.end(), '-', '_');
    return stem() + (option.empty() ? "" : "." + suffix) + ".cir";
  }
  std::string report_golden() const { return option.empty() ? stem() + ".report.txt" : ""; }
  std::string flags() const { return option.empty() ? "" : " --" + option; }
};

std::vector<std::string> rungs_files(const fs::path& folder, const std::string& prefix) {
  std::vector<std::string> files;
  for (const auto& entry : fs::directory_iterator(folder))
    if (entry.path().extension() == ".rungs")
      files.push_back(prefix + entry.path().filename().string());
  std::sort(files.begin(), files.end());
  return files;
}

/// Every example and golden design plainly, and some golden designs with an option.
std::vector<GoldenCase> golden_cases() {
  std::vector<GoldenCase> cases;
  for (const std::string& input : rungs_files(kSource / "examples", "examples/"))
    cases.push_back({input, ""});
  for (const std::string& input : rungs_files(kGolden, "tests/golden/"))
    cases.push_back({input, ""});
  cases.push_back({"tests/golden/lossy_shapes.rungs", "library"});
  cases.push_back({"tests/golden/lossy_shapes.rungs", "with-ideal"});
  cases.push_back({"tests/golden/name_clashes.rungs", "with-ideal"});
  cases.push_back({"tests/golden/drives_and_loads.rungs", "with-ideal"});
  return cases;
}

/// What `rungs emit` writes for a case, run from the source folder: the deck and the report.
struct Emitted {
  int exit_code = -1;
  std::string err;
  std::string deck;
  std::string report;
};

Emitted emit_case(const GoldenCase& c) {
  TempDir dir;
  const fs::path report = dir.path / "report.txt";
  InSourceFolder here;
  const auto r = run_rungs("emit " + c.input + c.flags() + " -o - -q --report " + report.string());
  return {r.exit_code, r.err, r.out, read_file(report)};
}

/// The examples whose verified plans take longest (about 20 s and 10 s of CPU time). Their
/// golden files have a test of their own, tagged [slow], so that the quick loop (ctest -L
/// fast) still compares every other golden file.
bool slow_to_plan(const GoldenCase& c) {
  return c.input == "examples/bench_pulse_line.rungs" || c.input == "examples/clock_fanout.rungs";
}

/// Emits a case as `rungs emit` does by default (the verified planner) and compares the deck
/// and the report with their golden files.
void check_golden_case(const GoldenCase& c) {
  INFO("rungs emit " << c.input << c.flags());
  const Emitted e = emit_case(c);
  CHECK(e.exit_code == 0);
  CHECK(e.err.empty());  // neither warnings nor errors in any golden design
  check_golden(c.deck_golden(), e.deck);
  if (!c.report_golden().empty()) check_golden(c.report_golden(), e.report);
}

TEST_CASE("emitted decks and reports equal the golden files", "[golden]") {
  for (const GoldenCase& c : golden_cases())
    if (!slow_to_plan(c)) check_golden_case(c);
}

TEST_CASE("the examples slowest to plan emit their golden files", "[golden][slow]") {
  int checked = 0;
  for (const GoldenCase& c : golden_cases()) {
    if (!slow_to_plan(c)) continue;
    check_golden_case(c);
    ++checked;
  }
  CHECK(checked == 2);  // both are still examples
}

TEST_CASE("every golden file belongs to a case, and every example has one", "[golden]") {
  std::set<std::string> expected;
  for (const GoldenCase& c : golden_cases()) {
    CHECK(expected.insert(c.deck_golden()).second);  // no two cases share a golden file
    if (!c.report_golden().empty()) CHECK(expected.insert(c.report_golden()).second);
  }
  std::set<std::string> found;
  for (const auto& entry : fs::directory_iterator(kGolden))
    if (entry.path().extension() != ".rungs") found.insert(entry.path().filename().string());
  CHECK(found == expected);
  CHECK(rungs_files(kSource / "examples", "").size() >= 5);
  CHECK(rungs_files(kGolden, "").size() >= 3);
}

// ---- the same bytes -----------------------------------------------------------------------

TEST_CASE("two runs write the same bytes, to a file as to standard output", "[determinism]") {
  // With the analytic plan: that the verified planner gives the same plan on every run is
  // shown by the golden files, which the emits above, the locale runs and the in-process
  // stages below all meet. What is left to show is the writing.
  for (const GoldenCase& c : golden_cases()) {
    INFO("rungs emit " << c.input << c.flags());
    TempDir dir;
    InSourceFolder here;
    std::vector<std::string> decks;
    for (int run = 0; run < 2; ++run) {
      const fs::path out = dir.path / ("run" + std::to_string(run) + ".cir");
      REQUIRE(run_rungs("emit --analytic " + c.input + c.flags() + " -q -o " + out.string())
                  .exit_code == 0);
      decks.push_back(read_file(out));
    }
    const auto to_stdout = run_rungs("emit --analytic " + c.input + c.flags() + " -q");
    CHECK(to_stdout.exit_code == 0);
    CHECK(decks[0].size() > 500);
    CHECK(first_difference(decks[0], decks[1]) == "");
    CHECK(first_difference(decks[0], to_stdout.out) == "");
  }
}

bool has_decimal_comma(const std::string& name) {
  try {
    return std::use_facet<std::numpunct<char>>(std::locale(name)).decimal_point() == ',';
  } catch (const std::runtime_error&) {
    return false;
  }
}

/// A locale that writes one half as "0,5": one the system has, else de_DE.UTF-8 compiled by
/// localedef from the system's locale sources (Debian's `locales` package) into a cache
/// folder that LOCPATH then names, for this process and the commands it runs. Empty when
/// neither is possible (no network is needed either way).
std::string comma_locale() {
  for (const char* name : {"de_DE.UTF-8", "de_DE.utf8", "fr_FR.UTF-8", "fr_FR.utf8", "nl_NL.UTF-8"})
    if (has_decimal_comma(name)) return name;
  const std::string name = "de_DE.UTF-8";
  const fs::path cache = fs::temp_directory_path() / "rungs-test-locales";
  std::error_code ec;
  if (!fs::exists(cache / name / "LC_NUMERIC")) {
    // Built beside the cache and renamed into place, so that tests running at the same time
    // never see half a locale.
    const fs::path scratch = cache.string() + "." + std::to_string(::getpid());
    fs::create_directories(scratch, ec);
    const std::string command =
        "localedef -i de_DE -f UTF-8 '" + (scratch / name).string() + "' >/dev/null 2>&1";
    [[maybe_unused]] const int status = std::system(command.c_str());  // 1 means warnings
    if (fs::exists(scratch / name / "LC_NUMERIC")) fs::rename(scratch, cache, ec);
    fs::remove_all(scratch, ec);
  }
  if (!fs::exists(cache / name / "LC_NUMERIC")) return "";
  ::setenv("LOCPATH", cache.c_str(), 1);
  if (has_decimal_comma(name)) return name;
  ::unsetenv("LOCPATH");
  return "";
}

/// A case emitted with --analytic (the locale is about formatting, not planning), as in
/// emit_case.
Emitted emit_analytic(const GoldenCase& c) {
  TempDir dir;
  const fs::path report = dir.path / "report.txt";
  InSourceFolder here;
  const auto r = run_rungs("emit " + c.input + c.flags() + " --analytic -o - -q --report " +
                           report.string());
  return {r.exit_code, r.err, r.out, read_file(report)};
}

TEST_CASE("the binary writes the same bytes under a decimal-comma locale", "[determinism]") {
  std::vector<Emitted> plain;
  {
    const ScopedEnv all("LC_ALL", "C");
    for (const GoldenCase& c : golden_cases()) plain.push_back(emit_analytic(c));
  }
  const std::string locale = comma_locale();
  if (locale.empty()) {
    WARN(
        "no decimal-comma locale here and none could be built (install Debian's `locales`); "
        "only the default locale is checked");
  } else {
    // The locale is really in force for a program that asks for it (coreutils printf does).
    const ScopedEnv all("LC_ALL", locale);
    CHECK(shell_output("/usr/bin/printf '%.1f' 0.5") == "0,5");
  }
  const ScopedEnv all("LC_ALL", locale.empty() ? "C" : locale);
  const std::vector<GoldenCase> cases = golden_cases();
  for (std::size_t i = 0; i < cases.size(); ++i) {
    INFO("LC_ALL=" << locale << " rungs emit --analytic " << cases[i].input << cases[i].flags());
    const Emitted e = emit_analytic(cases[i]);
    CHECK(e.exit_code == 0);
    CHECK(plain[i].exit_code == 0);
    CHECK(first_difference(plain[i].deck, e.deck) == "");
    CHECK(first_difference(plain[i].report, e.report) == "");
  }
}

/// Grouping by threes with '.' and a decimal comma: the German convention, for a process
/// that has no such locale installed.
struct CommaPunctuation : std::numpunct<char> {
  char do_decimal_point() const override { return ','; }
  char do_thousands_sep() const override { return '.'; }
  std::string do_grouping() const override { return "\3"; }
};

/// The deck and report of a case made in this process, the way `rungs emit` makes them.
Emitted emit_in_process(const GoldenCase& c) {
  namespace syntax = rungs::syntax;
  const syntax::InputFile file{c.input, read_file(kSource / c.input)};
  syntax::Diagnostics diagnostics(file);
  const auto circuit = rungs::model::resolve(syntax::parse_description(diagnostics), diagnostics);
  REQUIRE_FALSE(diagnostics.has_errors());
  rungs::plan::Plan plan = rungs::plan::plan_circuit(circuit, diagnostics);
  REQUIRE_FALSE(diagnostics.has_errors());
  // Planned analytically: the locale is about formatting, not planning.
  rungs::plan::set_closing_voltages(circuit, plan);
  std::ostringstream deck;
  const std::string error = rungs::emit::write_netlist(
      deck, circuit, plan, {file.name, rungs::emit::sha256_hex(file.text)},
      rungs::emit::builtin_templates(), {c.option == "library", c.option == "with-ideal"});
  REQUIRE(error.empty());
  const auto peak = rungs::sim::estimate_peak(circuit, plan.window);
  return {0, "", deck.str(), rungs::report::plan_text(circuit, plan, peak, file.name, nullptr)};
}

TEST_CASE("the stages write the same bytes with a decimal-comma global locale",
          "[determinism]") {
  std::vector<Emitted> plain;
  for (const GoldenCase& c : golden_cases()) plain.push_back(emit_in_process(c));
  const std::string name = comma_locale();
  // A named locale also sets the C library's locale (printf, strtod); the fallback changes
  // the C++ streams only.
  const std::locale comma =
      name.empty() ? std::locale(std::locale::classic(), new CommaPunctuation) : std::locale(name);
  if (name.empty()) WARN("no decimal-comma locale here: the C++ streams' locale only");
  struct Restore {
    std::locale previous;
    ~Restore() { std::locale::global(previous); }
  } restore{std::locale::global(comma)};

  std::ostringstream probe;
  probe << 0.5 << ' ' << 1000000;
  CHECK(probe.str().substr(0, 3) == "0,5");
  if (!name.empty()) {
    char buffer[16];
    std::snprintf(buffer, sizeof buffer, "%.1f", 0.5);
    CHECK(std::string(buffer) == "0,5");
  }
  CHECK(rungs::emit::spice_number(2.5e-10) == "2.5e-10");
  const std::vector<GoldenCase> cases = golden_cases();
  for (std::size_t i = 0; i < cases.size(); ++i) {
    INFO("in process, analytic: " << cases[i].input << cases[i].flags());
    const Emitted e = emit_in_process(cases[i]);
    CHECK(first_difference(plain[i].deck, e.deck) == "");
    CHECK(first_difference(plain[i].report, e.report) == "");
  }
}

// ---- writing files ------------------------------------------------------------------------

const char* kSmall =
    "line feed a -> b ideal z0=50ohm delay=1ns\n"
    "drive a step 0V to 1V rise=200ps source=50ohm\n"
    "load b 50ohm\n";
const char* kOther =
    "line other p -> q ideal z0=75ohm delay=2ns\n"
    "drive p step 0V to 5V rise=1ns source=75ohm\n"
    "load q 75ohm\n";

/// `rungs emit - --analytic ARGS` on `text`. What is under test here is how decks are
/// written, not the planner, so the analytic plan serves.
rungs::testing::CommandResult emit_text(const std::string& args, const std::string& text) {
  return run_rungs("emit - --analytic " + args, text);
}

std::string deck_of(const std::string& text, const std::string& flags = "") {
  const auto r = emit_text("-q" + flags, text);
  REQUIRE(r.exit_code == 0);
  return r.out;
}

TEST_CASE("a deck goes to standard output with -o - or no -o", "[cli]") {
  const auto dash = emit_text("-o -", kSmall);
  CHECK(dash.exit_code == 0);
  CHECK(dash.out.rfind(std::string("* generated by rungs ") + RUNGS_VERSION +
                           " from <stdin>; do not edit, regenerate it\n",
                       0) == 0);
  CHECK(dash.out.size() > 6);
  CHECK(dash.out.substr(dash.out.size() - 5) == ".end\n");
  // The summary goes to standard error, never into the deck.
  CHECK(dash.err.rfind("rungs: design: 1 line, ", 0) == 0);
  CHECK(dash.out.find("rungs: design") == std::string::npos);
  const auto plain = emit_text("", kSmall);
  CHECK(plain.exit_code == 0);
  CHECK(plain.out == dash.out);
  const auto quiet = emit_text("-q", kSmall);
  CHECK(quiet.err.empty());
  CHECK(quiet.out == dash.out);
}

TEST_CASE("a deck file is complete and nothing is left beside it", "[cli]") {
  TempDir dir;
  const fs::path deck = dir.path / "deck.cir";
  const auto r = emit_text("-q -o " + deck.string(), kSmall);
  CHECK(r.exit_code == 0);
  CHECK(r.out.empty());
  CHECK(read_file(deck) == deck_of(kSmall));
  CHECK(dir.entries() == std::set<std::string>{"deck.cir"});
}

/// A design of `lines` lines of `sections` sections each, with a drive and a load each.
std::string many_lines(int lines, int sections) {
  std::string text = "design many\n";
  for (int i = 0; i < lines; ++i) {
    const std::string n = std::to_string(i);
    text += "line l" + n + " a" + n + " -> b" + n +
            " ideal z0=50ohm delay=1ns sections=" + std::to_string(sections) + "\ndrive a" + n +
            " step 0V to 1V rise=100ps source=50ohm\n" + "load b" + n + " 50ohm\n";
  }
  return text;
}

TEST_CASE("while a deck is replaced, a reader sees the old one or the new one whole", "[cli]") {
  TempDir dir;
  const fs::path deck = dir.path / "deck.cir";
  const fs::path input = dir.path / "many.rungs";
  write_file(input, many_lines(400, 1000));  // 800 400 elements, about 16 MB of deck
  REQUIRE(emit_text("-q -o " + deck.string(), kSmall).exit_code == 0);
  const std::string old_deck = read_file(deck);

  const std::string binary = RUNGS_BINARY, out = deck.string(), in = input.string();
  std::vector<char*> argv = {const_cast<char*>(binary.c_str()),
                             const_cast<char*>("emit"),
                             const_cast<char*>("--analytic"),
                             const_cast<char*>(in.c_str()),
                             const_cast<char*>("-q"),
                             const_cast<char*>("-o"),
                             const_cast<char*>(out.c_str()),
                             nullptr};
  pid_t pid = 0;
  REQUIRE(::posix_spawn(&pid, binary.c_str(), nullptr, nullptr, argv.data(), environ) == 0);
  std::vector<std::string> seen;  // every text read while the writer ran, but the old one
  int reads = 0, status = 0;
  while (::waitpid(pid, &status, WNOHANG) == 0) {
    std::string now = read_file(deck);
    ++reads;
    if (now != old_deck && (seen.empty() || seen.back() != now)) seen.push_back(std::move(now));
  }
  REQUIRE(WIFEXITED(status));
  CHECK(WEXITSTATUS(status) == 0);
  const std::string new_deck = read_file(deck);
  CHECK(new_deck.size() > 10u * 1000 * 1000);
  CHECK(new_deck.substr(new_deck.size() - 5) == ".end\n");
  // How often the reader got in beside the writer is up to the scheduler, so it decides
  // nothing; a run where it hardly did says so.
  if (reads <= 10) WARN("the reader ran only " << reads << " times while the deck was written");
  for (const std::string& text : seen) CHECK(text == new_deck);
  CHECK(dir.entries() == std::set<std::string>{"deck.cir", "many.rungs"});
}

TEST_CASE("a file rungs did not write is replaced only with --force", "[cli]") {
  TempDir dir;
  const fs::path deck = dir.path / "deck.cir";
  const std::string own = "* my hand-made deck\nR1 a 0 50\n.end\n";
  write_file(deck, own);
  const auto refused = emit_text("-o " + deck.string(), kSmall);
  CHECK(refused.exit_code == 2);
  CHECK(refused.out.empty());
  CHECK(refused.err == "rungs: '" + deck.string() +
                           "' exists and was not written by rungs; not overwriting it (use "
                           "--force to replace it)\n");
  CHECK(read_file(deck) == own);
  CHECK(dir.entries() == std::set<std::string>{"deck.cir"});

  const auto forced = emit_text("-q --force -o " + deck.string(), kSmall);
  CHECK(forced.exit_code == 0);
  CHECK(read_file(deck) == deck_of(kSmall));
  CHECK(dir.entries() == std::set<std::string>{"deck.cir"});
}

TEST_CASE("a file rungs wrote, by this version or another, is replaced", "[cli]") {
  TempDir dir;
  const fs::path deck = dir.path / "deck.cir";
  REQUIRE(emit_text("-q -o " + deck.string(), kSmall).exit_code == 0);
  const auto again = emit_text("-q -o " + deck.string(), kOther);
  CHECK(again.exit_code == 0);
  CHECK(again.err.empty());
  CHECK(read_file(deck) == deck_of(kOther));

  write_file(deck, "* generated by rungs 0.0.1 from old.rungs; do not edit, regenerate it\n.end\n");
  CHECK(emit_text("-q -o " + deck.string(), kSmall).exit_code == 0);
  CHECK(read_file(deck) == deck_of(kSmall));
  CHECK(dir.entries() == std::set<std::string>{"deck.cir"});
}

/// The lines of `deck` outside .subckt ... .ends that are not blank or comments.
std::vector<std::string> top_level_lines(const std::string& deck) {
  std::vector<std::string> out;
  std::istringstream in(deck);
  bool inside = false;
  for (std::string line; std::getline(in, line);) {
    if (line.rfind(".subckt ", 0) == 0) inside = true;
    if (!inside && !line.empty() && line[0] != '*') out.push_back(line);
    if (line.rfind(".ends", 0) == 0) inside = false;
  }
  return out;
}

TEST_CASE("a library deck (--library) holds the subcircuits alone", "[cli]") {
  const std::string text = std::string(kSmall) + "line spur b -> c ideal z0=50ohm delay=300ps\n";
  const std::string library = deck_of(text, " --library");
  CHECK(library.find(".subckt line_feed near far ref\n") != std::string::npos);
  CHECK(library.find(".subckt line_spur near far ref\n") != std::string::npos);
  CHECK(top_level_lines(library).empty());  // no elements, no .tran, no .save, no .end
  CHECK(library.find(".tran") == std::string::npos);
  CHECK(library.find("\n.end\n") == std::string::npos);
  // The same subcircuits as in the runnable deck, which goes on where the library stops.
  const std::string deck = deck_of(text);
  CHECK(deck.rfind(library, 0) == 0);
  CHECK(top_level_lines(deck).size() > 5);
}

TEST_CASE("the option --with-ideal adds the simulator's ideal line beside each ladder", "[cli]") {
  const std::string text = std::string(kSmall) + "line spur b -> c ideal z0=75ohm delay=300ps\n";
  const std::string deck = deck_of(text, " --with-ideal");
  std::vector<std::string> ideal;
  for (const std::string& line : top_level_lines(deck))
    if (line[0] == 'T') ideal.push_back(line);
  CHECK(ideal == std::vector<std::string>{
                     "T_feed_ideal a_ideal 0 b_ideal 0 Z0=5e+01 TD=1e-09 REL=10 ABS=10",
                     "T_spur_ideal b_ideal 0 c_ideal 0 Z0=7.5e+01 TD=3e-10 REL=10 ABS=10"});
  CHECK(deck.find("V_a_ideal a_ideal__src 0 PWL(") != std::string::npos);
  CHECK(deck.find(" v(a_ideal) v(b_ideal) v(c_ideal)\n") != std::string::npos);
  // The ladder circuit is as without the option: the plain deck up to its analysis.
  const std::string plain = deck_of(text);
  const std::string ladder_part = plain.substr(0, plain.find("\n* integration method"));
  CHECK(deck.rfind(ladder_part, 0) == 0);
  CHECK(plain.find("T_") == std::string::npos);
}

TEST_CASE("set method and set step choose the deck's integration method and maximum step",
          "[cli]") {
  // By default: trap, written out, and the planned step on .tran.
  const std::string plain = deck_of(kSmall);
  CHECK(plain.find("\n.options method=trap\n") != std::string::npos);
  CHECK(plain.find("\n* run it: ngspice -b -r DECK.raw DECK.cir ") != std::string::npos);
  const std::string chosen = deck_of(std::string(kSmall) + "set method gear\nset step 2.5ps\n");
  CHECK(chosen.find("\n.options method=gear\n") != std::string::npos);
  CHECK(chosen.find("\n.tran 2.5e-12 ") != std::string::npos);
  CHECK(chosen.find(" 0 2.5e-12\n") != std::string::npos);
  // The plan reports the step the deck has.
  const auto planned = run_rungs("plan --analytic --json -", std::string(kSmall) + "set step 2.5ps\n");
  CHECK(planned.out.find("\"time_step\": 2.5e-12") != std::string::npos);
}

TEST_CASE("a template folder (--templates) replaces the deck's fixed parts", "[cli]") {
  // A changed template changes the output, and only where it is used.
  TempDir dir;
  const std::string analysis = read_file(kSource / "templates" / "analysis.tmpl");
  const std::size_t tran = analysis.find(".tran ");
  REQUIRE(tran != std::string::npos);
  std::string changed = analysis;
  changed.insert(tran, ".options method=gear reltol=1e-4\n");
  write_file(dir.path / "analysis.tmpl", changed);
  write_file(dir.path / "header.tmpl", "* {{design}} for the bench rig: {{lines}}\n");

  const std::string plain = deck_of(kSmall);
  const auto r = emit_text("-q --templates " + dir.path.string(), kSmall);
  CHECK(r.exit_code == 0);
  CHECK(r.err.empty());
  const std::string& deck = r.out;
  CHECK(deck != plain);
  // Header: the marker stays (it is not a template), then the new header.
  const std::size_t marker_end = plain.find('\n') + 1;
  CHECK(deck.substr(0, marker_end) == plain.substr(0, marker_end));
  CHECK(deck.substr(marker_end).rfind("* design for the bench rig: 1 line\n\n* line feed:", 0) ==
        0);
  // Analysis: the new line just before .tran; everything else as before.
  CHECK(deck.find(".options method=gear reltol=1e-4\n.tran ") != std::string::npos);
  std::string expected = plain;
  expected.insert(expected.find(".tran "), ".options method=gear reltol=1e-4\n");
  const std::size_t body = plain.find("\n* line feed:");
  CHECK(deck.substr(deck.find("\n* line feed:")) == expected.substr(body));
}

TEST_CASE("a template that does not fill is an error and nothing is written", "[cli]") {
  TempDir dir;
  const fs::path templates = dir.path / "templates";
  fs::create_directory(templates);
  write_file(templates / "line_begin.tmpl",
             "* line {{name}}, {{impedance}} ohm\n.subckt {{subckt}} near far ref\n");
  const fs::path deck = dir.path / "deck.cir";
  const auto r = emit_text("-o " + deck.string() + " --templates " + templates.string(), kSmall);
  CHECK(r.exit_code == 2);
  CHECK(r.out.empty());
  CHECK(r.err ==
        "rungs: template line_begin: unknown placeholder {{impedance}}; it knows "
        "delay, model, name, sections, shape, subckt, z0\n");
  CHECK(dir.entries() == std::set<std::string>{"templates"});

  // A deck already there stays as it was.
  REQUIRE(emit_text("-q -o " + deck.string(), kOther).exit_code == 0);
  const auto again =
      emit_text("-o " + deck.string() + " --templates " + templates.string(), kSmall);
  CHECK(again.exit_code == 2);
  CHECK(read_file(deck) == deck_of(kOther));
  CHECK(dir.entries() == std::set<std::string>{"deck.cir", "templates"});
}

TEST_CASE("a template folder with a misnamed part, or no folder, is an error", "[cli]") {
  TempDir dir;
  write_file(dir.path / "headr.tmpl", "* {{design}}\n");
  const auto misnamed = emit_text("-q --templates " + dir.path.string(), kSmall);
  CHECK(misnamed.exit_code == 2);
  CHECK(misnamed.out.empty());
  CHECK(misnamed.err == "rungs: " + (dir.path / "headr.tmpl").string() +
                            ": no deck part is called 'headr'; did you mean 'header'?\n");
  const std::string file = (dir.path / "headr.tmpl").string();
  const auto not_folder = emit_text("-q --templates " + file, kSmall);
  CHECK(not_folder.exit_code == 2);
  CHECK(not_folder.err == "rungs: --templates '" + file + "' is not a folder\n");
}

TEST_CASE("the reports (--report, --report-json) are written beside the deck", "[cli]") {
  TempDir dir;
  const fs::path input = dir.path / "small.rungs";
  write_file(input, kSmall);
  const fs::path deck = dir.path / "small.cir", text = dir.path / "small.txt",
                 json = dir.path / "small.json";
  const auto r = run_rungs("emit --analytic " + input.string() + " -q -o " + deck.string() +
                           " --report " + text.string() + " --report-json " + json.string());
  CHECK(r.exit_code == 0);
  CHECK(dir.entries() ==
        std::set<std::string>{"small.rungs", "small.cir", "small.txt", "small.json"});
  // The reports are what `rungs plan` prints.
  const auto plan_text = run_rungs("plan --analytic " + input.string());
  const auto plan_json = run_rungs("plan --analytic --json " + input.string());
  CHECK(plan_text.exit_code == 0);
  CHECK(plan_json.exit_code == 0);
  CHECK(read_file(text) == plan_text.out);
  CHECK(read_file(json) == plan_json.out);
  CHECK(read_file(text).rfind("design small (" + input.string() + "): 1 line", 0) == 0);
  CHECK(read_file(json).find("\"version\": 1") != std::string::npos);
  CHECK(read_file(deck).rfind("* generated by rungs ", 0) == 0);
}

TEST_CASE("bad input writes nothing and exits 2", "[cli]") {
  TempDir dir;
  const std::string outputs = " -o " + (dir.path / "deck.cir").string() + " --report " +
                              (dir.path / "r.txt").string() + " --report-json " +
                              (dir.path / "r.json").string();
  SECTION("a syntax error") {
    const auto r = emit_text(outputs, "line a -> b coax\n");
    CHECK(r.exit_code == 2);
    CHECK(r.out.empty());
    CHECK(r.err.rfind("<stdin>:1:8: error:", 0) == 0);
    CHECK(r.err.find("<stdin>: 1 error; nothing written\n") != std::string::npos);
  }
  SECTION("a design the planner cannot plan: no edge reaches the line") {
    const auto r = emit_text(outputs, "line t a -> b ideal z0=50ohm delay=1ns\n");
    CHECK(r.exit_code == 2);
    CHECK(r.err.find("error: no drive reaches line 't'") != std::string::npos);
    CHECK(r.err.find("<stdin>: 1 error; nothing written\n") != std::string::npos);
  }
  CHECK(dir.entries().empty());
}

TEST_CASE("bad input leaves a deck already there as it was", "[cli]") {
  TempDir dir;
  const fs::path deck = dir.path / "deck.cir";
  REQUIRE(emit_text("-q -o " + deck.string(), kSmall).exit_code == 0);
  const std::string before = read_file(deck);
  CHECK(emit_text("-o " + deck.string(), "line a -> b coax\n").exit_code == 2);
  CHECK(read_file(deck) == before);
  CHECK(dir.entries() == std::set<std::string>{"deck.cir"});
}

TEST_CASE("a deck that cannot be written is exit code 3", "[cli]") {
  TempDir dir;
  const fs::path deck = dir.path / "no_such_folder" / "deck.cir";
  const auto r = emit_text("-q -o " + deck.string(), kSmall);
  CHECK(r.exit_code == 3);
  CHECK(r.err.rfind("rungs: cannot write '" + (dir.path / "no_such_folder").string(), 0) == 0);
  CHECK(dir.entries().empty());
}

}  // namespace
