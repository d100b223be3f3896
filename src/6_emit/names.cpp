// Case-insensitive allocation of unique netlist names.
#include "6_emit/names.h"

#include <cctype>

#include <fmt/format.h>

#include "1_syntax/text.h"

namespace rungs::emit {

bool NameTable::reserve(std::string_view name) {
  return folded_.insert(syntax::fold_case(name)).second;
}

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
