// Writing make-syntax depfiles.
#include "8_project/depfile.h"

#include <set>
#include <vector>

namespace rungs::project {

std::string escape_make_path(std::string_view path) {
  std::string out;
  for (std::size_t i = 0; i < path.size(); ++i) {
    const char c = path[i];
    if (c == ' ' || c == '\t') {
      // Make reads 2N+1 backslashes before a space as N backslashes and the space, so the
      // backslashes already there are doubled, then one more escapes the space.
      for (std::size_t back = i; back > 0 && path[back - 1] == '\\'; --back) out += '\\';
      out += '\\';
    } else if (c == '#') {
      out += '\\';
    } else if (c == '$') {
      out += '$';
    }
    out += c;
  }
  return out;
}

bool depfile_can_name(std::string_view path) {
  return !path.empty() && path.find_first_of("\r\n") == std::string_view::npos;
}

std::string depfile_problem(std::span<const std::string> targets,
                            std::span<const std::string> prerequisites) {
  for (const auto& list : {targets, prerequisites})
    for (const std::string& path : list)
      if (!depfile_can_name(path))
        return path.empty() ? "a depfile cannot name an empty path"
                            : "a depfile cannot name a path with a line break in it";
  return "";
}

std::string make_depfile(std::span<const std::string> targets,
                         std::span<const std::string> prerequisites) {
  std::string out;
  for (std::size_t i = 0; i < targets.size(); ++i) {
    if (i > 0) out += ' ';
    out += escape_make_path(targets[i]);
  }
  out += ':';
  std::set<std::string_view> seen;
  std::vector<std::string_view> unique;
  for (const std::string& path : prerequisites)
    if (seen.insert(path).second) unique.push_back(path);
  for (std::string_view path : unique) {
    out += " \\\n  ";
    out += escape_make_path(path);
  }
  out += '\n';
  for (std::string_view path : unique) {
    out += '\n';
    out += escape_make_path(path);
    out += ":\n";
  }
  return out;
}

}  // namespace rungs::project
