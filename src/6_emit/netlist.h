// The whole netlist: header, one subcircuit per line, and unless a library, the top level.
#pragma once
#include <ostream>
#include <string>

#include "6_emit/templates.h"
#include "3_model/circuit.h"
#include "5_plan/plan.h"

namespace rungs::emit {

struct NetlistOptions {
  bool library = false;     // subcircuits only: no drives, loads, analysis or .end
  bool with_ideal = false;  // also the simulator's ideal line beside each ladder
};

/// What the deck is made from.
struct NetlistOrigin {
  std::string name;  // the source file as the user named it, for the header
  std::string hash;  // SHA-256 of its text
};

/// The first line of every deck rungs writes; a file that does not start with it was not
/// written by rungs and is not overwritten without --force.
std::string deck_marker(std::string_view source_name);
/// True when `first_line` is a marker that deck_marker wrote (any source, any version).
bool is_deck_marker(std::string_view first_line);

/// Checks that every template the deck uses is present and fills with the placeholders it
/// is given (header: design, source_hash, lines, elements, tolerance; line_begin and
/// line_end: name, model, z0, delay, sections, shape, subckt; analysis: max_step, stop, uic,
/// saves). Returns the first problem, or empty. write_netlist assumes this passed.
std::string check_templates(const TemplateSet& templates);

/// Writes the netlist to `out`, streaming. Top-level nodes keep the description's names,
/// so `v(rx1)` probes load rx1; generated names never clash with them, even with case
/// folded. Drives are voltage sources with a linear ramp (0-100 % in rise/0.8) behind
/// their source resistance; loads are R, C, L networks to ground, switched ones through a
/// SPICE3 voltage-controlled switch; a charged line starts from its voltage under `uic`.
/// Returns an error message for a template that fails to fill, else empty.
std::string write_netlist(std::ostream& out, const model::Circuit& circuit, const plan::Plan& plan,
                       const NetlistOrigin& source, const TemplateSet& templates,
                       const NetlistOptions& options);

}  // namespace rungs::emit
