// The Spirit X3 rules of the description language; each production of rungs.ebnf beside
// this file is a rule here of the same name. Included only by src/syntax/parser.cpp.
#pragma once
#include <optional>
#include <set>
#include <string>

#include <boost/fusion/include/adapt_struct.hpp>
#include <boost/spirit/home/x3.hpp>

#include "1_syntax/ast.h"

BOOST_FUSION_ADAPT_STRUCT(rungs::syntax::ast::Param, key, value)
BOOST_FUSION_ADAPT_STRUCT(rungs::syntax::ast::Waveform, kind, low, high)
BOOST_FUSION_ADAPT_STRUCT(rungs::syntax::ast::LoadNetwork, kind, terms)
BOOST_FUSION_ADAPT_STRUCT(rungs::syntax::ast::SetStatement, key, value)
BOOST_FUSION_ADAPT_STRUCT(rungs::syntax::ast::LineStatement, name, near, far, model, params)
BOOST_FUSION_ADAPT_STRUCT(rungs::syntax::ast::DriveStatement, node, waveform, params)
BOOST_FUSION_ADAPT_STRUCT(rungs::syntax::ast::LoadStatement, node, network, params)

namespace rungs::grammar {

namespace x3 = boost::spirit::x3;
namespace ast = rungs::syntax::ast;

/// Context tags: the start of the file text (spans are offsets from it) and the set that
/// records which productions matched (for the grammar coverage test).
struct base_tag;
struct trace_tag;
using Trace = std::set<std::string>;

/// Every production's rule ID derives from this: on success it records the span of what the
/// rule matched and the production's name.
template <typename ID>
struct production {
  template <typename Iterator, typename Attribute, typename Context>
  void on_success(Iterator const& first, Iterator const& last, Attribute& attribute,
                  Context const& context) const {
    const char* base = x3::get<base_tag>(context);
    if constexpr (std::is_base_of_v<ast::Spanned, Attribute>) {
      attribute.span = {static_cast<std::size_t>(first - base),
                        static_cast<std::size_t>(last - base)};
    }
    x3::get<trace_tag>(context)->insert(ID::name);
  }
};

#define RUNGS_PRODUCTION(rule_name)                    \
  struct rule_name##_id : production<rule_name##_id> { \
    static constexpr const char* name = #rule_name;    \
  }

RUNGS_PRODUCTION(line_of_text);
RUNGS_PRODUCTION(comment);
RUNGS_PRODUCTION(statement);
RUNGS_PRODUCTION(design_statement);
RUNGS_PRODUCTION(set_statement);
RUNGS_PRODUCTION(line_statement);
RUNGS_PRODUCTION(drive_statement);
RUNGS_PRODUCTION(load_statement);
RUNGS_PRODUCTION(waveform);
RUNGS_PRODUCTION(step_waveform);
RUNGS_PRODUCTION(pulse_waveform);
RUNGS_PRODUCTION(dc_waveform);
RUNGS_PRODUCTION(load_network);
RUNGS_PRODUCTION(series_network);
RUNGS_PRODUCTION(parallel_network);
RUNGS_PRODUCTION(load_term);
RUNGS_PRODUCTION(param);
RUNGS_PRODUCTION(value);
RUNGS_PRODUCTION(node);
RUNGS_PRODUCTION(name);
RUNGS_PRODUCTION(quantity);
RUNGS_PRODUCTION(number);
RUNGS_PRODUCTION(unit);
#undef RUNGS_PRODUCTION

/// The names of the productions above, for the test that holds them against rungs.ebnf.
inline const std::set<std::string>& production_names() {
  static const std::set<std::string> names = {"line_of_text",
                                              "comment",
                                              "statement",
                                              "design_statement",
                                              "set_statement",
                                              "line_statement",
                                              "drive_statement",
                                              "load_statement",
                                              "waveform",
                                              "step_waveform",
                                              "pulse_waveform",
                                              "dc_waveform",
                                              "load_network",
                                              "series_network",
                                              "parallel_network",
                                              "load_term",
                                              "param",
                                              "value",
                                              "node",
                                              "name",
                                              "quantity",
                                              "number",
                                              "unit"};
  return names;
}

