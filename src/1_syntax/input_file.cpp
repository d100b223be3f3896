// Locating byte offsets of a description as lines and columns.
#include "1_syntax/input_file.h"

#include <algorithm>

#include "1_syntax/text.h"

namespace rungs::syntax {

namespace {

/// A line ends at LF, or at a CR that no LF follows (old Mac files); CRLF counts once.
bool breaks_line(std::string_view text, std::size_t i) {
  return text[i] == '\n' || (text[i] == '\r' && (i + 1 == text.size() || text[i + 1] != '\n'));
}
}  // namespace

Location InputFile::locate(std::size_t offset) const {
  offset = std::min(offset, text.size());
  Location where;
  // Counted with std::count (vectorised): a lone CR breaks a line too, so CRs are counted
  // only when the text has any (CRLF counts once, at its LF).
  const std::string_view before = std::string_view(text).substr(0, offset);
  where.line += static_cast<int>(std::count(before.begin(), before.end(), '\n'));
  if (before.find('\r') != std::string_view::npos) {
    for (std::size_t i = 0; i < offset; ++i)
      if (text[i] == '\r' && breaks_line(text, i)) ++where.line;
  }
  std::size_t line_start = offset;
  while (line_start > 0 && !breaks_line(text, line_start - 1)) --line_start;
  for (std::size_t i = line_start; i < offset; ++i) {
    if (!is_utf8_continuation(text[i])) ++where.column;
  }
  return where;
}

std::string_view InputFile::line_of(std::size_t offset) const {
  std::string_view all(text);
  offset = std::min(offset, all.size());
  std::size_t begin = offset;
  while (begin > 0 && !breaks_line(all, begin - 1)) --begin;
  std::size_t end = offset;
  while (end < all.size() && all[end] != '\n' && all[end] != '\r') ++end;
  return all.substr(begin, end - begin);
}

std::string_view InputFile::slice(Span span) const {
  std::size_t begin = std::min(span.begin, text.size());
  std::size_t end = std::clamp(span.end, begin, text.size());
  return std::string_view(text).substr(begin, end - begin);
}

}  // namespace rungs::syntax
