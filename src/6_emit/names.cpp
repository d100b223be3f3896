// Case-insensitive allocation of unique netlist names.
#include "6_emit/names.h"

#include <cctype>

#include <fmt/format.h>

namespace rungs::emit {

namespace {
std::string fold(std::string_view name) {
  std::string out(name);
  for (char& c : out) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return out;
}
}  // namespace

bool NameTable::reserve(std::string_view name) { return folded_.insert(fold(name)).second; }

std::string NameTable::claim(std::string_view wanted) {
  std::string name(wanted);
  for (int suffix = 2; !reserve(name); ++suffix) name = fmt::format("{}_{}", wanted, suffix);
  return name;
}

std::string sanitize_name(std::string_view name) {
  std::string out(name);
  for (char& c : out) {
    if (!std::isalnum(static_cast<unsigned char>(c)) && c != '_') c = '_';
  }
  return out;
}

}  // namespace rungs::emit