// Character classes (EBNF: letter_, letter, digit, unit_start). The locale never enters:
// ranges are spelled out rather than taken from <cctype>.
inline const auto letter = x3::char_('a', 'z') | x3::char_('A', 'Z');
inline const auto digit = x3::char_('0', '9');
inline const auto letter_ = letter | x3::char_('_');
// Single bytes of the UTF-8 forms of µ (C2 B5), μ (CE BC), Ω (CE A9, E2 84 A6).
inline const auto unit_start =
    letter | x3::char_("/%") | x3::char_("\xC2\xB5\xCE\xBC\xA9\xE2\x84\xA6");

/// Parses `subject` and makes a Word or Value of the characters it matched. A directive of
/// our own because X3 mishandles structs adapted with a single member.
template <typename Token, typename Subject>
struct token_directive : x3::unary_parser<Subject, token_directive<Token, Subject>> {
  using base_type = x3::unary_parser<Subject, token_directive<Token, Subject>>;
  using attribute_type = Token;
  static bool const has_attribute = true;
  constexpr explicit token_directive(Subject const& inner) : base_type(inner) {}

  template <typename Iterator, typename Context, typename RContext, typename Attribute>
  bool parse(Iterator& first, Iterator const& last, Context const& context, RContext& rcontext,
             Attribute& attribute) const {
    x3::skip_over(first, last, context);
    Iterator i = first;
    if (!this->subject.parse(i, last, context, rcontext, x3::unused)) return false;
    Token token;
    token.text.assign(first, i);
    x3::traits::move_to(token, attribute);
    first = i;
    return true;
  }
};

/// `directive[subject]` for a directive template of one parser parameter.
template <template <typename> class Directive>
struct directive_generator {
  template <typename Subject>
  constexpr auto operator[](Subject const& subject) const {
    using parser = typename x3::extension::as_parser<Subject>::value_type;
    return Directive<parser>(x3::as_parser(subject));
  }
};
template <typename Subject>
using word_directive = token_directive<ast::Word, Subject>;
template <typename Subject>
using value_directive = token_directive<ast::Value, Subject>;
inline constexpr directive_generator<word_directive> as_word{};
inline constexpr directive_generator<value_directive> as_value{};

/// A keyword matched whole: `line` is not the start of `liner`.
inline auto keyword(const char* word) {
  return x3::lexeme[x3::lit(word) >> !(letter_ | digit)];
}

// Human names of the rules: they are what an error says was expected.
x3::rule<line_of_text_id, std::optional<ast::Statement>> const line_of_text = "a statement";
x3::rule<comment_id> const comment = "a comment";
x3::rule<statement_id, ast::Statement> const statement = "a statement";
x3::rule<design_statement_id, ast::DesignStatement> const design_statement = "design";
x3::rule<set_statement_id, ast::SetStatement> const set_statement = "set";
x3::rule<line_statement_id, ast::LineStatement> const line_statement = "line";
x3::rule<drive_statement_id, ast::DriveStatement> const drive_statement = "drive";
x3::rule<load_statement_id, ast::LoadStatement> const load_statement = "load";
x3::rule<waveform_id, ast::Waveform> const waveform = "a waveform (step, pulse or dc)";
x3::rule<step_waveform_id, ast::Waveform> const step_waveform = "step";
x3::rule<pulse_waveform_id, ast::Waveform> const pulse_waveform = "pulse";
x3::rule<dc_waveform_id, ast::Waveform> const dc_waveform = "dc";
x3::rule<load_network_id, ast::LoadNetwork> const load_network =
    "a load (open, short, or values such as 50ohm || 4pF)";
