// Subcommands of `rungs`: reading the description, running the stages, printing results.
#include "cli/commands.h"

#include <cerrno>
#include <cstring>
#include <fstream>
#include <iostream>
#include <optional>
#include <sstream>

#include <CLI/CLI.hpp>
#include <fmt/format.h>

#include "physics/resolve.h"
#include "report/lines_table.h"
#include "syntax/parser.h"

namespace rungs::cli {

namespace {

/// Reads a description from a path, or from standard input for "-".
std::optional<syntax::SourceFile> read_source(const std::string& path) {
  std::ostringstream text;
  if (path == "-") {
    text << std::cin.rdbuf();
    return syntax::SourceFile{"<stdin>", text.str()};
  }
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    fmt::print(stderr, "rungs: cannot read '{}': {}\n", path, std::strerror(errno));
    return std::nullopt;
  }
  text << in.rdbuf();
  return syntax::SourceFile{path, text.str()};
}

/// Parses and resolves; prints every diagnostic to stderr. Empty when there were errors.
std::optional<physics::Circuit> load_circuit(const syntax::SourceFile& file) {
  syntax::Diagnostics diagnostics(file);
  const auto description = syntax::parse_description(diagnostics);
  physics::Circuit circuit = physics::resolve(description, diagnostics);
  std::cerr << diagnostics.render();
  if (diagnostics.has_errors()) {
    fmt::print(stderr, "{}: {} error{}; nothing written\n", file.name, diagnostics.error_count(),
               diagnostics.error_count() == 1 ? "" : "s");
    return std::nullopt;
  }
  return circuit;
}

int lines_command(const std::string& path, bool json) {
  const auto file = read_source(path);
  if (!file) return kExitInternal;
  const auto circuit = load_circuit(*file);
  if (!circuit) return kExitBadInput;
  std::cout << (json ? report::lines_json(*circuit) : report::lines_table(*circuit));
  std::cout.flush();
  return std::cout ? kExitOk : kExitInternal;
}

}  // namespace

int run(int argc, char** argv) {
  CLI::App app{"rungs: turns transmission-line descriptions into lumped-ladder SPICE netlists",
               "rungs"};
  app.set_version_flag("--version", std::string("rungs ") + RUNGS_VERSION);
  app.require_subcommand(1);

  std::string path;
  bool json = false;
  CLI::App* lines = app.add_subcommand("lines", "Print every line's Z0, delay, L', C', R', G'");
  lines->add_option("FILE", path, "Description file (.rungs), or - for standard input")
      ->required();
  lines->add_flag("--json", json, "Print JSON (SI units) instead of a table");

  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    const int code = app.exit(e);
    return code == 0 ? kExitOk : kExitBadInput;
  }
  try {
    if (lines->parsed()) return lines_command(path, json);
  } catch (const std::exception& e) {
    fmt::print(stderr, "rungs: internal error: {}\n", e.what());
    return kExitInternal;
  }
  return kExitBadInput;
}

}  // namespace rungs::cli
