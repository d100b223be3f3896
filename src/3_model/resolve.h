// Resolving a parsed description into a circuit: units, models, options and topology.
#pragma once
#include "1_syntax/diagnostics.h"
#include "3_model/circuit.h"

namespace rungs::syntax::ast {
struct Description;  // 1_syntax/ast.h; declared here so that Spirit stays out of this header
}

namespace rungs::model {

/// Turns the syntax tree into SI values and line figures, reporting every error and warning
/// through `diagnostics` (all of them, not only the first). The circuit is complete only
/// when no error was reported. The design name defaults to the source file's stem. The
/// circuit's edges are derived (derive_edges).
Circuit resolve(const syntax::ast::Description& description, syntax::Diagnostics& diagnostics);

/// Checks how lines, drives and loads connect: names unique (also once case is folded, as
/// simulators fold it), one drive a node, drives and loads on nodes that a line reaches, no
/// line end on ground; a line end that touches nothing else is a warning (treated as open).
/// With `check_reach` false, only names are checked, not what reaches what.
void check_topology(const Circuit& circuit, syntax::Diagnostics& diagnostics,
                    bool check_reach = true);

}  // namespace rungs::model
