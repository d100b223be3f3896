// The driver around the X3 grammar: one line at a time, with error recovery and messages.
#include "1_syntax/parser.h"

#include <optional>
#include <vector>

#include <fmt/format.h>

#include "1_syntax/suggest.h"
#include "rules.h"  // grammar/rules.h

#include "1_syntax/text.h"

namespace rungs::syntax {

namespace x3 = boost::spirit::x3;

namespace {

bool is_blank(char c) {
  return c == ' ' || c == '\t';
}
bool is_line_end(char c) {
  return c == '\n' || c == '\r';
}
bool is_word_char(char c) {
  return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') || c == '_';
}

/// The token that starts at `at`: a word, or a run of other non-blank characters.
Span token_at(const std::string& text, std::size_t at) {
  while (at < text.size() && is_blank(text[at])) ++at;
  std::size_t end = at;
  if (end < text.size() && is_word_char(text[end])) {
    while (end < text.size() && is_word_char(text[end])) ++end;
  } else {
    while (end < text.size() && !is_blank(text[end]) && !is_line_end(text[end]) &&
           !is_word_char(text[end]))
      ++end;
  }
  return {at, end};
}

std::string describe_found(const InputFile& file, Span token) {
  if (token.begin == token.end || file.text[token.begin] == '#') return "the end of the line";
  return fmt::format("'{}'", file.slice(token));
}

bool is_name(std::string_view token) {
  return !token.empty() && !(token[0] >= '0' && token[0] <= '9') &&
         std::all_of(token.begin(), token.end(), is_word_char);
}

/// The first token of the line that starts at `line_begin`: the statement keyword.
Span first_token(const InputFile& file, std::size_t line_begin) {
  std::size_t i = line_begin;
  while (i < file.text.size() && is_blank(file.text[i])) ++i;
  return token_at(file.text, i);
}

/// The token that ends just before `at` (blanks skipped), on the same line.
std::string_view token_before(const InputFile& file, std::size_t at) {
  std::size_t end = at;
  while (end > 0 && is_blank(file.text[end - 1])) --end;
  std::size_t begin = end;
  while (begin > 0 && !is_blank(file.text[begin - 1]) && !is_line_end(file.text[begin - 1]))
    --begin;
  return std::string_view(file.text).substr(begin, end - begin);
}

bool is_digit(char c) {
  return c >= '0' && c <= '9';
}

/// The message for a line whose statement parsed but was followed by something else.
std::string leftover_message(const InputFile& file, Span token, std::string_view keyword,
                             const std::string& found) {
  const std::string_view found_text = file.slice(token);
  const std::string_view before = token_before(file, token.begin);
  if (keyword == "load" && (found_text == "+" || found_text == "||")) {
    const Span next = token_at(file.text, token.end);
    if (next.begin == next.end || file.text[next.begin] == '#')
      return fmt::format(
          "expected a value such as 50ohm, 4pF or 10nH after '{}', found the end "
          "of the line",
          found_text);
    return "'+' and '||' cannot be mixed without brackets; write for example "
           "(50ohm + 1nF) || 10kohm";
  }
  if (is_name(found_text) && !before.empty() && is_digit(before.back())) {
    const std::string_view number = before.substr(before.find('=') + 1);
    return fmt::format("a unit follows its number with no blank between them: write {}{}", number,
                       found_text);
  }
  if (keyword == "drive" && found_text == "to")
    return "a dc drive takes one level; for a change between two levels write step LOW to HIGH";
  if (keyword == "load" && !found_text.empty() && !is_name(found_text) && found_text != "#")
    return fmt::format("expected '+' (series) or '||' (parallel) between load values, found {}",
                       found);
  if (is_name(found_text))
    return fmt::format(
        "expected key=value or the end of the line, found {}; "
        "a parameter is written {}=VALUE",
        found, found_text);
  return fmt::format("expected key=value or the end of the line, found {}", found);
}

std::string expectation_message(const InputFile& file, std::size_t line_begin,
                                std::string_view which, Span token) {
  const std::string found = describe_found(file, token);
  const std::string_view found_text = file.slice(token);
  const Span keyword_token = first_token(file, line_begin);
  const std::string_view keyword = file.slice(keyword_token);
  const bool at_line_start = token.begin == keyword_token.begin;

  if (!found_text.empty() && is_non_ascii(found_text[0]))
    return fmt::format("names use ASCII letters, digits and _ only, found {}", found);
  if (which == grammar::value.name) {
    const std::string_view before = token_before(file, token.begin);
    if (!before.empty() && before.back() == '=')
      return fmt::format("expected a value right after '{}', found {}", before, found);
  }
  if (which == grammar::end_of_line.name) {
    if (at_line_start) {
      if (is_name(found_text))
        return fmt::format("unknown statement {}{}", found,
                           did_you_mean(found_text, kStatementKeywords));
      return fmt::format("expected a statement (design, set, line, drive or load), found {}",
                         found);
    }
    return leftover_message(file, token, keyword, found);
  }
  if (which == grammar::node.name && keyword == "line" && found_text == "->")
    return "expected a line name before its ends: line NAME NEAR -> FAR MODEL key=value...";
  if (which == grammar::waveform.name && is_name(found_text)) {
    static constexpr std::string_view kinds[] = {"step", "pulse", "dc"};
    return fmt::format("unknown waveform {}{}", found, did_you_mean(found_text, kinds));
  }
  if (which == grammar::load_network.name && is_name(found_text)) {
    static constexpr std::string_view kinds[] = {"open", "short"};
    const std::string near = nearest(found_text, kinds);
    if (!near.empty())
      return fmt::format("expected a load, found {}; did you mean '{}'?", found, near);
  }
  return fmt::format("expected {}, found {}", which, found);
}

/// The start of the line after the one that holds `at` (LF, CRLF or a lone CR ends a line).
const char* next_line(const char* at, const char* end) {
  at = std::find_if(at, end, [](char c) { return is_line_end(c); });
  if (at == end) return at;
  if (*at == '\r' && at + 1 != end && at[1] == '\n') return at + 2;
  return at + 1;
}

/// The first '(' of the line that starts at `line_begin` that opens a bracket deeper than
/// kMaxBracketDepth, if any (a comment is not looked into). Checked before the grammar runs,
/// whose recursion follows the brackets: a line of many '(' would otherwise exhaust the stack.
std::optional<std::size_t> too_deep_bracket(const std::string& text, std::size_t line_begin) {
  int depth = 0;
  for (std::size_t i = line_begin; i < text.size() && !is_line_end(text[i]) && text[i] != '#';
       ++i) {
    if (text[i] == '(' && ++depth > kMaxBracketDepth) return i;
    if (text[i] == ')' && depth > 0) --depth;
  }
  return std::nullopt;
}

/// Appends the values of `network` and of the networks in its brackets to `values`, in order.
void collect_values(const ast::LoadNetwork& network, std::vector<const ast::Value*>& values) {
  for (const ast::LoadTerm& term : network.terms) {
    if (const auto* value = boost::get<ast::Value>(&term.get())) {
      values.push_back(value);
    } else {
      collect_values(boost::get<x3::forward_ast<ast::LoadNetwork>>(term.get()).get(), values);
    }
  }
}

/// Reports a load with more than kMaxLoadValues values (at the first value past the limit)
/// and returns false for it.
bool check_load_size(const ast::Statement& statement, Diagnostics& diagnostics) {
  const auto* load = std::get_if<ast::LoadStatement>(&statement);
  if (!load) return true;
  std::vector<const ast::Value*> values;
  collect_values(load->network, values);
  if (values.size() <= kMaxLoadValues) return true;
  diagnostics.error(values[kMaxLoadValues]->span,
                    fmt::format("a load takes at most {} values, this one has {}; combine them "
                                "first (values in series or in parallel make one value) or "
                                "spread them over several nodes",
                                kMaxLoadValues, values.size()));
  return false;
}

}  // namespace

const std::set<std::string>& grammar_productions() {
  static const std::set<std::string> names = [] {
    std::set<std::string> all = grammar::production_names();
    all.insert("description");
    return all;
  }();
  return names;
}

ast::Description parse_description(Diagnostics& diagnostics, std::set<std::string>* productions) {
  const InputFile& file = diagnostics.file();
  const char* const base = file.text.data();
  const char* const end = base + file.text.size();
  grammar::Trace trace;
  ast::Description description;

  const auto parser = x3::with<grammar::base_tag>(
      base)[x3::with<grammar::trace_tag>(&trace)[grammar::line_of_text]];
  const char* at = base;
  while (at != end) {
    const char* line_begin = at;
    std::optional<ast::Statement> statement;
    if (const auto deep =
            too_deep_bracket(file.text, static_cast<std::size_t>(line_begin - base))) {
      diagnostics.error({*deep, *deep + 1},
                        fmt::format("brackets nested deeper than {} levels; write the load with "
                                    "fewer brackets: a + b + c needs none, (a + b) || c needs one",
                                    kMaxBracketDepth));
      at = next_line(base + *deep, end);
      continue;
    }
    try {
      if (x3::phrase_parse(at, end, parser, x3::blank, statement) && statement &&
          check_load_size(*statement, diagnostics))
        description.statements.push_back(std::move(*statement));
    } catch (const x3::expectation_failure<const char*>& failure) {
      const Span token = token_at(file.text, static_cast<std::size_t>(failure.where() - base));
      diagnostics.error(token,
                        expectation_message(file, static_cast<std::size_t>(line_begin - base),
                                            failure.which(), token));
      at = next_line(failure.where(), end);
    }
    if (at == line_begin) {  // defensive: never loop on input the grammar does not consume
      at = next_line(at, end);
    }
  }
  if (productions) {
    productions->insert(trace.begin(), trace.end());
    productions->insert("description");
  }
  return description;
}

}  // namespace rungs::syntax
