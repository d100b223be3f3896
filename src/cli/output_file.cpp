// Atomic file replacement through a temporary file and rename.
#include "cli/output_file.h"

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <iostream>

#include <fmt/format.h>
#include <unistd.h>

#include "emit/deck.h"

namespace rungs::cli {

namespace fs = std::filesystem;

std::string write_atomically(const std::string& path,
                             const std::function<void(std::ostream&)>& write,
                             bool protect_foreign, bool force) {
  if (path == "-") {
    write(std::cout);
    std::cout.flush();
    return std::cout ? "" : "cannot write to standard output";
  }
  std::error_code ec;
  if (protect_foreign && !force && fs::exists(path, ec)) {
    std::ifstream existing(path);
    std::string first_line;
    std::getline(existing, first_line);
    if (!emit::is_deck_marker(first_line))
      return fmt::format("'{}' exists and was not written by rungs; not overwriting it "
                         "(use --force to replace it)",
                         path);
  }
  const fs::path target(path);
  const fs::path temporary =
      target.parent_path() / fmt::format(".{}.rungs-{}.tmp", target.filename().string(), ::getpid());
  {
    std::ofstream out(temporary, std::ios::binary | std::ios::trunc);
    if (!out) return fmt::format("cannot write '{}': {}", temporary.string(), std::strerror(errno));
    write(out);
    out.flush();
    if (!out) {
      const std::string reason = std::strerror(errno);
      out.close();
      fs::remove(temporary, ec);
      return fmt::format("cannot write '{}': {}", path, reason);
    }
  }
  fs::rename(temporary, target, ec);
  if (ec) {
    fs::remove(temporary, ec);
    return fmt::format("cannot replace '{}': {}", path, ec.message());
  }
  return "";
}

}  // namespace rungs::cli
