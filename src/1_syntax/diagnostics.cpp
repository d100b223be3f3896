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
  const std::size_t shown = std::min(sorted.size(), kMaxDiagnosticsShown);
  for (std::size_t i = 0; i < shown; ++i) out += render_diagnostic(*file_, sorted[i]);
  if (sorted.size() > shown) {
    const auto errors = static_cast<std::size_t>(
        std::count_if(sorted.begin() + static_cast<std::ptrdiff_t>(shown), sorted.end(),
                      [](const Diagnostic& d) { return d.severity == Severity::error; }));
    const std::size_t warnings = sorted.size() - shown - errors;
    std::string rest;
    if (errors > 0) rest = fmt::format("{} more {}", errors, errors == 1 ? "error" : "errors");
    if (warnings > 0)
      rest += fmt::format("{}{} {}", errors > 0 ? " and " : "", warnings,
                          warnings == 1 ? "warning" : "warnings");
    if (errors == 0) rest = "more: " + rest;
    out += fmt::format("{}: {} not shown\n", file_->name, rest);
  }
  return out;
}

std::string render_diagnostic(const InputFile& file, const Diagnostic& diagnostic) {
  const Location where = file.locate(diagnostic.span.begin);
  const std::string_view line = file.line_of(diagnostic.span.begin);
  const char* label = diagnostic.severity == Severity::error ? "error" : "warning";

  // A long line is echoed as a window of about kEchoWidth bytes around the column, cut at
  // character boundaries and marked with "..." where it was cut.
  const std::size_t line_begin = static_cast<std::size_t>(line.data() - file.text.data());
  const std::size_t at = std::min(diagnostic.span.begin, line_begin + line.size()) - line_begin;
  std::size_t from = 0;
  std::size_t to = line.size();
  if (line.size() > kEchoWidth) {
    from = at > kEchoWidth / 2 ? at - kEchoWidth / 2 : 0;
    while (from > 0 && is_utf8_continuation(line[from])) --from;
    to = std::min(line.size(), from + kEchoWidth);
    while (to < line.size() && is_utf8_continuation(line[to])) ++to;
  }
  const std::string_view shown = line.substr(from, to - from);
  const char* const before = from > 0 ? "..." : "";
  const char* const after = to < line.size() ? "..." : "";

  // The caret line copies tabs from the source so the caret lines up in any terminal.
  std::string marker(std::string_view(before).size(), ' ');
  for (std::size_t i = from; i < at; ++i) {
    if (is_utf8_continuation(line[i])) continue;
    marker += line[i] == '\t' ? '\t' : ' ';
  }
  marker += '^';
  const std::size_t span_end = std::min(diagnostic.span.end, line_begin + to);
  for (std::size_t i = diagnostic.span.begin + 1; i < span_end; ++i) {
    if (!is_utf8_continuation(file.text[i])) marker += '~';
  }
  return fmt::format("{}:{}:{}: {}: {}\n{}{}{}\n{}\n", file.name, where.line, where.column, label,
                     diagnostic.message, before, shown, after, marker);
}

}  // namespace rungs::syntax
