// The one path by which every user-facing error and warning is collected and printed.
#pragma once
#include <cstddef>
#include <string>
#include <vector>

#include "1_syntax/input_file.h"

namespace rungs::syntax {

enum class Severity { error, warning };

/// How many diagnostics of one file render() shows; a last line counts the rest.
inline constexpr std::size_t kMaxDiagnosticsShown = 50;
/// How many bytes of a long source line a diagnostic echoes, around its column.
inline constexpr std::size_t kEchoWidth = 100;

/// One message about a span of the source.
struct Diagnostic {
  Severity severity = Severity::error;
  Span span;
  std::string message;
};

/// Collects the diagnostics of one source file. Messages are short, lower case, and say what
/// was expected and what to write instead; they carry no location (the span gives it).
class Diagnostics {
 public:
  explicit Diagnostics(const InputFile& file) : file_(&file) {}

  void error(Span span, std::string message);
  void warning(Span span, std::string message);

  bool has_errors() const { return error_count_ > 0; }
  int error_count() const { return error_count_; }
  const std::vector<Diagnostic>& all() const { return list_; }
  const InputFile& file() const { return *file_; }

  /// The diagnostics in source order, each as `file:line:col: error: message`, the source
  /// line (a window of it when it is long), and a caret with tildes under the span; the first
  /// kMaxDiagnosticsShown only, then a line `file: N more errors not shown`.
  std::string render() const;

 private:
  const InputFile* file_;
  std::vector<Diagnostic> list_;
  int error_count_ = 0;
};

/// One diagnostic in the format of Diagnostics::render.
std::string render_diagnostic(const InputFile& file, const Diagnostic& diagnostic);

}  // namespace rungs::syntax
