// A description's text with its name, and spans into it.
#pragma once
#include <cstddef>
#include <string>
#include <string_view>

namespace rungs::syntax {

/// Half-open byte range [begin, end) into a InputFile's text.
struct Span {
  std::size_t begin = 0;
  std::size_t end = 0;
};

/// 1-based line and column; the column counts UTF-8 code points, not bytes.
struct Location {
  int line = 1;
  int column = 1;
};

/// The text of one description and the name it is reported under (a path or "<stdin>").
struct InputFile {
  std::string name;
  std::string text;

  /// Line and column of a byte offset (offsets past the end give the end).
  Location locate(std::size_t offset) const;
  /// The whole line that holds `offset`, without its line break.
  std::string_view line_of(std::size_t offset) const;
  /// The text a span covers.
  std::string_view slice(Span span) const;
};

}  // namespace rungs::syntax