x3::rule<load_term_id, ast::LoadTerm> const load_term = "a value such as 50ohm, 4pF or 10nH";
x3::rule<param_id, ast::Param> const param = "key=value";
x3::rule<value_id, ast::Value> const value = "a value";
x3::rule<node_id, ast::Word> const node = "a node name";
x3::rule<name_id, ast::Word> const name = "a name";
x3::rule<quantity_id, ast::Value> const quantity = "a number";
x3::rule<number_id> const number = "a number";
x3::rule<unit_id> const unit = "a unit";

// Helper rules that are not productions of their own: names for what an error expects.
x3::rule<struct line_name_id, ast::Word> const line_name = "a line name";
x3::rule<struct setting_name_id, ast::Word> const setting_name =
    "a setting name (rise, tolerance, shape or window)";
x3::rule<struct model_name_id, ast::Word> const model_name = "a model name such as coax";
x3::rule<struct level_id, ast::Value> const level = "a voltage such as 0V";
x3::rule<struct arrow_id> const arrow = "'->' between the two ends";
x3::rule<struct to_id> const to = "'to' between the two levels";
x3::rule<struct close_id> const close_bracket = "')'";
x3::rule<struct end_id> const end_of_line = "the end of the line";

namespace actions {
inline const auto assign = [](auto& ctx) { x3::_val(ctx) = std::move(x3::_attr(ctx)); };
inline const auto design_name = [](auto& ctx) { x3::_val(ctx).name = std::move(x3::_attr(ctx)); };
}  // namespace actions

// Rules with semantic actions lose their on_success attribute (X3 passes `unused`), so every
// production that carries a span is written without actions: attributes flow by structure,
// and x3::attr supplies the kind of a waveform or network.
x3::rule<struct value_word_id, ast::Value> const value_word = "a value";
x3::rule<struct open_network_id, ast::LoadNetwork> const open_network = "open";
x3::rule<struct short_network_id, ast::LoadNetwork> const short_network = "short";

/// series_network | parallel_network | load_term of rungs.ebnf, parsed in one pass: the first
/// term once, then `+ term`... (series) or `|| term`... (parallel), or nothing (single). The
/// three productions all start with a load_term; trying them one after another as
/// alternatives parsed a bracketed term three times at every level of brackets, which is
/// exponential in the nesting depth. An operator with no term after it is left unconsumed,
/// as the alternatives did, so the end-of-line check reports it.
struct load_chain_parser : x3::parser<load_chain_parser> {
  using attribute_type = ast::LoadNetwork;
  static bool const has_attribute = true;

  template <typename Iterator, typename Context, typename RContext, typename Attribute>
  bool parse(Iterator& first, Iterator const& last, Context const& context, RContext& rcontext,
             Attribute& attribute) const;
};
inline constexpr load_chain_parser load_chain{};

// Tokens.
inline const auto name_chars = x3::lexeme[letter_ >> *(letter_ | digit)];
inline const auto name_def = as_word[name_chars];
inline const auto number_def =
    x3::lexeme[-x3::char_("+-") >> ((+digit >> -('.' >> *digit)) | ('.' >> +digit)) >>
               -(x3::char_("eE") >> -x3::char_("+-") >> +digit)];
inline const auto unit_def = x3::lexeme[unit_start >> *(unit_start | digit)];
inline const auto quantity_def = as_value[x3::lexeme[number >> -unit]];
// A word followed by '=' is the next parameter, not this one's value.
inline const auto value_word_def = as_value[name_chars] >> !x3::lit('=');
inline const auto value_def = quantity | value_word;
inline const auto node_def = name | as_word[x3::lexeme[x3::lit('0') >> !(letter_ | digit)]];
inline const auto param_def = name >> '=' > value;
inline const auto comment_def = x3::lexeme['#' >> *(x3::char_ - x3::eol)];

// Helpers.
inline const auto line_name_def = name;
inline const auto setting_name_def = name;
inline const auto model_name_def = name;
inline const auto level_def = quantity;
inline const auto arrow_def = x3::lit("->");
inline const auto to_def = keyword("to");
inline const auto close_bracket_def = x3::lit(')');
inline const auto end_of_line_def = x3::eol | x3::eoi;
inline const auto open_network_def = x3::attr(ast::NetworkKind::open) >>
                                     keyword("open") >> x3::attr(std::vector<ast::LoadTerm>{});
