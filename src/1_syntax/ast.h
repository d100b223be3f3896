// The parsed description: statements as written, every piece with its source span.
// Nothing here is interpreted yet; units and models are checked by 3_model/resolve.
#pragma once
#include <cctype>
#include <string>
#include <variant>
#include <vector>

#include <boost/optional.hpp>
#include <boost/spirit/home/x3/support/ast/variant.hpp>

#include "1_syntax/kinds.h"
#include "1_syntax/input_file.h"

namespace rungs::syntax::ast {

/// Base of every node that remembers where in the text it came from.
struct Spanned {
  Span span;
};

/// A name: a statement keyword, a line, node, model or parameter name.
struct Word : Spanned {
  std::string text;
};

/// A value token as written: a number with its unit (`42mm`, `0.66c`, `2%`) or a word (`pi`).
struct Value : Spanned {
  std::string text;
  /// True when the token is a number (with or without a unit), false for a word.
  bool is_number() const { return !text.empty() && !(text[0] == '_' || std::isalpha(static_cast<unsigned char>(text[0]))); }
};

/// `key=value`.
struct Param : Spanned {
  Word key;
  Value value;
};

/// `design NAME` (its place in the text is name.span).
struct DesignStatement {
  Word name;
};

/// `set KEY VALUE`.
struct SetStatement : Spanned {
  Word key;
  Value value;
};

/// `line NAME NEAR -> FAR MODEL key=value...`.
struct LineStatement : Spanned {
  Word name;
  Word near;
  Word far;
  Word model;
  std::vector<Param> params;
};

/// `step LOW to HIGH`, `pulse LOW to HIGH`, or `dc LEVEL` (then `high` is empty; boost's
/// optional because the parser library fills it).
struct Waveform : Spanned {
  WaveKind kind = WaveKind::step;
  Value low;
  boost::optional<Value> high;
};

/// `drive NODE WAVEFORM key=value...`.
struct DriveStatement : Spanned {
  Word node;
  Waveform waveform;
  std::vector<Param> params;
};

struct LoadNetwork;
/// One element of a load network: a value (`50ohm`, `4pF`, `10nH`) or a bracketed network.
struct LoadTerm : boost::spirit::x3::variant<Value, boost::spirit::x3::forward_ast<LoadNetwork>> {
  using base_type::base_type;
  using base_type::operator=;
};

/// Terms joined all by `+` (series) or all by `||` (parallel); or open, or short.
struct LoadNetwork : Spanned {
  NetworkKind kind = NetworkKind::single;
  std::vector<LoadTerm> terms;
};

/// `load NODE NETWORK key=value...`.
struct LoadStatement : Spanned {
  Word node;
  LoadNetwork network;
  std::vector<Param> params;
};

using Statement =
    std::variant<DesignStatement, SetStatement, LineStatement, DriveStatement, LoadStatement>;

/// A whole description: its statements in source order.
struct Description {
  std::vector<Statement> statements;
};

}  // namespace rungs::syntax::ast
