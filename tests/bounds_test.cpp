// Bounded work on hostile input: deep brackets, long load chains, many errors and long lines
// each end in a located error or a capped report, checked by the text a user sees.
#include <catch2/catch.hpp>

#include <string>
#include <utility>

#include "1_syntax/diagnostics.h"
#include "1_syntax/input_file.h"
#include "1_syntax/parser.h"

namespace {

using rungs::syntax::Diagnostics;
using rungs::syntax::InputFile;

struct Parsed {
  std::size_t statements = 0;
  int errors = 0;
  std::string rendered;
};

Parsed parse(std::string text) {
  const InputFile file{"hostile.rungs", std::move(text)};
  Diagnostics diagnostics(file);
  const auto description = rungs::syntax::parse_description(diagnostics);
  return {description.statements.size(), diagnostics.error_count(), diagnostics.render()};
}

std::string repeated(const std::string& piece, std::size_t n, const std::string& between = "") {
  std::string out;
  for (std::size_t i = 0; i < n; ++i) out += (i ? between : "") + piece;
  return out;
}

}  // namespace

TEST_CASE("100,000 opening brackets give the depth error, not a crash", "[bounds]") {
  const Parsed p =
      parse("load b " + repeated("(", 100000) + "50ohm" + repeated(")", 100000) + "\n");
  CHECK(p.errors == 1);
  CHECK(p.statements == 0);
  // The 65th '(' is column 8 + 64 = 72.
  CHECK(p.rendered.rfind("hostile.rungs:1:72: error: brackets nested deeper than 64 levels; "
                         "write the load with fewer brackets",
                         0) == 0);
}

TEST_CASE("64 levels of brackets parse into one load", "[bounds]") {
  const Parsed p = parse("load b " + repeated("(", 64) + "50ohm + 1nF" + repeated(")", 64) + "\n");
  CHECK(p.rendered.empty());
  CHECK(p.statements == 1);
}

TEST_CASE("a bracket in a comment does not count towards the depth", "[bounds]") {
  const Parsed p = parse("load b 50ohm # " + repeated("(", 1000) + "\n");
  CHECK(p.rendered.empty());
  CHECK(p.statements == 1);
}

TEST_CASE("a load of 256 values parses and one of 5,000 names the limit", "[bounds]") {
  const Parsed ok = parse("load b " + repeated("1ohm", 256, " + ") + "\n");
  CHECK(ok.rendered.empty());
  CHECK(ok.statements == 1);
  const Parsed nested = parse("load b " + repeated("(1ohm || 2ohm)", 128, " + ") + "\n");
  CHECK(nested.rendered.empty());
  const Parsed big = parse("load b " + repeated("1ohm", 5000, " + ") + "\n");
  CHECK(big.errors == 1);
  CHECK(big.statements == 0);
  // The 257th value starts after 256 values of "1ohm + " (7 characters) and "load b ".
  CHECK(big.rendered.rfind("hostile.rungs:1:1800: error: a load takes at most 256 values, this "
                           "one has 5000",
                           0) == 0);
  const Parsed huge = parse("load b " + repeated("1ohm", 100000, " || ") + "\n");
  CHECK(huge.errors == 1);
  CHECK(huge.rendered.find("this one has 100000") != std::string::npos);
}

TEST_CASE("40,000 bad lines show 50 errors and a count of the rest", "[bounds]") {
  const Parsed p = parse(repeated("bogus x\n", 40000));
  CHECK(p.errors == 40000);
  std::size_t shown = 0;
  for (std::size_t at = p.rendered.find(": error: "); at != std::string::npos;
       at = p.rendered.find(": error: ", at + 1))
    ++shown;
  CHECK(shown == 50);
  CHECK(p.rendered.find("hostile.rungs:50:1: error: unknown statement 'bogus'") !=
        std::string::npos);
  CHECK(p.rendered.find("hostile.rungs:51:1:") == std::string::npos);
  const std::string last = "hostile.rungs: 39950 more errors not shown\n";
  REQUIRE(p.rendered.size() > last.size());
  CHECK(p.rendered.substr(p.rendered.size() - last.size()) == last);
}

TEST_CASE("a long source line is echoed as a window around the column", "[bounds]") {
  const std::string text = "load b 50ohm" + std::string(100000, ' ') + "bogus\n";
  const Parsed p = parse(text);
  REQUIRE(p.errors == 1);
  // Message line, echo, caret: the echo is a window of 100 bytes with "..." before it.
  const std::size_t first = p.rendered.find('\n');
  const std::size_t second = p.rendered.find('\n', first + 1);
  REQUIRE(second != std::string::npos);
  const std::string echo = p.rendered.substr(first + 1, second - first - 1);
  const std::string caret = p.rendered.substr(second + 1, p.rendered.size() - second - 2);
  CHECK(echo.size() <= 3 + 100);
  CHECK(echo.rfind("...", 0) == 0);
  CHECK(echo.find("bogus") != std::string::npos);
  // The caret stands under the 'b' of bogus in the window.
  CHECK(caret.find('^') == echo.find("bogus"));
  CHECK(caret.substr(caret.find('^')) == "^~~~~");
  CHECK(p.rendered.size() < 400);
}