inline const auto short_network_def = x3::attr(ast::NetworkKind::short_circuit) >>
                                      keyword("short") >> x3::attr(std::vector<ast::LoadTerm>{});

// Statements.
inline const auto design_statement_def = (keyword("design") > name)[actions::design_name];
inline const auto set_statement_def = keyword("set") > setting_name > value;
inline const auto line_statement_def =
    keyword("line") > line_name > node > arrow > node > model_name > *param;
inline const auto step_waveform_def = x3::attr(ast::WaveKind::step) >> keyword("step") > level > to
                                      > level;
inline const auto pulse_waveform_def = x3::attr(ast::WaveKind::pulse) >> keyword("pulse") > level
                                       > to > level;
inline const auto dc_waveform_def = x3::attr(ast::WaveKind::dc) >> keyword("dc") > level
                                    >> x3::attr(boost::optional<ast::Value>{});
inline const auto waveform_def = step_waveform | pulse_waveform | dc_waveform;
inline const auto drive_statement_def = keyword("drive") > node > waveform > *param;
inline const auto load_term_def = quantity | ('(' > load_network > close_bracket);
// The first term is parsed once and what follows it decides the kind (see load_chain_parser).
inline const auto load_network_def = open_network | short_network | load_chain;
inline const auto load_statement_def = keyword("load") > node > load_network > *param;
inline const auto statement_def = design_statement[actions::assign] |
                                  set_statement[actions::assign] | line_statement[actions::assign] |
                                  drive_statement[actions::assign] |
                                  load_statement[actions::assign];
inline const auto line_of_text_def = -statement[actions::assign] >> -comment > end_of_line;

BOOST_SPIRIT_DEFINE(line_of_text, comment, statement, design_statement, set_statement,
                    line_statement, drive_statement, load_statement, waveform, step_waveform,
                    pulse_waveform, dc_waveform, load_network, load_term, param, value, node, name,
                    quantity, number, unit)
BOOST_SPIRIT_DEFINE(line_name, setting_name, level, model_name, arrow, to, close_bracket,
                    end_of_line, value_word, open_network, short_network)

template <typename Iterator, typename Context, typename RContext, typename Attribute>
bool load_chain_parser::parse(Iterator& first, Iterator const& last, Context const& context,
                              RContext& rcontext, Attribute& attribute) const {
  ast::LoadNetwork network;
  Iterator i = first;
  ast::LoadTerm term;
  if (!load_term.parse(i, last, context, rcontext, term)) return false;
  network.terms.push_back(std::move(term));
  // The operator that joins the terms is the one after the first term; the other one ends
  // the chain (mixing them without brackets is reported by the end-of-line check).
  const auto plus = x3::lit('+');
  const auto bars = x3::lit("||");
  auto more = [&](auto const& op) {
    while (true) {
      Iterator j = i;
      if (!op.parse(j, last, context, rcontext, x3::unused)) return;
      ast::LoadTerm next;
      if (!load_term.parse(j, last, context, rcontext, next)) return;
      network.terms.push_back(std::move(next));
      i = j;
    }
  };
  more(plus);
  if (network.terms.size() > 1) {
    network.kind = ast::NetworkKind::series;
  } else {
    more(bars);
    network.kind = network.terms.size() > 1 ? ast::NetworkKind::parallel : ast::NetworkKind::single;
  }
  const char* production = network.kind == ast::NetworkKind::series     ? series_network_id::name
                           : network.kind == ast::NetworkKind::parallel ? parallel_network_id::name
                                                                        : nullptr;
  if (production) x3::get<trace_tag>(context)->insert(production);
  x3::traits::move_to(std::move(network), attribute);
  first = i;
  return true;
}

}  // namespace rungs::grammar
