// Parsing a description's text into its syntax tree, reporting every syntax error.
#pragma once
#include <cstddef>
#include <set>
#include <string>

#include "1_syntax/ast.h"
#include "1_syntax/diagnostics.h"

namespace rungs::syntax {

/// Parses every line of `diagnostics.file()`. A line with a syntax error is reported (one
/// error a line, at the token where the grammar failed) and left out; parsing goes on with
/// the next line, so all errors of a file are reported. When `productions` is given, the
/// names of the grammar productions that matched are added to it (for the grammar tests).
ast::Description parse_description(Diagnostics& diagnostics,
                                   std::set<std::string>* productions = nullptr);

/// The names of the productions that the X3 rules implement (grammar/rules.h), plus
/// "description", which is the line loop of parse_description itself.
const std::set<std::string>& grammar_productions();

/// The deepest nesting of brackets in a load: a deeper line is an error before the grammar
/// runs (its recursion follows the brackets).
inline constexpr int kMaxBracketDepth = 64;
/// The most values one load takes, counted through its brackets: every value becomes
/// elements and nodes of the circuit that the later stages solve.
inline constexpr std::size_t kMaxLoadValues = 256;

/// The statement keywords, for "did you mean".
inline constexpr std::string_view kStatementKeywords[] = {"design", "set", "line", "drive", "load"};

}  // namespace rungs::syntax
