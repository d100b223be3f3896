// Writing output files atomically, and never over a file rungs did not write.
#pragma once
#include <functional>
#include <ostream>
#include <string>

namespace rungs::cli {

/// Writes `path` by calling `write` on a temporary file beside it, then renaming it over
/// `path`, so a reader sees the old file or the new one, never half of one. "-" writes to
/// standard output. When `protect_foreign` is set, an existing file whose first line is not
/// a rungs deck marker is left alone unless `force`. Returns an error message, or empty.
std::string write_atomically(const std::string& path,
                             const std::function<void(std::ostream&)>& write,
                             bool protect_foreign, bool force);

}  // namespace rungs::cli
