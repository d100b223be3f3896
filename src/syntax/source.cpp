// Locating byte offsets of a description as lines and columns.
#include "syntax/source.h"

#include <algorithm>

namespace rungs::syntax {

namespace {
bool is_continuation_byte(char c) { return (static_cast<unsigned char>(c) & 0xC0) == 0x80; }
}  // namespace

Location SourceFile::locate(std::size_t offset) const {
  offset = std::min(offset, text.size());
  Location where;
  std::size_t line_start = 0;
  for (std::size_t i = 0; i < offset; ++i) {
    if (text[i] == '\n') {
      ++where.line;
      line_start = i + 1;
    }
  }
  for (std::size_t i = line_start; i < offset; ++i) {
    if (!is_continuation_byte(text[i])) ++where.column;
  }
  return where;
}

std::string_view SourceFile::line_of(std::size_t offset) const {
  std::string_view all(text);
  offset = std::min(offset, all.size());
  std::size_t newline_before = all.substr(0, offset).rfind('\n');
  std::size_t begin = newline_before == std::string_view::npos ? 0 : newline_before + 1;
  std::size_t end = std::min(all.find('\n', offset), all.size());
  if (end > begin && all[end - 1] == '\r') --end;
  return all.substr(begin, end - begin);
}

std::string_view SourceFile::slice(Span span) const {
  std::size_t begin = std::min(span.begin, text.size());
  std::size_t end = std::clamp(span.end, begin, text.size());
  return std::string_view(text).substr(begin, end - begin);
}

}  // namespace rungs::syntax
