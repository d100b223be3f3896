// ASCII case folding and UTF-8 byte classes, as names and columns use them.
#include <catch2/catch.hpp>

#include <string>

#include "1_syntax/text.h"

using rungs::syntax::equals_folded;
using rungs::syntax::fold_case;
using rungs::syntax::is_non_ascii;
using rungs::syntax::is_utf8_continuation;
using rungs::syntax::starts_with_folded;

TEST_CASE("case folding makes ASCII capitals small and leaves every other byte") {
  CHECK(fold_case(std::string_view("Line_A9")) == "line_a9");
  CHECK(fold_case('Z') == 'z');
  CHECK(fold_case('[') == '[');  // just past Z
  CHECK(fold_case('@') == '@');  // just before A
  CHECK(fold_case(std::string_view("\xC2\xB5"
                                   "F")) ==
        "\xC2\xB5"
        "f");  // µF
  CHECK(equals_folded("GnD", "gnd"));
  CHECK_FALSE(equals_folded("gnd", "gnd0"));
  CHECK(starts_with_folded("MEGohm", "meg"));
  CHECK_FALSE(starts_with_folded("me", "meg"));
}

TEST_CASE("a UTF-8 continuation byte is told from the byte that starts a code point") {
  // UTF-8 (RFC 3629): continuation bytes are 10xxxxxx; µ is C2 B5, Ω is E2 84 A6.
  CHECK_FALSE(is_utf8_continuation('\xC2'));
  CHECK(is_utf8_continuation('\xB5'));
  CHECK_FALSE(is_utf8_continuation('\xE2'));
  CHECK(is_utf8_continuation('\x84'));
  CHECK_FALSE(is_utf8_continuation('a'));
  CHECK(is_non_ascii('\xE2'));
  CHECK_FALSE(is_non_ascii('~'));
}
