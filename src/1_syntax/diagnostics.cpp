// Rendering diagnostics compiler-style: location, message, source line, caret.
#include "1_syntax/diagnostics.h"

#include <algorithm>

#include <fmt/format.h>

#include "1_syntax/text.h"

namespace rungs::syntax {

void Diagnostics::error(Span span, std::string message) {
  list_.push_back({Severity::error, span, std::move(message)});
  ++error_count_;
}

void Diagnostics::warning(Span span, std::string message) {
  list_.push_back({Severity::warning, span, std::move(message)});
}

std::string Diagnostics::render() const {
  std::vector<Diagnostic> sorted = list_;
  std::stable_sort(sorted.begin(), sorted.end(), [](const Diagnostic& a, const Diagnostic& b) {
    return a.span.begin < b.span.begin;
  });
  std::string out;
  for (const Diagnostic& d : sorted) out += render_diagnostic(*file_, d);
  return out;
}

std::string render_diagnostic(const InputFile& file, const Diagnostic& diagnostic) {
  const Location where = file.locate(diagnostic.span.begin);
  const std::string_view line = file.line_of(diagnostic.span.begin);
  const char* label = diagnostic.severity == Severity::error ? "error" : "warning";

  // The caret line copies tabs from the source so the caret lines up in any terminal.
  std::string marker;
  int column = 1;
  for (char c : line) {
    if (column >= where.column) break;
    if (is_utf8_continuation(c)) continue;
    marker += c == '\t' ? '\t' : ' ';
    ++column;
  }
  marker += '^';
  const std::size_t line_begin = static_cast<std::size_t>(line.data() - file.text.data());
  const std::size_t line_end = line_begin + line.size();
  const std::size_t span_end = std::min(diagnostic.span.end, line_end);
  for (std::size_t i = diagnostic.span.begin + 1; i < span_end; ++i) {
    if (!is_utf8_continuation(file.text[i])) marker += '~';
  }
  return fmt::format("{}:{}:{}: {}: {}\n{}\n{}\n", file.name, where.line, where.column, label,
                     diagnostic.message, line, marker);
}

}  // namespace rungs::syntax
