// The build manifest (rungs.toml): which descriptions become which netlists, and defaults.
#pragma once
#include <string>
#include <string_view>
#include <vector>

#include "1_syntax/input_file.h"
#include "1_syntax/diagnostics.h"

namespace rungs::syntax::ast {
struct Description;  // 1_syntax/ast.h; declared here so that Spirit stays out of this header
}

namespace rungs::project {

/// The manifest's file name, looked up from the current folder upward.
inline constexpr std::string_view kManifestName = "rungs.toml";

/// One design-wide setting given in [defaults], as the description language writes its value
/// ("2%", "350ps", "pi"); already checked as a `set` statement would be.
struct DefaultSetting {
  std::string key;    // rise, tolerance, shape or window
  std::string value;  // the value token
  syntax::Span span;  // the TOML value, in the manifest
};

/// [defaults]: settings for every description that does not `set` them itself.
struct Defaults {
  std::vector<DefaultSetting> settings;  // in the order rise, tolerance, shape, window
  std::string templates;                 // template folder as written; empty for built-in
  syntax::Span templates_span;
};

/// One [[netlist]] table. Paths are as written, relative to the manifest's folder unless
/// absolute; empty where an optional key is left out.
struct NetlistEntry {
  std::string source;        // the .rungs description
  std::string output;        // the netlist
  std::string report;        // the plan report, text
  std::string report_json;   // the plan report, JSON
  std::string templates;     // template folder for this netlist; empty: the default's
  bool library = false;      // subcircuits only
  bool with_ideal = false;   // also the simulator's ideal line beside each ladder
  syntax::Span span;         // the [[netlist]] header
  syntax::Span source_span;  // each path's value, for messages about it
  syntax::Span output_span;
  syntax::Span report_span;
  syntax::Span report_json_span;
  syntax::Span templates_span;
};

struct Manifest {
  Defaults defaults;
  std::vector<NetlistEntry> netlists;
};

/// Parses `diagnostics.file()` as a manifest. Reports every problem through `diagnostics`
/// with the span of the key or value it is about: TOML syntax (the first error only, where
/// the TOML reader stops), unknown keys with a "did you mean", wrong value types, missing
/// source or output, settings that `set` would reject (with its message), and two tables
/// that write the same file. The manifest is complete only when no error was reported.
/// Pure: no file is read; paths are not looked up.
Manifest parse_manifest(syntax::Diagnostics& diagnostics);

/// The template folder a netlist uses: its own, else the default's (as written).
std::string templates_of(const Manifest& manifest, const NetlistEntry& entry);

/// Adds a `set` statement for each default that `description` does not set itself, so a
/// description's own `set` always wins. The added statements carry an empty span; their
/// values were checked by parse_manifest, so they raise no diagnostic of their own.
void apply_defaults(syntax::ast::Description& description,
                    const std::vector<DefaultSetting>& settings);

}  // namespace rungs::project
