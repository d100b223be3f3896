// The grammar: rungs.ebnf and the X3 rules name the same productions, the examples and the
// corpus exercise every one, and the syntax tree keeps what was written and where.
#include <catch2/catch.hpp>

#include <filesystem>
#include <fstream>
#include <regex>
#include <sstream>

#include "1_syntax/parser.h"

namespace fs = std::filesystem;
using namespace rungs::syntax;

namespace {

std::string slurp(const fs::path& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

/// The left-hand sides of the EBNF file, comments removed.
std::set<std::string> ebnf_productions() {
  std::string text = slurp(fs::path(RUNGS_SOURCE_DIR) / "grammar" / "rungs.ebnf");
  text = std::regex_replace(text, std::regex(R"(\(\*[\s\S]*?\*\))"), "");
  std::set<std::string> names;
  const std::regex lhs(R"((?:^|\n)\s*([a-z_]+)\s*=)");
  for (auto it = std::sregex_iterator(text.begin(), text.end(), lhs); it != std::sregex_iterator();
       ++it)
    names.insert((*it)[1]);
  return names;
}

ast::Description parse(const std::string& text, std::set<std::string>* trace = nullptr,
                       std::string* rendered = nullptr) {
  InputFile file{"t.rungs", text};
  Diagnostics d(file);
  auto description = parse_description(d, trace);
  if (rendered) *rendered = d.render();
  return description;
}

}  // namespace

TEST_CASE("the EBNF and the X3 rules name the same productions") {
  std::set<std::string> expected = grammar_productions();
  // Character classes are written in EBNF but implemented as X3 character parsers.
  for (const char* cls : {"letter_", "letter", "digit", "unit_start"}) expected.insert(cls);
  CHECK(ebnf_productions() == expected);
}

TEST_CASE("the examples and the corpus exercise every production, with no syntax error") {
  std::set<std::string> used;
  std::vector<fs::path> files;
  for (const auto& entry : fs::directory_iterator(fs::path(RUNGS_SOURCE_DIR) / "examples"))
    if (entry.path().extension() == ".rungs") files.push_back(entry.path());
  files.push_back(fs::path(RUNGS_SOURCE_DIR) / "tests/data/grammar_corpus.rungs");
  files.push_back(fs::path(RUNGS_SOURCE_DIR) / "tests/data/grammar_corpus_2.rungs");
  REQUIRE(files.size() >= 5);  // at least three examples
  for (const fs::path& path : files) {
    std::string rendered;
    parse(slurp(path), &used, &rendered);
    INFO(path.string());
    CHECK(rendered.empty());
  }
  for (const std::string& production : grammar_productions()) {
    INFO("production never matched: " << production);
    CHECK(used.count(production) == 1);
  }
}

TEST_CASE("a line statement keeps its words and their spans") {
  const std::string text = "line feed tap -> rx2 coax inner=0.91mm outer=2.95mm er=2.25\n";
  auto d = parse(text);
  REQUIRE(d.statements.size() == 1);
  const auto& line = std::get<ast::LineStatement>(d.statements[0]);
  CHECK(line.name.text == "feed");
  CHECK(line.near.text == "tap");
  CHECK(line.far.text == "rx2");
  CHECK(line.model.text == "coax");
  REQUIRE(line.params.size() == 3);
  CHECK(line.params[0].key.text == "inner");
  CHECK(line.params[0].value.text == "0.91mm");
  CHECK(line.params[0].value.is_number());
  CHECK(text.substr(line.params[1].value.span.begin,
                    line.params[1].value.span.end - line.params[1].value.span.begin) == "2.95mm");
  CHECK(line.near.span.begin == 10);
  CHECK(line.near.span.end == 13);
  CHECK(line.span.begin == 0);
}

TEST_CASE("drives: step, pulse and dc waveforms") {
  auto d = parse("drive a step 0V to 3.3V rise=1ns\ndrive b pulse -1V to 1V width=2ns\n"
                 "drive c dc 10V\n");
  REQUIRE(d.statements.size() == 3);
  const auto& step = std::get<ast::DriveStatement>(d.statements[0]);
  CHECK(step.waveform.kind == ast::WaveKind::step);
  CHECK(step.waveform.low.text == "0V");
  REQUIRE(step.waveform.high.has_value());
  CHECK(step.waveform.high->text == "3.3V");
  const auto& pulse = std::get<ast::DriveStatement>(d.statements[1]);
  CHECK(pulse.waveform.kind == ast::WaveKind::pulse);
  CHECK(pulse.waveform.low.text == "-1V");
  const auto& dc = std::get<ast::DriveStatement>(d.statements[2]);
  CHECK(dc.waveform.kind == ast::WaveKind::dc);
  CHECK(dc.waveform.low.text == "10V");
  CHECK_FALSE(dc.waveform.high.has_value());
}

TEST_CASE("loads: series, parallel, brackets, open and short") {
  auto d = parse("load a 10kohm || 4pF\nload b 50ohm + 1nF + 2nH\nload c (50ohm + 1nH) || 2pF\n"
                 "load d open\nload e short\nload f 50ohm at=20ns\n");
  REQUIRE(d.statements.size() == 6);
  auto network = [&](int i) { return std::get<ast::LoadStatement>(d.statements[i]).network; };
  CHECK(network(0).kind == ast::NetworkKind::parallel);
  CHECK(network(0).terms.size() == 2);
  CHECK(network(1).kind == ast::NetworkKind::series);
  CHECK(network(1).terms.size() == 3);
  CHECK(network(2).kind == ast::NetworkKind::parallel);
  const auto& inner =
      boost::get<boost::spirit::x3::forward_ast<ast::LoadNetwork>>(network(2).terms[0]).get();
  CHECK(inner.kind == ast::NetworkKind::series);
  CHECK(network(3).kind == ast::NetworkKind::open);
  CHECK(network(4).kind == ast::NetworkKind::short_circuit);
  CHECK(network(5).kind == ast::NetworkKind::single);
  CHECK(std::get<ast::LoadStatement>(d.statements[5]).params.at(0).key.text == "at");
}

TEST_CASE("comments, blank lines and CRLF line ends are ignored") {
  std::string rendered;
  auto d = parse("# a comment\r\n\r\n   \r\nset rise 1ns # trailing\r\n\tset shape t\r\n",
                 nullptr, &rendered);
  CHECK(rendered.empty());
  REQUIRE(d.statements.size() == 2);
  CHECK(std::get<ast::SetStatement>(d.statements[0]).value.text == "1ns");
  CHECK(std::get<ast::SetStatement>(d.statements[1]).value.text == "t");
  CHECK_FALSE(std::get<ast::SetStatement>(d.statements[1]).value.is_number());
}

TEST_CASE("keywords are matched whole") {
  std::string rendered;
  auto d = parse("liner a -> b coax\n", nullptr, &rendered);
  CHECK(d.statements.empty());
  CHECK(rendered.find("unknown statement 'liner'; did you mean 'line'?") != std::string::npos);
}

TEST_CASE("a syntax error costs only its own line") {
  std::string rendered;
  auto d = parse("set rise 1ns\nline a -> b coax\nset shape pi\n", nullptr, &rendered);
  CHECK(d.statements.size() == 2);
  CHECK(rendered.rfind("t.rungs:2:8: error:", 0) == 0);
}
