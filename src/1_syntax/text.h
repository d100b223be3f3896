// Byte-level text helpers: ASCII case folding (as simulators fold names) and UTF-8 byte classes.
#pragma once
#include <string>
#include <string_view>

namespace rungs::syntax {

/// `c` with an ASCII capital made small; every other byte (UTF-8 included) unchanged. Not
/// locale-dependent, so a name folds the same on every machine.
constexpr char fold_case(char c) {
  return c >= 'A' && c <= 'Z' ? static_cast<char>(c + 32) : c;
}

/// `text` with every ASCII capital made small (fold_case of each byte).
inline std::string fold_case(std::string_view text) {
  std::string out(text);
  for (char& c : out) c = fold_case(c);
  return out;
}

/// True when `text` begins with `prefix` once both are case folded.
constexpr bool starts_with_folded(std::string_view text, std::string_view prefix) {
  if (text.size() < prefix.size()) return false;
  for (std::size_t i = 0; i < prefix.size(); ++i)
    if (fold_case(text[i]) != fold_case(prefix[i])) return false;
  return true;
}

/// True for an ASCII control byte (below a space, or DEL): a line break in a file name would
/// end a comment line of the deck and start a netlist line of its own.
constexpr bool is_control(char c) {
  return static_cast<unsigned char>(c) < 0x20 || static_cast<unsigned char>(c) == 0x7f;
}

/// `text` with each control byte written as \xNN, so that it stays on one line and shows.
inline std::string escape_controls(std::string_view text) {
  static constexpr char kHex[] = "0123456789abcdef";
  std::string out;
  out.reserve(text.size());
  for (char c : text) {
    if (!is_control(c)) {
      out += c;
      continue;
    }
    const auto byte = static_cast<unsigned char>(c);
    out += "\\x";
    out += kHex[byte >> 4];
    out += kHex[byte & 15];
  }
  return out;
}

/// True when `a` and `b` are the same once case folded.
constexpr bool equals_folded(std::string_view a, std::string_view b) {
  return a.size() == b.size() && starts_with_folded(a, b);
}

/// True for a UTF-8 continuation byte (10xxxxxx): it does not start a code point, so columns
/// and carets skip it.
constexpr bool is_utf8_continuation(char c) {
  return (static_cast<unsigned char>(c) & 0xC0) == 0x80;
}

/// True for a byte outside ASCII: a part of a multi-byte UTF-8 code point.
constexpr bool is_non_ascii(char c) {
  return static_cast<unsigned char>(c) >= 0x80;
}

}  // namespace rungs::syntax
